/**
 * The sweep: from orbit nodes to accumulators. Per satellite:
 *   layout.ts   which stations and links it has;
 *   plan.ts     its passes (searched in slabs on the interpolated orbit) and the chunks of its sweep;
 *   chunk.ts    a chunk swept in windows of grid times, in columns: satellite state (once),
 *               station look angles, each link's budget (budget/engine.ts evaluateColumns), then the
 *               pass, day, network, mask, rate, envelope and series accumulators fed from the columns;
 *   window.ts   a window's columns as the steps writers see them;
 *   network.ts  per grid time, the one station that carries each link (the network's accumulators);
 *   merge.ts    chunks merged in order into the run's result;
 *   pipeline.ts all of it in this thread; parallel.ts + tasks.ts + worker.ts on several threads, same result.
 */
export * from './types.js';
export * from './window.js';
export * from './layout.js';
export * from './plan.js';
export { createSweeper, type Sweeper, type SweepOptions } from './chunk.js';
export * from './merge.js';
export { runPipeline } from './pipeline.js';
export { runPipelineParallel, checkWorkers, type ParallelPipelineOptions } from './parallel.js';
