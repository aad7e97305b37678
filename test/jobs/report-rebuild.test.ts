/**
 * `passbudget report DIR` rebuilds the report from an output folder with the
 * same bounded data a run hands it: the same pass sections drawn in detail and
 * the margin envelope over every step (read back from steps.csv).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadScenario } from '../../src/scenario/index.js';
import { runScenario } from '../../src/jobs/run.js';
import { loadReportInput, rebuildReport } from '../../src/jobs/report.js';
import { summaryFromJson } from '../../src/output/json.js';
import { allKeys, badKeys } from '../output/jsonKeys.js';
import { removeTempDirs, tempDir, writeDemoCopy } from './helpers.js';

afterAll(removeTempDirs);

describe('report rebuilt from an output folder', () => {
  it('draws the same pass sections and an envelope over every step', async () => {
    const dir = tempDir('rebuild');
    const run = await runScenario(loadScenario(writeDemoCopy(dir, '1d')), { outDir: path.join(dir, 'out'), quiet: true, steps: true });
    const sections = (html: string) => (html.match(/<details class="pass/g) ?? []).length;
    const before = readFileSync(path.join(run.outDir, 'report.html'), 'utf8');
    const input = await loadReportInput(run.outDir);
    expect(input.passes.length).toBe(run.pipeline.passLinks.length);
    expect(input.envelopes?.length).toBeGreaterThan(0);
    // envelope bins read back from steps.csv (3-decimal margins) agree with the run's to the file's rounding
    const runEnv = run.pipeline.envelopes.filter((e) => e.link === 'x-band' && e.weather === 'clear');
    const lowest = Math.min(...runEnv.flatMap((e) => [...e.minDB].filter(Number.isFinite)));
    const back = input.envelopes!.find((e) => e.link === 'x-band' && e.weather === 'clear')!;
    expect(Math.min(...back.bins.map((b) => b.minDB))).toBeCloseTo(lowest, 3);
    const after = readFileSync(await rebuildReport(run.outDir), 'utf8');
    expect(sections(after)).toBe(sections(before));
    expect(after).toContain('every step of every pass');
  });

  it('reads steps.parquet as it reads steps.csv: the same series and envelope, to the float32 of the printed decimals', async () => {
    const dir = tempDir('rebuild-parquet');
    const scenario = loadScenario(writeDemoCopy(dir, '1d'));
    const csvRun = await runScenario(scenario, { outDir: path.join(dir, 'csv'), quiet: true, steps: 'csv' });
    const pqRun = await runScenario(scenario, { outDir: path.join(dir, 'parquet'), quiet: true, steps: 'parquet' });
    const a = await loadReportInput(csvRun.outDir);
    const b = await loadReportInput(pqRun.outDir);
    expect(b.series.length).toBe(a.series.length);
    expect(b.series.length).toBeGreaterThan(0);
    let worst = 0;
    const same = (x: number, y: number) => { if (Number.isNaN(x) || Number.isNaN(y)) expect(Number.isNaN(x)).toBe(Number.isNaN(y)); else worst = Math.max(worst, Math.abs(x - y)); };
    for (const [i, s] of a.series.entries()) {
      const t = b.series[i];
      expect([t.passId, t.link, t.timeS.length]).toEqual([s.passId, s.link, s.timeS.length]);
      expect(t.timeS).toEqual(s.timeS);
      s.elevationDeg.forEach((v, j) => same(v, t.elevationDeg[j]));
      s.cases.forEach((c, k) => c.marginDB.forEach((v, j) => same(v, t.cases[k].marginDB[j])));
    }
    expect(b.envelopes?.length).toBe(a.envelopes?.length);
    for (const [i, e] of a.envelopes!.entries()) e.bins.forEach((bin, j) => same(bin.minDB, b.envelopes![i].bins[j].minDB));
    // float32 of a 3-decimal value below 8192 is within 2^-12 of it (stepsParquet.ts F32_LIMIT)
    expect(worst).toBeLessThan(2 ** -12);
    const html = readFileSync(await rebuildReport(pqRun.outDir), 'utf8');
    expect(html).toContain('every step of every pass');
  });

  it('summary.json is snake_case with units in the names, and reads back into the same record', async () => {
    const dir = tempDir('summary-names');
    const run = await runScenario(loadScenario(writeDemoCopy(dir, '6h')), { outDir: path.join(dir, 'out'), quiet: true, steps: false });
    const file = path.join(run.outDir, 'summary.json');
    const json = JSON.parse(readFileSync(file, 'utf8')) as Record<string, unknown>;
    // required_margin_db and horizon_masks_deg are keyed by link and station names.
    const maps = ['required_margin_db', 'horizon_masks_deg'];
    expect(badKeys(json, maps)).toEqual([]);
    const keys = allKeys(json, maps);
    for (const k of ['scenario_file', 'start_utc', 'end_utc', 'step_s', 'duration_d', 'weather_cases', 'network_policy', 'usable_passes', 'usable_min',
      'fixed_volume_bits', 'adaptive_volume_bits', 'daily_volume_bits', 'defaults_applied', 'inputs_sha256', ...maps]) {
      expect(keys.has(k), k).toBe(true);
    }
    for (const old of ['usablePasses', 'fixedVolumeBits', 'inputsSha256', 'requiredMarginDB', 'stepS']) expect(keys.has(old), old).toBe(false);
    expect((json.window as { duration_d: number }).duration_d).toBe(0.25);
    // One conversion each way: what report DIR reads is the run's own record.
    expect(summaryFromJson(json, file)).toEqual(run.summary);
    expect((await loadReportInput(run.outDir)).summary).toEqual(run.summary);
  });

  it('a summary.json with the old camelCase names is refused with one line saying so', () => {
    expect(() => summaryFromJson({ scenario: 'x', scenarioFile: '/a.yaml', weatherCases: ['clear'] }, 'old/summary.json'))
      .toThrow(/^old\/summary\.json: written by an older passbudget \(camelCase keys/);
  });
});
