/**
 * The engine in columns (evaluateColumns, what the sweep runs) against the
 * engine one instant at a time (evaluate on a GeometrySample, what `explain`
 * runs) over whole passes of the demo (invented satellite and stations): every
 * field of every step within 1e-9 (the two differ only in how the line of
 * sight is rotated into TEME, ~1e-15 relative), mount state included (both
 * step the same rate-limited mount from AOS). With `full` off, the terms the
 * summaries read are the same numbers.
 */
import { describe, expect, it } from 'vitest';
import { createLinkEngine, createStepBudget } from '../../src/budget/engine.js';
import { createLinkColumns, readStep } from '../../src/budget/linkColumns.js';
import { createSatelliteColumns, createStationColumns, satelliteEarthFixed, stationLook } from '../../src/geometry/columns.js';
import { createStationGeometry } from '../../src/geometry/station.js';
import { createGeometrySample } from '../../src/geometry/types.js';
import { createOrbit, findPasses } from '../../src/passes/find.js';
import { loadScenario } from '../../src/scenario/index.js';
import { DEMO } from '../parallel/scenario.js';

const s = loadScenario(DEMO);

describe('evaluateColumns equals evaluate, step by step', () => {
  for (const st of s.stations) {
    it(`${st.station.name}: the highest pass of the week, every link`, () => {
      const orbit = createOrbit(s.satellites[0].elements, s.window);
      const passes = findPasses({ orbit, station: st.station, startS: s.window.startS, endS: s.window.endS });
      const p = passes.reduce((a, b) => (b.maxElevationDeg > a.maxElevationDeg ? b : a));
      const k0 = Math.ceil((p.aosS - s.window.startS) / s.window.stepS);
      const n = Math.min(512, Math.floor((p.losS - s.window.startS) / s.window.stepS) - k0 + 1);
      const sat = createSatelliteColumns(512);
      sat.originS = s.window.startS; sat.stepS = s.window.stepS; sat.k0 = k0; sat.n = n;
      orbit.fillGrid(k0, n, sat.teme);
      satelliteEarthFixed(sat);
      const geo = createStationGeometry(st.station);
      const stn = createStationColumns(512);
      stationLook(geo.frame, sat, 0, n, stn);
      const sample = createGeometrySample();
      // With the per-step effects (element error, Sun) as a run has them.
      const fx = { elementError: s.satellites[0].elementError, sun: s.sun ?? undefined };
      for (const link of s.links.filter((l) => l.station === st.station.name)) {
        const a = createLinkEngine({ link, climate: st.climate, weatherCases: s.weatherCases, ...fx });
        const b = createLinkEngine({ link, climate: st.climate, weatherCases: s.weatherCases, table: a.table, ...fx });
        const cols = createLinkColumns(512, s.weatherCases.length);
        a.beginPass();
        a.evaluateColumns(sat, 0, stn, n, cols, true);
        const lean = createLinkColumns(512, s.weatherCases.length);
        const c = createLinkEngine({ link, climate: st.climate, weatherCases: s.weatherCases, table: a.table, ...fx });
        c.beginPass();
        c.evaluateColumns(sat, 0, stn, n, lean, false);
        b.beginPass();
        const fromCols = createStepBudget(s.weatherCases);
        let limited = 0;
        for (let i = 0; i < n; i++) {
          const t = s.window.startS + (k0 + i) * s.window.stepS;
          const one = b.evaluate(geo.sample(orbit, t, sample));
          readStep(stn, cols, i, t, a.modeNames, fromCols);
          if (one.mount_limited) limited++;
          for (const [k, v] of Object.entries(one)) {
            if (k === 'cases') continue;
            const w = (fromCols as unknown as Record<string, unknown>)[k];
            // The columns interpolate the Sun's direction between nodes ≤ 600 s apart (effects.ts: < 1e-7°); one instant computes it exactly.
            if (k === 'sun_separation_deg') expect(Math.abs((w as number) - (v as number)), `${link.name} ${k} step ${i}`).toBeLessThan(1e-6);
            else if (typeof v === 'number') expect(w as number, `${link.name} ${k} step ${i}`).toBeCloseTo(v, 9);
            else expect(w, `${link.name} ${k} step ${i}`).toBe(v);
          }
          one.cases.forEach((oc, j) => {
            const fc = fromCols.cases[j];
            for (const [k, v] of Object.entries(oc)) {
              const w = (fc as unknown as Record<string, unknown>)[k];
              if (typeof v === 'number') expect(w as number, `${link.name} ${oc.weather} ${k} step ${i}`).toBeCloseTo(v, 9);
              else expect(w, `${link.name} ${oc.weather} ${k} step ${i}`).toBe(v);
            }
            for (const f of ['cOverN0DBHz', 'esN0DB', 'ebN0DB', 'marginDB', 'informationRateBps', 'atmosphericDB'] as const) {
              expect(lean.cases[j][f][i]).toBe(cols.cases[j][f][i]);
            }
            expect(lean.cases[j].usable[i]).toBe(cols.cases[j].usable[i]);
            expect(lean.cases[j].mode[i]).toBe(cols.cases[j].mode[i]);
          });
        }
        if (link.ground.pointing.kind === 'track' && link.ground.pointing.maxAzimuthRateDegS !== undefined && p.maxElevationDeg > 85) {
          expect(limited).toBeGreaterThan(0);
        }
      }
    });
  }
});
