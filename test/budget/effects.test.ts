/**
 * The per-step effects in the engine: element-set error (pointing of program
 * tracks) and the Sun in the beam, on hand-built geometry (fixtures.ts:
 * spherical Earth, GMST = 0 so TEME = ECEF).
 */
import { describe, expect, it } from 'vitest';
import { createLinkEngine, createStepBudget } from '../../src/budget/engine.js';
import { copyStepBudget } from '../../src/budget/columns.js';
import { parabolicBeamwidthDeg, parabolicGainDBi } from '../../src/models/antenna.js';
import { quietSunBrightnessTemperatureK } from '../../src/models/sunNoise.js';
import { SUN_DISC_DIAMETER_DEG, sunDirection } from '../../src/models/sun.js';
import { baseClimate, baseLink, CASES, R_KM, sampleFromVectors, syntheticPass } from './fixtures.js';
import type { StepBudget } from '../../src/budget/types.js';

const DEG = Math.PI / 180;

/** Every field of two step records alike except those named. */
function sameExcept(a: StepBudget, b: StepBudget, skip: string[]): void {
  for (const k of Object.keys(a) as (keyof StepBudget)[]) {
    if (k === 'cases' || skip.includes(k)) continue;
    expect(b[k], k).toBe(a[k]);
  }
  a.cases.forEach((c, i) => expect(b.cases[i]).toEqual(c));
}

describe('element-set error in the engine', () => {
  it('age 0 with no error at epoch gives the results of an engine without the term, exactly', () => {
    const link = baseLink({ ground: { ...baseLink().ground, pointing: { kind: 'track', pointingErrorDeg: 0.1 } } });
    const plain = createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES });
    const aged = createLinkEngine({
      link, climate: baseClimate(), weatherCases: CASES,
      elementError: { epochS: 0, atEpochKm: 0, alongTrackKmPerDay: 2, crossTrackKmPerDay: 0.2, ageDays: 0 },
    });
    const zeroRates = createLinkEngine({
      link, climate: baseClimate(), weatherCases: CASES,
      elementError: { epochS: -5 * 86_400, atEpochKm: 0, alongTrackKmPerDay: 0, crossTrackKmPerDay: 0 },
    });
    const samples = syntheticPass(3, 500, 5);
    for (const s of samples) {
      const a = copyStepBudget(plain.evaluate(s, createStepBudget(CASES)));
      const b = copyStepBudget(aged.evaluate(s, createStepBudget(CASES)));
      const c = copyStepBudget(zeroRates.evaluate(s, createStepBudget(CASES)));
      expect(b.element_age_days).toBe(0);
      expect(b.element_pointing_error_deg).toBe(0);
      expect(c.element_age_days).toBeCloseTo(5 + s.timeS / 86_400, 12);
      sameExcept(a, b, ['element_age_days']);
      sameExcept(a, c, ['element_age_days']);
    }
  });
  it('the pointing error overhead is atan(along-track error / range), and it is added in quadrature to the mount error', () => {
    // Overhead: satellite at (R + 600, 0, 0) moving along +y; the line of sight is perpendicular to the track.
    const s = sampleFromVectors([R_KM + 600, 0, 0], [0, 7.56, 0], 86_400);
    const link = baseLink({ ground: { ...baseLink().ground, pointing: { kind: 'track', pointingErrorDeg: 0.1 } } });
    const e = createLinkEngine({
      link, climate: baseClimate(), weatherCases: CASES,
      elementError: { epochS: 0, atEpochKm: 1, alongTrackKmPerDay: 2, crossTrackKmPerDay: 0 }, // age 1 d: 3 km along, 1 km cross
    });
    const step = e.evaluate(s, createStepBudget(CASES));
    // Along (y) and cross (orbit normal z) both lie across the line of sight (x): e⊥ = √(3² + 1²) km.
    expect(Math.abs(step.element_pointing_error_deg - Math.atan(Math.sqrt(10) / 600) / DEG)).toBeLessThan(1e-9);
    const total = Math.sqrt(0.1 ** 2 + step.element_pointing_error_deg ** 2);
    const dish = { diameterM: 3, frequencyGHz: 8.2, efficiency: 0.6 };
    // Main-lobe loss 12 (θ/θ3dB)² (PHYSICS.md §2, common practice).
    expect(step.rx_pointing_loss_db).toBeCloseTo(12 * (total / parabolicBeamwidthDeg(dish)) ** 2, 9);
  });
});

describe('the Sun in the beam (constructed pass through the Sun)', () => {
  // 2026-03-20T12:00Z: near the March equinox the Sun is close to the +x axis of the equatorial frame,
  // so with GMST = 0 it stands nearly overhead the fixtures' station at (R, 0, 0).
  const t0 = Date.UTC(2026, 2, 20, 12) / 1000;
  const sun = new Float64Array(3);
  sunDirection(t0, sun);
  // Unit vectors across the Sun's direction: e (in the equator plane) and f = s × e.
  const ex = [-sun[1], sun[0], 0].map((v) => v / Math.hypot(sun[0], sun[1]));
  const f = [sun[1] * ex[2] - sun[2] * ex[1], sun[2] * ex[0] - sun[0] * ex[2], sun[0] * ex[1] - sun[1] * ex[0]];
  const link = baseLink();
  const bw = parabolicBeamwidthDeg({ diameterM: 3, frequencyGHz: 8.2 });
  /** A straight track 800 km from the station seen along s + x e + y f, x from −3θ3 to 3θ3 (tangent). */
  const track = (offsetDeg: number) => {
    const out = [];
    const y = Math.tan(offsetDeg * DEG);
    for (let k = -60; k <= 60; k++) {
      const x = Math.tan(((k / 20) * bw) * DEG);
      const u = [0, 1, 2].map((j) => sun[j] + x * ex[j] + y * f[j]);
      const n = Math.hypot(u[0], u[1], u[2]);
      const r = [R_KM + (800 * u[0]) / n, (800 * u[1]) / n, (800 * u[2]) / n];
      out.push(sampleFromVectors(r, [7 * ex[0], 7 * ex[1], 7 * ex[2]], t0 + k));
    }
    return out;
  };
  const withSun = () => createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES, sun: { activityFactor: 1 } });
  const without = createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES });

  it('shows the noise rise at the crossing, as the pattern-weighted disc predicts', () => {
    const e = withSun();
    const steps = track(0).map((s) => copyStepBudget(e.evaluate(s, createStepBudget(CASES))));
    const mid = steps[60];
    expect(mid.sun_separation_deg).toBeLessThan(0.01);
    const peak = Math.max(...steps.map((s) => s.sun_noise_temperature_k));
    expect(mid.sun_noise_temperature_k).toBe(peak);
    // Closed form for the Gaussian main lobe 10^(−1.2 (θ/θ3)²) over a disc centred on boresight
    // (1/4π) G0 (π/c)(1 − e^(−c a²)), c = 1.2 ln10 / θ3² (small angles; calculus), minus the 30 dB floor (0.1 %).
    const c = (1.2 * Math.LN10) / (bw * DEG) ** 2, a = (SUN_DISC_DIAMETER_DEG / 2) * DEG;
    const g0 = 10 ** (parabolicGainDBi({ diameterM: 3, frequencyGHz: 8.2, efficiency: 0.6 }) / 10);
    const expected = quietSunBrightnessTemperatureK({ frequencyGHz: 8.2 }) * (g0 / (4 * Math.PI)) * (Math.PI / c) * (1 - Math.exp(-c * a * a));
    expect(Math.abs(mid.sun_noise_temperature_k / expected - 1)).toBeLessThan(0.01);
    // Thousands of kelvin on a 3 m X-band dish: the margin falls by many dB at the crossing.
    expect(mid.sun_noise_temperature_k).toBeGreaterThan(1000);
    const ref = copyStepBudget(without.evaluate(track(0)[60], createStepBudget(CASES)));
    const drop = ref.cases[0].margin_db - mid.cases[0].margin_db;
    expect(drop).toBeGreaterThan(5);
    expect(drop).toBeCloseTo(mid.cases[0].sun_loss_db, 9);
    // T_sys rises by the Sun's noise through the 0.3 dB feed loss: 10 log10(T_sys'/T_sys) is the loss.
    expect(10 * Math.log10(mid.cases[0].system_temperature_k / ref.cases[0].system_temperature_k)).toBeCloseTo(mid.cases[0].sun_loss_db, 9);
    expect(mid.cases[0].antenna_temperature_k - ref.cases[0].antenna_temperature_k).toBeCloseTo(mid.sun_noise_temperature_k, 6);
    // Symmetric about the crossing, and nothing far out on the track.
    expect(steps[40].sun_noise_temperature_k).toBeCloseTo(steps[80].sun_noise_temperature_k, 0);
    expect(steps[0].sun_noise_temperature_k).toBe(0);
  });
  it('a pass 10 beamwidths away shows none: results equal those without the Sun', () => {
    const e = withSun();
    for (const s of track(10 * bw)) {
      const a = copyStepBudget(without.evaluate(s, createStepBudget(CASES)));
      const b = copyStepBudget(e.evaluate(s, createStepBudget(CASES)));
      expect(b.sun_separation_deg).toBeGreaterThan(9 * bw);
      expect(b.sun_noise_temperature_k).toBe(0);
      sameExcept(a, b, ['sun_separation_deg']);
    }
  });
  it('a Sun below the station\'s horizon adds nothing (the Earth hides it), though the boresight points its way', () => {
    // 2026-09-23T12:00Z: near the September equinox the Sun is near −x, below the horizon of the station at (R, 0, 0).
    const t = Date.UTC(2026, 8, 23, 12) / 1000;
    const s2 = new Float64Array(3);
    sunDirection(t, s2);
    const r = [R_KM + 800 * s2[0], 800 * s2[1], 800 * s2[2]];
    const step = withSun().evaluate(sampleFromVectors(r, [0, 7, 0], t), createStepBudget(CASES));
    expect(step.elevation_deg).toBeLessThan(-80);
    expect(step.sun_separation_deg).toBeLessThan(0.01);
    expect(step.sun_noise_temperature_k).toBe(0);
  });
  it('an uplink gets no Sun noise (the spacecraft looks at the Earth) and the activity factor scales it', () => {
    const up = createLinkEngine({
      link: baseLink({ direction: 'uplink', ground: { ...baseLink().ground, txPowerDBW: 10 }, spacecraft: { ...baseLink().spacecraft, receiver: baseLink().ground.receiver } }),
      climate: baseClimate(), weatherCases: CASES, sun: { activityFactor: 1 },
    });
    const s = track(0)[60];
    expect(up.evaluate(s, createStepBudget(CASES)).sun_noise_temperature_k).toBe(0);
    const q = withSun().evaluate(s, createStepBudget(CASES)).sun_noise_temperature_k;
    const act = createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES, sun: { activityFactor: 3 } }).evaluate(s, createStepBudget(CASES));
    expect(act.sun_noise_temperature_k).toBeCloseTo(3 * q, 6);
  });
});
