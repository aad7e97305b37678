/**
 * The sweep in this thread: for each satellite, plan (pass search in slabs,
 * chunks), then sweep the chunks in order and merge them. The parallel run
 * (parallel.ts) does the same pieces on worker threads and merges them in
 * the same order, so its outputs are identical.
 */
import { createOrbit } from '../passes/find.js';
import { scenarioLayouts, type SatelliteLayout } from './layout.js';
import { createSatelliteMerge, emptyPipelineResult, finishPipelineResult } from './merge.js';
import { planSatellite, selectSeries, SERIES_MAX_SECTIONS, type SatellitePlan } from './plan.js';
import { createSweeper, type SweepOptions } from './chunk.js';
import type { PipelineOptions, PipelineResult } from './types.js';
import type { DailyRow } from '../analysis/types.js';
import type { OrbitSource } from '../orbit/interpolated.js';

export async function runPipeline(options: PipelineOptions): Promise<PipelineResult> {
  const { scenario } = options;
  const result = emptyPipelineResult(scenario);
  const networkDaily: DailyRow[] = [];
  // Plan every satellite first (cheap), so the report's series can be chosen over the whole run.
  const plans: { layout: SatelliteLayout; plan: SatellitePlan; orbit: OrbitSource }[] = [];
  for (const layout of scenarioLayouts(scenario, options.maskFloorDeg)) {
    const orbit = createOrbit(scenario.satellites[layout.satIndex].elements, scenario.window, scenario.exactOrbit);
    const t0 = performance.now();
    plans.push({ layout, plan: planSatellite(scenario, layout, orbit), orbit });
    if (options.timings) options.timings.passSearchS += (performance.now() - t0) / 1000;
    result.sgp4Calls += orbit.sgp4Calls;
  }
  if (options.collectSeries) selectSeries(plans, options.seriesMaxSections ?? SERIES_MAX_SECTIONS);
  for (const { layout, plan, orbit } of plans) {
    const t0 = performance.now();
    const sweeper = createSweeper(scenario, layout, undefined, orbit);
    if (options.timings) options.timings.tablesS += (performance.now() - t0) / 1000;
    for (const e of sweeper.engines) result.engines.push(e);
    const merge = createSatelliteMerge(scenario, layout, result);
    let doneS = 0;
    const sweep: SweepOptions = {
      onStep: options.onStep,
      onWindow: options.onWindow,
      collectSeries: options.collectSeries,
      seriesMaxPoints: options.seriesMaxPoints,
      timings: options.timings,
      collectWhatIf: options.collectWhatIf,
      onPassDone: (d) => { doneS += d; options.onProgress?.(doneS, plan.totalS); },
    };
    for (let c = 0; c + 1 < plan.chunkStarts.length; c++) {
      merge.add(await sweeper.sweepChunk(plan.items.slice(plan.chunkStarts[c], plan.chunkStarts[c + 1]), c, sweep));
    }
    const rows = merge.finish();
    for (const d of rows.stationDaily) result.daily.push(d);
    for (const d of rows.networkDaily) networkDaily.push(d);
  }
  return finishPipelineResult(result, networkDaily);
}
