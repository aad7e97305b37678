/**
 * The pipeline on worker threads. The main thread finds every satellite's
 * passes and cuts its sweep into the pipeline's fixed chunks (cuts where no
 * station sees the satellite: no pass or network contact crosses one); the
 * workers sweep chunks as they become free, each writing its steps.csv rows
 * to a file of its own; the main thread merges the chunks' accumulators and
 * appends their rows to steps.csv strictly in chunk order, which is the order
 * of the in-process sweep. So every output is byte-identical to the
 * in-process run (`workers` ≤ 1), which merges the same chunks the same way.
 */
import { createReadStream, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Writable } from 'node:stream';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { LinkEngine } from '../budget/engine.js';
import {
  createSatelliteMerge, createSweeper, emptyPipelineResult, finishPipelineResult, planSatellite, runPipeline,
  satelliteLayout, type ChunkPartial, type PipelineResult, type PlannedPass, type SatelliteMerge,
} from '../analysis/pipeline.js';
import type { DailyRow } from '../analysis/types.js';
import { InputError } from '../errors.js';
import type { ResolvedScenario } from '../scenario/types.js';
import type { FromWorker, ToWorker, WorkerInit } from './workerThread.js';
import { ChunkedTextWriter, createStepsCsvFormatter } from './workerStepsCsv.js';

export interface ParallelPipelineOptions {
  scenario: ResolvedScenario;
  /** Worker threads; ≤ 1 runs in this thread (default 1). */
  workers?: number;
  /** steps.csv stream (header and rows written, then ended); null or absent: no steps. */
  stepsOut?: Writable | null;
  collectSeries?: boolean;
  seriesMaxPoints?: number;
  maskFloorDeg?: number;
  /** Seconds of pass time done and the total (all satellites). */
  onProgress?: (doneS: number, totalS: number) => void;
  /** The worker script (default: workerThread.js beside this file, else dist/jobs/). */
  workerScript?: string;
}

/** Check a --workers value: an integer from 1 to 64. */
export function checkWorkers(value: unknown, where = '--workers'): number {
  const n = typeof value === 'string' && /^\s*\d+\s*$/.test(value) ? Number(value) : value;
  if (typeof n !== 'number' || !Number.isInteger(n) || n < 1 || n > 64) {
    throw new InputError(`${where}: ${JSON.stringify(value)} is not a worker count (allowed an integer from 1 to 64)`);
  }
  return n;
}

function defaultWorkerScript(): string {
  const here = fileURLToPath(new URL('./workerThread.js', import.meta.url));
  if (existsSync(here)) return here;
  // Running from the TypeScript sources (tests): the built worker.
  const built = fileURLToPath(new URL('../../dist/jobs/workerThread.js', import.meta.url));
  if (existsSync(built)) return built;
  throw new Error(`parallel run: no worker script at ${here} or ${built} (run npm run build)`);
}

/** Engines are built only in the workers; `engines` builds the main thread's copy when first read. */
function lazyEngines(result: PipelineResult, scenario: ResolvedScenario, maskFloorDeg: number | undefined): void {
  let cache: LinkEngine[] | null = null;
  Object.defineProperty(result, 'engines', {
    enumerable: true,
    get() {
      if (!cache) {
        cache = [];
        scenario.satellites.forEach((_, i) => {
          const layout = satelliteLayout(scenario, i, maskFloorDeg);
          if (layout.stations.length > 0) cache!.push(...createSweeper(scenario, layout).engines);
        });
      }
      return cache;
    },
  });
}

export async function runPipelineParallel(o: ParallelPipelineOptions): Promise<PipelineResult> {
  const { scenario } = o;
  const workers = o.workers ?? 1;
  const fmt = o.stepsOut ? createStepsCsvFormatter(scenario.weatherCases) : null;
  const writer = o.stepsOut && fmt ? new ChunkedTextWriter(o.stepsOut, () => fmt.ascii) : null;
  if (writer && fmt) await writer.write(fmt.header);

  if (workers <= 1) {
    const result = await runPipeline({
      scenario, collectSeries: o.collectSeries, seriesMaxPoints: o.seriesMaxPoints, maskFloorDeg: o.maskFloorDeg, onProgress: o.onProgress,
      onStep: writer && fmt ? (e) => writer.write(fmt.row(e)) : undefined,
    });
    if (writer) await writer.close();
    return result;
  }

  // Plan every satellite here (passes, chunks); the workers build engines meanwhile.
  const stepsDir = writer ? mkdtempSync(join(tmpdir(), 'passbudget-steps-')) : null;
  const init: WorkerInit = { scenario, maskFloorDeg: o.maskFloorDeg, collectSeries: o.collectSeries === true, seriesMaxPoints: o.seriesMaxPoints, stepsDir };
  const script = o.workerScript ?? defaultWorkerScript();
  const pool: Worker[] = [];
  try {
    for (let w = 0; w < workers; w++) pool.push(new Worker(script, { workerData: init }));
    const result = emptyPipelineResult();
    lazyEngines(result, scenario, o.maskFloorDeg);
    const tasks: { satIndex: number; chunk: number; items: PlannedPass[]; merge: SatelliteMerge }[] = [];
    const merges: SatelliteMerge[] = [];
    let totalS = 0;
    for (let satIndex = 0; satIndex < scenario.satellites.length; satIndex++) {
      const layout = satelliteLayout(scenario, satIndex, o.maskFloorDeg);
      if (layout.stations.length === 0) continue;
      const merge = createSatelliteMerge(scenario, layout, result);
      merges.push(merge);
      const plan = planSatellite(scenario, layout);
      for (const ps of plan.passesByStation) for (const p of ps) result.passes.push(p);
      totalS += plan.totalS;
      for (let c = 0; c + 1 < plan.chunkStarts.length; c++) {
        tasks.push({ satIndex, chunk: c, items: plan.items.slice(plan.chunkStarts[c], plan.chunkStarts[c + 1]), merge });
      }
    }

    await new Promise<void>((resolveAll, rejectAll) => {
      let failed = false;
      let next = 0;
      let merged = 0;
      let doneS = 0;
      const ready = new Map<number, { partial: ChunkPartial; stepsFile: string | null }>();
      let chain: Promise<void> = Promise.resolve();
      const fail = (err: unknown) => { if (!failed) { failed = true; rejectAll(err); } };
      const dispatch = (w: Worker) => {
        if (failed || next >= tasks.length) return;
        const t = tasks[next];
        const msg: ToWorker = { type: 'chunk', task: next, satIndex: t.satIndex, chunk: t.chunk, items: t.items };
        next++;
        w.postMessage(msg);
      };
      // Merge and append rows strictly in task order.
      const drain = async () => {
        while (!failed && ready.has(merged)) {
          const { partial, stepsFile } = ready.get(merged)!;
          ready.delete(merged);
          tasks[merged].merge.add(partial);
          if (writer && stepsFile) {
            for await (const piece of createReadStream(stepsFile, { highWaterMark: 1 << 20 })) await writer.writeBuffer(piece as Buffer);
            rmSync(stepsFile, { force: true });
          }
          merged++;
        }
        if (!failed && merged === tasks.length) resolveAll();
      };
      if (tasks.length === 0) { resolveAll(); return; }
      for (const w of pool) {
        w.on('message', (m: FromWorker) => {
          if (m.type === 'progress') {
            doneS += m.doneS;
            o.onProgress?.(doneS, totalS);
          } else if (m.type === 'done') {
            ready.set(m.task, { partial: m.partial, stepsFile: m.stepsFile });
            dispatch(w);
            chain = chain.then(drain).catch(fail);
          } else {
            const err = m.name === 'InputError' ? new InputError(m.message) : new Error(m.message);
            if (m.stack && !(err instanceof InputError)) err.stack = m.stack;
            fail(err);
          }
        });
        w.on('error', fail);
        w.on('exit', (code) => { if (code !== 0) fail(new Error(`parallel run: a worker exited with code ${code}`)); });
        dispatch(w);
      }
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
