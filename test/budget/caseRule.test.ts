/**
 * The per-step rule from C/N0 (budget/caseRule.ts), alone: the definitions
 * Eb/N0 = C/N0 − 10 log10 R_b and Es/N0 = C/N0 − 10 log10 R_s (PHYSICS.md §10,
 * any link-budget handbook, e.g. Sklar, Digital Communications, §5.5), the
 * margin against the required Eb/N0 plus implementation loss, and the
 * adaptive choice equal to selectAdaptiveMode over ETSI EN 302 307-1 Table 13
 * (the table is "from memory" in models/modcod.ts).
 */
import { describe, expect, it } from 'vitest';
import { applyCaseRule, createCaseRule } from '../../src/budget/caseRule.js';
import { DVBS2_MODES, selectAdaptiveMode } from '../../src/models/modcod.js';

function cols(cn0: number[]) {
  const n = cn0.length, f = () => new Float64Array(n);
  return { cOverN0DBHz: Float64Array.from(cn0), esN0DB: f(), ebN0DB: f(), requiredEbN0DB: f(), marginDB: f(), usable: new Uint8Array(n), mode: new Int16Array(n), informationRateBps: f() };
}

describe('case rule', () => {
  it('fixed rate: 1 Mb/s at C/N0 70 dB-Hz is Eb/N0 10 dB; margin and usable against 4.2 + 1.5 dB and a 3 dB requirement', () => {
    const rule = createCaseRule({ modcod: { kind: 'fixed', bitRateBps: 1e6, modulation: 'bpsk', coding: 'conv-r1/2-k7', requiredEbN0DB: 4.2, bitsPerSymbol: 0.5 }, implementationLossDB: 1.5, requiredMarginDB: 3 });
    const c = cols([70, 68.7, 68.69]);
    applyCaseRule(rule, c, 3, true);
    expect(c.ebN0DB[0]).toBeCloseTo(10, 12);
    // R_s = R_b / 0.5 = 2 Msym/s: Es/N0 = 70 − 63.0103 dB.
    expect(c.esN0DB[0]).toBeCloseTo(70 - 10 * Math.log10(2e6), 12);
    expect(c.marginDB[0]).toBeCloseTo(10 - 4.2 - 1.5, 12);
    // 68.7 dB-Hz: margin exactly 3.0 dB (usable, ≥); 68.69: 2.99 dB (not).
    expect(Array.from(c.usable)).toEqual([1, 1, 0]);
    expect(Array.from(c.informationRateBps)).toEqual([1e6, 1e6, 0]);
    expect(c.requiredEbN0DB[0]).toBe(4.2);
  });

  it('adaptive: the mode chosen is selectAdaptiveMode of Es/N0 − implementation loss, the rate R_s η', () => {
    const rule = createCaseRule({ modcod: { kind: 'adaptive', symbolRateBaud: 1e7, modes: [...DVBS2_MODES] }, implementationLossDB: 1, requiredMarginDB: 3 });
    const cn0 = Array.from({ length: 400 }, (_, i) => 66 + i * 0.06); // Es/N0 −4 … 20 dB at 10 Msym/s
    const c = cols(cn0);
    applyCaseRule(rule, c, cn0.length, true);
    cn0.forEach((x, i) => {
      const es = x - 70;
      expect(c.esN0DB[i]).toBeCloseTo(es, 9);
      const want = selectAdaptiveMode(DVBS2_MODES, es - 1, 3);
      expect(c.mode[i]).toBe(want);
      expect(c.usable[i]).toBe(want >= 0 ? 1 : 0);
      expect(c.informationRateBps[i]).toBeCloseTo(want >= 0 ? 1e7 * DVBS2_MODES[want].efficiencyBitsPerSymbol : 0, 3);
      if (want >= 0) expect(c.marginDB[i]).toBeCloseTo(es - 1 - DVBS2_MODES[want].requiredEsN0DB, 9);
    });
    expect(new Set(Array.from(c.mode)).size).toBeGreaterThan(20);
  });
});
