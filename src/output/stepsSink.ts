/**
 * The steps file, whichever its format: what the sweep hands it (windows in
 * this thread, chunk files from worker threads) and how it ends. The sweep
 * sees only these two small interfaces, so the formats live here. The
 * Parquet modules (hyparquet-writer, zstd) load only when a run asks for
 * steps.parquet, so no other command pays for them at start-up.
 */
import { closeSync, createReadStream, openSync, writeSync } from 'node:fs';
import type { Writable } from 'node:stream';
import type { WeatherCase } from '../budget/types.js';
import type { StepWindow } from '../sweep/window.js';
import { ChunkedTextWriter, createStepsCsvFormatter, writeWindowRows, type RowTarget } from './stepsCsv.js';

/** Formats of the steps file (`output.steps` without `none`). */
export type StepsFormat = 'csv' | 'parquet';
export const STEPS_FILE: Record<StepsFormat, string> = { csv: 'steps.csv', parquet: 'steps.parquet' };

/** The main thread's end: rows of this thread's windows, or a worker's chunk file, in order. */
export interface StepsSink {
  window(w: StepWindow): void | Promise<void>;
  /** A chunk file written by `openChunkSteps` in a worker, appended after what came before. */
  appendChunkFile(file: string): Promise<void>;
  /** Finish the file and end its stream. */
  close(): Promise<void>;
}

/** A worker thread's end: one chunk's rows into a file of its own. */
export interface ChunkStepsFile {
  window(w: StepWindow): void;
  close(): void;
}

export async function createStepsSink(out: Writable, format: StepsFormat, cases: readonly WeatherCase[], parquetRowGroupRows?: number): Promise<StepsSink> {
  if (format === 'parquet') {
    const { loadZstd, StepsParquetWriter } = await import('./stepsParquet.js');
    await loadZstd();
    const w = new StepsParquetWriter(out, cases, parquetRowGroupRows);
    return { window: (win) => w.window(win), appendChunkFile: (f) => w.appendChunkFile(f), close: () => w.close() };
  }
  const fmt = createStepsCsvFormatter(cases);
  const writer = new ChunkedTextWriter(out, () => fmt.ascii);
  await writer.write(fmt.header);
  return {
    window: (win) => writer.writeWindow(fmt, win),
    async appendChunkFile(file) {
      for await (const piece of createReadStream(file, { highWaterMark: 1 << 20 })) await writer.writeBuffer(piece as Buffer);
    },
    close: () => writer.close(),
  };
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

/** A worker's chunk file maker for this format (formatters built once per thread). */
export async function chunkStepsFiles(format: StepsFormat, cases: readonly WeatherCase[]): Promise<(file: string) => ChunkStepsFile> {
  if (format === 'parquet') {
    const { ChunkBlockFile, stepsParquetColumns } = await import('./stepsParquet.js');
    const specs = stepsParquetColumns(cases);
    return (file) => {
      const fd = openSync(file, 'w');
      const f = new ChunkBlockFile(fd, specs, cases.length);
      return { window: (w) => f.window(w), close: () => { f.flush(); closeSync(fd); } };
    };
  }
  const fmt = createStepsCsvFormatter(cases);
  return (file) => {
    const fd = openSync(file, 'w');
    const target = fileTarget(fd);
    return {
      window: (w) => { writeWindowRows(fmt, w, target); },
      close: () => { target.flush(); closeSync(fd); },
    };
  };
}
