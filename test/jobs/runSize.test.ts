/**
 * The run-size estimate's time-in-view share (src/jobs/runSize.ts) against
 * closed forms of the same geometry and against the pass finder over 30 days
 * (the pass finder is checked against brute force in test/passes).
 */
import { describe, expect, it } from 'vitest';
import { capAngleRad, estimateRunSize, semiMajorAxisKm, timeInViewFraction } from '../../src/jobs/runSize.js';
import { createPropagator } from '../../src/orbit/propagator.js';
import { findPasses } from '../../src/passes/find.js';
import { loadScenario } from '../../src/scenario/index.js';
import { DEMO } from './helpers.js';

const R = 6378.137;

describe('geometry', () => {
  it('semi-major axis from mean motion: 1.00273791 rev/day (one sidereal day) is 42 164 km (geostationary radius)', () => {
    expect(semiMajorAxisKm(1.00273791)).toBeCloseTo(42_164.2, 0);
  });
  it('cap angle at mask 0 is arccos(R/r) (the horizon), and shrinks with the mask', () => {
    const r = R + 500;
    expect(capAngleRad(r, 0)).toBeCloseTo(Math.acos(R / r), 12);
    expect(capAngleRad(r, 10)).toBeLessThan(capAngleRad(r, 5));
    expect(capAngleRad(r, 90)).toBe(0);
  });
  it('equatorial orbit over an equatorial station: the share is λ/π (the ground track crosses a cap of half-width λ)', () => {
    const r = R + 800;
    expect(timeInViewFraction(r, 0, 0, 5)).toBeCloseTo(capAngleRad(r, 5) / Math.PI, 12);
  });
  it('an orbit of inclination 20° is never seen from 80° N above 5°', () => {
    expect(timeInViewFraction(R + 600, 20, 80, 5)).toBe(0);
  });
});

describe('against the pass finder over 30 days (demo satellite and stations)', () => {
  const s = loadScenario(DEMO);
  const e = s.satellites[0].elements;
  const prop = createPropagator(e);
  it.each(s.stations.map((st) => [st.station.name, st] as const))('%s within 10 %', (_n, st) => {
    const startS = s.window.startS;
    const endS = startS + 30 * 86_400;
    const inView = findPasses({ propagator: prop, station: st.station, startS, endS }).reduce((a, p) => a + (p.losS - p.aosS), 0);
    const est = estimateRunSize({ ...s, links: s.links.filter((l) => l.station === st.station.name).slice(0, 1), window: { startS, endS, stepS: 1 } });
    expect(Math.abs(est.linkSteps / inView - 1)).toBeLessThan(0.1);
  });
});
