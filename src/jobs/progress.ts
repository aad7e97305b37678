/**
 * Progress on stderr, with rate and ETA: only when stderr is a terminal, not
 * with --quiet, and only once a run has taken longer than about 2 s.
 */
export interface Progress {
  update: (done: number, total: number) => void;
  done: () => void;
}

export function createProgress(opts: { quiet: boolean; label: string; stream?: NodeJS.WriteStream }): Progress {
  const stream = opts.stream ?? process.stderr;
  const enabled = !opts.quiet && stream.isTTY === true;
  const t0 = Date.now();
  let lastDraw = 0;
  let drawn = false;
  const update = (done: number, total: number) => {
    if (!enabled || total <= 0) return;
    const now = Date.now();
    if (now - t0 < 2000 || now - lastDraw < 200) return;
    lastDraw = now;
    drawn = true;
    const frac = Math.min(1, done / total);
    const elapsed = (now - t0) / 1000;
    const eta = frac > 0 ? elapsed * (1 - frac) / frac : NaN;
    const width = 30;
    const bar = '#'.repeat(Math.round(frac * width)).padEnd(width, '.');
    const rate = done / elapsed / 3600; // hours of pass time per second of wall time
    stream.write(`\r${opts.label} [${bar}] ${(frac * 100).toFixed(0).padStart(3)}%  ${rate.toFixed(2)} h of passes/s  ETA ${Number.isFinite(eta) ? eta.toFixed(0) : '?'} s `);
  };
  const done = () => {
    if (drawn) stream.write('\r\x1b[K');
    drawn = false;
  };
  return { update, done };
}
