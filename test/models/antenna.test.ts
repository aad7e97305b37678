import { describe, expect, it } from 'vitest';
import {
  cosinePowerExponent, cosinePowerGainDBi, cosinePowerGainPairColumnDBi, parabolicBeamwidthDeg, parabolicGainAtDBi, parabolicGainDBi, pointingLossDB,
  tabulatedGainDBi, validateGainTable,
} from '../../src/models/antenna.js';

describe('parabolic antenna (G = η (π D / λ)², θ3dB ≈ 70 λ / D; common practice)', () => {
  it('gives ≈ 47.8 dBi for a 3.7 m dish at 8.2 GHz with efficiency 0.6', () => {
    // λ = 299 792 458 / 8.2e9 = 0.036560 m; π D / λ = 11.6239 / 0.036560 = 317.94;
    // (π D / λ)² = 101 085; × 0.6 = 60 651; 10 log10 → 47.83 dBi.
    expect(parabolicGainDBi({ diameterM: 3.7, frequencyGHz: 8.2, efficiency: 0.6 })).toBeCloseTo(47.83, 2);
    // θ3dB = 70 × 0.036560 / 3.7 = 0.6917°.
    expect(parabolicBeamwidthDeg({ diameterM: 3.7, frequencyGHz: 8.2 })).toBeCloseTo(0.6917, 4);
  });
  it('doubling the diameter adds 6.02 dB and halves the beamwidth', () => {
    const g1 = parabolicGainDBi({ diameterM: 2, frequencyGHz: 2.2, efficiency: 0.55 });
    const g2 = parabolicGainDBi({ diameterM: 4, frequencyGHz: 2.2, efficiency: 0.55 });
    expect(g2 - g1).toBeCloseTo(20 * Math.log10(2), 10);
    expect(parabolicBeamwidthDeg({ diameterM: 4, frequencyGHz: 2.2 }) * 2).toBeCloseTo(parabolicBeamwidthDeg({ diameterM: 2, frequencyGHz: 2.2 }), 12);
  });
  it('pointing loss is 3 dB at half the half-power beamwidth (12 (θe/θ3dB)², Gaussian main lobe)', () => {
    expect(pointingLossDB({ errorDeg: 0.35, beamwidthDeg: 0.7 })).toBeCloseTo(3, 12);
    expect(pointingLossDB({ errorDeg: 0, beamwidthDeg: 0.7 })).toBe(0);
  });
  it('off-boresight parabolic gain follows the main lobe, then the stated floor (peak − 30 dB, or the one given)', () => {
    const dish = { diameterM: 3.7, frequencyGHz: 8.2, efficiency: 0.6 };
    const peak = parabolicGainDBi(dish), bw = parabolicBeamwidthDeg(dish);
    expect(parabolicGainAtDBi({ ...dish, offBoresightDeg: bw / 2 })).toBeCloseTo(peak - 3, 10);
    expect(parabolicGainAtDBi({ ...dish, offBoresightDeg: 30 })).toBeCloseTo(peak - 30, 10);
    expect(parabolicGainAtDBi({ ...dish, offBoresightDeg: 30, floorGainDBi: -10 })).toBe(-10);
  });
});

describe('cosine-power broad-beam pattern (G0 + 10 log10 cosⁿ θ; common practice)', () => {
  it('has n = 1 for a 120° beamwidth (cos 60° = 1/2) and is 3.01 dB down at half the beamwidth', () => {
    expect(cosinePowerExponent({ beamwidthDeg: 120 })).toBeCloseTo(1, 12);
    const n = cosinePowerExponent({ beamwidthDeg: 70 });
    expect(cosinePowerGainDBi({ peakGainDBi: 8, exponent: n, offBoresightDeg: 35 })).toBeCloseTo(8 - 10 * Math.log10(2), 10);
    expect(cosinePowerGainDBi({ peakGainDBi: 8, exponent: n, offBoresightDeg: -35 })).toBeCloseTo(8 - 10 * Math.log10(2), 10);
  });
  it('returns the floor at and beyond 90° and never below it', () => {
    expect(cosinePowerGainDBi({ peakGainDBi: 5, exponent: 1, offBoresightDeg: 90 })).toBe(-25);
    expect(cosinePowerGainDBi({ peakGainDBi: 5, exponent: 1, offBoresightDeg: 150, floorGainDBi: -10 })).toBe(-10);
    expect(cosinePowerGainDBi({ peakGainDBi: 5, exponent: 1, offBoresightDeg: 89.9, floorGainDBi: -10 })).toBe(-10);
  });
  it('column pair (θ and θ + ε through the angle-sum identity) equals two direct evaluations', () => {
    // Same half-power fact as above: n for a 70° beamwidth puts 35° at G0 − 3.01 dB, so θ = 30°, ε = 5° gives it too.
    const n = cosinePowerExponent({ beamwidthDeg: 70 });
    const a = { peakGainDBi: 8, exponent: n };
    const off = new Float64Array([0, 1e-6, 0.3, 12.5, 30, 45, 84.9, 85.1, 89.99, 90, 120, 180]);
    const eps = 5;
    const g = new Float64Array(off.length), gp = new Float64Array(off.length);
    cosinePowerGainPairColumnDBi(a, off, eps, off.length, g, gp);
    for (let i = 0; i < off.length; i++) {
      expect(g[i]).toBeCloseTo(cosinePowerGainDBi({ ...a, offBoresightDeg: off[i] }), 12);
      // sin θ from cos θ loses about √(2⁻⁵³) ≈ 1e-8 rad near boresight: within 1e-8 dB (the outputs print 0.001 dB).
      expect(Math.abs(gp[i] - cosinePowerGainDBi({ ...a, offBoresightDeg: off[i] + eps }))).toBeLessThan(1e-8);
    }
    expect(gp[4]).toBeCloseTo(8 - 10 * Math.log10(2), 9);
    expect(gp[7]).toBe(8 - 30); // 85.1° + 5° ≥ 90°: the floor
  });
});

describe('tabulated pattern (linear in dB)', () => {
  const t = { offBoresightDeg: [0, 10, 30, 90], gainDBi: [6, 5, 0, -10] };
  it('interpolates linearly in dB and holds the end values', () => {
    expect(tabulatedGainDBi(t, 0)).toBe(6);
    expect(tabulatedGainDBi(t, 5)).toBeCloseTo(5.5, 12);
    expect(tabulatedGainDBi(t, 20)).toBeCloseTo(2.5, 12);
    expect(tabulatedGainDBi(t, 60)).toBeCloseTo(-5, 12);
    expect(tabulatedGainDBi(t, 120)).toBe(-10);
    expect(tabulatedGainDBi(t, -3)).toBe(6);
    expect(tabulatedGainDBi({ offBoresightDeg: [0], gainDBi: [2] }, 45)).toBe(2);
  });
  it('rejects bad tables with a message naming the fault', () => {
    const bad: [unknown, RegExp][] = [
      [{ offBoresightDeg: [0, 10], gainDBi: [1] }, /2 points and gainDBi 1/],
      [{ offBoresightDeg: [], gainDBi: [] }, /empty/],
      [{ offBoresightDeg: [0, 10, 10], gainDBi: [1, 2, 3] }, /offBoresightDeg\[2\] = 10 is not above/],
      [{ offBoresightDeg: [0, 20, 10], gainDBi: [1, 2, 3] }, /strictly increasing/],
      [{ offBoresightDeg: [0, NaN], gainDBi: [1, 2] }, /point 1 is not finite/],
    ];
    for (const [table, re] of bad) expect(() => validateGainTable(table as never)).toThrow(re);
    expect(() => tabulatedGainDBi({ offBoresightDeg: [0, 1], gainDBi: [0] }, 0.5)).toThrow(RangeError);
  });
});

describe('parabolic gain in columns', () => {
  it('gives exactly parabolicGainAtDBi at each angle (the same formula, peak and beamwidth computed once)', async () => {
    const { parabolicGainColumnDBi } = await import('../../src/models/antenna.js');
    const dish = { diameterM: 3.7, frequencyGHz: 8.2, efficiency: 0.6 };
    const off = Float64Array.from([0, 0.05, 0.3, 0.7, 1.2, 5, 40]);
    const out = new Float64Array(off.length);
    parabolicGainColumnDBi(dish, off, 0.1, off.length, out);
    off.forEach((o, i) => expect(out[i]).toBe(parabolicGainAtDBi({ ...dish, offBoresightDeg: o + 0.1 })));
  });
});
