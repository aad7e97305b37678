/**
 * The general event search on functions with known roots and extrema
 * (analytic references: roots of sin, of a Gaussian bump, of a parabola).
 */
import { describe, expect, it } from 'vitest';
import { findCrossings, findMaximum, findRoot } from '../../src/passes/search.js';
import { centralPassDurationS, passScanStepS } from '../../src/passes/scanstep.js';
import { findPasses } from '../../src/passes/find.js';
import { createStationGeometry } from '../../src/geometry/station.js';
import { createGeometrySample } from '../../src/geometry/types.js';
import { createPropagator } from '../../src/orbit/propagator.js';
import { loadElementsFile } from '../../src/elements/load.js';
import { DEMO_STATIONS, KALDFJELL, ORBILUX_TLE } from '../geometry/demo-stations.js';

describe('findRoot / findMaximum', () => {
  it('root of cos on [0, 3] is pi/2 within the tolerance', () => {
    const r = findRoot(Math.cos, 0, 3, 1, Math.cos(3), 1e-9);
    expect(Math.abs(r - Math.PI / 2)).toBeLessThan(1e-9);
  });
  it('maximum of a parabola and of a monotone function (end point)', () => {
    const m = findMaximum((t) => 4 - (t - 1.234) ** 2, -10, 10, 1e-6);
    expect(m.timeS).toBeCloseTo(1.234, 5);
    expect(m.value).toBeCloseTo(4, 10);
    expect(findMaximum((t) => t, 0, 5, 1e-6).timeS).toBe(5);
  });
});

describe('findCrossings', () => {
  it('intervals of sin(t) >= 0 over [0.5, 18.5]: roots at k pi to 1 ms; first clipped at start', () => {
    const c = findCrossings(Math.sin, 0.5, 18.5, 0.7, 1e-3);
    expect(c.map((x) => x.clippedStart)).toEqual([true, false, false]);
    expect(c.map((x) => x.clippedEnd)).toEqual([false, false, false]);
    expect(c[0].startS).toBe(0.5);
    const roots = c.flatMap((x) => [x.startS, x.endS]).slice(1);
    const want = [Math.PI, 2 * Math.PI, 3 * Math.PI, 4 * Math.PI, 5 * Math.PI];
    expect(roots.length).toBe(want.length);
    want.forEach((w, i) => expect(Math.abs(roots[i] - w)).toBeLessThan(1e-3));
  });
  it('clipped at the end', () => {
    const c = findCrossings(Math.sin, 0.5, 7, 1, 1e-3);
    expect(c[c.length - 1]).toMatchObject({ endS: 7, clippedEnd: true });
  });
  it('finds a bump that peaks between two negative samples (hidden from a pure sign scan)', () => {
    // Above zero for |t - 53.3| < 2 sqrt(0.1) = 0.6325 s; samples every 10 s are all negative.
    const g = (t: number) => 0.1 - ((t - 53.3) / 2) ** 2;
    const c = findCrossings(g, 0, 100, 10, 1e-4);
    expect(c.length).toBe(1);
    const halfWidth = 2 * Math.sqrt(0.1);
    expect(Math.abs(c[0].startS - (53.3 - halfWidth))).toBeLessThan(1e-4);
    expect(Math.abs(c[0].endS - (53.3 + halfWidth))).toBeLessThan(1e-4);
  });
  it('finds a dip below zero between two positive samples (splits the interval)', () => {
    const g = (t: number) => 1 - 1.5 * Math.exp(-(((t - 47.1) / 0.5) ** 2));
    const c = findCrossings(g, 0, 100, 10, 1e-4);
    expect(c.length).toBe(2);
    expect(c[0]).toMatchObject({ startS: 0, clippedStart: true, clippedEnd: false });
    expect(c[1]).toMatchObject({ endS: 100, clippedStart: false, clippedEnd: true });
    expect(c[0].endS).toBeCloseTo(47.1 - 0.5 * Math.sqrt(Math.log(1.5)), 3);
  });
  it('nothing when g stays negative, one whole interval when it stays positive', () => {
    expect(findCrossings(() => -1, 0, 100, 7, 1e-3)).toEqual([]);
    expect(findCrossings(() => 1, 0, 100, 7, 1e-3)).toEqual([{ startS: 0, endS: 100, clippedStart: true, clippedEnd: true }]);
  });
  it('cost grows with events, not window length / tolerance: evaluations counted', () => {
    let calls = 0;
    const g = (t: number) => { calls++; return Math.sin(t / 1000); };
    findCrossings(g, 0, 100 * 1000 * Math.PI, 100, 1e-3);
    // 3142 scan samples + about 100 roots of ~20 evaluations + extremum searches.
    expect(calls).toBeLessThan(3142 + 100 * 40 + 100 * 60);
  });
});

describe('scan step from the orbit (SMAD visibility circle)', () => {
  const e = loadElementsFile(ORBILUX_TLE)[0];
  it('central pass above 0 deg at ~500 km lasts about 11-12 min; step is a tenth', () => {
    // Spherical estimate: lambda = 90 - eta, sin eta = R/(R+h) -> about 22 deg of a 94.6-min orbit.
    expect(centralPassDurationS(e, 0)).toBeGreaterThan(640);
    expect(centralPassDurationS(e, 0)).toBeLessThan(720);
    expect(passScanStepS(e, 5)).toBeCloseTo(centralPassDurationS(e, 5) / 10, 9);
  });
});

describe('findPasses details', () => {
  const e = loadElementsFile(ORBILUX_TLE)[0];
  it('a window starting and ending inside passes gives clipped passes at the window edges', () => {
    const all = findPasses({ elements: e, station: KALDFJELL, startS: e.epochUnixS, endS: e.epochUnixS + 86_400 });
    const p = all[3];
    const q = all[6];
    const mid = (p.aosS + p.losS) / 2;
    const mid2 = (q.aosS + q.losS) / 2;
    const clipped = findPasses({ elements: e, station: KALDFJELL, startS: mid, endS: mid2 });
    expect(clipped[0]).toMatchObject({ aosS: mid, clippedStart: true, clippedEnd: false });
    expect(Math.abs(clipped[0].losS - p.losS)).toBeLessThan(0.01);
    const last = clipped[clipped.length - 1];
    expect(last).toMatchObject({ losS: mid2, clippedEnd: true, clippedStart: false });
    expect(Math.abs(last.aosS - q.aosS)).toBeLessThan(0.01);
    expect(clipped.length).toBe(4);
  });
  it.each(DEMO_STATIONS)('TCA is the minimum range and peak elevation the maximum, vs 0.1-s sampling ($name)', (station) => {
    const passes = findPasses({ elements: e, station, startS: e.epochUnixS, endS: e.epochUnixS + 2 * 86_400 });
    expect(passes.length).toBeGreaterThan(3);
    const geo = createStationGeometry(station);
    const prop = createPropagator(e);
    const s = createGeometrySample();
    for (const p of passes.slice(0, 4)) {
      expect(p.durationS).toBeCloseTo(p.losS - p.aosS, 9);
      let maxEl = -90; let minR = Infinity; let tMinR = NaN;
      for (let t = p.aosS; t <= p.losS; t += 0.1) {
        geo.sample(prop, t, s);
        maxEl = Math.max(maxEl, s.elevationDeg);
        if (s.rangeKm < minR) { minR = s.rangeKm; tMinR = t; }
      }
      // The maximiser must be at least as good as any sample and not much better: near
      // the zenith elevation peaks sharply (about 1 deg/s either side of an 89.6 deg
      // peak), so the best 0.1-s sample falls short of it by a few thousandths of a degree.
      expect(p.maxElevationDeg).toBeGreaterThanOrEqual(maxEl - 1e-9);
      expect(p.maxElevationDeg - maxEl).toBeLessThan(p.maxElevationDeg > 80 ? 0.01 : 1e-4);
      expect(p.minRangeKm).toBeLessThanOrEqual(minR + 1e-9);
      expect(minR - p.minRangeKm).toBeLessThan(1e-3);
      expect(Math.abs(p.tcaS - tMinR)).toBeLessThan(0.1);
    }
  });
});
