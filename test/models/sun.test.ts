import { describe, expect, it } from 'vitest';
import { SUN_DISC_DIAMETER_DEG, solarPosition, sunDirection, TT_MINUS_UTC_S } from '../../src/models/sun.js';
import { discPatternFraction, quietSunBrightnessTemperatureK } from '../../src/models/sunNoise.js';

/** Unix seconds (UTC) of a Julian date given on the TT (TD) scale. */
const utcOfJdTT = (jd: number) => (jd - 2440587.5) * 86_400 - TT_MINUS_UTC_S;

describe('solarPosition (Astronomical Almanac low-precision formula; from memory)', () => {
  it('matches Meeus, Astronomical Algorithms, example 25.a (1992 October 13.0 TD) within 0.01°', () => {
    // Meeus example 25.a (from memory): apparent α = 13h 13m 31.4s = 198.38083°, δ = −7° 47′ 06″ = −7.78507°, R = 0.99766 AU.
    const s = solarPosition(utcOfJdTT(2448908.5));
    expect(Math.abs(s.rightAscensionDeg - 198.38083)).toBeLessThan(0.01);
    expect(Math.abs(s.declinationDeg - -7.78507)).toBeLessThan(0.01);
    expect(Math.abs(s.distanceAu - 0.99766)).toBeLessThan(1e-4);
  });
  it('declination at the 2026 solstices is within 0.02° of ±23.44° (obliquity, a fact of the trade)', () => {
    // Solstice instants 2026-06-21T08:24Z and 2026-12-21T20:50Z (from memory); δ changes by < 0.004° a day there.
    expect(Math.abs(solarPosition(Date.UTC(2026, 5, 21, 8, 24) / 1000).declinationDeg - 23.44)).toBeLessThan(0.02);
    expect(Math.abs(solarPosition(Date.UTC(2026, 11, 21, 20, 50) / 1000).declinationDeg + 23.44)).toBeLessThan(0.02);
    // And the year's extremes fall within a day of those dates.
    let maxT = 0, max = -90;
    for (let d = 0; d < 365; d += 0.25) {
      const t = Date.UTC(2026, 0, 1) / 1000 + d * 86_400;
      const dec = solarPosition(t).declinationDeg;
      if (dec > max) { max = dec; maxT = t; }
    }
    expect(Math.abs(maxT - Date.UTC(2026, 5, 21, 8, 24) / 1000)).toBeLessThan(86_400);
  });
  it('is the library export of that name', async () => {
    const lib = await import('../../src/index.js');
    expect(lib.solarPosition).toBe(solarPosition);
  });
  it('the unit vector is (cos δ cos α, cos δ sin α, sin δ) and the range is checked', () => {
    const t = Date.UTC(2026, 10, 21) / 1000;
    const p = solarPosition(t);
    const u = new Float64Array(3);
    sunDirection(t, u);
    const D = Math.PI / 180;
    expect(u[0]).toBeCloseTo(Math.cos(p.declinationDeg * D) * Math.cos(p.rightAscensionDeg * D), 14);
    expect(u[2]).toBeCloseTo(Math.sin(p.declinationDeg * D), 14);
    expect(() => solarPosition(Date.UTC(1900, 0, 1) / 1000)).toThrow(RangeError);
  });
});

describe('quiet-Sun brightness temperature (from memory, rough)', () => {
  it('at 2.8 GHz agrees within 10 % with a solar-minimum 10.7 cm flux of 67 sfu over the 0.53° disc (from memory)', () => {
    // T_b = S λ² / (2 k Ω), S = 67e-22 W m⁻² Hz⁻¹, Ω = π (0.2665°)².
    const lambda = 299_792_458 / 2.8e9;
    const omega = Math.PI * ((SUN_DISC_DIAMETER_DEG / 2) * Math.PI / 180) ** 2;
    const tb = (67e-22 * lambda * lambda) / (2 * 1.380649e-23 * omega);
    expect(Math.abs(quietSunBrightnessTemperatureK({ frequencyGHz: 2.8 }) / tb - 1)).toBeLessThan(0.1);
  });
  it('falls with frequency, tens of thousands of K at S-band, of order 10^4 K at X-band (PHYSICS.md §13, from memory)', () => {
    const s = quietSunBrightnessTemperatureK({ frequencyGHz: 2.245 });
    const x = quietSunBrightnessTemperatureK({ frequencyGHz: 8.2 });
    expect(s).toBeGreaterThan(2e4); expect(s).toBeLessThan(1e5);
    expect(x).toBeGreaterThan(8e3); expect(x).toBeLessThan(2e4);
    expect(() => quietSunBrightnessTemperatureK({ frequencyGHz: 0.05 })).toThrow(/frequencyGHz/);
  });
});

describe('disc weighted by the pattern, (1/4π) ∫disc G dΩ', () => {
  // Gaussian main lobe G = G0 exp(−c θ²): centred on boresight the integral is G0 (π/c)(1 − exp(−c a²)) (small angles; exact calculus).
  const theta3 = 0.7, g0 = 60_000, c = (4 * Math.LN2) / (theta3 * Math.PI / 180) ** 2;
  const gauss = (offDeg: number) => g0 * Math.exp(-c * (offDeg * Math.PI / 180) ** 2);
  it('equals the closed form for a Gaussian beam centred on the disc (within 0.1 %)', () => {
    const a = (SUN_DISC_DIAMETER_DEG / 2) * Math.PI / 180;
    const exact = (g0 * (Math.PI / c) * (1 - Math.exp(-c * a * a))) / (4 * Math.PI);
    const got = discPatternFraction({ separationDeg: 0, discDiameterDeg: SUN_DISC_DIAMETER_DEG, gainLinear: gauss });
    expect(Math.abs(got / exact - 1)).toBeLessThan(1e-3);
  });
  it('for a constant gain is G Ω_disc / 4π (within 1e-6)', () => {
    const a = (SUN_DISC_DIAMETER_DEG / 2) * Math.PI / 180;
    const omega = 2 * Math.PI * (1 - Math.cos(a));
    const got = discPatternFraction({ separationDeg: 3, discDiameterDeg: SUN_DISC_DIAMETER_DEG, gainLinear: () => 10 });
    expect(Math.abs(got / ((10 * omega) / (4 * Math.PI)) - 1)).toBeLessThan(1e-6);
  });
  it('falls off the beam: at one beamwidth about 16 times (12 dB) less than at boresight for a small disc', () => {
    const tiny = 0.02;
    const at0 = discPatternFraction({ separationDeg: 0, discDiameterDeg: tiny, gainLinear: gauss });
    const at1 = discPatternFraction({ separationDeg: theta3, discDiameterDeg: tiny, gainLinear: gauss });
    expect(10 * Math.log10(at0 / at1)).toBeCloseTo(12.04, 1);
  });
});
