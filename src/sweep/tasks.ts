/**
 * The tasks of a parallel run, as any of its threads runs them: build the
 * elevation tables of a station's links; search a slab of the window for
 * passes (all stations of a satellite on one orbit); take the tables built
 * elsewhere; sweep a chunk with the same code as the in-process run
 * (chunk.ts), writing its steps.csv rows to a file of its own, and hand back
 * the chunk's accumulator state (typed arrays transferable, not copied).
 */
import { closeSync, openSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import type { ElevationTable } from '../budget/atmosphere.js';
import { createLinkEngine } from '../budget/engine.js';
import { createStepsCsvFormatter, writeWindowRows, type RowTarget } from '../output/stepsCsv.js';
import { createOrbit } from '../passes/find.js';
import type { OrbitSource } from '../orbit/interpolated.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { createSweeper, type Sweeper } from './chunk.js';
import { satelliteLayout } from './layout.js';
import { createPassSearcher, type PassSearcher, type PlannedPass, type SlabEvents } from './plan.js';
import type { ChunkPartial } from './types.js';

export interface WorkerInit {
  scenario: ResolvedScenario;
  maskFloorDeg?: number;
  collectSeries: boolean;
  seriesMaxPoints?: number;
  /** Folder for the chunks' steps rows; null when steps.csv is not written. */
  stepsDir: string | null;
}

export type ToWorker =
  | { type: 'slab'; task: number; satIndex: number; slab: number }
  /** Build the elevation tables of one layout station's links. */
  | { type: 'buildTables'; task: number; satIndex: number; station: number }
  /** Per satellite index: its engines' tables (layout station × link order); sent before any chunk. */
  | { type: 'tables'; tables: [number, ElevationTable[]][] }
  | { type: 'chunk'; task: number; satIndex: number; chunk: number; items: PlannedPass[] };
export type FromWorker =
  | { type: 'slab'; task: number; events: SlabEvents; sgp4Calls: number }
  | { type: 'tables'; task: number; tables: ElevationTable[] }
  | { type: 'progress'; doneS: number }
  | { type: 'done'; task: number; partial: ChunkPartial; stepsFile: string | null }
  | { type: 'error'; name: string; message: string; stack?: string };

function transferables(p: ChunkPartial): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>();
  const add = (a: Float64Array) => { out.add(a.buffer as ArrayBuffer); };
  for (const d of p.daily) { add(d.passes); add(d.usablePasses); add(d.usableS); add(d.fixedBits); add(d.adaptiveBits); add(d.runs); }
  for (const m of p.mask) { add(m.timeS); add(m.usableS); add(m.volumeBits); add(m.keyholeS); }
  for (const r of p.rate) if (r) add(r.timeS);
  for (const e of p.envelope) add(e);
  const t = p.passLinks;
  for (const a of [t.text, t.times, t.ints, t.caseNums, t.caseInts]) out.add(a.buffer as ArrayBuffer);
  if (p.profiles) { out.add(p.profiles.rows.buffer as ArrayBuffer); out.add(p.profiles.values.buffer as ArrayBuffer); }
  return [...out];
}

/** steps rows of one chunk into a file, through a 1 MB buffer. */
function fileTarget(fd: number): RowTarget {
  const t = {
    buffer: new Uint8Array(1 << 20),
    filled: 0,
    capacity: 1 << 20,
    flush() { if (t.filled > 0) writeSync(fd, t.buffer, 0, t.filled); t.filled = 0; },
    writeRaw(bytes: Uint8Array) { t.flush(); writeSync(fd, bytes); },
  };
  return t;
}

/**
 * What a thread of a parallel run does with the tasks it is sent (the same in
 * a worker thread and in the main thread, which takes tasks too): results
 * are handed to `post` with the buffers that may be transferred.
 */
export function createTaskRunner(init: WorkerInit, post: (m: FromWorker, transfer?: ArrayBuffer[]) => void): (msg: ToWorker) => Promise<void> {
  const { scenario } = init;
  const orbits = new Map<number, OrbitSource>();
  const searchers = new Map<number, PassSearcher>();
  const sweepers = new Map<number, Sweeper>();
  const tables = new Map<number, ElevationTable[]>();
  const layoutOf = (satIndex: number) => satelliteLayout(scenario, satIndex, init.maskFloorDeg);
  const orbitFor = (satIndex: number) => {
    let o = orbits.get(satIndex);
    if (!o) { o = createOrbit(scenario.satellites[satIndex].elements, scenario.window, scenario.exactOrbit); orbits.set(satIndex, o); }
    return o;
  };
  const searcherFor = (satIndex: number) => {
    let s = searchers.get(satIndex);
    if (!s) { s = createPassSearcher(scenario, layoutOf(satIndex), orbitFor(satIndex)); searchers.set(satIndex, s); }
    return s;
  };
  const sweeperFor = (satIndex: number) => {
    let s = sweepers.get(satIndex);
    if (!s) { s = createSweeper(scenario, layoutOf(satIndex), tables.get(satIndex), orbitFor(satIndex)); sweepers.set(satIndex, s); }
    return s;
  };
  const fmt = init.stepsDir ? createStepsCsvFormatter(scenario.weatherCases) : null;

  return async (msg) => {
    if (msg.type === 'tables') {
      for (const [satIndex, t] of msg.tables) tables.set(satIndex, t);
      return;
    }
    if (msg.type === 'buildTables') {
      const st = layoutOf(msg.satIndex).stations[msg.station];
      const built = st.links.map((link) => createLinkEngine({ link, climate: st.entry.climate, weatherCases: scenario.weatherCases }).table);
      const buffers = new Set<ArrayBuffer>();
      for (const t of built) { buffers.add(t.elevationsDeg.buffer as ArrayBuffer); buffers.add(t.values.buffer as ArrayBuffer); }
      post({ type: 'tables', task: msg.task, tables: built }, [...buffers]);
      return;
    }
    if (msg.type === 'slab') {
      const orbit = orbitFor(msg.satIndex);
      const before = orbit.sgp4Calls;
      const events = searcherFor(msg.satIndex).searchSlab(msg.slab);
      post({ type: 'slab', task: msg.task, events, sgp4Calls: orbit.sgp4Calls - before });
      return;
    }
    let fd = -1;
    let stepsFile: string | null = null;
    if (fmt && init.stepsDir) {
      stepsFile = join(init.stepsDir, `s${msg.satIndex}-c${msg.chunk}.csv`);
      fd = openSync(stepsFile, 'w');
    }
    const target = fd >= 0 ? fileTarget(fd) : null;
    let doneS = 0;
    let lastPost = 0;
    const partial = await sweeperFor(msg.satIndex).sweepChunk(msg.items, msg.chunk, {
      collectSeries: init.collectSeries,
      seriesMaxPoints: init.seriesMaxPoints,
      onWindow: fmt && target ? (w) => writeWindowRows(fmt, w, target) : undefined,
      onPassDone: (d) => {
        doneS += d;
        const now = Date.now();
        if (now - lastPost > 100) { post({ type: 'progress', doneS }); doneS = 0; lastPost = now; }
      },
    });
    if (target) { target.flush(); closeSync(fd); }
    if (doneS > 0) post({ type: 'progress', doneS });
    post({ type: 'done', task: msg.task, partial, stepsFile }, transferables(partial));
  };
}

