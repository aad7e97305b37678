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

/** Options of findMaximum: known end values, and an early answer to "does the maximum reach `level`?". */
export interface MaximumOptions {
  fa?: number;
  fb?: number;
  /**
   * With a bound on |df/dt| (`rate`, per second): stop as soon as the maximum
   * provably stays below `level` (every point of the bracket is within its
   * width of an evaluated point, so max ≤ best + rate × width). The value
   * returned is then the best found, below `level`, not the maximum itself.
   */
  below?: { level: number; rate: number };
}

/**
 * Maximum of f on [a, b] by golden-section search (Kiefer 1953) until the
 * bracket is narrower than `toleranceS`; the end points are candidates too,
 * so a monotone f returns its larger end.
 */
export function findMaximum(f: (t: number) => number, a: number, b: number, toleranceS: number, opts: MaximumOptions = {}): Extremum {
  let lo = a; let hi = b;
  let x1 = lo + GOLDEN * (hi - lo); let f1 = f(x1);
  let x2 = hi - GOLDEN * (hi - lo); let f2 = f(x2);
  const fa = opts.fa ?? f(a); const fb = opts.fb ?? f(b);
  const below = opts.below;
  const ends = fa > fb ? fa : fb;
  while (hi - lo > toleranceS) {
    if (below) {
      const top = f1 > f2 ? f1 : f2;
      if ((top > ends ? top : ends) + below.rate * (hi - lo) < below.level) break;
    }
    if (f1 >= f2) { hi = x2; x2 = x1; f2 = f1; x1 = lo + GOLDEN * (hi - lo); f1 = f(x1); }
    else { lo = x1; x1 = x2; f1 = f2; x2 = hi - GOLDEN * (hi - lo); f2 = f(x2); }
  }
  let best: Extremum = f1 >= f2 ? { timeS: x1, value: f1 } : { timeS: x2, value: f2 };
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
 * The coarse scan's sample times: T(i) = startS + i·stepS for i < n, T(n) = endS,
 * n = ⌈(endS − startS)/stepS⌉ (at least 1). A fixed grid, so any piece of it
 * can be searched on its own (`scanEvents`) and the pieces' events combined.
 */
export interface ScanGrid { startS: number; endS: number; stepS: number; n: number }

export function scanGrid(startS: number, endS: number, stepS: number): ScanGrid {
  if (!(stepS > 0)) throw new RangeError('findCrossings: scan step and tolerance must be > 0');
  return { startS, endS, stepS, n: Math.max(1, Math.ceil((endS - startS) / stepS)) };
}

export function scanTime(grid: ScanGrid, i: number): number {
  return i === grid.n ? grid.endS : grid.startS + i * grid.stepS;
}

/** A crossing of zero: +1 rising (g becomes ≥ 0), −1 falling. */
export interface CrossingEvent { t: number; dir: 1 | -1 }

/**
 * The events that scan intervals i0 … i1−1 and samples i0 … i1−1 (and sample
 * n when i1 = n) contribute, and whether g ≥ 0 at sample i0: a root in every interval whose ends differ in
 * sign, and a pair of roots around every sample extremum whose neighbours
 * share its side of zero but whose bracketed extremum crosses it. Pieces
 * [0, a), [a, b), …, [z, n) together give exactly the events of the whole grid.
 * `rateBound` (an upper bound of |dg/dt| per second, default none) lets the
 * extremum searches stop, or not start, where no crossing can hide;
 * `samples(i)`, when given, is g at scan time i computed by the caller (e.g.
 * shared by several stations).
 */
export function scanEvents(
  g: (t: number) => number, grid: ScanGrid, i0: number, i1: number, toleranceS: number, rateBound = Infinity,
  samples?: (i: number) => number,
): { events: CrossingEvent[]; firstAbove: boolean } {
  if (!(toleranceS > 0)) throw new RangeError('findCrossings: scan step and tolerance must be > 0');
  const { n } = grid;
  const lo = Math.max(0, i0 - 1);
  const hi = Math.min(n, i1 + 1);
  const T = new Float64Array(hi - lo + 1);
  const G = new Float64Array(hi - lo + 1);
  for (let i = lo; i <= hi; i++) {
    T[i - lo] = scanTime(grid, i);
    G[i - lo] = samples ? samples(i) : g(T[i - lo]);
  }
  const events: CrossingEvent[] = [];
  for (let i = i0; i < Math.min(i1, n); i++) {
    const a = i - lo;
    if ((G[a] >= 0) !== (G[a + 1] >= 0)) events.push({ t: findRoot(g, T[a], T[a + 1], G[a], G[a + 1], toleranceS), dir: G[a + 1] >= 0 ? 1 : -1 });
  }
  // Hidden excursions: a sample extremum whose neighbours share its side of zero.
  const neg = (t: number) => -g(t);
  const last = i1 >= n ? n : i1 - 1;
  for (let i = i0; i <= last; i++) {
    const l = (i > 0 ? i - 1 : i) - lo; const r = (i < n ? i + 1 : i) - lo;
    if (l === r) continue;
    const gi = G[i - lo];
    const below = gi < 0 && G[l] < 0 && G[r] < 0;
    const above = gi >= 0 && G[l] >= 0 && G[r] >= 0;
    if (below && gi >= G[l] && gi >= G[r] && (gi > G[l] || gi > G[r])) {
      // With a bound on |dg/dt| the search stops as soon as the excursion provably stays below zero.
      if (gi + rateBound * (T[r] - T[l]) < 0) continue;
      const m = findMaximum(g, T[l], T[r], toleranceS, { fa: G[l], fb: G[r], below: { level: 0, rate: rateBound } });
      if (m.value >= 0) {
        events.push({ t: findRoot(g, T[l], m.timeS, G[l], m.value, toleranceS), dir: 1 });
        events.push({ t: findRoot(g, m.timeS, T[r], m.value, G[r], toleranceS), dir: -1 });
      }
    } else if (above && gi <= G[l] && gi <= G[r] && (gi < G[l] || gi < G[r])) {
      if (gi - rateBound * (T[r] - T[l]) >= 0) continue;
      const m = findMaximum(neg, T[l], T[r], toleranceS, { fa: -G[l], fb: -G[r], below: { level: 0, rate: rateBound } });
      if (-m.value < 0) {
        events.push({ t: findRoot(g, T[l], m.timeS, G[l], -m.value, toleranceS), dir: -1 });
        events.push({ t: findRoot(g, m.timeS, T[r], -m.value, G[r], toleranceS), dir: 1 });
      }
    }
  }
  return { events, firstAbove: G[i0 - lo] >= 0 };
}

/**
 * Intervals where g ≥ 0 from the events of the whole grid (any order) and the
 * sign at the window start (`startsAbove`: g(startS) ≥ 0).
 */
export function assembleCrossings(events: CrossingEvent[], startsAbove: boolean, startS: number, endS: number): Crossing[] {
  const sorted = [...events].sort((p, q) => p.t - q.t || q.dir - p.dir);
  const out: Crossing[] = [];
  let open = startsAbove;
  let openAt = startS;
  let clippedStart = open;
  for (const ev of sorted) {
    if (ev.dir === 1 && !open) { open = true; openAt = ev.t; clippedStart = false; }
    else if (ev.dir === -1 && open) {
      out.push({ startS: openAt, endS: ev.t, clippedStart, clippedEnd: false });
      open = false;
    }
  }
  if (open) out.push({ startS: openAt, endS, clippedStart, clippedEnd: true });
  return out;
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
  const grid = scanGrid(startS, endS, scanStepS);
  const { events, firstAbove } = scanEvents(g, grid, 0, grid.n, toleranceS);
  return assembleCrossings(events, firstAbove, startS, endS);
}
