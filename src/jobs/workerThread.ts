/**
 * Worker thread of a parallel run (see workerRun.ts). First it finds the
 * passes of the stations it is sent (the plan's expensive part); it receives
 * the engines' elevation tables built once by the main thread (so it builds
 * none); then it sweeps the chunks it is sent with the same code as the
 * in-process run (analysis/pipeline.ts), writes each chunk's steps.csv rows
 * to its own file and posts the chunk's accumulator state back (typed arrays
 * transferred, not copied).
 */
import { closeSync, openSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { parentPort, workerData } from 'node:worker_threads';
import {
  createSweeper, findStationPasses, satelliteLayout, type ChunkPartial, type PlannedPass, type Sweeper,
} from '../analysis/pipeline.js';
import type { ElevationTable } from '../budget/atmosphere.js';
import type { Pass } from '../passes/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { createStepsCsvFormatter } from './workerStepsCsv.js';

export interface WorkerInit {
  scenario: ResolvedScenario;
  maskFloorDeg?: number;
  collectSeries: boolean;
  seriesMaxPoints?: number;
  /** Folder for the chunks' steps rows; null when steps.csv is not written. */
  stepsDir: string | null;
}

export type ToWorker =
  | { type: 'passes'; task: number; satIndex: number; station: number }
  /** Per satellite index: its engines' tables (layout station × link order); sent before any chunk. */
  | { type: 'tables'; tables: [number, ElevationTable[]][] }
  | { type: 'chunk'; task: number; satIndex: number; chunk: number; items: PlannedPass[] };
export type FromWorker =
  | { type: 'passes'; task: number; passes: Pass[] }
  | { type: 'progress'; doneS: number }
  | { type: 'done'; task: number; partial: ChunkPartial; stepsFile: string | null }
  | { type: 'error'; name: string; message: string; stack?: string };

function transferables(p: ChunkPartial): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>();
  const add = (a: Float64Array) => { out.add(a.buffer as ArrayBuffer); };
  for (const d of p.daily) { add(d.passes); add(d.usablePasses); add(d.usableS); add(d.fixedBits); add(d.adaptiveBits); add(d.runs); }
  for (const m of p.mask) { add(m.timeS); add(m.usableS); add(m.volumeBits); }
  for (const r of p.rate) if (r) add(r.timeS);
  for (const e of p.envelope) add(e);
  return [...out];
}

function main(): void {
  const port = parentPort;
  if (!port) throw new Error('workerThread.ts runs as a worker thread only');
  const init = workerData as WorkerInit;
  const { scenario } = init;
  const post = (m: FromWorker, transfer: ArrayBuffer[] = []) => port.postMessage(m, transfer);
  const fail = (err: unknown) => {
    const e = err instanceof Error ? err : new Error(String(err));
    post({ type: 'error', name: e.name, message: e.message, stack: e.stack });
  };
  try {
    const sweepers = new Map<number, Sweeper>();
    const tables = new Map<number, ElevationTable[]>();
    const sweeperFor = (satIndex: number) => {
      let s = sweepers.get(satIndex);
      if (!s) { s = createSweeper(scenario, satelliteLayout(scenario, satIndex, init.maskFloorDeg), tables.get(satIndex)); sweepers.set(satIndex, s); }
      return s;
    };
    const fmt = init.stepsDir ? createStepsCsvFormatter(scenario.weatherCases) : null;

    port.on('message', (msg: ToWorker) => {
      if (msg.type === 'tables') {
        for (const [satIndex, t] of msg.tables) tables.set(satIndex, t);
        return;
      }
      if (msg.type === 'passes') {
        try {
          const passes = findStationPasses(scenario, satelliteLayout(scenario, msg.satIndex, init.maskFloorDeg), msg.station);
          post({ type: 'passes', task: msg.task, passes });
        } catch (err) {
          fail(err);
        }
        return;
      }
      void (async () => {
        try {
          let fd = -1;
          const buf = Buffer.allocUnsafe(1 << 20);
          let off = 0;
          let stepsFile: string | null = null;
          if (fmt && init.stepsDir) {
            stepsFile = join(init.stepsDir, `s${msg.satIndex}-c${msg.chunk}.csv`);
            fd = openSync(stepsFile, 'w');
          }
          let doneS = 0;
          let lastPost = 0;
          const partial = await sweeperFor(msg.satIndex).sweepChunk(msg.items, msg.chunk, {
            collectSeries: init.collectSeries,
            seriesMaxPoints: init.seriesMaxPoints,
            onStep: fmt ? (e) => {
              const need = fmt.rowBytesBound(e);
              if (off + need > buf.length) { writeSync(fd, buf, 0, off); off = 0; }
              if (need > buf.length) { writeSync(fd, Buffer.from(fmt.row(e), 'utf8')); return; }
              off = fmt.rowInto(e, buf, off);
            } : undefined,
            onPassDone: (d) => {
              doneS += d;
              const now = Date.now();
              if (now - lastPost > 100) { post({ type: 'progress', doneS }); doneS = 0; lastPost = now; }
            },
          });
          if (fd >= 0) {
            if (off > 0) writeSync(fd, buf, 0, off);
            closeSync(fd);
          }
          if (doneS > 0) post({ type: 'progress', doneS });
          post({ type: 'done', task: msg.task, partial, stepsFile }, transferables(partial));
        } catch (err) {
          fail(err);
        }
      })();
    });
  } catch (err) {
    fail(err);
  }
}

main();
