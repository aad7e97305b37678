/**
 * steps.csv, fast: rows written as bytes straight from the sweep's columns.
 *
 * The general path (stepRow → csv-stringify) costs tens of µs a row; steps.csv
 * has hundreds of thousands of rows of ~70 cells, so this file writes each
 * row's bytes into large buffers itself, reading the typed arrays of a sweep
 * window (sweep/window.ts) directly; the small tables keep csv-stringify.
 *
 * It produces byte for byte what stepRow + CsvStreamWriter produce (the
 * tests compare the two on real runs and on hostile names):
 *   - numbers: `putFixed` equals `fmt` (Number.prototype.toFixed, empty for
 *     non-finite, no "-0"): the integer n = round(|v|·10^d) is computed in
 *     floating point and used only when |v|·10^d < 1e9 and its fractional
 *     part is farther than 1e-6 from ½; there the product's rounding error
 *     (≤ ½ ulp < 6e-8) cannot change which integer is nearest, which is the
 *     integer toFixed picks (ECMA-262 Number.prototype.toFixed, "let n be an
 *     integer for which n / 10^f − x is as close to zero as possible"). Every
 *     other value goes to toFixed itself.
 *   - times: `putIso` equals formatIsoUtc (Date.toISOString of the time
 *     rounded to the millisecond), with the date part cached per day.
 *   - text cells (pass id, names, mode): csv-stringify's default quoting
 *     (RFC 4180): a cell containing `"`, `,`, CR or LF is quoted, quotes
 *     doubled; others as is. Booleans print `true`/`false`.
 * Decimals per column follow stepsColumns.ts (decimalsFor).
 */
import { once } from 'node:events';
import type { Writable } from 'node:stream';
import type { WeatherCase } from '../budget/types.js';
import type { StepPart, StepWindow } from '../sweep/window.js';
import { fmt } from './csv.js';
import { CASE_FIELDS, decimalsFor, STEP_FIELDS, stepColumns } from './stepsColumns.js';

const POW10 = [1, 10, 100, 1000, 10_000, 100_000, 1_000_000];
/**
 * String forms of the byte writers below (putFixed, putIso): the rare row too
 * long for a piece buffer and the tests use them. One implementation each, so
 * the string and byte paths cannot drift apart.
 */
const SCRATCH = new Uint8Array(64);
const latin1 = (n: number) => Buffer.from(SCRATCH.buffer, SCRATCH.byteOffset, n).toString('latin1');

/** `fmt(value, decimals)` (toFixed; '' for non-finite; no "-0"), fast for decimals 0–3. */
export function fixedDecimal(value: number, decimals: number): string {
  const n = putFixed(SCRATCH, 0, value, decimals);
  return latin1(n);
}

/** formatIsoUtc(t): ISO-8601 UTC with milliseconds, the date part cached per UTC day. */
export function isoUtcMillis(timeS: number): string {
  return latin1(putIso(SCRATCH, 0, timeS));
}

const NEEDS_QUOTES = /[",\r\n]/;
/** One text cell as csv-stringify writes it by default (RFC 4180 quoting). */
export function csvField(text: string): string {
  return NEEDS_QUOTES.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

// ---------------------------------------------------------------------------
// Bytes: the same cells, digits written into a Uint8Array.

/** Bytes a number cell may take: toFixed of |v| < 1e21 with ≤ 3 decimals is ≤ 26 characters; exponential forms are shorter. */
const NUMBER_CELL_BYTES = 32;
const ZERO = 48;
const DOT = 46;
const MINUS = 45;
const TRUE_BYTES = Uint8Array.from([116, 114, 117, 101]);
const FALSE_BYTES = Uint8Array.from([102, 97, 108, 115, 101]);

/** "00" … "99" as bytes: two digits per int32 division. */
const DIG2 = Uint8Array.from({ length: 200 }, (_, i) => ZERO + (i % 2 === 0 ? Math.floor(i / 20) : (i >> 1) % 10));

/** Decimal digits of the integer 0 ≤ n < 2^31 at b[o…] (int32 arithmetic); returns the offset after them. */
function putInt(b: Uint8Array, o: number, n: number): number {
  if (n < 10) { b[o] = ZERO + n; return o + 1; }
  const len = n < 100 ? 2 : n < 1000 ? 3 : n < 10_000 ? 4 : n < 100_000 ? 5 : n < 1_000_000 ? 6
    : n < 10_000_000 ? 7 : n < 100_000_000 ? 8 : n < 1_000_000_000 ? 9 : 10;
  let q = n | 0;
  let p = o + len;
  while (q >= 100) {
    const t = (q / 100) | 0;
    const r = (q - t * 100) << 1;
    b[--p] = DIG2[r + 1]; b[--p] = DIG2[r];
    q = t;
  }
  if (q >= 10) { const r = q << 1; b[--p] = DIG2[r + 1]; b[--p] = DIG2[r]; } else b[--p] = ZERO + q;
  return o + len;
}

/** An ASCII string (e.g. a toFixed result) at b[o…]. */
function putAscii(b: Uint8Array, o: number, t: string): number {
  for (let i = 0; i < t.length; i++) b[o++] = t.charCodeAt(i);
  return o;
}

function putBytes(b: Uint8Array, o: number, bytes: Uint8Array): number {
  const n = bytes.length;
  if (n > 24) { b.set(bytes, o); return o + n; }
  for (let i = 0; i < n; i++) b[o + i] = bytes[i];
  return o + n;
}

/** `fixedDecimal(v, d)` as bytes: the same fast path and the same fallback (fmt), so the same characters. */
export function putFixed(b: Uint8Array, o: number, value: number, decimals: number): number {
  if (decimals <= 3) {
    const neg = value < 0;
    const x = (neg ? -value : value) * POW10[decimals];
    // NaN and ±Infinity fail this test too and take toFixed's own path.
    if (x < 1e9) {
      const fl = x | 0; // x < 1e9 < 2^31: truncation is floor
      const fr = x - fl;
      if (fr < 0.499999 || fr > 0.500001) {
        // n ≤ 1e9 < 2^31: integer (int32) arithmetic from here.
        const n = fr < 0.5 ? fl : fl + 1;
        if (neg && n !== 0) b[o++] = MINUS;
        if (decimals === 0) return putInt(b, o, n);
        const p = POW10[decimals];
        const ip = (n / p) | 0;
        o = putInt(b, o, ip);
        b[o++] = DOT;
        const q = n - ip * p;
        if (decimals === 3) {
          const h = (q / 100) | 0;
          const r = (q - h * 100) << 1;
          b[o] = ZERO + h; b[o + 1] = DIG2[r]; b[o + 2] = DIG2[r + 1];
          return o + 3;
        }
        if (decimals === 2) { const r = q << 1; b[o] = DIG2[r]; b[o + 1] = DIG2[r + 1]; return o + 2; }
        b[o] = ZERO + q;
        return o + 1;
      }
    }
  }
  return putAscii(b, o, fmt(value, decimals));
}

let bytesDay = NaN;
let bytesPrefix = new Uint8Array(0);
/** `isoUtcMillis(t)` as bytes (24 for years 0000–9999). */
export function putIso(b: Uint8Array, o: number, timeS: number): number {
  const ms = Math.round(timeS * 1000);
  const day = Math.floor(ms / 86_400_000);
  if (day !== bytesDay) {
    const iso = new Date(day * 86_400_000).toISOString();
    bytesPrefix = Buffer.from(iso.slice(0, iso.indexOf('T') + 1), 'latin1');
    bytesDay = day;
  }
  o = putBytes(b, o, bytesPrefix);
  let rem = ms - day * 86_400_000;
  const h = Math.floor(rem / 3_600_000); rem -= h * 3_600_000;
  const m = Math.floor(rem / 60_000); rem -= m * 60_000;
  const s = Math.floor(rem / 1000);
  const f = rem - s * 1000;
  b[o] = ZERO + ((h / 10) | 0); b[o + 1] = ZERO + (h % 10); b[o + 2] = 58;
  b[o + 3] = ZERO + ((m / 10) | 0); b[o + 4] = ZERO + (m % 10); b[o + 5] = 58;
  b[o + 6] = ZERO + ((s / 10) | 0); b[o + 7] = ZERO + (s % 10); b[o + 8] = DOT;
  b[o + 9] = ZERO + ((f / 100) | 0); b[o + 10] = ZERO + (((f / 10) | 0) % 10); b[o + 11] = ZERO + (f % 10); b[o + 12] = 90;
  return o + 13;
}

/** Where each steps.csv field comes from in a window part: the column (per step) or the constant (per link). */
const STEP_SOURCE: Record<string, string> = {
  range_km: 's.rangeKm[i]', elevation_deg: 's.elevationDeg[i]', azimuth_deg: 's.azimuthDeg[i]',
  tx_off_boresight_deg: 'c.txOffBoresightDeg[i]', rx_off_boresight_deg: 'c.rxOffBoresightDeg[i]', eirp_dbw: 'c.eirpDBW[i]',
  free_space_loss_db: 'c.freeSpaceLossDB[i]', polarisation_loss_db: 'c.polarisationLossDB', tx_pointing_loss_db: 'c.txPointingLossDB[i]',
  rx_pointing_loss_db: 'c.rxPointingLossDB[i]', other_losses_db: 'c.otherLossesDB', mount_lag_deg: 'c.mountLagDeg[i]',
  mount_limited: 'c.mountLimited[i]', doppler_hz: 'c.dopplerHz[i]', doppler_rate_hz_s: 'c.dopplerRateHzS[i]',
  element_age_days: 'c.elementAgeDays[i]', element_pointing_error_deg: 'c.elementPointingErrorDeg[i]',
  sun_separation_deg: 'c.sunSeparationDeg[i]', sun_noise_temperature_k: 'c.sunNoiseK[i]',
};
const CASE_SOURCE: Record<string, string> = {
  gas_loss_db: 'k.gasDB[i]', rain_loss_db: 'k.rainDB[i]', cloud_loss_db: 'k.cloudDB[i]', scintillation_db: 'k.scintillationDB[i]',
  atmospheric_loss_db: 'k.atmosphericDB[i]', antenna_temperature_k: 'k.antennaTemperatureK[i]', system_temperature_k: 'k.systemTemperatureK[i]',
  g_over_t_dbk: 'k.gOverTDBK[i]', c_over_n0_dbhz: 'k.cOverN0DBHz[i]', eb_over_n0_db: 'k.ebN0DB[i]', es_over_n0_db: 'k.esN0DB[i]',
  required_eb_over_n0_db: 'k.requiredEbN0DB[i]', margin_db: 'k.marginDB[i]', usable: 'k.usable[i]', mode: 'k.mode[i]',
  information_rate_bps: 'k.informationRateBps[i]',
};
const BOOLEAN_FIELDS = new Set(['mount_limited', 'usable']);

interface ByteHelpers {
  fixed: typeof putFixed;
  iso: typeof putIso;
  bytes: typeof putBytes;
  /** Text cell bytes (quoted as csvField), cached. */
  tx: (s: string) => Uint8Array;
  T: Uint8Array;
  F: Uint8Array;
}
/** A window part with its text cells as bytes, ready for rows: pass id; ",satellite,station,link"; mode names by index. */
export interface PreparedPart {
  part: StepPart;
  id: Uint8Array;
  names: Uint8Array;
  modes: Uint8Array[];
  /** Bytes any row of the part may take at most. */
  bound: number;
}
type RowIntoFn = (p: StepPart, pp: PreparedPart, i: number, t: number, b: Uint8Array, o: number) => number;

/**
 * The row function, generated once from the column lists so each cell is a
 * plain typed-array read (a loop over field names costs a keyed lookup per
 * cell). Sources are checked to cover every column.
 */
function compileRowInto(nCases: number, H: ByteHelpers): RowIntoFn {
  const lines = ['const s = p.stn; const c = p.cols; const cs = c.cases; let v;',
    'o = bytes(b, o, pp.id); b[o++] = 44; o = iso(b, o, t); o = bytes(b, o, pp.names);', 'const md = pp.modes;'];
  const cellCode = (f: string, src: string | undefined, d: number) => {
    if (src === undefined) throw new Error(`steps.csv: no source for column ${f}`);
    if (BOOLEAN_FIELDS.has(f)) return `b[o++] = 44; o = bytes(b, o, ${src} === 1 ? T : F);`;
    if (f === 'mode') return `b[o++] = 44; v = ${src}; if (v >= 0 && k.usable[i] === 1) o = bytes(b, o, md[v]);`;
    return `b[o++] = 44; o = fixed(b, o, ${src}, ${d});`;
  };
  for (const f of STEP_FIELDS) lines.push(cellCode(f, STEP_SOURCE[f], decimalsFor(f)));
  for (let j = 0; j < nCases; j++) {
    lines.push(`{ const k = cs[${j}];`);
    for (const f of CASE_FIELDS) lines.push(cellCode(f, CASE_SOURCE[f], decimalsFor(f)));
    lines.push('}');
  }
  lines.push('b[o++] = 10; return o;');
  // The helpers are bound as the generated function's own variables (direct calls, not loads from an object per cell).
  // eslint-disable-next-line @typescript-eslint/no-implied-eval
  const make = new Function('fixed', 'iso', 'bytes', 'T', 'F', `return function rowInto(p, pp, i, t, b, o) {\n${lines.join('\n')}\n};`);
  return make(H.fixed, H.iso, H.bytes, H.T, H.F) as RowIntoFn;
}

const NON_ASCII = /[^\x00-\x7f]/;

export interface StepsCsvFormatter {
  /** Header line (with its newline). */
  header: string;
  /** Entry i (time t) of a window part as one row's UTF-8 bytes into `buf` at `off`; returns the offset after it. Needs `rowBytesBound(p)` bytes free. */
  rowInto(p: StepPart, i: number, timeS: number, buf: Uint8Array, off: number): number;
  /** An upper bound of the bytes any row of part `p` takes. */
  rowBytesBound(p: StepPart): number;
  /** The part's text cells as bytes (once per part and window), for rowIntoPrepared. */
  prepare(p: StepPart): PreparedPart;
  /** rowInto with the part prepared. */
  rowIntoPrepared(pp: PreparedPart, i: number, timeS: number, buf: Uint8Array, off: number): number;
  /** The same row as a string (tests, and the rare row longer than a piece buffer). */
  row(p: StepPart, i: number, timeS: number): string;
  /** False once a text cell held a non-ASCII character. */
  readonly ascii: boolean;
}

/** steps.csv header and rows for these weather cases (columns of stepsColumns.ts stepColumns). */
export function createStepsCsvFormatter(cases: readonly WeatherCase[]): StepsCsvFormatter {
  const header = `${stepColumns(cases).map(csvField).join(',')}\n`;
  let ascii = !NON_ASCII.test(header);
  const textBytes = new Map<string, Uint8Array>();
  const tx = (v: string): Uint8Array => {
    let bytes = textBytes.get(v);
    if (bytes === undefined) {
      if (NON_ASCII.test(v)) ascii = false;
      bytes = Buffer.from(csvField(v), 'utf8');
      textBytes.set(v, bytes);
    }
    return bytes;
  };
  const H: ByteHelpers = {
    fixed: putFixed, iso: putIso, bytes: putBytes, tx, T: TRUE_BYTES, F: FALSE_BYTES,
  };
  const into = compileRowInto(cases.length, H);
  const cells = 5 + STEP_FIELDS.length + cases.length * CASE_FIELDS.length;
  const check = (p: StepPart) => {
    if (p.cols.cases.length !== cases.length) throw new Error(`steps.csv: step has ${p.cols.cases.length} weather cases, expected ${cases.length}`);
  };
  const namesCache = new Map<string, Uint8Array>();
  const prepare = (p: StepPart): PreparedPart => {
    check(p);
    const id = tx(p.passId);
    const key = `${p.satellite}\u0000${p.station}\u0000${p.link.name}`;
    let names = namesCache.get(key);
    if (!names) {
      const s = tx(p.satellite), st = tx(p.station), l = tx(p.link.name);
      names = new Uint8Array(3 + s.length + st.length + l.length);
      let o = 0;
      names[o++] = 44; names.set(s, o); o += s.length;
      names[o++] = 44; names.set(st, o); o += st.length;
      names[o++] = 44; names.set(l, o);
      namesCache.set(key, names);
    }
    const modes = p.modeNames.map(tx);
    let longestMode = 0;
    for (const m of modes) longestMode = Math.max(longestMode, m.length);
    return { part: p, id, names, modes, bound: cells * (NUMBER_CELL_BYTES + 1) + 1 + id.length + names.length + cases.length * longestMode };
  };
  const bound = (p: StepPart) => prepare(p).bound;
  const scratch = { buf: new Uint8Array(1 << 16) };
  return {
    header,
    rowInto(p, i, t, buf, off) {
      return into(p, prepare(p), i, t, buf, off);
    },
    prepare,
    rowIntoPrepared(pp, i, t, buf, off) {
      return into(pp.part, pp, i, t, buf, off);
    },
    rowBytesBound: bound,
    row(p, i, t) {
      check(p);
      const need = bound(p);
      if (scratch.buf.length < need) scratch.buf = new Uint8Array(need);
      const n = into(p, prepare(p), i, t, scratch.buf, 0);
      return Buffer.from(scratch.buf.buffer, scratch.buf.byteOffset, n).toString('utf8');
    },
    get ascii() { return ascii; },
  };
}

/** Where rows go: a buffer filled from `filled`, emptied by `flush`; `writeRaw` for a row too long for the buffer. */
export interface RowTarget {
  readonly buffer: Uint8Array;
  filled: number;
  readonly capacity: number;
  flush(): void | Promise<void>;
  writeRaw(bytes: Uint8Array): void | Promise<void>;
}

/** The rows of a window in steps.csv order into `target`; a promise when the target asked to wait (it has the bytes already). */
export function writeWindowRows(fmt: StepsCsvFormatter, w: StepWindow, target: RowTarget): void | Promise<void> {
  const parts = w.parts;
  const prepared = parts.map((p) => fmt.prepare(p));
  const bounds = prepared.map((p) => p.bound);
  let pending: Promise<void> | undefined;
  const wait = (x: void | Promise<void>) => { if (x) pending = pending ? pending.then(() => x) : x; };
  for (let k = w.k0; k < w.k1; k++) {
    const t = w.startS + k * w.stepS;
    for (let j = 0; j < parts.length; j++) {
      const p = parts[j];
      const i = k - p.k0;
      if (i < 0 || i >= p.n) continue;
      if (target.filled + bounds[j] > target.capacity) wait(target.flush());
      if (bounds[j] > target.capacity) { wait(target.writeRaw(Buffer.from(fmt.row(p, i, t), 'utf8'))); continue; }
      target.filled = fmt.rowIntoPrepared(prepared[j], i, t, target.buffer, target.filled);
    }
  }
  return pending;
}

/** A sweep step sink that writes steps.csv rows through `writer` (rows in window order). */
export function stepsCsvSink(writer: ChunkedTextWriter, fmt: StepsCsvFormatter): (w: StepWindow) => void | Promise<void> {
  return (w) => writer.writeWindow(fmt, w);
}

/**
 * Text to a Writable in large pieces (1 MB buffers filled in place, so no
 * long string is ever built), honouring backpressure: when the stream's
 * buffer passes `maxBufferedBytes`, `write` returns a promise that settles on
 * 'drain'. `ascii()` true lets it encode as latin1 (same bytes, cheaper).
 */
export class ChunkedTextWriter implements RowTarget {
  private buf: Buffer;
  private off = 0;
  private readonly pool: Buffer[] = [];
  constructor(
    private readonly out: Writable,
    private readonly ascii: () => boolean = () => false,
    private readonly pieceBytes = 1 << 20,
    private readonly maxBufferedBytes = 1 << 22,
  ) {
    this.buf = Buffer.allocUnsafe(pieceBytes);
  }

  write(text: string): void | Promise<void> {
    // UTF-8 needs at most 3 bytes per UTF-16 unit.
    if (this.off + 3 * text.length > this.pieceBytes) {
      const wait = this.flush();
      if (3 * text.length > this.pieceBytes) return this.writeBuffer(Buffer.from(text, 'utf8'));
      if (wait) return wait.then(() => { this.put(text); });
    }
    this.put(text);
    return undefined;
  }

  /** A sweep window's steps.csv rows, their bytes written straight into the piece buffer. */
  writeWindow(fmt: StepsCsvFormatter, w: StepWindow): void | Promise<void> {
    return writeWindowRows(fmt, w, this);
  }

  /** RowTarget: the piece buffer and how full it is. */
  get buffer(): Uint8Array { return this.buf; }
  get filled(): number { return this.off; }
  set filled(n: number) { this.off = n; }
  get capacity(): number { return this.pieceBytes; }

  private put(text: string): void {
    this.off += this.ascii() ? this.buf.write(text, this.off, 'latin1') : this.buf.write(text, this.off, 'utf8');
  }

  flush(): void | Promise<void> {
    if (this.off === 0) return undefined;
    const full = this.buf;
    const piece = full.subarray(0, this.off);
    // A piece buffer goes back to the pool once the stream has written it (hundreds of 1 MB buffers otherwise churn the heap).
    this.buf = this.pool.pop() ?? Buffer.allocUnsafe(this.pieceBytes);
    this.off = 0;
    const ok = this.out.write(piece, () => { if (this.pool.length < 8) this.pool.push(full); });
    if (!ok && this.out.writableLength > this.maxBufferedBytes) return once(this.out, 'drain').then(() => undefined);
    return undefined;
  }

  /** RowTarget: raw bytes after what is buffered. */
  writeRaw(bytes: Uint8Array): Promise<void> {
    return this.writeBuffer(bytes);
  }

  /** Raw bytes (a chunk file's rows), after any buffered text. */
  async writeBuffer(bytes: Uint8Array): Promise<void> {
    await this.flush();
    if (!this.out.write(bytes) && this.out.writableLength > this.maxBufferedBytes) await once(this.out, 'drain');
  }

  /** Flush and end the stream; resolves when it has finished. */
  async close(): Promise<void> {
    await this.flush();
    const finished = once(this.out, 'finish');
    this.out.end();
    await finished;
  }
}
