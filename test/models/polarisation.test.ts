import { describe, expect, it } from 'vitest';
import { checkAxialRatio, MAX_POLARISATION_LOSS_DB, polarisationLossDB } from '../../src/models/polarisation.js';
import { faradayRotationDeg } from '../../src/models/p531.js';

// Polarisation loss factor between elliptical polarisations (common textbook form, PHYSICS.md §3).
describe('polarisation loss', () => {
  it('is 0 dB for same-sense circular, any tilt', () => {
    expect(polarisationLossDB({ axialRatioTx: 1, axialRatioRx: 1, tiltDifferenceDeg: 37 })).toBeCloseTo(0, 12);
    expect(polarisationLossDB({ axialRatioTx: -1, axialRatioRx: -1, tiltDifferenceDeg: 0 })).toBeCloseTo(0, 12);
  });
  it('is 3.01 dB between circular and linear, either sense, any tilt', () => {
    for (const [t, r] of [[1, Infinity], [-1, Infinity], [Infinity, 1], [1, -Infinity]]) {
      expect(polarisationLossDB({ axialRatioTx: t, axialRatioRx: r, tiltDifferenceDeg: 20 })).toBeCloseTo(10 * Math.log10(2), 10);
    }
  });
  it('is −10 log10 cos² Δτ between two linear polarisations', () => {
    for (const d of [0, 10, 45, 60, 80]) {
      const expected = -10 * Math.log10(Math.cos((d * Math.PI) / 180) ** 2);
      expect(polarisationLossDB({ axialRatioTx: Infinity, axialRatioRx: -Infinity, tiltDifferenceDeg: d })).toBeCloseTo(expected, 9);
    }
  });
  it('clamps opposite-sense circular and crossed linear at the stated maximum', () => {
    expect(MAX_POLARISATION_LOSS_DB).toBe(40);
    expect(polarisationLossDB({ axialRatioTx: 1, axialRatioRx: -1, tiltDifferenceDeg: 0 })).toBe(40);
    expect(polarisationLossDB({ axialRatioTx: Infinity, axialRatioRx: Infinity, tiltDifferenceDeg: 90 })).toBe(40);
  });
  it('gives the formula value for an elliptical wave (AR = 2) on a co-sense circular antenna', () => {
    // PLF = 1/2 + 4·2·1 / (2·5·2) = 0.9 → 0.4576 dB.
    expect(polarisationLossDB({ axialRatioTx: 2, axialRatioRx: 1, tiltDifferenceDeg: 13 })).toBeCloseTo(-10 * Math.log10(0.9), 10);
  });
  it('rejects |axial ratio| < 1', () => {
    expect(() => checkAxialRatio('axialRatioTx', 0.5)).toThrow(/axialRatioTx = 0.5 is outside \|r\| ≥ 1/);
    expect(() => checkAxialRatio('axialRatioTx', Infinity)).not.toThrow();
  });
});

describe('Faraday rotation (ITU-R P.531, from memory)', () => {
  it('uses the constant e³ / (8 π² ε0 m_e² c) ≈ 2.36e4 (CODATA 2018 constants)', () => {
    const e = 1.602176634e-19, me = 9.1093837015e-31, eps0 = 8.8541878128e-12, c = 299_792_458;
    const k = e ** 3 / (8 * Math.PI ** 2 * eps0 * me ** 2 * c);
    // P.531 rounds the constant to three figures (2.3648e4 → 2.36e4): 0.21 % relative.
    expect(Math.abs(k - 2.36e4) / k).toBeLessThan(2.5e-3);
    // 10 TECU at 435 MHz with B = 5e-5 T: Ω = k B N_T / f² rad.
    const expectedDeg = ((k * 5e-5 * 1e17) / 435e6 ** 2) * (180 / Math.PI);
    expect(Math.abs(faradayRotationDeg({ frequencyMHz: 435, electronContentTECU: 10 }) - expectedDeg) / expectedDeg).toBeLessThan(2.5e-3);
  });
  it('scales as 1/f² and linearly with B', () => {
    const a = faradayRotationDeg({ frequencyMHz: 145, electronContentTECU: 20 });
    expect(faradayRotationDeg({ frequencyMHz: 290, electronContentTECU: 20 })).toBeCloseTo(a / 4, 9);
    expect(faradayRotationDeg({ frequencyMHz: 145, electronContentTECU: 20, magneticFieldT: 1e-4 })).toBeCloseTo(2 * a, 9);
  });
});
