/**
 * Rate-limited az–el mount (our kinematic model, see src/budget/mount.ts) and
 * its effect in the engine: an overhead pass on a slow mount lags, loses gain
 * and is flagged; a low pass is followed exactly. The pointing loss of the lag
 * is the dish main-lobe model 12 (θ/θ3dB)² (Gaussian beam, common practice),
 * floored 30 dB below the peak (model assumption).
 */
import { describe, expect, it } from 'vitest';
import { createMountState, stepMount, azimuthDeltaDeg } from '../../src/budget/mount.js';
import { createLinkEngine } from '../../src/budget/engine.js';
import { copyStepBudget } from '../../src/budget/columns.js';
import { pointingLossDB } from '../../src/models/index.js';
import { baseClimate, baseLink, CASES, syntheticPass } from './fixtures.js';

describe('stepMount kinematics', () => {
  it('target moving 5°/s in azimuth at 0° elevation, mount limited to 2°/s: lag grows 3°/s', () => {
    const m = createMountState();
    stepMount(m, 0, 100, 0, 2, 2);
    expect(m.lagDeg).toBe(0);
    for (let t = 1; t <= 10; t++) stepMount(m, t, 100 + 5 * t, 0, 2, 2);
    // At 0° elevation the angular separation equals the azimuth difference: 50° − 20° = 30°.
    expect(m.lagDeg).toBeCloseTo(30, 9);
    expect(m.azDeg).toBeCloseTo(120, 9);
    expect(m.limited).toBe(true);
  });
  it('at 60° elevation the same azimuth lag is a smaller angle: 2 asin(cos 60° sin 15°) = 14.84°', () => {
    const m = createMountState();
    stepMount(m, 0, 100, 60, 2, 2);
    for (let t = 1; t <= 10; t++) stepMount(m, t, 100 + 5 * t, 60, 2, 2);
    expect(m.lagDeg).toBeCloseTo((2 * Math.asin(Math.cos(60 * Math.PI / 180) * Math.sin(15 * Math.PI / 180)) * 180) / Math.PI, 9);
  });
  it('azimuth takes the short way round through north', () => {
    const m = createMountState();
    stepMount(m, 0, 350, 10, 1, 1);
    stepMount(m, 10, 10, 10, 1, 1); // 20° away through north, 10 s at 1°/s
    expect(m.azDeg).toBeCloseTo(0, 9);
    expect(azimuthDeltaDeg(350, 10)).toBe(20);
    expect(azimuthDeltaDeg(10, 350)).toBe(-20);
  });
  it('a mount fast enough follows exactly and is never flagged', () => {
    const m = createMountState();
    stepMount(m, 0, 100, 20, 10, 10);
    for (let t = 1; t <= 10; t++) {
      stepMount(m, t, 100 + 3 * t, 20 + t, 10, 10);
      expect(m.lagDeg).toBe(0);
      expect(m.limited).toBe(false);
    }
  });
  it('refuses steps out of time order', () => {
    const m = createMountState();
    stepMount(m, 10, 0, 10, 1, 1);
    expect(() => stepMount(m, 5, 0, 10, 1, 1)).toThrow(/time order/);
  });
});

describe('engine: overhead pass on a slow mount vs a low pass', () => {
  const link = baseLink();
  link.ground.pointing = { kind: 'track', pointingErrorDeg: 0, maxAzimuthRateDegS: 3, maxElevationRateDegS: 3 };
  const engine = createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES });
  const beam = engine.groundAntenna.beamwidthDeg; // 70 λ/D = 0.853° at 8.2 GHz, 3 m

  function run(offsetDeg: number) {
    const pass = syntheticPass(offsetDeg);
    engine.beginPass();
    return pass.map((s) => ({ ...copyStepBudget(engine.evaluate(s)), sample: s }));
  }

  it('overhead (ground track 11 km from the station, max elevation ≈ 88.7°): lag, extra loss, flags', () => {
    const steps = run(0.1);
    const maxEl = Math.max(...steps.map((s) => s.elevation_deg));
    expect(maxEl).toBeGreaterThan(88);
    const limited = steps.filter((s) => s.mount_limited);
    expect(limited.length).toBeGreaterThan(10);
    const worst = steps.reduce((a, b) => (b.mount_lag_deg > a.mount_lag_deg ? b : a));
    expect(worst.mount_lag_deg).toBeGreaterThan(5);
    // Near zenith, lagging by degrees with a 0.85° beam: the loss hits the model's 30 dB floor.
    expect(worst.rx_pointing_loss_db).toBeCloseTo(30, 6);
    // Where the lag is inside the main lobe, the loss is 12 (lag/θ3dB)².
    const small = steps.find((s) => s.mount_lag_deg > 0.05 && s.mount_lag_deg < 0.5)!;
    expect(small).toBeDefined();
    expect(small.rx_pointing_loss_db).toBeCloseTo(pointingLossDB({ errorDeg: small.mount_lag_deg, beamwidthDeg: beam }), 9);
    expect(small.rx_off_boresight_deg).toBe(small.mount_lag_deg);
    // The lag costs C/N0 one for one: against an unlimited mount at the same instant.
    const free = createLinkEngine({ link: baseLink(), climate: baseClimate(), weatherCases: CASES });
    const ref = free.evaluate(worst.sample);
    expect(ref.mount_lag_deg).toBe(0);
    for (let i = 0; i < CASES.length; i++) {
      expect(ref.cases[i].c_over_n0_dbhz - worst.cases[i].c_over_n0_dbhz).toBeCloseTo(worst.rx_pointing_loss_db, 9);
    }
    // AOS: pre-positioned, no lag.
    expect(steps[0].mount_lag_deg).toBe(0);
  });

  it('low pass (max elevation ≈ 12°): no lag, no flag, no pointing loss', () => {
    const steps = run(15);
    const maxEl = Math.max(...steps.map((s) => s.elevation_deg));
    expect(maxEl).toBeGreaterThan(5);
    expect(maxEl).toBeLessThan(20);
    expect(steps.every((s) => !s.mount_limited && s.mount_lag_deg === 0 && s.rx_pointing_loss_db === 0)).toBe(true);
  });

  it('beginPass resets the mount: the same pass twice gives the same lags', () => {
    const a = run(0.1).map((s) => s.mount_lag_deg);
    const b = run(0.1).map((s) => s.mount_lag_deg);
    expect(b).toEqual(a);
  });
});

describe('stepMount is the exact solution of its kinematic model (no sub-steps)', () => {
  /** The same model integrated with 1 ms sub-steps (target linear between steps, each axis at most its rate toward it). */
  function fine(steps: [number, number, number][], azRate: number, elRate: number): number[] {
    let maz = steps[0][1], mel = steps[0][2];
    const lags = [0];
    for (let k = 1; k < steps.length; k++) {
      const [t0, a0, e0] = steps[k - 1];
      const [t1, a1, e1] = steps[k];
      const n = Math.round((t1 - t0) / 1e-3);
      const h = (t1 - t0) / n;
      const dA = azimuthDeltaDeg(a0, a1), dE = e1 - e0;
      for (let i = 1; i <= n; i++) {
        const ta = a0 + (i / n) * dA, te = e0 + (i / n) * dE;
        const da = azimuthDeltaDeg(maz, ta), de = te - mel;
        maz += Math.abs(da) > azRate * h ? Math.sign(da) * azRate * h : da;
        mel += Math.abs(de) > elRate * h ? Math.sign(de) * elRate * h : de;
      }
      const sep = (2 * Math.asin(Math.sqrt(Math.sin(((e1 - mel) * Math.PI) / 360) ** 2
        + Math.cos((mel * Math.PI) / 180) * Math.cos((e1 * Math.PI) / 180) * Math.sin((azimuthDeltaDeg(maz, a1) * Math.PI) / 360) ** 2)) * 180) / Math.PI;
      lags.push(sep);
    }
    return lags;
  }
  it('matches a 1 ms sub-step integration within 0.01° through a keyhole (azimuth swinging 180° in seconds)', () => {
    // Target near zenith: azimuth swings from 10° to 190° over ~6 s, elevation peaks at 88°.
    const steps: [number, number, number][] = [];
    for (let t = 0; t <= 60; t++) {
      const s = t - 30;
      steps.push([t, (100 + (90 * 2 / Math.PI) * Math.atan(s / 2)) % 360, 88 - 0.02 * s * s]);
    }
    const ref = fine(steps, 3, 2);
    const m = createMountState();
    let worst = 0, maxLag = 0;
    steps.forEach(([t, a, e], i) => {
      stepMount(m, t, a, e, 3, 2);
      worst = Math.max(worst, Math.abs(m.lagDeg - ref[i]));
      maxLag = Math.max(maxLag, m.lagDeg);
    });
    expect(maxLag).toBeGreaterThan(10);
    expect(worst).toBeLessThan(0.01);
  });
  it('catches up exactly: 4° behind on a target at 1°/s with a 3°/s mount closes in 2 s, then follows', () => {
    const m = createMountState();
    stepMount(m, 0, 100, 10, 3, 3);
    stepMount(m, 1, 105, 10, 3, 3); // target jumps 5° in 1 s: the mount moves 3°, 2° behind
    expect(m.lagDeg).toBeCloseTo(2 * Math.cos((10 * Math.PI) / 180), 2);
    stepMount(m, 2, 106, 10, 3, 3); // closes at 2°/s: on target after 1 s
    expect(m.lagDeg).toBe(0);
    expect(m.limited).toBe(true);
    stepMount(m, 3, 107, 10, 3, 3);
    expect(m.lagDeg).toBe(0);
    expect(m.limited).toBe(false);
  });
});
