/**
 * The selection problem of one planning horizon, solver-independent:
 * binaries x_c (take candidate c or not), maximise
 *     Σ gain_c x_c − Σ_t penalty_t · s_t,
 * with s_t = max(0, need_t − Σ coef_tc x_c) the shortfall of target t, subject to
 *     Σ_{c ∈ G} x_c ≤ 1   for each conflict group G (cliques of an interval graph),
 *     Σ_{c ∈ K} x_c ≤ max_K   for each cap K.
 * `evaluate` is the one definition of the objective: the brute force, the
 * greedy and the check of the MIP solver's answer all use it.
 */

export interface Target { key: string; vars: number[]; coef: number[]; need: number; penalty: number }
export interface Cap { key: string; vars: number[]; max: number }

export interface SelectionProblem {
  n: number;
  gain: number[];
  groups: number[][];
  caps: Cap[];
  targets: Target[];
}

/** Is x feasible (groups and caps)? */
export function feasible(p: SelectionProblem, x: ArrayLike<number>): boolean {
  for (const g of p.groups) { let s = 0; for (const v of g) s += x[v]; if (s > 1) return false; }
  for (const k of p.caps) { let s = 0; for (const v of k.vars) s += x[v]; if (s > k.max) return false; }
  return true;
}

export function shortfall(t: Target, x: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < t.vars.length; i++) s += t.coef[i] * x[t.vars[i]];
  return Math.max(0, t.need - s);
}

/** The objective of a selection (−Infinity when infeasible). */
export function evaluate(p: SelectionProblem, x: ArrayLike<number>): number {
  if (!feasible(p, x)) return -Infinity;
  let z = 0;
  for (let c = 0; c < p.n; c++) z += p.gain[c] * x[c];
  for (const t of p.targets) z -= t.penalty * shortfall(t, x);
  return z;
}

/** Exhaustive search over all 2^n selections (n ≤ 20): the reference the solver is checked against. */
export function bruteForce(p: SelectionProblem): { x: Uint8Array; objective: number } {
  if (p.n > 20) throw new RangeError(`brute force: ${p.n} candidates (allowed at most 20)`);
  const x = new Uint8Array(p.n);
  let best = -Infinity, bestMask = 0;
  for (let m = 0; m < 2 ** p.n; m++) {
    for (let c = 0; c < p.n; c++) x[c] = (m >> c) & 1;
    const z = evaluate(p, x);
    if (z > best + 1e-12) { best = z; bestMask = m; }
  }
  for (let c = 0; c < p.n; c++) x[c] = (bestMask >> c) & 1;
  return { x, objective: best };
}

/**
 * Greedy: from nothing, repeatedly add the candidate that keeps the selection
 * feasible and raises the objective most (ties: the lower index), until no
 * addition raises it. Deterministic; no optimality claim (it is the fallback
 * when the solver runs out of time, and a check: it never beats the optimum).
 */
export function greedy(p: SelectionProblem): { x: Uint8Array; objective: number } {
  const x = new Uint8Array(p.n);
  // Conflict lists, so a candidate's feasibility is checked against its own groups and caps only.
  const groupsOf: number[][] = Array.from({ length: p.n }, () => []);
  p.groups.forEach((g, gi) => { for (const v of g) groupsOf[v].push(gi); });
  const capsOf: number[][] = Array.from({ length: p.n }, () => []);
  p.caps.forEach((k, ki) => { for (const v of k.vars) capsOf[v].push(ki); });
  const groupUsed = new Int32Array(p.groups.length);
  const capUsed = new Int32Array(p.caps.length);
  const targetsOf: { t: number; coef: number }[][] = Array.from({ length: p.n }, () => []);
  p.targets.forEach((t, ti) => t.vars.forEach((v, i) => targetsOf[v].push({ t: ti, coef: t.coef[i] })));
  const have = new Float64Array(p.targets.length);
  let z = evaluate(p, x);
  for (;;) {
    let best = -1, bestGain = 1e-12;
    for (let c = 0; c < p.n; c++) {
      if (x[c]) continue;
      if (groupsOf[c].some((g) => groupUsed[g] >= 1) || capsOf[c].some((k) => capUsed[k] >= p.caps[k].max)) continue;
      let d = p.gain[c];
      for (const { t, coef } of targetsOf[c]) {
        const T = p.targets[t];
        d += T.penalty * (Math.max(0, T.need - have[t]) - Math.max(0, T.need - have[t] - coef));
      }
      if (d > bestGain) { bestGain = d; best = c; }
    }
    if (best < 0) break;
    x[best] = 1;
    for (const g of groupsOf[best]) groupUsed[g]++;
    for (const k of capsOf[best]) capUsed[k]++;
    for (const { t, coef } of targetsOf[best]) have[t] += coef;
  }
  z = evaluate(p, x);
  return { x, objective: z };
}

/**
 * Maximal cliques of an interval graph: intervals [start, end) overlap when
 * each starts before the other ends. At each start the intervals covering it
 * form a clique; those not contained in the previous one are kept.
 */
export function intervalCliques(items: readonly { v: number; start: number; end: number }[]): number[][] {
  const sorted = [...items].sort((a, b) => a.start - b.start || a.v - b.v);
  const out: number[][] = [];
  let prev: Set<number> | null = null;
  for (let i = 0; i < sorted.length; i++) {
    const at = sorted[i].start;
    if (i + 1 < sorted.length && sorted[i + 1].start === at) continue; // the last interval starting here sees them all
    const clique = sorted.filter((s, j) => j <= i && s.end > at).map((s) => s.v);
    if (clique.length < 2) { prev = new Set(clique); continue; }
    if (prev && clique.every((v) => prev!.has(v))) continue;
    out.push(clique.sort((a, b) => a - b));
    prev = new Set(clique);
  }
  return out;
}
