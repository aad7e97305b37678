/**
 * `exact_orbit` (SGP4 at every step) against the default interpolated orbit on
 * the demo (invented satellite and stations), 2 days: the same passes with
 * AOS and LOS within 1 ms, and daily.csv and passes.csv equal within their
 * printed rounding (a value may differ by one unit of its last printed digit,
 * where the two orbits' micrometre difference crosses a rounding boundary).
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { runScenario } from '../../src/jobs/run.js';
import { smallScenario } from '../parallel/scenario.js';

const tmp = mkdtempSync(path.join(tmpdir(), 'passbudget-exact-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

function decimals(text: string): number {
  const i = text.indexOf('.');
  return i < 0 ? 0 : text.length - i - 1;
}

/** Compare two CSV tables cell by cell: text equal, or numbers within one unit of the last printed digit, or times within `timeTolS`. */
function compare(a: string, b: string, timeTolS: number): { cells: number; differing: number; worstTimeS: number } {
  const ra = parse(a) as string[][];
  const rb = parse(b) as string[][];
  expect(rb.length).toBe(ra.length);
  let cells = 0, differing = 0, worstTimeS = 0;
  ra.forEach((row, i) => row.forEach((x, j) => {
    const y = rb[i][j];
    cells++;
    if (x === y) return;
    differing++;
    if (/^\d{4}-\d\d-\d\dT/.test(x)) {
      const d = Math.abs(Date.parse(x) - Date.parse(y)) / 1000;
      worstTimeS = Math.max(worstTimeS, d);
      expect(d, `row ${i} col ${j}: ${x} vs ${y}`).toBeLessThanOrEqual(timeTolS);
      return;
    }
    const unit = 10 ** -decimals(x);
    expect(Math.abs(Number(x) - Number(y)), `row ${i} col ${j}: ${x} vs ${y}`).toBeLessThanOrEqual(unit * 1.0000001);
  }));
  return { cells, differing, worstTimeS };
}

describe('exact_orbit against the interpolated orbit', () => {
  it('gives the same passes.csv and daily.csv within the printed rounding (AOS/LOS within 1 ms)', async () => {
    const s = smallScenario(2);
    const a = await runScenario(s, { outDir: path.join(tmp, 'interp'), quiet: true, steps: false });
    const b = await runScenario({ ...s, exactOrbit: true }, { outDir: path.join(tmp, 'exact'), quiet: true, steps: false });
    expect(b.pipeline.sgp4Calls).toBeGreaterThan(4 * a.pipeline.sgp4Calls);
    const read = (dir: string, f: string) => readFileSync(path.join(dir, f), 'utf8');
    const passes = compare(read(a.outDir, 'passes.csv'), read(b.outDir, 'passes.csv'), 0.001);
    const daily = compare(read(a.outDir, 'daily.csv'), read(b.outDir, 'daily.csv'), 0);
    console.log(`exact vs interpolated orbit, 2 days: passes.csv ${passes.differing} of ${passes.cells} cells differ in the last digit (times by ≤ ${(passes.worstTimeS * 1e3).toFixed(0)} ms); daily.csv ${daily.differing} of ${daily.cells}`);
    expect(passes.differing).toBeLessThan(passes.cells / 100);
  });
});
