/**
 * steps.parquet: the steps table as Apache Parquet, the same columns in the
 * same order as steps.csv (stepsColumns.ts), typed and compressed.
 *
 * Types (the README lists them):
 *   - time_utc: INT64 TIMESTAMP(MILLIS, adjusted to UTC), DELTA_BINARY_PACKED;
 *   - pass_id, satellite, station, link, mode_<case>: UTF-8 strings, dictionary
 *     encoded (mode is null where steps.csv leaves it empty);
 *   - mount_limited, usable_<case>: BOOLEAN;
 *   - numbers: the value steps.csv prints (rounded to its decimals), as FLOAT
 *     (float32) where that decimal survives the narrowing (see F32_LIMIT) and
 *     as DOUBLE otherwise (range, Doppler shift, temperatures, bit rates);
 *     NaN where steps.csv prints an empty cell (a non-finite value), so the
 *     columns are REQUIRED (no definition levels to write or read);
 *     PLAIN encoded (on W1, 52.7 MB against 59.2 MB with BYTE_STREAM_SPLIT: zstd does better on
 *     the whole values of these slowly varying, rounded columns, and every reader knows PLAIN);
 *     no min/max statistics (time and the satellite, station and link names have them).
 * Every column chunk is zstd-compressed (level ZSTD_LEVEL); row groups hold
 * ROW_GROUP_ROWS rows, written as they fill, so memory does not grow with the
 * window. The writer is hyparquet-writer (pure JavaScript); zstd is
 * @bokuweb/zstd-wasm (WebAssembly in the package, no native build).
 *
 * Workers: a worker thread copies its chunk's rows into blocks of the same
 * typed columns and writes them to a file (`ChunkBlockFile`); the main thread
 * appends those blocks, in chunk order, to the one row-group builder. The
 * values, their order and the row-group cuts are those of the in-thread run,
 * so the file is byte-identical for any number of workers.
 */
import { once } from 'node:events';
import { closeSync, openSync, readSync, writeSync } from 'node:fs';
import type { Writable } from 'node:stream';
import { compress as zstdCompress, init as zstdInit } from '@bokuweb/zstd-wasm';
import { ByteWriter, ParquetWriter } from 'hyparquet-writer';
import type { WeatherCase } from '../budget/types.js';
import type { StepPart, StepWindow } from '../sweep/window.js';
import { cellNumber, fmt } from './csv.js';
import { BOOLEAN_FIELDS, CASE_FIELDS, CASE_SOURCE, decimalsFor, STEP_FIELDS, STEP_SOURCE, stepColumns } from './stepsColumns.js';

/**
 * Rows per row group: 262 144 (about 60 MB of typed columns held before a group is written). On the demo week
 * the file was 18.7 % of steps.csv against 20.8 % with 65 536-row groups (zstd sees longer runs; measured with
 * BYTE_STREAM_SPLIT floats, now PLAIN: 16.5 %); memory stays bounded.
 */
export const ROW_GROUP_ROWS = 262_144;
/** zstd level of every column chunk (3: zstd's default, a good size for its speed). */
export const ZSTD_LEVEL = 3;
/** Rows per block of a worker's chunk file. */
const FILE_BLOCK_ROWS = 16_384;

export type ParquetKind = 'text' | 'time' | 'f32' | 'f64' | 'bool';

export interface ParquetColumnSpec {
  name: string;
  kind: ParquetKind;
  /** Decimals steps.csv prints (numbers). */
  decimals: number;
  /** May hold nulls (mode where no mode was taken). */
  nullable: boolean;
}

/**
 * |v| below which float32 keeps a value printed with d decimals (index d =
 * 0…6): there the float32 spacing is at most ½·10^-d (2^-1 for d = 0, 2^-8
 * for d = 2, 2^-11 for d = 3, 2^-21 for d = 6), so the float32 nearest the
 * printed decimal lies within ¼·10^-d of it and prints back as the same decimal.
 */
export const F32_LIMIT = [4_194_304, 524_288, 65_536, 8_192, 512, 64, 8];

/** Columns kept as DOUBLE: values that can pass F32_LIMIT (ranges to GEO, Doppler shifts, temperatures with the Sun, bit rates in b/s and Mb/s). */
function isDouble(field: string): boolean {
  return field.endsWith('_km') || field === 'doppler_hz' || field.endsWith('_k') || field.endsWith('_bps') || field.endsWith('_mbps');
}

function fieldSpec(field: string, name: string): ParquetColumnSpec {
  if (BOOLEAN_FIELDS.has(field)) return { name, kind: 'bool', decimals: 0, nullable: false };
  if (field === 'mode') return { name, kind: 'text', decimals: 0, nullable: true };
  return { name, kind: isDouble(field) ? 'f64' : 'f32', decimals: decimalsFor(field), nullable: false };
}

/** steps.parquet's columns, in steps.csv's order (stepColumns), with their Parquet kinds. */
export function stepsParquetColumns(cases: readonly WeatherCase[]): ParquetColumnSpec[] {
  const names = stepColumns(cases);
  const specs: ParquetColumnSpec[] = [
    { name: 'pass_id', kind: 'text', decimals: 0, nullable: false },
    { name: 'time_utc', kind: 'time', decimals: 0, nullable: false },
    { name: 'satellite', kind: 'text', decimals: 0, nullable: false },
    { name: 'station', kind: 'text', decimals: 0, nullable: false },
    { name: 'link', kind: 'text', decimals: 0, nullable: false },
  ];
  for (const f of STEP_FIELDS) specs.push(fieldSpec(f, f));
  for (const c of cases) for (const f of CASE_FIELDS) specs.push(fieldSpec(f, `${f}_${c.name}`));
  if (specs.length !== names.length || specs.some((s, i) => s.name !== names[i])) throw new Error('steps.parquet: columns differ from steps.csv');
  return specs;
}

const POW10 = [1, 10, 100, 1000];
/**
 * The number steps.csv prints for v with d decimals (fmt: toFixed, '' for
 * non-finite, no "-0"), as the double nearest that decimal; NaN for ''.
 * The integer of the decimal is found as stepsCsv's putFixed finds it (the
 * same fast path, toFixed otherwise), so the two files agree digit for digit.
 */
export function printedValue(v: number, d: number): number {
  if (d <= 3) {
    const neg = v < 0;
    const x = (neg ? -v : v) * POW10[d];
    if (x < 1e9) {
      const fl = Math.floor(x);
      const fr = x - fl;
      if (fr < 0.499999 || fr > 0.500001) {
        const n = fr < 0.5 ? fl : fl + 1;
        if (n === 0) return 0;
        const r = n / POW10[d];
        return neg ? -r : r;
      }
    }
  }
  return cellNumber(fmt(v, d));
}

// ---------------------------------------------------------------------------
// Blocks: rows of the steps table in typed columns.

type ColumnArray = Int32Array | Float64Array | Float32Array | Uint8Array;

function allocate(kind: ParquetKind, n: number): ColumnArray {
  switch (kind) {
    case 'text': return new Int32Array(n);
    case 'time': return new Float64Array(n);
    case 'f32': return new Float32Array(n);
    case 'f64': return new Float64Array(n);
    case 'bool': return new Uint8Array(n);
  }
}

/** A column's source in a window part: per-step array or per-link constant, and for mode the usable flags and names. */
interface Source { array: ArrayLike<number> | null; constant: number }

function sourceIn(p: StepPart, expr: string, caseIndex: number): Source {
  const m = /^([sck])\.(\w+)(\[i\])?$/.exec(expr);
  if (!m) throw new Error(`steps.parquet: cannot read source ${expr}`);
  const owner = (m[1] === 's' ? p.stn : m[1] === 'c' ? p.cols : p.cols.cases[caseIndex]) as unknown as Record<string, unknown>;
  const v = owner[m[2]];
  return m[3] ? { array: v as ArrayLike<number>, constant: NaN } : { array: null, constant: v as number };
}

/** Text values of a column, interned: index ↔ string. */
class Dictionary {
  readonly values: string[] = [];
  private readonly index = new Map<string, number>();
  intern(s: string): number {
    let i = this.index.get(s);
    if (i === undefined) { i = this.values.length; this.values.push(s); this.index.set(s, i); }
    return i;
  }
}

/**
 * Rows of the steps table in typed columns (text as dictionary indices, −1
 * for null; times in ms; numbers already rounded as steps.csv prints them),
 * growing as needed; `drain(rows)` hands the first rows on.
 */
export class StepsBlock {
  n = 0;
  capacity: number;
  cols: ColumnArray[];
  readonly dicts: Dictionary[];
  private pos = new Int32Array(256);
  private readonly plans = new WeakMap<object, { stn: object; passId: string; modes: readonly string[]; arrays: unknown[]; plan: PartSource[] }>();

  constructor(readonly specs: readonly ParquetColumnSpec[], capacity: number) {
    this.capacity = capacity;
    this.cols = specs.map((s) => allocate(s.kind, capacity));
    this.dicts = specs.map(() => new Dictionary());
  }

  ensure(rows: number): void {
    if (this.n + rows <= this.capacity) return;
    let c = this.capacity;
    while (c < this.n + rows) c *= 2;
    this.cols = this.cols.map((a, j) => { const b = allocate(this.specs[j].kind, c); b.set(a.subarray(0, this.n) as never); return b; });
    this.capacity = c;
  }

  /** Drop the first `rows` rows (moved on), keeping the rest at the start. */
  shift(rows: number): void {
    for (const a of this.cols) a.copyWithin(0, rows, this.n);
    this.n -= rows;
  }

  /** A sweep window's rows, in steps.csv order (grid time, then part), appended column by column. */
  appendWindow(w: StepWindow, cases: number): void {
    const parts = w.parts;
    const first: number[] = [];
    const counts: number[] = [];
    let rows = 0;
    for (const p of parts) {
      const i0 = Math.max(0, w.k0 - p.k0);
      const m = Math.max(0, Math.min(p.n, w.k1 - p.k0) - i0);
      first.push(i0); counts.push(m); rows += m;
    }
    if (rows === 0) return;
    this.ensure(rows);
    // Row of each (part, entry): rows go grid time by grid time, parts in order within a time.
    if (this.pos.length < rows) this.pos = new Int32Array(rows);
    const pos = this.pos;
    const fill: number[] = [];
    for (let j = 0, o = 0; j < parts.length; j++) { fill.push(o); o += counts[j]; }
    const offsets = fill.slice();
    let r = this.n;
    for (let k = w.k0; k < w.k1; k++) {
      for (let j = 0; j < parts.length; j++) {
        const i = k - parts[j].k0;
        if (i < 0 || i >= parts[j].n) continue;
        pos[fill[j]++] = r++;
      }
    }
    for (let j = 0; j < parts.length; j++) {
      const m = counts[j];
      if (m === 0) continue;
      const p = parts[j];
      const i0 = first[j];
      const base = offsets[j];
      if (p.cols.cases.length !== cases) throw new Error(`steps.parquet: step has ${p.cols.cases.length} weather cases, expected ${cases}`);
      const plan = this.planFor(p);
      for (let c = 0; c < plan.length; c++) {
        const src = plan[c];
        const out = this.cols[c];
        switch (src.kind) {
          case 'text': fillConstant(out as Int32Array, pos, base, m, this.dicts[c].intern(src.text)); break;
          case 'time': fillTimes(out as Float64Array, pos, base, m, w.startS + (p.k0 + i0) * w.stepS, w.stepS); break;
          case 'bool': fillBools(out as Uint8Array, pos, base, m, src.array as Uint8Array, i0); break;
          case 'mode': fillModes(out as Int32Array, pos, base, m, src.array as Int16Array, src.usable, i0, p.modeNames.map((t) => this.dicts[c].intern(t))); break;
          case 'constant': {
            const v = printedValue(src.constant, src.decimals);
            checkF32(this.specs[c], v);
            if (out instanceof Float32Array) fillConstant32(out, pos, base, m, v); else fillConstant64(out as Float64Array, pos, base, m, v);
            break;
          }
          case 'f32': if (!fillF32(out as Float32Array, pos, base, m, src.array as Float64Array, i0, src.decimals)) throw f32Error(this.specs[c], src.array as Float64Array, i0, m); break;
          case 'f64': fillF64(out as Float64Array, pos, base, m, src.array as Float64Array, i0, src.decimals); break;
        }
      }
    }
    this.n += rows;
  }

  /** Where each column of a part's rows comes from, resolved once per link's columns (the sweep reuses them window after window). */
  private planFor(p: StepPart): PartSource[] {
    const cached = this.plans.get(p.cols);
    if (cached && cached.stn === p.stn && cached.passId === p.passId && cached.modes === p.modeNames
      && cached.arrays[0] === p.stn.rangeKm && cached.arrays[1] === p.cols.eirpDBW && cached.arrays[2] === p.cols.cases[0]?.marginDB) return cached.plan;
    const plan: PartSource[] = [];
    const text = (t: string): PartSource => ({ kind: 'text', text: t, array: null, usable: null, constant: NaN, decimals: 0 });
    plan.push(text(p.passId), { kind: 'time', text: '', array: null, usable: null, constant: NaN, decimals: 0 }, text(p.satellite), text(p.station), text(p.link.name));
    const field = (f: string, expr: string | undefined, caseIndex: number) => {
      if (expr === undefined) throw new Error(`steps.parquet: no source for column ${f}`);
      const spec = this.specs[plan.length];
      const src = sourceIn(p, expr, caseIndex);
      if (spec.kind === 'bool') plan.push({ kind: 'bool', text: '', array: src.array, usable: null, constant: NaN, decimals: 0 });
      else if (f === 'mode') plan.push({ kind: 'mode', text: '', array: src.array, usable: p.cols.cases[caseIndex].usable, constant: NaN, decimals: 0 });
      else if (src.array === null) plan.push({ kind: 'constant', text: '', array: null, usable: null, constant: src.constant, decimals: spec.decimals });
      else plan.push({ kind: spec.kind === 'f32' ? 'f32' : 'f64', text: '', array: src.array, usable: null, constant: NaN, decimals: spec.decimals });
    };
    for (const f of STEP_FIELDS) field(f, STEP_SOURCE[f], -1);
    for (let k = 0; k < p.cols.cases.length; k++) for (const f of CASE_FIELDS) field(f, CASE_SOURCE[f], k);
    this.plans.set(p.cols, { stn: p.stn, passId: p.passId, modes: p.modeNames, arrays: [p.stn.rangeKm, p.cols.eirpDBW, p.cols.cases[0]?.marginDB], plan });
    return plan;
  }

  /** Rows [0, src.n) of another block (its dictionaries mapped onto this block's). */
  appendBlock(src: { n: number; cols: readonly ColumnArray[]; dicts: readonly (readonly string[])[] }): void {
    const m = src.n;
    this.ensure(m);
    for (let c = 0; c < this.specs.length; c++) {
      const from = src.cols[c].subarray(0, m);
      const to = this.cols[c];
      if (this.specs[c].kind === 'text') {
        const map = src.dicts[c].map((s) => this.dicts[c].intern(s));
        const a = from as Int32Array;
        const b = to as Int32Array;
        for (let q = 0; q < m; q++) { const v = a[q]; b[this.n + q] = v < 0 ? -1 : map[v]; }
      } else to.set(from as never, this.n);
    }
    this.n += m;
  }
}

/** A column's source in a part: a name, the time grid, flags, a mode index with its usable flags, a constant or a per-step array. */
interface PartSource {
  kind: 'text' | 'time' | 'bool' | 'mode' | 'constant' | 'f32' | 'f64';
  text: string;
  array: ArrayLike<number> | null;
  usable: Uint8Array | null;
  constant: number;
  decimals: number;
}

// Column copies, one per kind so each loop sees one array type.
function fillConstant(out: Int32Array, pos: Int32Array, base: number, m: number, v: number): void {
  for (let q = 0; q < m; q++) out[pos[base + q]] = v;
}
function fillConstant32(out: Float32Array, pos: Int32Array, base: number, m: number, v: number): void {
  for (let q = 0; q < m; q++) out[pos[base + q]] = v;
}
function fillConstant64(out: Float64Array, pos: Int32Array, base: number, m: number, v: number): void {
  for (let q = 0; q < m; q++) out[pos[base + q]] = v;
}
function fillTimes(out: Float64Array, pos: Int32Array, base: number, m: number, t0: number, stepS: number): void {
  for (let q = 0; q < m; q++) out[pos[base + q]] = Math.round((t0 + q * stepS) * 1000);
}
function fillBools(out: Uint8Array, pos: Int32Array, base: number, m: number, a: Uint8Array, i0: number): void {
  for (let q = 0; q < m; q++) out[pos[base + q]] = a[i0 + q] === 1 ? 1 : 0;
}
function fillModes(out: Int32Array, pos: Int32Array, base: number, m: number, a: Int16Array, usable: Uint8Array | null, i0: number, modes: number[]): void {
  for (let q = 0; q < m; q++) { const v = a[i0 + q]; out[pos[base + q]] = v >= 0 && usable![i0 + q] === 1 ? modes[v] : -1; }
}
/** False when a value is beyond F32_LIMIT (the caller names it). */
function fillF32(out: Float32Array, pos: Int32Array, base: number, m: number, a: Float64Array, i0: number, d: number): boolean {
  const limit = F32_LIMIT[d];
  let ok = true;
  for (let q = 0; q < m; q++) {
    const v = printedValue(a[i0 + q], d);
    if (v >= limit || v <= -limit) ok = false;
    out[pos[base + q]] = v;
  }
  return ok;
}
function fillF64(out: Float64Array, pos: Int32Array, base: number, m: number, a: Float64Array, i0: number, d: number): void {
  for (let q = 0; q < m; q++) out[pos[base + q]] = printedValue(a[i0 + q], d);
}
function f32Error(spec: ParquetColumnSpec, a: Float64Array, i0: number, m: number): Error {
  let worst = 0;
  for (let q = 0; q < m; q++) if (Math.abs(a[i0 + q]) > Math.abs(worst)) worst = a[i0 + q];
  return new Error(`steps.parquet: ${spec.name} = ${worst} is beyond float32's exact range for ${spec.decimals} decimals (|v| < ${F32_LIMIT[spec.decimals]})`);
}

function checkF32(spec: ParquetColumnSpec, v: number): void {
  if (spec.kind === 'f32' && Number.isFinite(v) && !(Math.abs(v) < F32_LIMIT[spec.decimals])) {
    throw new Error(`steps.parquet: ${spec.name} = ${v} is beyond float32's exact range for ${spec.decimals} decimals (|v| < ${F32_LIMIT[spec.decimals]})`);
  }
}

// ---------------------------------------------------------------------------
// Worker chunk files: blocks as bytes.

/** A worker's chunk of steps rows into a file of blocks (header JSON, then the columns' bytes). */
export class ChunkBlockFile {
  private readonly block: StepsBlock;
  constructor(private readonly fd: number, specs: readonly ParquetColumnSpec[], private readonly cases: number) {
    this.block = new StepsBlock(specs, FILE_BLOCK_ROWS);
  }

  window(w: StepWindow): void {
    this.block.appendWindow(w, this.cases);
    if (this.block.n >= FILE_BLOCK_ROWS) this.flush();
  }

  flush(): void {
    const b = this.block;
    if (b.n === 0) return;
    const header = Buffer.from(JSON.stringify({ n: b.n, dicts: b.specs.map((s, c) => (s.kind === 'text' ? b.dicts[c].values : [])) }), 'utf8');
    const len = Buffer.alloc(8);
    len.writeUInt32LE(header.length, 0);
    writeSync(this.fd, len);
    writeSync(this.fd, header);
    for (const a of b.cols) {
      const bytes = new Uint8Array(a.buffer, a.byteOffset, b.n * a.BYTES_PER_ELEMENT);
      writeSync(this.fd, bytes);
    }
    b.n = 0;
  }
}

/** The blocks of a chunk file written by ChunkBlockFile, in order. */
export function* readChunkBlocks(file: string, specs: readonly ParquetColumnSpec[]): Generator<{ n: number; cols: ColumnArray[]; dicts: string[][] }> {
  const fd = openSync(file, 'r');
  try {
    let at = 0;
    const len = Buffer.alloc(8);
    for (;;) {
      if (readSync(fd, len, 0, 8, at) < 8) return;
      at += 8;
      const hl = len.readUInt32LE(0);
      const hb = Buffer.alloc(hl);
      readSync(fd, hb, 0, hl, at);
      at += hl;
      const h = JSON.parse(hb.toString('utf8')) as { n: number; dicts: string[][] };
      const cols = specs.map((s) => {
        const a = allocate(s.kind, h.n);
        const bytes = new Uint8Array(a.buffer, 0, a.byteLength);
        if (readSync(fd, bytes, 0, bytes.length, at) !== bytes.length) throw new Error(`steps.parquet: chunk file ${file} is short`);
        at += bytes.length;
        return a;
      });
      yield { n: h.n, cols, dicts: h.dicts };
    }
  } finally {
    closeSync(fd);
  }
}

// ---------------------------------------------------------------------------
// The file.

/** hyparquet-writer's byte writer, emptied into a stream after each row group (backpressure honoured). */
class StreamByteWriter extends ByteWriter {
  constructor(private readonly out: Writable) { super(1 << 20); }
  flush(): void | Promise<void> {
    if (this.index === 0) return undefined;
    const piece = Buffer.from(new Uint8Array(this.buffer, 0, this.index)); // a copy: the buffer is reused
    this.index = 0;
    if (!this.out.write(piece) && this.out.writableLength > 1 << 22) return once(this.out, 'drain').then(() => undefined);
    return undefined;
  }
  override finish(): void { /* close() ends the stream */ }
}

function schemaOf(specs: readonly ParquetColumnSpec[]) {
  return [
    { name: 'root', num_children: specs.length },
    ...specs.map((s) => {
      const repetition_type = s.nullable ? 'OPTIONAL' : 'REQUIRED';
      switch (s.kind) {
        case 'text': return { name: s.name, type: 'BYTE_ARRAY', converted_type: 'UTF8', logical_type: { type: 'STRING' }, repetition_type };
        case 'time': return { name: s.name, type: 'INT64', logical_type: { type: 'TIMESTAMP', isAdjustedToUTC: true, unit: 'MILLIS' }, repetition_type };
        case 'f32': return { name: s.name, type: 'FLOAT', repetition_type };
        case 'f64': return { name: s.name, type: 'DOUBLE', repetition_type };
        case 'bool': return { name: s.name, type: 'BOOLEAN', repetition_type };
      }
    }),
  ];
}

let zstdReady: Promise<void> | null = null;
/** Load the zstd WebAssembly module (once). */
export function loadZstd(): Promise<void> {
  zstdReady ??= zstdInit();
  return zstdReady;
}

/** steps.parquet through a Writable: windows or worker blocks in, row groups out as they fill; `close` writes the footer and ends the stream. */
export class StepsParquetWriter {
  readonly specs: ParquetColumnSpec[];
  private readonly block: StepsBlock;
  private readonly writer: StreamByteWriter;
  private readonly pq: ParquetWriter;
  private readonly cases: number;
  private readonly groupRows: number;

  /** Call `loadZstd()` first. `rowGroupRows` other than ROW_GROUP_ROWS: tests of the row-group cuts only. */
  constructor(private readonly out: Writable, weatherCases: readonly WeatherCase[], rowGroupRows = ROW_GROUP_ROWS) {
    this.specs = stepsParquetColumns(weatherCases);
    this.cases = weatherCases.length;
    this.groupRows = rowGroupRows;
    this.block = new StepsBlock(this.specs, rowGroupRows + 16_384);
    this.writer = new StreamByteWriter(out);
    this.pq = new ParquetWriter({
      writer: this.writer,
      schema: schemaOf(this.specs) as never,
      codec: 'ZSTD',
      compressors: { ZSTD: (b: Uint8Array) => zstdCompress(b, ZSTD_LEVEL) },
      createdBy: 'passbudget (hyparquet-writer)',
    });
  }

  window(w: StepWindow): void | Promise<void> {
    this.block.appendWindow(w, this.cases);
    return this.drain();
  }

  async appendChunkFile(file: string): Promise<void> {
    for (const b of readChunkBlocks(file, this.specs)) {
      this.block.appendBlock(b);
      await this.drain();
    }
  }

  private drain(): void | Promise<void> {
    let pending: Promise<void> | undefined;
    while (this.block.n >= this.groupRows) {
      const wait = this.writeGroup(this.groupRows);
      this.block.shift(this.groupRows);
      if (wait) pending = pending ? pending.then(() => wait) : wait;
    }
    return pending;
  }

  private writeGroup(rows: number): void | Promise<void> {
    const b = this.block;
    const columnData = this.specs.map((s, c) => {
      const a = b.cols[c];
      const base = { name: s.name };
      switch (s.kind) {
        case 'text': {
          const dict = b.dicts[c].values;
          const idx = a as Int32Array;
          const data: (string | null)[] = new Array(rows);
          for (let q = 0; q < rows; q++) { const v = idx[q]; data[q] = v < 0 ? null : dict[v]; }
          // Statistics on the names (filters by station or link skip row groups), not on pass ids or modes.
          return { ...base, data, encoding: 'RLE_DICTIONARY' as const, statistics: s.name === 'satellite' || s.name === 'station' || s.name === 'link' };
        }
        case 'time': {
          const data = new BigInt64Array(rows);
          for (let q = 0; q < rows; q++) data[q] = BigInt(a[q]);
          return { ...base, data, encoding: 'DELTA_BINARY_PACKED' as const };
        }
        case 'bool': {
          const data: boolean[] = new Array(rows);
          for (let q = 0; q < rows; q++) data[q] = a[q] === 1;
          return { ...base, data, statistics: false };
        }
        default:
          // A view, not a copy: hyparquet-writer copies the group's values itself, before this call returns.
          return { ...base, data: a.subarray(0, rows), encoding: 'PLAIN' as const, statistics: false };
      }
    });
    // pageSize 0: one page per column chunk (no per-value page-size estimate; a chunk is at most ROW_GROUP_ROWS values).
    return this.pq.write({ columnData: columnData as never, rowGroupSize: rows, pageSize: 0 });
  }

  /** The last (partial) row group, the footer, and the end of the stream. */
  async close(): Promise<void> {
    if (this.block.n > 0) {
      await this.writeGroup(this.block.n);
      this.block.n = 0;
    }
    await this.pq.finish();
    await this.writer.flush();
    const finished = once(this.out, 'finish');
    this.out.end();
    await finished;
  }
}
