/**
 * steps.csv rows as strings, fast, for the run and its worker threads.
 *
 * The general path (stepRow → csv-stringify) costs about 40 µs a row: a
 * `toFixed` and a cast per cell, csv-stringify's per-field quoting checks and
 * a stream chunk per row. steps.csv has hundreds of thousands of rows of ~60
 * cells, so this file formats a row into one string itself and hands the
 * stream large pieces; the small tables keep csv-stringify.
 *
 * It produces byte for byte what stepRow + CsvStreamWriter produce (the
 * tests compare the two on real runs and on hostile names):
 *   - numbers: `fixedDecimal` equals `fmt` (Number.prototype.toFixed, empty
 *     for non-finite, no "-0"): the integer n = round(|v|·10^d) is computed
 *     in floating point and used only when |v|·10^d < 1e9 and its fractional
 *     part is farther than 1e-6 from ½; there the product's rounding error
 *     (≤ ½ ulp < 6e-8) cannot change which integer is nearest, which is the
 *     integer toFixed picks (ECMA-262 Number.prototype.toFixed, "let n be an
 *     integer for which n / 10^f − x is as close to zero as possible"). Every
 *     other value goes to toFixed itself.
 *   - times: `isoUtcMillis` equals formatIsoUtc (Date.toISOString of the
 *     time rounded to the millisecond), with the date part cached per day.
 *   - text cells (pass id, names, mode): csv-stringify's default quoting
 *     (RFC 4180): a cell containing `"`, `,`, CR or LF is quoted, quotes
 *     doubled; others as is. Booleans print `true`/`false`.
 * Decimals per column follow jobs/outputs.ts (decimalsFor): 0 for `_bps`,
 * 1 for doppler_hz, 2 for `_hz_s` and `_k`, else 3.
 */
import { once } from 'node:events';
import type { Writable } from 'node:stream';
import { createCaseBudget, createStepBudget } from '../budget/engine.js';
import type { CaseBudget, StepBudget, WeatherCase } from '../budget/types.js';
import type { StepEvent } from '../analysis/pipeline.js';
import { fmt } from '../output/csv.js';
import { CASE_FIELDS, decimalsFor, STEP_FIELDS, stepColumns } from './outputs.js';

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

const STEP_DEC = STEP_FIELDS.map(decimalsFor);
const CASE_DEC = CASE_FIELDS.map(decimalsFor);

function cell(v: unknown, decimals: number, text: Map<string, string>): string {
  if (typeof v === 'number') return fixedDecimal(v, decimals);
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  if (typeof v === 'string') {
    let q = text.get(v);
    if (q === undefined) { q = csvField(v); text.set(v, q); }
    return q;
  }
  return '';
}

export interface StepsCsvFormatter {
  /** Header line (with its newline). */
  header: string;
  /** One row (with its newline). */
  row(e: StepEvent): string;
  /**
   * One row written as UTF-8 bytes straight into `buf` at `off` (no string per
   * cell or row); returns the offset after it. Needs `rowBytesBound(e)` bytes free.
   */
  rowInto(e: StepEvent, buf: Uint8Array, off: number): number;
  /** An upper bound of the bytes `rowInto(e, …)` writes. */
  rowBytesBound(e: StepEvent): number;
  /** False once a text cell held a non-ASCII character (then the bytes must be UTF-8 encoded). */
  readonly ascii: boolean;
}

type RowFn = (e: StepEvent, cell: (v: unknown, d: number, t: Map<string, string>) => string, q: (s: string) => string,
  iso: (t: number) => string, text: Map<string, string>) => string;

const IDENT = /^[a-z_][a-z0-9_]*$/;
/**
 * The row function, generated once from the column lists so each cell is a
 * plain property read (a loop over field names costs a keyed lookup per cell,
 * about a third of the row time). Names are checked to be identifiers.
 */
function compileRow(nCases: number): RowFn {
  for (const f of [...STEP_FIELDS, ...CASE_FIELDS]) if (!IDENT.test(f)) throw new Error(`steps.csv: column ${f} is not an identifier`);
  const lines = ['const s = e.step; const cs = s.cases;',
    "let out = q(e.passId) + ',' + iso(e.timeS) + ',' + q(e.satellite) + ',' + q(e.station) + ',' + q(e.link.name);"];
  lines.push(`out += ${STEP_FIELDS.map((f, i) => `',' + cell(s.${f}, ${STEP_DEC[i]}, text)`).join(' + ')};`);
  for (let j = 0; j < nCases; j++) {
    lines.push(`{ const c = cs[${j}]; out += ${CASE_FIELDS.map((f, i) => `',' + cell(c.${f}, ${CASE_DEC[i]}, text)`).join(' + ')}; }`);
  }
  lines.push("return out + '\\n';");
  // eslint-disable-next-line @typescript-eslint/no-implied-eval
  return new Function('e', 'cell', 'q', 'iso', 'text', lines.join('\n')) as RowFn;
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

/** Decimal digits of the integer 0 ≤ n < 1e9 at b[o…]; returns the offset after them. */
function putInt(b: Uint8Array, o: number, n: number): number {
  let len = 1;
  for (let t = n; t >= 10; t = (t - (t % 10)) / 10) len++;
  let q = n;
  for (let i = o + len - 1; i >= o; i--) {
    const r = q % 10;
    b[i] = ZERO + r;
    q = (q - r) / 10;
  }
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
  if (decimals <= 3 && value === value && value !== Infinity && value !== -Infinity) {
    const neg = value < 0;
    const x = (neg ? -value : value) * POW10[decimals];
    if (x < 1e9) {
      const fl = Math.floor(x);
      const fr = x - fl;
      if (fr < 0.499999 || fr > 0.500001) {
        const n = fr < 0.5 ? fl : fl + 1;
        if (neg && n !== 0) b[o++] = MINUS;
        const p = POW10[decimals];
        const r = n % p;
        o = putInt(b, o, (n - r) / p);
        if (decimals > 0) {
          b[o++] = DOT;
          let q = r;
          for (let i = o + decimals - 1; i >= o; i--) { const dgt = q % 10; b[i] = ZERO + dgt; q = (q - dgt) / 10; }
          o += decimals;
        }
        return o;
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

type Kind = 'number' | 'boolean' | 'string';
/** Column kinds from fresh step records (the engine's own initial values). */
function kindsOf(): { step: Kind[]; cases: Kind[] } {
  const step = createStepBudget([]) as unknown as Record<string, unknown>;
  const c = createCaseBudget('x') as unknown as Record<string, unknown>;
  const kind = (v: unknown): Kind => (typeof v === 'boolean' ? 'boolean' : typeof v === 'string' ? 'string' : 'number');
  return { step: STEP_FIELDS.map((f) => kind(step[f])), cases: CASE_FIELDS.map((f) => kind(c[f])) };
}

interface ByteHelpers {
  fixed: typeof putFixed;
  iso: typeof putIso;
  bytes: typeof putBytes;
  /** Text cell bytes (quoted as csvField), cached. */
  tx: (s: unknown) => Uint8Array;
  /** Any cell by its runtime type, as `cell` (the rare path: a value not of its column's kind). */
  any: (b: Uint8Array, o: number, v: unknown, d: number) => number;
  T: Uint8Array;
  F: Uint8Array;
}
type RowIntoFn = (e: StepEvent, b: Uint8Array, o: number, H: ByteHelpers) => number;
type BoundFn = (e: StepEvent, H: ByteHelpers) => number;

function compileRowInto(nCases: number): { into: RowIntoFn; bound: BoundFn } {
  const kinds = kindsOf();
  const cellCode = (ref: string, kind: Kind, d: number) => {
    if (kind === 'number') return `v = ${ref}; o = typeof v === 'number' ? H.fixed(b, o, v, ${d}) : H.any(b, o, v, ${d});`;
    if (kind === 'boolean') return `v = ${ref}; o = v === true ? H.bytes(b, o, H.T) : v === false ? H.bytes(b, o, H.F) : H.any(b, o, v, ${d});`;
    return `o = H.bytes(b, o, H.tx(${ref}));`;
  };
  const lines = ['const s = e.step; const cs = s.cases; let v;',
    'o = H.bytes(b, o, H.tx(e.passId)); b[o++] = 44; o = H.iso(b, o, e.timeS); b[o++] = 44;',
    'o = H.bytes(b, o, H.tx(e.satellite)); b[o++] = 44; o = H.bytes(b, o, H.tx(e.station)); b[o++] = 44; o = H.bytes(b, o, H.tx(e.link.name));'];
  STEP_FIELDS.forEach((f, i) => lines.push(`b[o++] = 44; ${cellCode(`s.${f}`, kinds.step[i], STEP_DEC[i])}`));
  const boundText = ['H.tx(e.passId).length', 'H.tx(e.satellite).length', 'H.tx(e.station).length', 'H.tx(e.link.name).length'];
  for (let j = 0; j < nCases; j++) {
    lines.push(`{ const c = cs[${j}];`);
    CASE_FIELDS.forEach((f, i) => {
      lines.push(`b[o++] = 44; ${cellCode(`c.${f}`, kinds.cases[i], CASE_DEC[i])}`);
      if (kinds.cases[i] === 'string') boundText.push(`H.tx(e.step.cases[${j}].${f}).length`);
    });
    lines.push('}');
  }
  STEP_FIELDS.forEach((f, i) => { if (kinds.step[i] === 'string') boundText.push(`H.tx(e.step.${f}).length`); });
  lines.push('b[o++] = 10; return o;');
  const cells = 5 + STEP_FIELDS.length + nCases * CASE_FIELDS.length;
  // eslint-disable-next-line @typescript-eslint/no-implied-eval
  const into = new Function('e', 'b', 'o', 'H', lines.join('\n')) as RowIntoFn;
  // eslint-disable-next-line @typescript-eslint/no-implied-eval
  const bound = new Function('e', 'H', `return ${cells * (NUMBER_CELL_BYTES + 1) + 1} + ${boundText.join(' + ')};`) as BoundFn;
  return { into, bound };
}

const NON_ASCII = /[^\x00-\x7f]/;

/** steps.csv header and rows for these weather cases (columns of jobs/outputs.ts stepColumns). */
export function createStepsCsvFormatter(cases: readonly WeatherCase[]): StepsCsvFormatter {
  const header = `${stepColumns(cases).map(csvField).join(',')}\n`;
  const text = new Map<string, string>();
  let ascii = !NON_ASCII.test(header);
  const q = (s: string) => {
    let v = text.get(s);
    if (v === undefined) { v = csvField(s); text.set(s, v); if (NON_ASCII.test(s)) ascii = false; }
    return v;
  };
  const cellAscii = (v: unknown, d: number, t: Map<string, string>) => (typeof v === 'string' ? q(v) : cell(v, d, t));
  const fn = compileRow(cases.length);
  const textBytes = new Map<unknown, Uint8Array>();
  const tx = (v: unknown): Uint8Array => {
    let bytes = textBytes.get(v);
    if (bytes === undefined) {
      bytes = Buffer.from(typeof v === 'string' ? q(v) : cell(v, 3, text), 'utf8');
      textBytes.set(v, bytes);
    }
    return bytes;
  };
  const H: ByteHelpers = {
    fixed: putFixed, iso: putIso, bytes: putBytes, tx, T: TRUE_BYTES, F: FALSE_BYTES,
    any: (b, o, v, d) => {
      // Only strings can be long, and those are counted in the bound via tx when the column is text; any other value is short.
      const t = typeof v === 'string' ? q(v) : cell(v, d, text);
      if (t.length > NUMBER_CELL_BYTES || NON_ASCII.test(t)) throw new Error(`steps.csv: a cell of an unexpected kind: ${JSON.stringify(t).slice(0, 40)}`);
      return putAscii(b, o, t);
    },
  };
  const bytesFn = compileRowInto(cases.length);
  const check = (e: StepEvent) => {
    if (e.step.cases.length !== cases.length) throw new Error(`steps.csv: step has ${e.step.cases.length} weather cases, expected ${cases.length}`);
  };
  return {
    header,
    row(e) {
      check(e);
      return fn(e, cellAscii, q, isoUtcMillis, text);
    },
    rowInto(e, buf, off) {
      check(e);
      return bytesFn.into(e, buf, off, H);
    },
    rowBytesBound(e) {
      return bytesFn.bound(e, H);
    },
    get ascii() { return ascii; },
  };
}

/**
 * Text to a Writable in large pieces (1 MB buffers filled in place, so no
 * long string is ever built), honouring backpressure: when the stream's
 * buffer passes `maxBufferedBytes`, `write` returns a promise that settles on
 * 'drain'. `ascii()` true lets it encode as latin1 (same bytes, cheaper).
 */
export class ChunkedTextWriter {
  private buf: Buffer;
  private off = 0;
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

  /** One steps.csv row, its bytes written straight into the piece buffer. */
  writeRow(fmt: StepsCsvFormatter, e: StepEvent): void | Promise<void> {
    const need = fmt.rowBytesBound(e);
    if (this.off + need > this.pieceBytes) {
      const wait = this.flush();
      if (need > this.pieceBytes) return this.writeBuffer(Buffer.from(fmt.row(e), 'utf8'));
      if (wait) return wait.then(() => { this.off = fmt.rowInto(e, this.buf, this.off); });
    }
    this.off = fmt.rowInto(e, this.buf, this.off);
    return undefined;
  }

  private put(text: string): void {
    this.off += this.ascii() ? this.buf.write(text, this.off, 'latin1') : this.buf.write(text, this.off, 'utf8');
  }

  flush(): void | Promise<void> {
    if (this.off === 0) return undefined;
    const piece = this.buf.subarray(0, this.off);
    this.buf = Buffer.allocUnsafe(this.pieceBytes);
    this.off = 0;
    if (!this.out.write(piece) && this.out.writableLength > this.maxBufferedBytes) return once(this.out, 'drain').then(() => undefined);
    return undefined;
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
