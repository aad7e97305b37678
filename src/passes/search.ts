/**
 * One general event search over a scalar function of time: where is g(t) ≥ 0?
 * A coarse scan at a caller-chosen step, then bracketed root finding; local
 * extrema between samples that stay on one side are examined by bracketed
 * maximisation, so a short excursion above (or dip below) zero between two
 * samples of the same sign is still found, provided g is unimodal over two
 * scan steps around each extremum (the caller picks the step so).
 * Used for AOS/LOS (elevation − mask) and reusable for any threshold crossing.
 */

export interface Crossing {
  /** Start of the interval where g ≥ 0 (root of g, or the window start when clipped). */
  startS: number;
  endS: number;
  clippedStart: boolean;
  clippedEnd: boolean;
}

export interface Extremum { timeS: number; value: number }

const GOLDEN = (3 - Math.sqrt(5)) / 2;

/**
 * Maximum of f on [a, b] by golden-section search (Kiefer 1953) until the
 * bracket is narrower than `toleranceS`; the end points are candidates too,
 * so a monotone f returns its larger end.
 */
export function findMaximum(f: (t: number) => number, a: number, b: number, toleranceS: number): Extremum {
  let lo = a; let hi = b;
  let x1 = lo + GOLDEN * (hi - lo); let f1 = f(x1);
  let x2 = hi - GOLDEN * (hi - lo); let f2 = f(x2);
  while (hi - lo > toleranceS) {
    if (f1 >= f2) { hi = x2; x2 = x1; f2 = f1; x1 = lo + GOLDEN * (hi - lo); f1 = f(x1); }
    else { lo = x1; x1 = x2; f1 = f2; x2 = hi - GOLDEN * (hi - lo); f2 = f(x2); }
  }
  let best: Extremum = f1 >= f2 ? { timeS: x1, value: f1 } : { timeS: x2, value: f2 };
  const fa = f(a); const fb = f(b);
  if (fa > best.value) best = { timeS: a, value: fa };
  if (fb > best.value) best = { timeS: b, value: fb };
  return best;
}

/**
 * Root of g in [a, b] where g(a) and g(b) are on opposite sides of zero
 * (sign test: g ≥ 0 versus g < 0), by the Illinois variant of regula falsi
 * (Dowell & Jarratt 1971) with bisection steps to guarantee the bracket
 * shrinks; stops when the bracket is narrower than `toleranceS` and returns
 * its midpoint (so within toleranceS / 2 of the crossing).
 */
export function findRoot(g: (t: number) => number, a: number, b: number, ga: number, gb: number, toleranceS: number): number {
  let lo = a; let hi = b; let glo = ga; let ghi = gb;
  let side = 0;
  for (let it = 0; it < 200 && hi - lo > toleranceS; it++) {
    let x = it % 3 === 2 ? 0.5 * (lo + hi) : (lo * ghi - hi * glo) / (ghi - glo);
    if (!(x > lo && x < hi)) x = 0.5 * (lo + hi);
    // Keep the false-position point off the bracket ends so the width keeps shrinking.
    const minStep = 0.25 * toleranceS;
    if (x - lo < minStep) x = lo + minStep;
    if (hi - x < minStep) x = hi - minStep;
    const gx = g(x);
    if ((gx >= 0) === (glo >= 0)) {
      lo = x; glo = gx;
      if (side === -1) ghi *= 0.5;
      side = -1;
    } else {
      hi = x; ghi = gx;
      if (side === 1) glo *= 0.5;
      side = 1;
    }
  }
  return 0.5 * (lo + hi);
}

/**
 * Intervals of [startS, endS] where g ≥ 0. Cost: one evaluation per scan
 * step, plus a root search per crossing and an extremum search per local
 * extremum of the samples that stays on one side of zero.
 */
export function findCrossings(
  g: (t: number) => number, startS: number, endS: number, scanStepS: number, toleranceS: number,
): Crossing[] {
  if (!(endS > startS)) return [];
  if (!(scanStepS > 0) || !(toleranceS > 0)) throw new RangeError('findCrossings: scan step and tolerance must be > 0');
  const n = Math.max(1, Math.ceil((endS - startS) / scanStepS));
  const T = new Float64Array(n + 1);
  const G = new Float64Array(n + 1);
  for (let i = 0; i <= n; i++) {
    T[i] = i === n ? endS : startS + i * scanStepS;
    G[i] = g(T[i]);
  }
  // Events: +1 rising (g becomes ≥ 0), −1 falling.
  const events: { t: number; dir: 1 | -1 }[] = [];
  for (let i = 0; i < n; i++) {
    const a = G[i] >= 0; const b = G[i + 1] >= 0;
    if (a !== b) events.push({ t: findRoot(g, T[i], T[i + 1], G[i], G[i + 1], toleranceS), dir: b ? 1 : -1 });
  }
  // Hidden excursions: a sample extremum whose neighbours share its side of zero.
  const neg = (t: number) => -g(t);
  for (let i = 0; i <= n; i++) {
    const l = i > 0 ? i - 1 : i; const r = i < n ? i + 1 : i;
    if (l === r) continue;
    const gi = G[i];
    const below = gi < 0 && G[l] < 0 && G[r] < 0;
    const above = gi >= 0 && G[l] >= 0 && G[r] >= 0;
    if (below && gi >= G[l] && gi >= G[r] && (gi > G[l] || gi > G[r])) {
      const m = findMaximum(g, T[l], T[r], toleranceS);
      if (m.value >= 0) {
        events.push({ t: findRoot(g, T[l], m.timeS, G[l], m.value, toleranceS), dir: 1 });
        events.push({ t: findRoot(g, m.timeS, T[r], m.value, G[r], toleranceS), dir: -1 });
      }
    } else if (above && gi <= G[l] && gi <= G[r] && (gi < G[l] || gi < G[r])) {
      const m = findMaximum(neg, T[l], T[r], toleranceS);
      if (-m.value < 0) {
        events.push({ t: findRoot(g, T[l], m.timeS, G[l], -m.value, toleranceS), dir: -1 });
        events.push({ t: findRoot(g, m.timeS, T[r], -m.value, G[r], toleranceS), dir: 1 });
      }
    }
  }
  events.sort((p, q) => p.t - q.t || q.dir - p.dir);
  const out: Crossing[] = [];
  let open = G[0] >= 0;
  let openAt = startS;
  let clippedStart = open;
  for (const ev of events) {
    if (ev.dir === 1 && !open) { open = true; openAt = ev.t; clippedStart = false; }
    else if (ev.dir === -1 && open) {
      out.push({ startS: openAt, endS: ev.t, clippedStart, clippedEnd: false });
      open = false;
    }
  }
  if (open) out.push({ startS: openAt, endS, clippedStart, clippedEnd: true });
  return out;
}
