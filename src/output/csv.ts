/**
 * Streaming CSV with backpressure (csv-stringify): rows go out as they are
 * produced and are never held whole in memory.
 */
import { stringify, type Stringifier } from 'csv-stringify';
import type { Writable } from 'node:stream';
import { once } from 'node:events';

export type CsvCell = string | number | boolean | null | undefined;

export class CsvStreamWriter {
  private readonly csv: Stringifier;
  private readonly finished: Promise<unknown>;

  constructor(out: Writable, columns: string[]) {
    this.csv = stringify({
      header: true,
      columns,
      cast: { boolean: (v) => (v ? 'true' : 'false') },
    });
    this.csv.pipe(out);
    this.finished = once(out, 'finish');
  }

  /**
   * Write one row (cells in column order); awaits when the stream asks for
   * backpressure. The row is copied: the stringifier holds it until written,
   * so a caller may reuse its array.
   */
  async write(row: readonly CsvCell[]): Promise<void> {
    if (!this.csv.write(row.slice())) await once(this.csv, 'drain');
  }

  async close(): Promise<void> {
    this.csv.end();
    await this.finished;
  }
}

/** Render a whole (small) table as CSV text. */
export function csvText(columns: string[], rows: CsvCell[][]): Promise<string> {
  return new Promise((resolvePromise, reject) => {
    stringify(rows, { header: true, columns, cast: { boolean: (v) => (v ? 'true' : 'false') } }, (err, out) =>
      err ? reject(err) : resolvePromise(out),
    );
  });
}

/** Fixed-decimal formatting for numeric cells: NaN/±Infinity become empty cells. */
export function fmt(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  const s = value.toFixed(decimals);
  return s === `-${(0).toFixed(decimals)}` ? (0).toFixed(decimals) : s;
}

/** A number cell read back (the inverse of fmt): NaN for an empty or absent cell. */
export function cellNumber(s: string | undefined): number {
  return s === undefined || s === '' ? NaN : Number(s);
}
