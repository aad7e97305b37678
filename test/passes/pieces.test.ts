/**
 * The pass search in pieces (slabs of the window, as the sweep and its worker
 * threads do it) gives exactly the passes of one search over the window; the
 * interpolated orbit moves AOS, TCA and LOS by under 1 ms against the exact
 * orbit (the root tolerance is 0.5 ms and the orbits agree to micrometres);
 * TCA, found as the root of the range rate, is the minimum of the range.
 * Demo satellite and stations (invented), 7 days.
 */
import { describe, expect, it } from 'vitest';
import { loadElementsFile } from '../../src/elements/load.js';
import { createStationGeometry } from '../../src/geometry/station.js';
import { createOrbit, findPasses, passSearch, assemblePasses, completePass } from '../../src/passes/find.js';
import { DEMO_STATIONS, ORBILUX_TLE } from '../geometry/demo-stations.js';

const elements = loadElementsFile(ORBILUX_TLE)[0];
const start = elements.epochUnixS;
const end = start + 7 * 86_400;

describe('pass search in pieces', () => {
  it('slabs of any length give exactly the passes of one search', () => {
    for (const station of DEMO_STATIONS) {
      const orbit = createOrbit(elements, { startS: start, stepS: 1 });
      const whole = findPasses({ orbit, station, startS: start, endS: end });
      expect(whole.length).toBeGreaterThan(15);
      for (const slabS of [86_400, 20_000, 3_333]) {
        const search = passSearch(orbit, station, start, end);
        const events = [];
        let firstAbove = false;
        for (let s = 0, from = start; from < end; s++, from += slabS) {
          const [i0, i1] = search.range(from, Math.min(end, from + slabS));
          const piece = search.events(i0, i1);
          if (s === 0) firstAbove = piece.firstAbove;
          events.push(...piece.events);
        }
        const pieces = assemblePasses(search, events, firstAbove).map((c, k) => completePass(orbit, search.geo, c, k + 1));
        expect(pieces).toEqual(whole);
      }
    }
  });

  it('interpolated against exact orbit: AOS, TCA and LOS within 1 ms, peak elevation within 1e-6°', () => {
    let worst = 0, worstEl = 0, n = 0;
    for (const station of DEMO_STATIONS) {
      const a = findPasses({ elements, station, startS: start, endS: end });
      const b = findPasses({ elements, station, startS: start, endS: end, exactOrbit: true });
      expect(a.length).toBe(b.length);
      a.forEach((p, i) => {
        const q = b[i];
        worst = Math.max(worst, Math.abs(p.aosS - q.aosS), Math.abs(p.losS - q.losS), Math.abs(p.tcaS - q.tcaS));
        worstEl = Math.max(worstEl, Math.abs(p.maxElevationDeg - q.maxElevationDeg));
        n++;
      });
    }
    console.log(`exact vs interpolated orbit, ${n} passes: max |ΔAOS|, |ΔTCA|, |ΔLOS| ${(worst * 1e3).toFixed(3)} ms, max |Δ peak elevation| ${worstEl.toExponential(2)}°`);
    expect(worst).toBeLessThan(1e-3);
    expect(worstEl).toBeLessThan(1e-6);
  });

  it('TCA is the minimum of the range (within 1 ms: the range 1 ms either side is not smaller by more than rounding)', () => {
    const station = DEMO_STATIONS[0];
    const orbit = createOrbit(elements, { startS: start, stepS: 1 });
    const geo = createStationGeometry(station);
    const la = { azimuthDeg: 0, elevationDeg: 0, rangeKm: 0, rangeRateKmS: 0 };
    for (const p of findPasses({ orbit, station, startS: start, endS: end })) {
      if (p.clippedStart || p.clippedEnd) continue;
      const r = geo.look(orbit, p.tcaS, la).rangeKm;
      expect(r).toBeCloseTo(p.minRangeKm, 9);
      for (const dt of [-1, -0.01, 0.01, 1]) expect(geo.look(orbit, p.tcaS + dt, la).rangeKm).toBeGreaterThan(r - 1e-7);
      expect(Math.abs(geo.look(orbit, p.tcaS, la).rangeRateKmS)).toBeLessThan(1e-4);
    }
  });
});
