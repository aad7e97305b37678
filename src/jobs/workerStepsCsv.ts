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
import { CASE_COLUMNS, STEP_COLUMNS } from '../budget/columns.js';
import type { CaseBudget, StepBudget, WeatherCase } from '../budget/types.js';
import type { StepEvent } from '../analysis/pipeline.js';
import { fmt } from '../output/csv.js';
import { stepColumns } from './outputs.js';

const POW10 = [1, 10, 100, 1000, 10_000, 100_000, 1_000_000];
/** FRAC[d][r] = "." + r with d digits. */
const FRAC: string[][] = POW10.map((p, d) => Array.from({ length: d <= 3 ? p : 0 }, (_, r) => (d === 0 ? '' : `.${String(r).padStart(d, '0')}`)));

const INT = Array.from({ length: 1000 }, (_, i) => String(i));
const PAD3_INT = Array.from({ length: 1000 }, (_, i) => String(i).padStart(3, '0'));
/** Decimal digits of an integer 0 ≤ n < 1e9 from two lookups at most (no number-to-string conversion). */
function intText(n: number): string {
  if (n < 1000) return INT[n];
  const lo = n % 1000;
  const hi = (n - lo) / 1000;
  if (hi < 1000) return INT[hi] + PAD3_INT[lo];
  const mid = hi % 1000;
  return INT[(hi - mid) / 1000] + PAD3_INT[mid] + PAD3_INT[lo];
}

/** `fmt(value, decimals)` (toFixed; '' for non-finite; no "-0"), fast for decimals 0–3. */
export function fixedDecimal(value: number, decimals: number): string {
  if (decimals <= 3 && value === value && value !== Infinity && value !== -Infinity) {
    const neg = value < 0;
    const x = (neg ? -value : value) * POW10[decimals];
    if (x < 1e9) {
      const fl = Math.floor(x);
      const fr = x - fl;
      if (fr < 0.499999 || fr > 0.500001) {
        const n = fr < 0.5 ? fl : fl + 1;
        const p = POW10[decimals];
        const r = n % p;
        const s = intText((n - r) / p) + FRAC[decimals][r];
        return neg && n !== 0 ? `-${s}` : s;
      }
    }
  }
  return fmt(value, decimals);
}

const PAD2 = Array.from({ length: 60 }, (_, i) => String(i).padStart(2, '0'));
const PAD3 = Array.from({ length: 1000 }, (_, i) => String(i).padStart(3, '0'));
let cachedDay = NaN;
let cachedPrefix = '';

/** formatIsoUtc(t): ISO-8601 UTC with milliseconds, the date part cached per UTC day. */
export function isoUtcMillis(timeS: number): string {
  const ms = Math.round(timeS * 1000);
  const day = Math.floor(ms / 86_400_000);
  if (day !== cachedDay) {
    const iso = new Date(day * 86_400_000).toISOString();
    cachedPrefix = iso.slice(0, iso.indexOf('T') + 1);
    cachedDay = day;
  }
  let rem = ms - day * 86_400_000;
  const h = Math.floor(rem / 3_600_000); rem -= h * 3_600_000;
  const m = Math.floor(rem / 60_000); rem -= m * 60_000;
  const s = Math.floor(rem / 1000);
  return `${cachedPrefix}${PAD2[h]}:${PAD2[m]}:${PAD2[s]}.${PAD3[rem - s * 1000]}Z`;
}

const NEEDS_QUOTES = /[",\r\n]/;
/** One text cell as csv-stringify writes it by default (RFC 4180 quoting). */
export function csvField(text: string): string {
  return NEEDS_QUOTES.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function decimalsFor(column: string): number {
  if (column.endsWith('_bps')) return 0;
  if (column === 'doppler_hz') return 1;
  if (column.endsWith('_hz_s')) return 2;
  if (column.endsWith('_k')) return 2;
  return 3;
}

const STEP_FIELDS = STEP_COLUMNS.filter((c) => c !== 'time_s');
const CASE_FIELDS = CASE_COLUMNS.filter((c) => c !== 'weather');
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
  return {
    header,
    row(e) {
      if (e.step.cases.length !== cases.length) throw new Error(`steps.csv: step has ${e.step.cases.length} weather cases, expected ${cases.length}`);
      return fn(e, cellAscii, q, isoUtcMillis, text);
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
