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
});
