/**
 * The selection problem (model.ts) solved as a mixed-integer programme by
 * HiGHS (the `highs` package: HiGHS compiled to WebAssembly, no native build),
 * written in CPLEX LP format. Shortfalls are continuous s_t ≥ 0 with
 * s_t + Σ coef x ≥ need. Single-threaded, fixed random seed, relative gap 0:
 * the same problem gives the same answer. When the time limit stops it, the
 * LP relaxation gives the bound the gap is measured against.
 */
import type { Highs } from 'highs';
import type { SelectionProblem } from './model.js';

let loaded: Promise<Highs> | null = null;
/** HiGHS, loaded on first use (so no other command pays for its start-up). */
function solver(): Promise<Highs> {
  return (loaded ??= import('highs').then((m) => {
    // The package's ESM build exports the loader as default; its types describe the CommonJS shape.
    const loader = (m as unknown as { default?: () => Promise<Highs> }).default ?? (m as unknown as () => Promise<Highs>);
    return loader();
  }));
}

const num = (x: number) => {
  const s = Number(x.toPrecision(15)).toString();
  return s.includes('e') ? Number(x).toExponential(14) : s;
};

function terms(parts: [number, string][]): string {
  const out: string[] = [];
  let line = '';
  for (const [c, v] of parts) {
    if (c === 0) continue;
    line += ` ${c < 0 ? '-' : '+'} ${num(Math.abs(c))} ${v}`;
    if (line.length > 200) { out.push(line); line = ''; }
  }
  if (line) out.push(line);
  return out.length ? out.join('\n ') : ' 0 x0';
}

/** The problem as CPLEX LP text; `relaxed`: x in [0, 1] instead of binary. */
export function lpText(p: SelectionProblem, relaxed = false): string {
  const obj: [number, string][] = p.gain.map((g, c) => [g, `x${c}`]);
  p.targets.forEach((t, i) => obj.push([-t.penalty, `s${i}`]));
  const rows: string[] = [];
  p.groups.forEach((g, i) => rows.push(` g${i}:${terms(g.map((v) => [1, `x${v}`]))} <= 1`));
  p.caps.forEach((k, i) => rows.push(` k${i}:${terms(k.vars.map((v) => [1, `x${v}`]))} <= ${k.max}`));
  p.targets.forEach((t, i) => rows.push(` t${i}:${terms([...t.vars.map((v, j): [number, string] => [t.coef[j], `x${v}`]), [1, `s${i}`]])} >= ${num(t.need)}`));
  const xs = Array.from({ length: p.n }, (_, c) => `x${c}`);
  const bounds = [...(relaxed ? xs.map((x) => ` 0 <= ${x} <= 1`) : []), ...p.targets.map((_, i) => ` s${i} >= 0`)];
  const lines = ['Maximize', ` obj:${terms(obj)}`, 'Subject To', ...(rows.length ? rows : [' r0: x0 >= 0']), 'Bounds', ...bounds];
  if (!relaxed && p.n > 0) {
    lines.push('Binary');
    for (let i = 0; i < xs.length; i += 20) lines.push(` ${xs.slice(i, i + 20).join(' ')}`);
  }
  lines.push('End');
  return `${lines.join('\n')}\n`;
}

export interface MipResult {
  status: string;
  /** The selection (null when the solver gave none). */
  x: Uint8Array | null;
  /** Proven optimal (status Optimal). */
  optimal: boolean;
  /** Upper bound on the objective when not optimal (LP relaxation), else the objective. */
  bound: number | null;
  timeS: number;
}

export async function solveMip(p: SelectionProblem, timeLimitS: number): Promise<MipResult> {
  const h = await solver();
  const t0 = performance.now();
  if (p.n === 0) return { status: 'Empty', x: new Uint8Array(0), optimal: true, bound: 0, timeS: 0 };
  const opts = { output_flag: false, mip_rel_gap: 0, mip_abs_gap: 0, time_limit: timeLimitS, random_seed: 0, threads: 1, presolve: 'on' } as const;
  const r = h.solve(lpText(p), opts as Parameters<Highs['solve']>[1]);
  let x: Uint8Array | null = null;
  if (r.Status !== 'Infeasible' && r.Columns && Object.keys(r.Columns).length > 0) {
    const cols = r.Columns as Record<string, { Primal?: number }>;
    if (cols.x0 && typeof cols.x0.Primal === 'number') x = Uint8Array.from({ length: p.n }, (_, c) => ((cols[`x${c}`]?.Primal ?? 0) > 0.5 ? 1 : 0));
  }
  const optimal = r.Status === 'Optimal';
  let bound: number | null = optimal ? r.ObjectiveValue : null;
  if (!optimal) {
    const lp = h.solve(lpText(p, true), { output_flag: false, time_limit: Math.max(1, timeLimitS) } as Parameters<Highs['solve']>[1]);
    if (lp.Status === 'Optimal') bound = lp.ObjectiveValue;
  }
  return { status: r.Status, x, optimal, bound, timeS: (performance.now() - t0) / 1000 };
}
