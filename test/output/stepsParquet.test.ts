/**
 * steps.parquet read back by an independent Parquet implementation:
 * parquet-wasm 0.8 (the Apache Arrow Rust `parquet` crate compiled to
 * WebAssembly) into Apache Arrow JS 21 tables, not the hyparquet family that
 * writes it. Every value of the demo's first day must equal steps.csv's after
 * the CSV's rounding (text and times exactly, numbers as the printed decimal,
 * an empty mode as null, an empty number as NaN), with the column names and types the README states;
 * and the file must be byte-identical for 1, 2 and 3 worker threads.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { tableFromIPC, type Table } from 'apache-arrow';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createWriteStream } from 'node:fs';
import { runScenario } from '../../src/jobs/run.js';
import { runPipelineParallel } from '../../src/sweep/parallel.js';
import { fmt } from '../../src/output/csv.js';
import { F32_LIMIT, printedValue, stepsParquetColumns } from '../../src/output/stepsParquet.js';
import { smallScenario } from '../parallel/scenario.js';
import { rng } from '../rng.js';

const require = createRequire(import.meta.url);
const parquetWasm = require('parquet-wasm/node') as { readParquet(b: Uint8Array): { intoIPCStream(): Uint8Array } };

const tmp = mkdtempSync(path.join(tmpdir(), 'passbudget-parquet-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

function readParquet(file: string): Table {
  return tableFromIPC(parquetWasm.readParquet(new Uint8Array(readFileSync(file))).intoIPCStream());
}


describe('printedValue: the number steps.csv prints', () => {
  it('is the double nearest fmt(v, d) (toFixed), on ties, signed zeros, non-finite values and 200 000 random values', () => {
    const edge = [0, -0, 0.5, 1.5, 2.5, -2.5, 1.0005, 1.0015, 2.675, 0.0005, -0.0005, -0.0004, 1.005, 8.345, 123.4565, 999.9995,
      1e9, 1e9 - 0.5, -1e-12, 1e21, NaN, Infinity, -Infinity, 2 ** 53];
    const r = rng(20261202);
    const values = [...edge];
    for (let i = 0; i < 50_000; i++) values.push((r() < 0.3 ? -1 : 1) * 10 ** (r() * 12 - 4));
    let mismatches = 0;
    for (const v of values) {
      for (const d of [0, 1, 2, 3, 4, 5, 6]) {
        const t = fmt(v, d);
        const want = t === '' ? NaN : Number(t);
        const got = printedValue(v, d);
        if (!Object.is(got, want) && !(Number.isNaN(got) && Number.isNaN(want))) mismatches++;
      }
    }
    expect(mismatches).toBe(0);
  });

  it('survives float32 below F32_LIMIT: the nearest float32 prints back as the same decimal', () => {
    const r = rng(7);
    let mismatches = 0;
    for (let d = 0; d <= 6; d++) {
      for (let i = 0; i < 50_000; i++) {
        const v = (r() < 0.5 ? -1 : 1) * r() * F32_LIMIT[d];
        const t = fmt(v, d);
        if (fmt(Math.fround(printedValue(v, d)), d) !== t) mismatches++;
      }
    }
    expect(mismatches).toBe(0);
  });
});

describe('steps.parquet of the demo\'s first day', () => {
  let table: Table;
  let csvRows: string[][];
  let header: string[];
  beforeAll(async () => {
    const scenario = smallScenario(1);
    await runScenario(scenario, { outDir: path.join(tmp, 'csv'), quiet: true, steps: 'csv' });
    await runScenario(scenario, { outDir: path.join(tmp, 'parquet'), quiet: true, steps: 'parquet' });
    const rows = parse(readFileSync(path.join(tmp, 'csv', 'steps.csv'))) as string[][];
    header = rows[0];
    csvRows = rows.slice(1);
    table = readParquet(path.join(tmp, 'parquet', 'steps.parquet'));
  }, 120_000);

  it('has steps.csv\'s columns in its order, with the documented types', () => {
    const scenario = smallScenario(1);
    expect(table.schema.fields.map((f) => f.name)).toEqual(header);
    const specs = stepsParquetColumns(scenario.weatherCases);
    const want: Record<string, string> = { text: 'Utf8', time: 'Timestamp<MILLISECOND, UTC>', f32: 'Float32', f64: 'Float64', bool: 'Bool' };
    for (const [i, f] of table.schema.fields.entries()) expect(`${f.name} ${String(f.type)}`).toBe(`${f.name} ${want[specs[i].kind]}`);
    const kind = (n: string) => specs.find((s) => s.name === n)!.kind;
    expect([kind('range_km'), kind('doppler_hz'), kind('information_rate_bps_clear'), kind('system_temperature_k_clear')]).toEqual(['f64', 'f64', 'f64', 'f64']);
    expect([kind('elevation_deg'), kind('margin_db_clear'), kind('doppler_rate_hz_s')]).toEqual(['f32', 'f32', 'f32']);
    expect(table.numRows).toBe(csvRows.length);
    expect(csvRows.length).toBeGreaterThan(10_000);
  });

  it('holds every value of steps.csv, after the CSV\'s rounding', () => {
    const specs = stepsParquetColumns(smallScenario(1).weatherCases);
    const bad: string[] = [];
    for (const [c, spec] of specs.entries()) {
      const col = table.getChildAt(c)!;
      for (let r = 0; r < csvRows.length; r++) {
        const text = csvRows[r][c];
        const v = col.get(r) as unknown;
        let ok: boolean;
        switch (spec.kind) {
          case 'text': ok = text === '' ? v === null : v === text; break;
          case 'time': ok = typeof v === 'number' && v === Date.parse(text); break;
          case 'bool': ok = v === (text === 'true'); break;
          case 'f64': ok = text === '' ? Number.isNaN(v) : v === Number(text) && fmt(v as number, spec.decimals) === text; break;
          case 'f32': ok = text === '' ? Number.isNaN(v) : v === Math.fround(Number(text)) && fmt(v as number, spec.decimals) === text; break;
        }
        if (!ok && bad.length < 5) bad.push(`row ${r + 1} ${spec.name}: parquet ${String(v)} csv ${JSON.stringify(text)}`);
      }
    }
    expect(bad).toEqual([]);
  });

  it('is at most a fifth of steps.csv\'s size', () => {
    const pq = readFileSync(path.join(tmp, 'parquet', 'steps.parquet')).length;
    const csv = readFileSync(path.join(tmp, 'csv', 'steps.csv')).length;
    expect(pq / csv).toBeLessThan(0.25);
  });
});

describe('steps.parquet with worker threads', () => {
  it('is byte-identical for 1, 2 and 3 workers (1.5 days)', async () => {
    const scenario = smallScenario(1.5);
    const files: Buffer[] = [];
    for (const workers of [1, 2, 3]) {
      const outDir = path.join(tmp, `w${workers}`);
      await runScenario(scenario, { outDir, quiet: true, steps: 'parquet', workers });
      files.push(readFileSync(path.join(outDir, 'steps.parquet')));
    }
    expect(files[1].equals(files[0])).toBe(true);
    expect(files[2].equals(files[0])).toBe(true);
  }, 180_000);
});

describe('steps.parquet row groups cut across chunks and worker files', () => {
  it('is byte-identical for 1 and 2 workers with 5 000-row groups (a day), and reads back with every row in order', async () => {
    const scenario = smallScenario(1);
    const files: Buffer[] = [];
    for (const workers of [1, 2]) {
      const file = path.join(tmp, `groups-w${workers}.parquet`);
      await runPipelineParallel({ scenario, workers, stepsOut: createWriteStream(file), stepsFormat: 'parquet', parquetRowGroupRows: 5_000 });
      files.push(readFileSync(file));
    }
    expect(files[1].equals(files[0])).toBe(true);
    const t = tableFromIPC(parquetWasm.readParquet(new Uint8Array(files[0])).intoIPCStream());
    const csv = parse(readFileSync(path.join(tmp, 'csv', 'steps.csv'))) as string[][];
    expect(t.numRows).toBe(csv.length - 1);
    expect(t.batches.length).toBeGreaterThan(3);
    const time = t.getChild('time_utc')!;
    const id = t.getChild('pass_id')!;
    for (let r = 0; r < t.numRows; r += 997) expect([id.get(r), new Date(time.get(r) as number).toISOString()]).toEqual([csv[r + 1][0], csv[r + 1][1]]);
  }, 120_000);
});
