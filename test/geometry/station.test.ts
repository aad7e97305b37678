/**
 * Station geometry checks:
 * - look angles and range against satellite.js `ecfToLookAngles` (an
 *   independent implementation of the topocentric transform), 1e-6 deg / 1e-6 km;
 * - range rate against a central finite difference of range (1e-4 km/s);
 * - range acceleration against a central finite difference of range rate;
 * - Doppler against satellite.js `dopplerFactor` fed with the rotation-only
 *   ECEF velocity (that function adds the observer's rotation itself): 1 Hz at 8 GHz.
 */
import { dopplerFactor, ecfToLookAngles, eciToEcf } from 'satellite.js';
import { describe, expect, it } from 'vitest';
import { loadElementsFile } from '../../src/elements/load.js';
import { createGeometrySample } from '../../src/geometry/types.js';
import { createStationGeometry } from '../../src/geometry/station.js';
import { dopplerShiftHz, dopplerRateHzS } from '../../src/geometry/doppler.js';
import { createPropagator } from '../../src/orbit/propagator.js';
import { DEMO_STATIONS, ORBILUX_TLE } from './demo-stations.js';

const DEG = Math.PI / 180;
const prop = createPropagator(loadElementsFile(ORBILUX_TLE)[0]);
const t0 = prop.elements.epochUnixS;

/** Small deterministic generator (LCG) so the "random" cases are repeatable. */
function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

describe('look angles and range vs satellite.js ecfToLookAngles', () => {
  it('agree within 1e-6 deg and 1e-6 km on 2000 random (station, time) pairs', () => {
    const rand = rng(7);
    const out = createGeometrySample();
    let maxAz = 0; let maxEl = 0; let maxR = 0;
    for (let k = 0; k < 2000; k++) {
      const st = {
        name: 'r', latitudeDeg: -89 + 178 * rand(), longitudeDeg: -180 + 360 * rand(), heightM: 3000 * rand(),
        mask: { kind: 'constant' as const, elevationDeg: 0 },
      };
      const geo = createStationGeometry(st);
      const t = t0 + 2 * 86400 * rand();
      geo.sample(prop, t, out);
      const la = ecfToLookAngles(
        { latitude: st.latitudeDeg * DEG, longitude: st.longitudeDeg * DEG, height: st.heightM / 1000 },
        { x: out.satPositionEcefKm[0], y: out.satPositionEcefKm[1], z: out.satPositionEcefKm[2] },
      );
      let dAz = Math.abs(la.azimuth / DEG - out.azimuthDeg);
      dAz = Math.min(dAz, 360 - dAz);
      // Azimuth is undefined at the zenith; skip it within 1e-4 deg of 90 deg.
      if (out.elevationDeg < 89.9999) maxAz = Math.max(maxAz, dAz);
      maxEl = Math.max(maxEl, Math.abs(la.elevation / DEG - out.elevationDeg));
      maxR = Math.max(maxR, Math.abs(la.rangeSat - out.rangeKm));
    }
    expect(maxAz).toBeLessThan(1e-6);
    expect(maxEl).toBeLessThan(1e-6);
    expect(maxR).toBeLessThan(1e-6);
  });
});

describe('range rate, range acceleration and Doppler', () => {
  const out = createGeometrySample();
  const tmp = createGeometrySample();
  const cases: number[] = [];
  const rand = rng(11);
  for (let k = 0; k < 300; k++) cases.push(t0 + 3 * 86400 * rand());

  it.each(DEMO_STATIONS)('range rate matches a central difference of range within 1e-4 km/s ($name)', (st) => {
    const geo = createStationGeometry(st);
    const h = 0.5;
    for (const t of cases) {
      geo.sample(prop, t + h, tmp); const rp = tmp.rangeKm;
      geo.sample(prop, t - h, tmp); const rm = tmp.rangeKm;
      geo.sample(prop, t, out);
      expect(Math.abs(out.rangeRateKmS - (rp - rm) / (2 * h))).toBeLessThan(1e-4);
    }
  });

  it.each(DEMO_STATIONS)('range acceleration matches a central difference of range rate within 1 % + 1e-6 km/s^2 ($name)', (st) => {
    const geo = createStationGeometry(st);
    const h = 1;
    let worst = 0;
    for (const t of cases) {
      geo.sample(prop, t + h, tmp); const vp = tmp.rangeRateKmS;
      geo.sample(prop, t - h, tmp); const vm = tmp.rangeRateKmS;
      geo.sample(prop, t, out);
      const fd = (vp - vm) / (2 * h);
      const err = Math.abs(out.rangeAccelKmS2 - fd);
      worst = Math.max(worst, err / (Math.abs(fd) + 1e-4));
      expect(err).toBeLessThan(0.01 * Math.abs(fd) + 1e-6);
    }
    expect(worst).toBeLessThan(0.01);
  });

  it.each(DEMO_STATIONS)('Doppler at 8 GHz matches satellite.js dopplerFactor within 1 Hz ($name)', (st) => {
    const geo = createStationGeometry(st);
    const f = 8e9;
    for (const t of cases) {
      geo.sample(prop, t, out);
      const v = out.satVelocityTemeKmS;
      const vRotOnly = eciToEcf({ x: v[0], y: v[1], z: v[2] }, out.gmstRad);
      const s = out.stationEcefKm;
      const r = out.satPositionEcefKm;
      const factor = dopplerFactor({ x: s[0], y: s[1], z: s[2] }, { x: r[0], y: r[1], z: r[2] }, vRotOnly);
      expect(Math.abs(dopplerShiftHz({ frequencyHz: f, rangeRateKmS: out.rangeRateKmS }) - f * (factor - 1))).toBeLessThan(1);
    }
  });

  it('Doppler shift and rate follow -f rdot / c and -f rddot / c (c = 299792.458 km/s exact)', () => {
    // 8.2 GHz, receding at 7 km/s: -8.2e9 * 7 / 299792.458 = -191465.7906 Hz (computed independently in Python).
    expect(dopplerShiftHz({ frequencyHz: 8.2e9, rangeRateKmS: 7 })).toBeCloseTo(-191465.7906, 3);
    expect(dopplerShiftHz({ frequencyHz: 437e6, rangeRateKmS: -7.5 })).toBeCloseTo(10932.5632, 3);
    expect(dopplerRateHzS({ frequencyHz: 8.2e9, rangeAccelKmS2: 0.1 })).toBeCloseTo(-2735.2256, 3);
  });
});
