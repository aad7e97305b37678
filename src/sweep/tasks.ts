/**
 * The tasks of a parallel run, as any of its threads runs them: build the
 * elevation tables of a station's links; search a slab of the window for
 * passes (all stations of a satellite on one orbit); take the tables built
 * elsewhere; sweep a chunk with the same code as the in-process run
 * (chunk.ts), writing its steps.csv rows to a file of its own, and hand back
 * the chunk's accumulator state (typed arrays transferable, not copied).
 */
import { join } from 'node:path';
import type { ElevationTable } from '../budget/atmosphere.js';
import { createLinkEngine } from '../budget/engine.js';
import { chunkStepsFiles, type ChunkStepsFile, type StepsFormat } from '../output/stepsSink.js';
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
  collectWhatIf?: boolean | 'summary';
  /** Folder for the chunks' steps rows; null when no steps file is written. */
  stepsDir: string | null;
  stepsFormat: StepsFormat;
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
  for (const a of [t.text, t.times, t.ints, t.caseNums, t.caseInts, t.weatherNums]) out.add(a.buffer as ArrayBuffer);
  if (p.whatIf) for (const a of [p.whatIf.parts, p.whatIf.elevation, p.whatIf.cn0]) out.add(a.buffer as ArrayBuffer);
  const ws = p.whatIfSummary;
  if (ws) for (const a of [ws.groups, ws.cellEl, ws.cellCn, ws.cellCount, ws.items, ws.tStar]) out.add(a.buffer as ArrayBuffer);
  if (p.profiles) { out.add(p.profiles.rows.buffer as ArrayBuffer); out.add(p.profiles.values.buffer as ArrayBuffer); }
  return [...out];
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
  let chunkFile: ((file: string) => ChunkStepsFile) | null = null;

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
    if (init.stepsDir && !chunkFile) chunkFile = await chunkStepsFiles(init.stepsFormat, scenario.weatherCases);
    const stepsFile = chunkFile && init.stepsDir ? join(init.stepsDir, `s${msg.satIndex}-c${msg.chunk}.${init.stepsFormat}`) : null;
    const target = chunkFile && stepsFile ? chunkFile(stepsFile) : null;
    let doneS = 0;
    let lastPost = 0;
    const partial = await sweeperFor(msg.satIndex).sweepChunk(msg.items, msg.chunk, {
      collectSeries: init.collectSeries,
      seriesMaxPoints: init.seriesMaxPoints,
      collectWhatIf: init.collectWhatIf,
      onWindow: target ? (w) => target.window(w) : undefined,
      onPassDone: (d) => {
        doneS += d;
        const now = Date.now();
        if (now - lastPost > 100) { post({ type: 'progress', doneS }); doneS = 0; lastPost = now; }
      },
    });
    target?.close();
    if (doneS > 0) post({ type: 'progress', doneS });
    post({ type: 'done', task: msg.task, partial, stepsFile }, transferables(partial));
  };
}

