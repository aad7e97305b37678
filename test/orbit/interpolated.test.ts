/**
 * The interpolated orbit (src/orbit/interpolated.ts) against direct SGP4
 * (satellite.js, itself checked against Vallado et al. AIAA 2006-6753 in
 * sgp4-verification.test.ts). The bound the sweep relies on: over a full day,
 * position within 1 m and velocity within 1 mm/s of SGP4, for perigee heights
 * 300–2000 km and eccentricities up to 0.1 (invented element sets, see
 * orbitFixtures.ts). The measured errors are printed; they are far below the
 * bound (micrometres to millimetres; the largest come from SGP4's own
 * eccentricity floor kink on a circular orbit with drag).
 */
import { describe, expect, it } from 'vitest';
import { createPropagator } from '../../src/orbit/propagator.js';
import {
  createStateColumns, exactOrbit, interpolatedOrbit, lagrangeWeights, nodeSpacingTargetS,
} from '../../src/orbit/interpolated.js';
import { EPOCH_S, syntheticElements } from './orbitFixtures.js';

const CASES: [number, number][] = [[300, 0], [300, 0.001], [500, 0.0011], [800, 0.05], [2000, 0], [2000, 0.1], [300, 0.1], [600, 0.02]];

describe('interpolated orbit vs direct SGP4 over a day', () => {
  for (const [h, e] of CASES) {
    it(`perigee ${h} km, e = ${e}: position < 1 m, velocity < 1 mm/s at 1-s grid times and between them`, () => {
      const prop = createPropagator(syntheticElements(h, e));
      const orbit = interpolatedOrbit(prop, { originS: EPOCH_S, stepS: 1 });
      expect(orbit.nodeSpacingS).toBeGreaterThanOrEqual(30);
      const r = new Float64Array(3), v = new Float64Array(3), r0 = new Float64Array(3), v0 = new Float64Array(3);
      let dr = 0, dv = 0;
      // Off-grid instants (0.37 s apart) exercise the arbitrary-time weights.
      for (let t = EPOCH_S; t < EPOCH_S + 86_400; t += 0.37) {
        orbit.stateTeme(t, r, v); prop.stateTeme(t, r0, v0);
        dr = Math.max(dr, Math.hypot(r[0] - r0[0], r[1] - r0[1], r[2] - r0[2]));
        dv = Math.max(dv, Math.hypot(v[0] - v0[0], v[1] - v0[1], v[2] - v0[2]));
      }
      // Grid times in bulk (the sweep's path).
      const cols = createStateColumns(600);
      for (let k0 = 0; k0 < 86_400; k0 += 600) {
        orbit.fillGrid(k0, 600, cols);
        for (let i = 0; i < 600; i++) {
          prop.stateTeme(EPOCH_S + k0 + i, r0, v0);
          dr = Math.max(dr, Math.hypot(cols.rx[i] - r0[0], cols.ry[i] - r0[1], cols.rz[i] - r0[2]));
          dv = Math.max(dv, Math.hypot(cols.vx[i] - v0[0], cols.vy[i] - v0[1], cols.vz[i] - v0[2]));
        }
      }
      console.log(`interpolation, perigee ${h} km e ${e}: nodes every ${orbit.nodeSpacingS} s, max |Δr| ${(dr * 1e3).toExponential(2)} m, max |Δv| ${(dv * 1e6).toExponential(2)} mm/s`);
      expect(dr).toBeLessThan(1e-3);
      expect(dv).toBeLessThan(1e-6);
      // SGP4 once per node, not per step: a day of 1-s steps takes ~1/60 of the calls.
      expect(orbit.sgp4Calls).toBeLessThan(86_400 / 20);
    });
  }

  it('returns SGP4 exactly at the nodes, and the same numbers for a grid time through stateTeme and fillGrid', () => {
    const prop = createPropagator(syntheticElements(500, 0.0011));
    const orbit = interpolatedOrbit(prop, { originS: EPOCH_S, stepS: 2 });
    const H = orbit.nodeSpacingS;
    expect(H % 2).toBe(0);
    const r = new Float64Array(3), v = new Float64Array(3), r0 = new Float64Array(3), v0 = new Float64Array(3);
    for (let j = -5; j < 50; j++) {
      orbit.stateTeme(EPOCH_S + j * H, r, v); prop.stateTeme(EPOCH_S + j * H, r0, v0);
      expect([...r, ...v]).toEqual([...r0, ...v0]);
    }
    const cols = createStateColumns(100);
    orbit.fillGrid(7, 100, cols);
    for (let i = 0; i < 100; i++) {
      orbit.stateTeme(EPOCH_S + (7 + i) * 2, r, v);
      expect([cols.rx[i], cols.ry[i], cols.rz[i], cols.vx[i], cols.vy[i], cols.vz[i]]).toEqual([...r, ...v]);
    }
  });

  it('a grid coarser than the node spacing: every grid time is a node (Δt = q·H)', () => {
    const prop = createPropagator(syntheticElements(500, 0.0011));
    const target = nodeSpacingTargetS(prop.elements);
    const orbit = interpolatedOrbit(prop, { originS: EPOCH_S, stepS: 3 * target });
    const cols = createStateColumns(20);
    orbit.fillGrid(0, 20, cols);
    const r0 = new Float64Array(3), v0 = new Float64Array(3);
    for (let i = 0; i < 20; i++) {
      prop.stateTeme(EPOCH_S + i * 3 * target, r0, v0);
      expect(cols.rx[i]).toBe(r0[0]);
      expect(cols.vz[i]).toBe(v0[2]);
    }
  });

  it('exactOrbit is SGP4 at every call', () => {
    const prop = createPropagator(syntheticElements(700, 0.01));
    const orbit = exactOrbit(prop, EPOCH_S, 1);
    const cols = createStateColumns(10);
    orbit.fillGrid(100, 10, cols);
    const r0 = new Float64Array(3), v0 = new Float64Array(3);
    prop.stateTeme(EPOCH_S + 105, r0, v0);
    expect(cols.rx[5]).toBe(r0[0]);
    expect(orbit.sgp4Calls).toBe(10);
  });
});

describe('Lagrange weights (8 nodes, −3…4)', () => {
  it('sum to 1 and reproduce every polynomial of degree ≤ 7 exactly (to rounding)', () => {
    const w = new Float64Array(8);
    for (const u of [0.001, 0.25, 0.5, 0.731, 0.999]) {
      lagrangeWeights(u, w);
      for (let deg = 0; deg <= 7; deg++) {
        let s = 0;
        for (let i = 0; i < 8; i++) s += w[i] * (i - 3) ** deg;
        expect(s).toBeCloseTo(u ** deg, 12);
      }
    }
  });
  it('are exactly 0 and 1 at a node', () => {
    const w = new Float64Array(8);
    lagrangeWeights(0, w);
    expect(Array.from(w)).toEqual([0, 0, 0, 1, 0, 0, 0, 0]);
    lagrangeWeights(1, w);
    expect(Array.from(w)).toEqual([0, 0, 0, 0, 1, 0, 0, 0]);
  });
});
