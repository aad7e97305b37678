/**
 * Adaptive coding in the engine: at each step the most efficient mode whose
 * required Es/N0 plus the required margin fits under Es/N0 − implementation loss;
 * none when nothing fits. Mode figures: a subset of the DVB-S2 ideal Es/N0 table
 * (ETSI EN 302 307-1, Table 13, AWGN, normal frames; from memory, as in PHYSICS.md §12).
 * The expected choice is found here by brute force, independently of the engine.
 */
import { describe, expect, it } from 'vitest';
import { createLinkEngine } from '../../src/budget/engine.js';
import type { AdaptiveMode } from '../../src/budget/types.js';
import { baseClimate, baseLink, CASES, sampleAtElevation } from './fixtures.js';

// (from memory) ETSI EN 302 307-1 Table 13
const MODES: AdaptiveMode[] = [
  { name: 'QPSK 1/4', requiredEsN0DB: -2.35, efficiencyBitsPerSymbol: 0.490243 },
  { name: 'QPSK 1/2', requiredEsN0DB: 1.0, efficiencyBitsPerSymbol: 0.988858 },
  { name: 'QPSK 3/4', requiredEsN0DB: 4.03, efficiencyBitsPerSymbol: 1.487473 },
  { name: '8PSK 2/3', requiredEsN0DB: 6.62, efficiencyBitsPerSymbol: 1.980636 },
  { name: '8PSK 5/6', requiredEsN0DB: 9.35, efficiencyBitsPerSymbol: 2.478562 },
  { name: '16APSK 3/4', requiredEsN0DB: 10.21, efficiencyBitsPerSymbol: 2.966728 },
  { name: '16APSK 9/10', requiredEsN0DB: 13.13, efficiencyBitsPerSymbol: 3.567342 },
  { name: '32APSK 9/10', requiredEsN0DB: 16.05, efficiencyBitsPerSymbol: 4.453027 },
];

function expected(effectiveEsN0: number, margin: number): AdaptiveMode | null {
  let best: AdaptiveMode | null = null;
  for (const m of MODES) {
    if (m.requiredEsN0DB + margin <= effectiveEsN0 && (!best || m.efficiencyBitsPerSymbol > best.efficiencyBitsPerSymbol)) best = m;
  }
  return best;
}

describe('adaptive mode choice per step', () => {
  const link = baseLink({
    modcod: { kind: 'adaptive', symbolRateBaud: 10e6, modes: MODES },
    implementationLossDB: 1.5,
    requiredMarginDB: 2,
  });
  link.spacecraft.txPowerDBW = 0; // 1 W, so the steps span "nothing fits" to the top modes
  link.ground.antenna = { kind: 'parabolic', diameterM: 3.7, efficiency: 0.6 };
  const engine = createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES });

  it('picks the most efficient fitting mode at every elevation, none when nothing fits', () => {
    const seen = new Set<string>();
    let none = 0;
    for (let el = 0; el <= 90; el += 0.5) {
      const step = engine.evaluate(sampleAtElevation(el, 600));
      for (const c of step.cases) {
        const eff = c.es_over_n0_db - 1.5;
        const want = expected(eff, 2);
        // Es/N0 = C/N0 − 10 log10(10e6) = C/N0 − 70
        expect(c.es_over_n0_db).toBeCloseTo(c.c_over_n0_dbhz - 70, 9);
        if (want) {
          expect(c.mode).toBe(want.name);
          expect(c.usable).toBe(true);
          expect(c.margin_db).toBeCloseTo(eff - want.requiredEsN0DB, 9);
          expect(c.margin_db).toBeGreaterThanOrEqual(2);
          expect(c.information_rate_bps).toBeCloseTo(10e6 * want.efficiencyBitsPerSymbol, 3);
          expect(c.eb_over_n0_db).toBeCloseTo(c.es_over_n0_db - 10 * Math.log10(want.efficiencyBitsPerSymbol), 9);
          seen.add(want.name);
        } else {
          none++;
          expect(c.mode).toBe('');
          expect(c.usable).toBe(false);
          expect(c.information_rate_bps).toBe(0);
          // Margin against the lowest mode (QPSK 1/4, −2.35 dB), below the required 2 dB.
          expect(c.margin_db).toBeCloseTo(eff + 2.35, 9);
          expect(c.margin_db).toBeLessThan(2);
        }
      }
    }
    // The sweep is not vacuous: it meets "none fits" and at least five distinct modes.
    expect(none).toBeGreaterThan(0);
    expect(seen.size).toBeGreaterThanOrEqual(5);
  });
});
