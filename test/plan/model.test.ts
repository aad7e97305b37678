/**
 * The selection problem: HiGHS (through the `highs` package) against
 * exhaustive enumeration on small instances, the greedy against both, and the
 * interval cliques against the pairwise overlap rule they stand for.
 */
import { describe, expect, it } from 'vitest';
import { bruteForce, evaluate, greedy, intervalCliques, type SelectionProblem } from '../../src/plan/model.js';
import { solveMip } from '../../src/plan/highs.js';
import { rng } from '../rng.js';


/** A random instance: n intervals on two antennas, caps, and a volume and a count target. */
function instance(seed: number, n: number): SelectionProblem {
  const r = rng(seed);
  const items = Array.from({ length: n }, (_, v) => { const start = Math.floor(r() * 100); return { v, start, end: start + 5 + Math.floor(r() * 20), ant: r() < 0.5 ? 0 : 1, vol: 0.1 + r() }; });
  const groups = [0, 1].flatMap((a) => intervalCliques(items.filter((i) => i.ant === a)));
  const gain = items.map((i) => (seed % 2 === 0 ? i.vol : -i.vol * 0.3));
  const P = 1 + gain.reduce((s, g) => s + Math.abs(g), 0);
  const half = items.filter((i) => i.v % 2 === 0).map((i) => i.v);
  return {
    n, gain, groups,
    caps: [{ key: 'cap', vars: items.filter((i) => i.ant === 0).map((i) => i.v), max: 2 }],
    targets: [
      { key: 'vol', vars: half, coef: half.map((v) => items[v].vol / 2), need: 1, penalty: P },
      { key: 'count', vars: items.map((i) => i.v), coef: items.map(() => 1 / 3), need: 1, penalty: P },
    ],
  };
}

describe('interval cliques', () => {
  it('exclude exactly the overlapping pairs (each overlapping pair shares a clique, no clique holds a non-overlapping pair)', () => {
    for (let seed = 1; seed <= 20; seed++) {
      const r = rng(seed);
      const items = Array.from({ length: 15 }, (_, v) => { const start = Math.floor(r() * 60); return { v, start, end: start + 1 + Math.floor(r() * 15) }; });
      const cliques = intervalCliques(items);
      for (const a of items) for (const b of items) {
        if (a.v >= b.v) continue;
        const overlap = a.start < b.end && b.start < a.end;
        const together = cliques.some((c) => c.includes(a.v) && c.includes(b.v));
        expect(together).toBe(overlap);
      }
    }
  });
});

describe('HiGHS against brute force on ≤ 12 candidates', () => {
  it('finds the enumerated optimum of 40 random instances (the objective of its selection to 1e-7), and the greedy never beats it', async () => {
    for (let seed = 1; seed <= 40; seed++) {
      const p = instance(seed, 4 + (seed % 9));
      const bf = bruteForce(p);
      const mip = await solveMip(p, 10);
      expect(mip.status).toBe('Optimal');
      expect(mip.x).not.toBeNull();
      const z = evaluate(p, mip.x!);
      expect(Math.abs(z - bf.objective)).toBeLessThan(1e-7 * Math.max(1, Math.abs(bf.objective)));
      // The solver's own objective value carries its row feasibility tolerance (1e-7, the HiGHS default) times the penalty (≈ 10).
      expect(Math.abs(mip.bound! - bf.objective)).toBeLessThan(1e-5 * Math.max(1, Math.abs(bf.objective)));
      const g = greedy(p);
      expect(g.objective).toBeLessThanOrEqual(bf.objective + 1e-12);
      expect(evaluate(p, g.x)).toBe(g.objective);
    }
  });

  it('a hand-checked case: three overlapping contacts, the outer two beat the middle one (3 + 4 > 5)', async () => {
    // x0 [0,10) gain 3, x1 [5,15) gain 5, x2 [10,20) gain 4: x0 and x2 do not overlap, so the optimum is 7.
    const p: SelectionProblem = { n: 3, gain: [3, 5, 4], groups: intervalCliques([{ v: 0, start: 0, end: 10 }, { v: 1, start: 5, end: 15 }, { v: 2, start: 10, end: 20 }]), caps: [], targets: [] };
    expect(p.groups).toEqual([[0, 1], [1, 2]]);
    const mip = await solveMip(p, 5);
    expect(Array.from(mip.x!)).toEqual([1, 0, 1]);
    expect(bruteForce(p).objective).toBe(7);
    // The greedy takes the largest first (5) and is stuck there: below the optimum.
    expect(greedy(p).objective).toBe(5);
  });
});
