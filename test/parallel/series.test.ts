/**
 * Report data bounded by design (src/sweep/chunk.ts): with
 * collectSeries, series are kept for the first `seriesMaxSections` pass-link
 * sections in the report's time order only, and the margin envelope covers
 * every step. Reference for the envelope: d3-array `bin` (marginEnvelope of
 * the report, thresholds every 2° over [0, 90]) applied to every step's
 * elevation and margin as the sweep hands them out. A prebuilt elevation
 * table (structured-cloned, as sent to workers) gives the same budget to the
 * last bit as the engine's own.
 */
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../src/sweep/pipeline.js';
import { satelliteLayout } from '../../src/sweep/layout.js';
import { createSweeper } from '../../src/sweep/chunk.js';
import { ENVELOPE_BINS } from '../../src/sweep/types.js';
import { createLinkEngine, createStepBudget } from '../../src/budget/engine.js';
import { createStationGeometry } from '../../src/geometry/station.js';
import { createGeometrySample } from '../../src/geometry/types.js';
import { createPropagator } from '../../src/orbit/propagator.js';
import { marginEnvelope } from '../../src/output/report/envelope.js';
import { linkEnvelopes } from '../../src/jobs/run.js';
import { runPipelineParallel } from '../../src/sweep/parallel.js';
import { smallScenario } from './scenario.js';

describe('report series cap and envelope', () => {
  it('keeps series for the first N pass-links in time order, the same with 2 workers; envelopes equal d3 bins of every step', async () => {
    const scenario = smallScenario(1);
    const n = 7;
    const steps = new Map<string, { el: number[]; m: number[][] }>();
    const p = await runPipeline({
      scenario, collectSeries: true, seriesMaxSections: n,
      onStep: (e) => {
        let s = steps.get(e.link.name);
        if (!s) { s = { el: [], m: e.step.cases.map(() => []) }; steps.set(e.link.name, s); }
        s.el.push(e.step.elevation_deg);
        e.step.cases.forEach((c, i) => s!.m[i].push(c.margin_db));
      },
    });
    const order = [...p.passLinks].sort((a, b) => a.aosS - b.aosS || a.station.localeCompare(b.station) || a.link.localeCompare(b.link));
    expect(order.length).toBeGreaterThan(3 * n);
    const want = order.slice(0, n).filter((x) => x.steps > 0).map((x) => `${x.passId}|${x.link}`).sort();
    expect(p.series.map((s) => `${s.passId}|${s.link}`).sort()).toEqual(want);
    for (const s of p.series) expect(s.timeS.length).toBeLessThanOrEqual(120);

    // Envelopes pooled per link equal the report's d3-bin envelope over every step.
    const pooled = linkEnvelopes(p.envelopes);
    expect(p.envelopes.length).toBe(scenario.links.length * scenario.weatherCases.length);
    for (const [link, s] of steps) {
      scenario.weatherCases.forEach((w, i) => {
        const ref = marginEnvelope(s.el, s.m[i]);
        const got = pooled.find((e) => e.link === link && e.weather === w.name)!;
        expect(got.bins).toEqual(ref);
      });
    }

    const p2 = await runPipelineParallel({ scenario, workers: 2, collectSeries: true, seriesMaxSections: n });
    expect(p2.series).toEqual(p.series);
    expect(p2.envelopes.map((e) => [e.station, e.link, e.weather, Array.from(e.minDB), Array.from(e.maxDB)]))
      .toEqual(p.envelopes.map((e) => [e.station, e.link, e.weather, Array.from(e.minDB), Array.from(e.maxDB)]));
    expect(p.envelopes[0].minDB.length).toBe(ENVELOPE_BINS);
  });

  it('a structured-cloned prebuilt elevation table gives bit-identical steps', () => {
    const scenario = smallScenario(1);
    const layout = satelliteLayout(scenario, 0);
    const own = createSweeper(scenario, layout).engines;
    const st = layout.stations[0];
    const link = st.links[0];
    const table = structuredClone(own[0].table);
    const a = createLinkEngine({ link, climate: st.entry.climate, weatherCases: scenario.weatherCases });
    const b = createLinkEngine({ link, climate: st.entry.climate, weatherCases: scenario.weatherCases, table });
    expect(b.table).toBe(table);
    expect(Array.from(b.table.values)).toEqual(Array.from(a.table.values));
    const geo = createStationGeometry(st.entry.station);
    const prop = createPropagator(scenario.satellites[0].elements);
    const sample = createGeometrySample();
    const sa = createStepBudget(scenario.weatherCases);
    const sb = createStepBudget(scenario.weatherCases);
    let compared = 0;
    for (let t = scenario.window.startS; t < scenario.window.endS && compared < 200; t += 20) {
      geo.sample(prop, t, sample);
      if (!(sample.elevationDeg > 0)) continue;
      expect(b.evaluate(sample, sb)).toEqual(a.evaluate(sample, sa));
      compared++;
    }
    expect(compared).toBe(200);
    expect(() => createLinkEngine({ link, climate: st.entry.climate, weatherCases: scenario.weatherCases.slice(0, 1), table }))
      .toThrow(/prebuilt elevation table has 3 weather cases, expected 1/);
  });
});
