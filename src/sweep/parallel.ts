/**
 * The sweep on worker threads. The workers build the links' elevation tables
 * (a task per satellite and station, each table built once) and search the
 * passes (a task per satellite and slab of the window); the main thread sends
 * every table to every worker (structured clone of Float64Arrays) and builds
 * its own engines from them, so it builds none (and keeps the table
 * building's garbage out of its heap). With every slab and table in, the
 * main thread plans each satellite's chunks (the same plan as the in-process
 * run); the workers sweep chunks as they become free, each writing its
 * steps.csv rows to a file of its own; the main thread merges the chunks'
 * accumulators and appends their rows to steps.csv strictly in chunk order,
 * which is the order of the in-process sweep. So every output is
 * byte-identical to the in-process run (`workers` ≤ 1), which merges the same
 * chunks the same way.
 */
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Writable } from 'node:stream';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { ElevationTable } from '../budget/atmosphere.js';
import type { DailyRow } from '../analysis/types.js';
import { InputError } from '../errors.js';
import { createStepsSink, type StepsFormat } from '../output/stepsSink.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { createSweeper } from './chunk.js';
import { scenarioLayouts, type SatelliteLayout } from './layout.js';
import { createSatelliteMerge, emptyPipelineResult, finishPipelineResult, type SatelliteMerge } from './merge.js';
import { planFromSlabs, selectSeries, SERIES_MAX_SECTIONS, slabCount, type PlannedPass, type SlabEvents } from './plan.js';
import { runPipeline } from './pipeline.js';
import type { ChunkPartial, PipelineResult, SweepTimings } from './types.js';
import { createTaskRunner, type FromWorker, type ToWorker, type WorkerInit } from './tasks.js';

export interface ParallelPipelineOptions {
  scenario: ResolvedScenario;
  /** Threads that sweep: this one and workers − 1 worker threads; ≤ 1 runs in this thread alone (default 1). */
  workers?: number;
  /** The steps file's stream (rows written, then ended); null or absent: no steps. */
  stepsOut?: Writable | null;
  /** Its format (default csv). */
  stepsFormat?: StepsFormat;
  /** steps.parquet rows per row group (default ROW_GROUP_ROWS; tests of the cuts). */
  parquetRowGroupRows?: number;
  collectSeries?: boolean;
  seriesMaxPoints?: number;
  /** With collectSeries: series only for the first this many pass-link sections in time order (default SERIES_MAX_SECTIONS). */
  seriesMaxSections?: number;
  maskFloorDeg?: number;
  /** Seconds of pass time done and the total (all satellites). */
  onProgress?: (doneS: number, totalS: number) => void;
  /** The worker script (default: worker.js beside this file, else dist/sweep/). */
  workerScript?: string;
  /** With workers ≤ 1: filled with where the time goes. */
  timings?: SweepTimings;
  /** Collect the report's what-if columns (PipelineResult.whatIf); 'summary': the long-window summary. */
  collectWhatIf?: boolean | 'summary';
}

/** Young-generation (nursery) size of each worker thread (MB). */
export const WORKER_YOUNG_GENERATION_MB = 8;

/** Check a --workers value: an integer from 1 to 64. */
export function checkWorkers(value: unknown, where = '--workers'): number {
  const n = typeof value === 'string' && /^\s*\d+\s*$/.test(value) ? Number(value) : value;
  if (typeof n !== 'number' || !Number.isInteger(n) || n < 1 || n > 64) {
    throw new InputError(`${where}: ${JSON.stringify(value)} is not a worker count (allowed an integer from 1 to 64)`);
  }
  return n;
}

function defaultWorkerScript(): string {
  const here = fileURLToPath(new URL('./worker.js', import.meta.url));
  if (existsSync(here)) return here;
  // Running from the TypeScript sources (tests): the built worker.
  const built = fileURLToPath(new URL('../../dist/sweep/worker.js', import.meta.url));
  if (existsSync(built)) return built;
  throw new Error(`parallel run: no worker script at ${here} or ${built} (run npm run build)`);
}

export async function runPipelineParallel(o: ParallelPipelineOptions): Promise<PipelineResult> {
  const { scenario } = o;
  const workers = o.workers ?? 1;
  const stepsFormat = o.stepsFormat ?? 'csv';
  const writer = o.stepsOut ? await createStepsSink(o.stepsOut, stepsFormat, scenario.weatherCases, o.parquetRowGroupRows) : null;

  if (workers <= 1) {
    const result = await runPipeline({
      scenario, collectSeries: o.collectSeries, seriesMaxPoints: o.seriesMaxPoints, seriesMaxSections: o.seriesMaxSections,
      maskFloorDeg: o.maskFloorDeg, onProgress: o.onProgress, onWindow: writer ? (w) => writer.window(w) : undefined,
      timings: o.timings, collectWhatIf: o.collectWhatIf,
    });
    if (writer) await writer.close();
    return result;
  }

  const stepsDir = writer ? mkdtempSync(join(tmpdir(), 'passbudget-steps-')) : null;
  const init: WorkerInit = { scenario, maskFloorDeg: o.maskFloorDeg, collectSeries: o.collectSeries === true, seriesMaxPoints: o.seriesMaxPoints, stepsDir, stepsFormat, collectWhatIf: o.collectWhatIf ?? false };
  const script = o.workerScript ?? defaultWorkerScript();
  const pool: Worker[] = [];
  try {
    // `workers` threads take tasks: this one and workers − 1 worker threads. The sweep keeps little garbage
    // alive, so a small nursery per worker costs nothing measurable and keeps each thread's resident memory
    // down (V8's default lets it grow to tens of MB).
    for (let w = 1; w < workers; w++) pool.push(new Worker(script, { workerData: init, resourceLimits: { maxYoungGenerationSizeMb: WORKER_YOUNG_GENERATION_MB } }));
    const result = emptyPipelineResult(scenario);
    const layouts: SatelliteLayout[] = scenarioLayouts(scenario, o.maskFloorDeg);
    const nSlabs = slabCount(scenario);
    const slabTasks = layouts.flatMap((layout, li) => Array.from({ length: nSlabs }, (_, slab) => ({ li, satIndex: layout.satIndex, slab })));
    const slabsBy: SlabEvents[][] = layouts.map(() => []);
    const tableTasks = layouts.flatMap((layout, li) => layout.stations.map((_, station) => ({ li, satIndex: layout.satIndex, station })));
    const tablesBy: ElevationTable[][][] = layouts.map((l) => l.stations.map(() => []));
    const chunkTasks: { satIndex: number; chunk: number; items: PlannedPass[]; merge: SatelliteMerge }[] = [];
    const merges: SatelliteMerge[] = [];
    let totalS = 0;

    await new Promise<void>((resolveAll, rejectAll) => {
      let failed = false;
      /** Where a task can go: a worker thread, or this thread (tasks run between messages). */
      interface Executor { postMessage(m: ToWorker): void }
      const idle: Executor[] = [];
      const queue: ToWorker[] = [
        ...tableTasks.map((t, task): ToWorker => ({ type: 'buildTables', task, satIndex: t.satIndex, station: t.station })),
        ...slabTasks.map((t, task): ToWorker => ({ type: 'slab', task, satIndex: t.satIndex, slab: t.slab })),
      ];
      let slabsLeft = slabTasks.length;
      let tablesLeft = tableTasks.length;
      let merged = 0;
      let doneS = 0;
      const ready = new Map<number, { partial: ChunkPartial; stepsFile: string | null }>();
      let chain: Promise<void> = Promise.resolve();
      const fail = (err: unknown) => { if (!failed) { failed = true; rejectAll(err); } };
      const pump = () => { while (!failed && idle.length > 0 && queue.length > 0) idle.shift()!.postMessage(queue.shift()!); };
      // Every slab and table in: the tables to every worker (before any chunk), the plan (the same as the
      // in-process run's), then the chunk tasks.
      const plan = () => {
        const tables: [number, ElevationTable[]][] = [];
        try {
          layouts.forEach((layout, li) => {
            const t = tablesBy[li].flat();
            for (const e of createSweeper(scenario, layout, t).engines) result.engines.push(e);
            tables.push([layout.satIndex, t]);
          });
        } catch (err) {
          fail(err);
          return;
        }
        const msg: ToWorker = { type: 'tables', tables };
        for (const w of executors) w.postMessage(msg);
        const plans = layouts.map((layout, li) => ({ layout, plan: planFromSlabs(scenario, layout, slabsBy[li]) }));
        if (o.collectSeries) selectSeries(plans, o.seriesMaxSections ?? SERIES_MAX_SECTIONS);
        for (const { layout, plan: p } of plans) {
          const merge = createSatelliteMerge(scenario, layout, result);
          merges.push(merge);
          totalS += p.totalS;
          for (let c = 0; c + 1 < p.chunkStarts.length; c++) {
            const items = p.items.slice(p.chunkStarts[c], p.chunkStarts[c + 1]);
            queue.push({ type: 'chunk', task: chunkTasks.length, satIndex: layout.satIndex, chunk: c, items });
            chunkTasks.push({ satIndex: layout.satIndex, chunk: c, items, merge });
          }
        }
        if (chunkTasks.length === 0) resolveAll();
      };
      // Merge and append rows strictly in task order.
      const drain = async () => {
        while (!failed && ready.has(merged)) {
          const { partial, stepsFile } = ready.get(merged)!;
          ready.delete(merged);
          chunkTasks[merged].merge.add(partial);
          if (writer && stepsFile) {
            await writer.appendChunkFile(stepsFile);
            rmSync(stepsFile, { force: true });
          }
          merged++;
        }
        if (!failed && merged === chunkTasks.length) resolveAll();
      };
      const onMessage = (w: Executor, m: FromWorker) => {
          if (failed) return;
          if (m.type === 'slab') {
            const t = slabTasks[m.task];
            slabsBy[t.li].push(m.events);
            result.sgp4Calls += m.sgp4Calls;
            idle.push(w);
            if (--slabsLeft === 0 && tablesLeft === 0) plan();
            pump();
          } else if (m.type === 'tables') {
            const t = tableTasks[m.task];
            tablesBy[t.li][t.station] = m.tables;
            idle.push(w);
            if (--tablesLeft === 0 && slabsLeft === 0) plan();
            pump();
          } else if (m.type === 'progress') {
            doneS += m.doneS;
            o.onProgress?.(doneS, totalS);
          } else if (m.type === 'done') {
            ready.set(m.task, { partial: m.partial, stepsFile: m.stepsFile });
            idle.push(w);
            pump();
            chain = chain.then(drain).catch(fail);
          } else {
            const err = m.name === 'InputError' ? new InputError(m.message) : new Error(m.message);
            if (m.stack && !(err instanceof InputError)) err.stack = m.stack;
            fail(err);
          }
      };
      // This thread's own runner: a task is started on the next turn, after the messages already queued.
      const local: Executor = {
        postMessage(m) {
          setImmediate(() => {
            if (failed) return;
            runLocal(m).catch((err: unknown) => fail(err));
          });
        },
      };
      const runLocal = createTaskRunner(init, (m) => onMessage(local, m));
      const executors: Executor[] = [local, ...pool];
      idle.push(local);
      for (const w of pool) {
        w.on('message', (m: FromWorker) => onMessage(w, m));
        w.on('error', fail);
        w.on('exit', (code) => { if (code !== 0) fail(new Error(`parallel run: a worker exited with code ${code}`)); });
        idle.push(w);
      }
      pump();
      if (slabTasks.length === 0 && tableTasks.length === 0) plan();
    });
    if (writer) await writer.close();
    const networkDaily: DailyRow[] = [];
    for (const m of merges) {
      const rows = m.finish();
      for (const d of rows.stationDaily) result.daily.push(d);
      for (const d of rows.networkDaily) networkDaily.push(d);
    }
    return finishPipelineResult(result, networkDaily);
  } finally {
    await Promise.all(pool.map((w) => { w.removeAllListeners('exit'); return w.terminate(); }));
    if (stepsDir) rmSync(stepsDir, { recursive: true, force: true });
  }
}
