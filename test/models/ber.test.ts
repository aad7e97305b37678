import { describe, expect, it } from 'vitest';
import { bitErrorRate, requiredEbN0DB } from '../../src/models/ber.js';
import { erfc, erfcParts } from '../../src/models/erfc.js';

describe('erfc (A&S 7.1.6 series and 7.1.14 continued fraction)', () => {
  it('matches tabulated values (Abramowitz & Stegun Table 7.1; values from memory) to 1e-12 relative', () => {
    const table: [number, number][] = [
      [0, 1], [0.5, 0.4795001221869535], [1, 0.15729920705028513], [2, 0.004677734981047266],
      [3, 2.209049699858544e-5], [-1, 1.8427007929497148],
    ];
    for (const [x, v] of table) expect(Math.abs(erfc(x) - v) / v, `erfc(${x})`).toBeLessThan(1e-12);
  });
  it('the two expansions agree where they meet, and the derivative is −2/√π e^(−x²)', () => {
    // 1 − erf(x) loses about ε / erfc(x) relative: ≈ 1e-12 at the 2.5 switch, hence the switch there.
    for (const x of [1.5, 2.0, 2.5]) {
      const a = 1 - erfcParts.erfSeries(x), b = erfcParts.erfcContinuedFraction(x);
      expect(Math.abs(a - b) / b, `x=${x}`).toBeLessThan(1e-11);
    }
    for (const x of [0.3, 1.7, 2.5, 4, 6]) {
      const h = 1e-5 * Math.max(1, x);
      const numeric = (erfc(x + h) - erfc(x - h)) / (2 * h);
      const exact = (-2 / Math.sqrt(Math.PI)) * Math.exp(-x * x);
      expect(Math.abs(numeric - exact) / Math.abs(exact), `x=${x}`).toBeLessThan(1e-6);
    }
  });
});

describe('uncoded bit error rates (Sklar, Digital Communications)', () => {
  it('BPSK needs 9.6 dB for 1e-5 and 10.5 dB for 1e-6 (Sklar; within 0.05 dB)', () => {
    expect(Math.abs(requiredEbN0DB({ modulation: 'bpsk', bitErrorRate: 1e-5 }) - 9.6)).toBeLessThan(0.05);
    expect(Math.abs(requiredEbN0DB({ modulation: 'bpsk', bitErrorRate: 1e-6 }) - 10.5)).toBeLessThan(0.05);
    expect(requiredEbN0DB({ modulation: 'qpsk', bitErrorRate: 1e-5 })).toBe(requiredEbN0DB({ modulation: 'bpsk', bitErrorRate: 1e-5 }));
  });
  it('inverts the exponential forms exactly: DBPSK Eb/N0 = −ln(2 P), non-coherent BFSK Eb/N0 = −2 ln(2 P)', () => {
    for (const p of [1e-3, 1e-5, 1e-8]) {
      expect(Math.abs(requiredEbN0DB({ modulation: 'dbpsk', bitErrorRate: p }) - 10 * Math.log10(-Math.log(2 * p)))).toBeLessThan(1e-3);
      expect(Math.abs(requiredEbN0DB({ modulation: 'bfsk-noncoherent', bitErrorRate: p }) - 10 * Math.log10(-2 * Math.log(2 * p)))).toBeLessThan(1e-3);
    }
  });
  it('coherent BFSK needs exactly 3.01 dB more than BPSK (½ erfc(√(Eb/2N0)))', () => {
    const d = requiredEbN0DB({ modulation: 'bfsk-coherent', bitErrorRate: 1e-6 }) - requiredEbN0DB({ modulation: 'bpsk', bitErrorRate: 1e-6 });
    expect(Math.abs(d - 10 * Math.log10(2))).toBeLessThan(1e-3);
  });
  it('bitErrorRate and requiredEbN0DB are inverse to ≤ 0.001 dB for every modulation', () => {
    for (const modulation of ['bpsk', 'qpsk', 'dbpsk', 'bfsk-coherent', 'bfsk-noncoherent'] as const) {
      for (const ebN0DB of [0, 4, 8.5, 12, 15]) {
        const p = bitErrorRate({ modulation, ebN0DB });
        if (p < 1e-15) continue;
        expect(Math.abs(requiredEbN0DB({ modulation, bitErrorRate: p }) - ebN0DB), `${modulation} ${ebN0DB}`).toBeLessThan(1e-3);
      }
    }
  });
});
