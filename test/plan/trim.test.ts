/**
 * A trimmed contact's volume is the per-step volume inside the trimmed window:
 * each candidate's volume (built from the sweep's 10 s cumulative profiles)
 * against Σ information rate × step over the steps at t in [start, end), summed
 * from every step record of the same sweep, in every weather case. Six hours
 * of the constellation demo; Cabo Lirio trims to its 60 s booking grid.
 */
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadScenario } from '../../src/scenario/index.js';
import { runPipeline } from '../../src/sweep/pipeline.js';
import { buildCandidates, profileGridS } from '../../src/plan/candidates.js';

describe('trimmed candidate volumes', () => {
  it('equal the step-by-step sum inside the trimmed window (to 1e-9), halves included', async () => {
    const s0 = loadScenario(path.resolve('fixtures/constellation/scenario.yaml'));
    const s = { ...s0, window: { ...s0.window, endS: s0.window.startS + 6 * 3600 }, volumeProfileGridS: profileGridS(s0) };
    const steps = new Map<string, { t: number; bits: number[] }[]>();
    const p = await runPipeline({
      scenario: s,
      onStep: (e) => {
        let l = steps.get(`${e.passId}\u0000${e.link.name}`);
        if (!l) { l = []; steps.set(`${e.passId}\u0000${e.link.name}`, l); }
        l.push({ t: e.timeS, bits: e.step.cases.map((c) => c.information_rate_bps * s.window.stepS) });
      },
    });
    const { candidates } = buildCandidates(s, p.passLinks, p.profiles!);
    let trimmed = 0;
    for (const c of candidates) {
      const want = s.weatherCases.map((_, ci) => c.links.reduce((sum, l) => sum + (steps.get(`${c.passId}\u0000${l}`) ?? [])
        .filter((x) => x.t >= c.startS && x.t < c.endS).reduce((a, x) => a + x.bits[ci], 0), 0));
      c.volumeBits.forEach((v, ci) => expect(Math.abs(v - want[ci])).toBeLessThanOrEqual(1e-9 * Math.max(1, want[ci])));
      if (c.station === 'Cabo Lirio' && (c.startS > c.windowStartS || c.endS < c.windowEndS)) trimmed++;
    }
    expect(candidates.some((c) => c.variant > 0)).toBe(true);
    expect(trimmed).toBeGreaterThan(0);
  }, 120_000);
});
