import { mkdtempSync, readFileSync, createWriteStream, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { CsvStreamWriter, fmt, type CsvCell } from '../../src/output/csv.js';

const dir = mkdtempSync(path.join(tmpdir(), 'passbudget-csv-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('CsvStreamWriter', () => {
  it('writes every row once even when the caller reuses one array (stringifier buffering)', async () => {
    const file = path.join(dir, 'rows.csv');
    const w = new CsvStreamWriter(createWriteStream(file, { highWaterMark: 64 }), ['k', 'name', 'ok']);
    const row: CsvCell[] = [];
    for (let k = 0; k < 5000; k++) {
      row[0] = k; row[1] = k % 7 === 0 ? 'a, "quoted" name' : `n${k}`; row[2] = k % 2 === 0;
      await w.write(row);
    }
    await w.close();
    const rows = parse(readFileSync(file), { columns: true }) as Record<string, string>[];
    expect(rows.length).toBe(5000);
    rows.forEach((r, k) => {
      expect(Number(r.k)).toBe(k);
      expect(r.name).toBe(k % 7 === 0 ? 'a, "quoted" name' : `n${k}`);
      expect(r.ok).toBe(k % 2 === 0 ? 'true' : 'false');
    });
  });

  it('fmt gives fixed decimals, no negative zero, empty for non-finite', () => {
    expect(fmt(1.23456, 3)).toBe('1.235');
    expect(fmt(-0.0001, 3)).toBe('0.000');
    expect(fmt(NaN, 2)).toBe('');
    expect(fmt(Infinity, 2)).toBe('');
    expect(fmt(null, 2)).toBe('');
  });
});
