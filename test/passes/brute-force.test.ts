/**
 * Pass finder against brute force: 7 days, the three demo stations (one at
 * 68°N, one with a terrain mask), the same geometry sampled every second.
 * Check: the same set of passes (none missed, none extra, except any shorter
 * than the 1-s sampling step), and every AOS/LOS inside the 1-s bracket where
 * the sampled sign changes (plus the 0.5 ms root tolerance).
 */
import { describe, expect, it } from 'vitest';
import { loadElementsFile } from '../../src/elements/load.js';
import { createStationGeometry } from '../../src/geometry/station.js';
import { createPropagator } from '../../src/orbit/propagator.js';
import { findPasses } from '../../src/passes/find.js';
import { DEMO_STATIONS, ORBILUX_TLE } from '../geometry/demo-stations.js';

const elements = loadElementsFile(ORBILUX_TLE)[0];
const start = elements.epochUnixS;
const end = start + 7 * 86_400;
const TOL = 0.0005;

interface Interval { rise: number; fall: number; clippedStart: boolean; clippedEnd: boolean }

describe('findPasses vs 1-s brute force over 7 days', () => {
  it('finds exactly the sampled passes, each AOS/LOS inside its 1-s bracket', () => {
    const prop = createPropagator(elements);
    const geos = DEMO_STATIONS.map(createStationGeometry);
    const brute: Interval[][] = geos.map(() => []);
    const prev = geos.map(() => NaN);
    const t0 = performance.now();
    // Outer loop over time so the propagator's one-entry cache serves all stations.
    for (let k = 0, t = start; t <= end; k++, t = start + k) {
      for (let s = 0; s < geos.length; s++) {
        const v = geos[s].elevationMinusMask(prop, t) >= 0;
        const p = prev[s];
        const list = brute[s];
        if (k === 0) { if (v) list.push({ rise: t, fall: NaN, clippedStart: true, clippedEnd: false }); }
        else if (v && p === 0) list.push({ rise: t, fall: NaN, clippedStart: false, clippedEnd: false });
        else if (!v && p === 1) list[list.length - 1].fall = t - 1;
        prev[s] = v ? 1 : 0;
      }
    }
    for (const list of brute) {
      const last = list[list.length - 1];
      if (last && Number.isNaN(last.fall)) { last.fall = end; last.clippedEnd = true; }
    }
    const bruteMs = performance.now() - t0;
    const t1 = performance.now();
    const found = DEMO_STATIONS.map((station) => findPasses({ propagator: prop, station, startS: start, endS: end, toleranceS: TOL }));
    const finderMs = performance.now() - t1;
    let total = 0;
    for (let s = 0; s < geos.length; s++) {
      const b = brute[s];
      const f = found[s];
      // Every finder pass not seen by the samples must be shorter than the sampling step.
      const matched = f.filter((p) => b.some((q) => p.aosS <= q.fall + TOL && p.losS >= q.rise - TOL));
      for (const p of f.filter((x) => !matched.includes(x))) expect(p.durationS, `${p.station} extra pass at ${p.aosS}`).toBeLessThan(1);
      expect(matched.length, `${DEMO_STATIONS[s].name}`).toBe(b.length);
      b.forEach((q, i) => {
        const p = matched[i];
        expect(p.clippedStart).toBe(q.clippedStart);
        expect(p.clippedEnd).toBe(q.clippedEnd);
        if (q.clippedStart) expect(p.aosS).toBe(start);
        else { expect(p.aosS).toBeGreaterThan(q.rise - 1 - TOL); expect(p.aosS).toBeLessThanOrEqual(q.rise + TOL); }
        if (q.clippedEnd) expect(p.losS).toBe(end);
        else { expect(p.losS).toBeGreaterThanOrEqual(q.fall - TOL); expect(p.losS).toBeLessThan(q.fall + 1 + TOL); }
        expect(p.tcaS).toBeGreaterThanOrEqual(p.aosS);
        expect(p.tcaS).toBeLessThanOrEqual(p.losS);
        expect(p.maxElevationDeg).toBeGreaterThanOrEqual(0);
      });
      total += b.length;
    }
    console.log(`brute force: ${total} passes over 3 stations x 7 d; 1-s sampling ${(bruteMs / 1000).toFixed(2)} s, finder ${(finderMs / 1000).toFixed(3)} s; per station ${found.map((f) => f.length).join(', ')}`);
    expect(total).toBeGreaterThan(40);
  });
});
