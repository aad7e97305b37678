/**
 * The contact plan over two days of the constellation demo (six invented
 * satellites, four invented stations with one dish each, one rented): the
 * issue's checks on a real plan.
 */
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadScenario, type ResolvedScenario } from '../../src/scenario/index.js';
import { runPipelineParallel } from '../../src/sweep/parallel.js';
import type { PipelineResult } from '../../src/sweep/types.js';
import { profileGridS } from '../../src/plan/candidates.js';
import { clash, horizonProblem, planContacts, type ContactPlan } from '../../src/plan/plan.js';
import { bruteForce, evaluate, greedy } from '../../src/plan/model.js';
import { solveMip } from '../../src/plan/highs.js';

const FILE = path.resolve('fixtures/constellation/scenario.yaml');

function twoDays(): ResolvedScenario {
  const s = loadScenario(FILE);
  return { ...s, window: { ...s.window, endS: s.window.startS + 2 * 86_400 }, volumeProfileGridS: profileGridS(s) };
}

let s: ResolvedScenario;
let pipe: PipelineResult;
let plan: ContactPlan;
beforeAll(async () => {
  s = twoDays();
  pipe = await runPipelineParallel({ scenario: s });
  plan = await planContacts(s, pipe);
}, 120_000);

describe('volume profiles', () => {
  it('sum to the pass table\'s volumes in every case (fixed: R_b × usable time; adaptive: Σ R_s η Δt) to 1e-9', () => {
    let checked = 0;
    for (const p of pipe.passLinks) {
      p.cases.forEach((c, ci) => {
        const want = c.adaptiveVolumeBits ?? c.fixedVolumeBits;
        const got = pipe.profiles!.total(p.passId, p.link, ci);
        expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-9 * Math.max(1, want));
        if (want > 0) checked++;
      });
    }
    expect(checked).toBeGreaterThan(100);
  });
});

describe('the plan', () => {
  const taken = () => plan.candidates.filter((c) => plan.chosen[c.id]);
  it('takes contacts, every horizon proven optimal (gap 0)', () => {
    expect(taken().length).toBeGreaterThan(20);
    expect(plan.horizons.map((h) => [h.method, h.solverStatus, h.gap])).toEqual([['highs', 'Optimal', 0], ['highs', 'Optimal', 0]]);
  });
  it('has no two contacts on one antenna overlapping or closer than setup_s (held = booked time)', () => {
    const t = taken();
    for (const a of t) for (const b of t) {
      if (a.id >= b.id || a.station !== b.station || a.antenna !== b.antenna) continue;
      const [first, second] = a.startS <= b.startS ? [a, b] : [b, a];
      expect(second.startS - first.heldEndS).toBeGreaterThanOrEqual(first.setupS);
      expect(clash(a, b)).toBe(false);
    }
  });
  it('keeps each contact inside a usable window of its satellite at that station', () => {
    const ci = s.weatherCases.findIndex((w) => w.name === plan.weather);
    for (const c of taken()) {
      const rows = [...pipe.passLinks].filter((p) => p.passId === c.passId && c.links.includes(p.link));
      const inside = rows.some((p) => {
        const u = p.cases[ci];
        return u.usableStartS !== null && c.startS >= u.usableStartS - 1e-9 && c.endS <= u.usableEndS! + s.window.stepS + 1e-9;
      });
      expect(inside).toBe(true);
      expect(c.endS).toBeGreaterThan(c.startS);
    }
  });
  it('plans no more than the unconstrained run per satellite, link and day, and loses some to contention', () => {
    let lost = 0;
    for (const d of plan.days) {
      for (const l of d.links) expect(l.plannedBits).toBeLessThanOrEqual(l.unconstrainedBits * (1 + 1e-12) + 1e-6);
      lost += d.lostToContentionBits;
    }
    expect(lost).toBeGreaterThan(0);
  });
  it('books the rented station on its minute grid, at least 5 minutes, at most 6 a day, 12 per minute', () => {
    const rented = taken().filter((c) => c.station === 'Cabo Lirio');
    for (const c of rented) {
      expect((c.startS - s.window.startS) % 60).toBe(0);
      expect((c.endS - s.window.startS) % 60).toBe(0);
      expect(c.bookedS).toBeGreaterThanOrEqual(300);
      expect(c.bookedS % 60).toBe(0);
      expect(c.cost).toBeCloseTo((c.bookedS / 60) * 12, 9);
    }
    for (const day of new Set(rented.map((c) => c.day))) expect(rented.filter((c) => c.day === day).length).toBeLessThanOrEqual(6);
    expect(plan.totalCost).toBeCloseTo(rented.reduce((x, c) => x + c.cost, 0), 9);
  });
  it('reports an unmet target as satellite, day and shortfall = target − planned', () => {
    const unmet = plan.days.filter((d) => d.unmetBits > 0);
    for (const d of plan.days) expect(d.unmetBits).toBeCloseTo(Math.max(0, (d.targetBits ?? 0) - d.plannedBits), 0);
    expect(unmet.length).toBeGreaterThan(0);
  });
});

describe('on the real candidates', () => {
  it('HiGHS equals brute force on the first 12 candidates of day one, and the greedy is no better', async () => {
    const day = plan.candidates[0].day;
    for (const from of [0, 12, 24]) {
      const cs = plan.candidates.filter((c) => c.day === day).slice(from, from + 12);
      const p = horizonProblem(s, cs, [day], []);
      const bf = bruteForce(p);
      const mip = await solveMip(p, 10);
      expect(mip.status).toBe('Optimal');
      expect(evaluate(p, mip.x!)).toBeCloseTo(bf.objective, 9);
      expect(greedy(p).objective).toBeLessThanOrEqual(bf.objective + 1e-12);
    }
  });
  it('a second plan of the same run is the same plan', async () => {
    const again = await planContacts(s, pipe);
    expect(Array.from(again.chosen)).toEqual(Array.from(plan.chosen));
    expect(again.days).toEqual(plan.days);
  });
});

describe('other plan terms on the same run', () => {
  it('min-cost pays no more than max-volume and still meets the contact counts it can', async () => {
    const cheap = await planContacts({ ...s, plan: { ...s.plan!, objective: 'min-cost' } }, pipe);
    expect(cheap.totalCost).toBeLessThanOrEqual(plan.totalCost + 1e-9);
    expect(cheap.horizons.every((h) => h.method === 'highs' && h.gap === 0)).toBe(true);
    for (const d of cheap.days) expect(d.unmetContacts).toBe(0);
  });
  it('past the time limit keeps the better of the solver\'s best and the greedy, with the gap to the LP bound', async () => {
    const rushed = await planContacts({ ...s, plan: { ...s.plan!, timeLimitS: 1e-4 } }, pipe);
    for (const h of rushed.horizons) {
      expect(h.solverStatus).toBe('Time limit reached');
      expect(h.objective).toBeGreaterThanOrEqual(h.greedyObjective);
      expect(h.bound).not.toBeNull();
      expect(h.gap).toBeGreaterThanOrEqual(0);
      expect(h.objective).toBeLessThanOrEqual(h.bound! + 1e-6);
    }
    // The optimum is no better than the LP bound and no worse than what the rushed plan kept.
    plan.horizons.forEach((h, i) => {
      expect(h.objective).toBeLessThanOrEqual(rushed.horizons[i].bound! + 1e-6);
      expect(h.objective).toBeGreaterThanOrEqual(rushed.horizons[i].objective - 1e-6);
    });
  });
  it('a two-day horizon plans both days in one optimal solve, without clashes', async () => {
    const both = await planContacts({ ...s, plan: { ...s.plan!, horizonDays: 2 } }, pipe);
    expect(both.horizons).toHaveLength(1);
    expect(both.horizons[0].gap).toBe(0);
    const t = both.candidates.filter((c) => both.chosen[c.id]);
    for (const a of t) for (const b of t) if (a.id < b.id) expect(clash(a, b)).toBe(false);
  });
});
