/**
 * The what-if data of a run's report, recomputed in Node with the page's
 * module (analysis/whatIf.ts) and no change: the network and station daily
 * volumes and usable passes of the run itself (daily rows of the same run;
 * volumes within 0.5 %: C/N0 is carried to 0.001 dB, so a step within
 * 0.0005 dB of the usable threshold can flip; usable passes equal). The same
 * from `passbudget report DIR` (read back from steps.csv), the one-line
 * reason when a folder has no steps, and the column code round trip.
 * (The demo week against reruns of changed scenarios: test/browser/whatif.test.ts.)
 */
import { copyFileSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DailyRow } from '../../src/analysis/types.js';
import { decodeIntColumn, decodeWhatIfPayload, encodeIntColumn, whatIf, type WhatIfData, type WhatIfPayload } from '../../src/analysis/whatIf.js';
import { rebuildReportWithNotes } from '../../src/jobs/report.js';
import { runScenario } from '../../src/jobs/run.js';
import { loadScenario } from '../../src/scenario/index.js';
import { WHATIF_MISSING } from '../../src/sweep/whatIfCollect.js';
import { removeTempDirs, tempDir, writeDemoCopy } from './helpers.js';

afterAll(removeTempDirs);

const fromB64 = (s: string) => new Uint8Array(Buffer.from(s, 'base64'));
const toB64 = (b: Uint8Array) => Buffer.from(b).toString('base64');

function pageData(file: string): WhatIfData {
  const m = readFileSync(file, 'utf8').match(/<script type="application\/json" id="passbudget-whatif-data">(.*?)<\/script>/s);
  if (!m) throw new Error(`${file}: no what-if data block`);
  return decodeWhatIfPayload(JSON.parse(m[1]) as WhatIfPayload, fromB64);
}

function expectLikeRun(data: WhatIfData, daily: DailyRow[]): void {
  for (const link of ['uhf-tm', 's-band', 'x-band']) {
    const r = whatIf(data, { link });
    for (const [weather, c] of Object.entries(r.cases)) {
      for (const [station, d] of [['(network)', c.network] as const, ...Object.entries(c.stations)]) {
        const rows = daily.filter((x) => x.link === link && x.weather === weather && x.station === station);
        expect(d.days_utc).toEqual(rows.map((x) => x.dayUtc));
        expect(d.usable_passes, `${link} ${weather} ${station}`).toBe(rows.reduce((a, x) => a + x.usablePasses, 0));
        d.daily_volume_bits.forEach((v, k) => {
          const want = rows[k].adaptiveVolumeBits ?? rows[k].fixedVolumeBits;
          if (want === 0) expect(v).toBe(0);
          else expect(Math.abs(v - want) / want, `${link} ${weather} ${station}`).toBeLessThanOrEqual(0.005);
        });
      }
    }
  }
}

describe('what-if data of a one-day demo run', () => {
  const tmp = tempDir('whatif');
  let daily: DailyRow[];
  let file: string;

  beforeAll(async () => {
    file = writeDemoCopy(tmp, '1d', '2026-11-23T12:00:00Z');
    const r = await runScenario(loadScenario(file), { outDir: path.join(tmp, 'out'), quiet: true, steps: true });
    daily = r.pipeline.daily;
  }, 120_000);

  it('recomputed with no change, gives the run', () => {
    const data = pageData(path.join(tmp, 'out', 'report.html'));
    expect(data.satellites.length).toBe(1);
    expectLikeRun(data, daily);
  });

  it('rebuilt from steps.csv by passbudget report, gives the run', async () => {
    const { file: html, whatIfMissing } = await rebuildReportWithNotes(path.join(tmp, 'out'));
    expect(whatIfMissing).toBeNull();
    expectLikeRun(pageData(html), daily);
  });

  it('rebuilt from steps.parquet by passbudget report, gives the run', async () => {
    const dir = path.join(tmp, 'parquet');
    await runScenario(loadScenario(file), { outDir: dir, quiet: true, steps: 'parquet' });
    const { file: html, whatIfMissing } = await rebuildReportWithNotes(dir);
    expect(whatIfMissing).toBeNull();
    expectLikeRun(pageData(html), daily);
  });

  it('names what is missing when the folder has no steps', async () => {
    const dir = path.join(tmp, 'nosteps');
    await runScenario(loadScenario(file), { outDir: dir, quiet: true, steps: false });
    copyFileSync(path.join(dir, 'report.html'), path.join(dir, 'report-run.html'));
    // The run's own report has the panel without steps (the data comes from the sweep) …
    expectLikeRun(pageData(path.join(dir, 'report-run.html')), daily);
    // … a rebuild from the folder says what it lacks.
    const { whatIfMissing } = await rebuildReportWithNotes(dir);
    expect(whatIfMissing).toMatch(/no steps\.csv or steps\.parquet/);
    expect(readFileSync(path.join(dir, 'report.html'), 'utf8')).not.toContain('passbudget-whatif-data');
  });
});

describe('what-if integer columns', () => {
  it('round-trip through the varint text, large steps and the missing marker included', () => {
    const a = Int32Array.from([0, 1, -1, 63, 64, -65, 2_000_000_000, -2_000_000_000, WHATIF_MISSING, 12_345, 12_346, 2_147_483_647]);
    expect(Array.from(decodeIntColumn(encodeIntColumn(a, toB64), a.length, fromB64))).toEqual(Array.from(a));
  });

  it('codes slowly varying columns in about a byte per value', () => {
    const a = Int32Array.from({ length: 10_000 }, (_, i) => Math.round(60_000 + 3000 * Math.sin(i / 300)));
    expect(fromB64(encodeIntColumn(a, toB64)).length).toBeLessThan(1.05 * a.length);
  });
});
