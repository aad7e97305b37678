/**
 * Reading a run's steps file back (steps.csv or steps.parquet), streamed: the
 * fields the report needs per row, whichever the format. steps.csv goes
 * through csv-parse; steps.parquet through hyparquet (the reader of the
 * family whose writer wrote it), a row group at a time and only the columns
 * asked for, with zstd from @bokuweb/zstd-wasm.
 */
import { createReadStream, existsSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'csv-parse';
import type { StepsFormat } from './stepsSink.js';
import { STEPS_FILE } from './stepsSink.js';
import { cellNumber as num } from './csv.js';

/** One steps row as the readers give it (NaN for an empty number). */
export interface StepRecord {
  passId: string;
  station: string;
  link: string;
  timeS: number;
  elevationDeg: number;
  azimuthDeg: number;
  mountLimited: boolean;
  /** Per weather case, in the order asked for. */
  cases: { marginDB: number; ebN0DB: number; cOverN0DBHz: number; usable: boolean }[];
}

/** The steps file in an output folder and its format; null when the run wrote none (steps.csv first if both are there). */
export function findStepsFile(dir: string): { file: string; format: StepsFormat } | null {
  for (const format of ['csv', 'parquet'] as const) {
    const file = join(dir, STEPS_FILE[format]);
    if (existsSync(file)) return { file, format };
  }
  return null;
}


/** The rows of a steps file, in file order. */
export function readStepRecords(file: string, format: StepsFormat, weather: readonly string[]): AsyncGenerator<StepRecord> {
  return format === 'parquet' ? parquetRecords(file, weather) : csvRecords(file, weather);
}

async function* csvRecords(file: string, weather: readonly string[]): AsyncGenerator<StepRecord> {
  const parser = createReadStream(file).pipe(parse({ columns: true }));
  for await (const r of parser as AsyncIterable<Record<string, string>>) {
    yield {
      passId: r.pass_id, station: r.station, link: r.link, timeS: Date.parse(r.time_utc) / 1000,
      elevationDeg: num(r.elevation_deg), azimuthDeg: num(r.azimuth_deg), mountLimited: r.mount_limited === 'true',
      cases: weather.map((w) => ({ marginDB: num(r[`margin_db_${w}`]), ebN0DB: num(r[`eb_over_n0_db_${w}`]), cOverN0DBHz: num(r[`c_over_n0_dbhz_${w}`]), usable: r[`usable_${w}`] === 'true' })),
    };
  }
}

const numOrNaN = (v: unknown): number => (typeof v === 'number' ? v : NaN);

async function* parquetRecords(file: string, weather: readonly string[]): AsyncGenerator<StepRecord> {
  // Loaded here, not at start-up: only a folder with steps.parquet needs them.
  const { asyncBufferFromFile, parquetMetadataAsync, parquetReadObjects } = await import('hyparquet');
  const { decompress: zstdDecompress } = await import('@bokuweb/zstd-wasm');
  const { loadZstd } = await import('./stepsParquet.js');
  await loadZstd();
  const buffer = await asyncBufferFromFile(file);
  const metadata = await parquetMetadataAsync(buffer);
  const columns = ['pass_id', 'station', 'link', 'time_utc', 'elevation_deg', 'azimuth_deg', 'mount_limited',
    ...weather.flatMap((w) => [`margin_db_${w}`, `eb_over_n0_db_${w}`, `c_over_n0_dbhz_${w}`, `usable_${w}`])];
  const compressors = { ZSTD: (input: Uint8Array) => zstdDecompress(input) };
  let rowStart = 0;
  for (const g of metadata.row_groups) {
    const rowEnd = rowStart + Number(g.num_rows);
    const rows = await parquetReadObjects({ file: buffer, metadata, columns, rowStart, rowEnd, compressors }) as Record<string, unknown>[];
    for (const r of rows) {
      const t = r.time_utc;
      yield {
        passId: r.pass_id as string, station: r.station as string, link: r.link as string,
        timeS: (t instanceof Date ? t.getTime() : Number(t)) / 1000,
        elevationDeg: numOrNaN(r.elevation_deg), azimuthDeg: numOrNaN(r.azimuth_deg), mountLimited: r.mount_limited === true,
        cases: weather.map((w) => ({ marginDB: numOrNaN(r[`margin_db_${w}`]), ebN0DB: numOrNaN(r[`eb_over_n0_db_${w}`]), cOverN0DBHz: numOrNaN(r[`c_over_n0_dbhz_${w}`]), usable: r[`usable_${w}`] === true })),
      };
    }
    rowStart = rowEnd;
  }
}
