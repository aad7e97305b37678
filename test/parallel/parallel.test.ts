/**
 * Parallel runs write the same bytes as serial ones: the demo over 1.5 days
 * (a window ending mid-day, so a day is partial), all outputs, steps.csv
 * included, with 1 (in-process), 2 and 3 worker threads. The workers run the
 * built script (dist/sweep/worker.js; `npm run build` first, as CI does).
 */
import { existsSync, readFileSync, readdirSync, rmSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runScenario } from '../../src/jobs/run.js';
import { checkWorkers, runPipelineParallel } from '../../src/sweep/parallel.js';
import { InputError } from '../../src/errors.js';
import { smallScenario } from './scenario.js';

const WORKER = path.resolve(process.cwd(), 'dist/sweep/worker.js');
const tmp = mkdtempSync(path.join(tmpdir(), 'passbudget-parallel-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('parallel run', () => {
  it('needs the built worker script', () => {
    expect(existsSync(WORKER), `missing ${WORKER}: run npm run build`).toBe(true);
  });

  it('writes byte-identical files with 1, 2 and 3 workers (1.5 days, steps.csv included)', async () => {
    const scenario = smallScenario(1.5);
    const dirs: string[] = [];
    const results = [];
    for (const workers of [1, 2, 3]) {
      const outDir = path.join(tmp, `w${workers}`);
      results.push(await runScenario(scenario, { outDir, quiet: true, steps: true, workers }));
      dirs.push(outDir);
    }
    const names = readdirSync(dirs[0]).sort();
    expect(names).toEqual(['daily.csv', 'passes.csv', 'passes.ics', 'passes.json', 'report.html', 'steps.csv', 'summary.json']);
    for (const d of dirs.slice(1)) {
      expect(readdirSync(d).sort()).toEqual(names);
      for (const n of names) {
        const a = readFileSync(path.join(dirs[0], n));
        const b = readFileSync(path.join(d, n));
        expect(b.length, `${d}/${n} size`).toBe(a.length);
        expect(b.equals(a), `${d}/${n} bytes`).toBe(true);
      }
    }
    // Not vacuous: many steps, several chunks, every step written once.
    const steps = readFileSync(path.join(dirs[0], 'steps.csv'), 'utf8').trimEnd().split('\n');
    expect(results[0].pipeline.linkSteps).toBeGreaterThan(20_000);
    expect(steps.length - 1).toBe(results[0].pipeline.linkSteps);
    const keys = new Set(steps.slice(1).map((l) => l.split(',').slice(0, 5).join(',')));
    expect(keys.size).toBe(steps.length - 1);
    // The histograms (mask and rate finders) agree bin for bin too.
    for (let i = 0; i < results[0].pipeline.histograms.length; i++) {
      const h0 = results[0].pipeline.histograms[i];
      const h2 = results[1].pipeline.histograms[i];
      expect(Array.from(h2.mask.volumeBits)).toEqual(Array.from(h0.mask.volumeBits));
      expect(h2.rate ? Array.from(h2.rate.timeS) : null).toEqual(h0.rate ? Array.from(h0.rate.timeS) : null);
    }
  });

  it('builds each elevation table once (in a worker, shared with the others and the main thread), and reports progress to the end', async () => {
    const scenario = smallScenario(0.5);
    let last = [0, 0];
    const p = await runPipelineParallel({ scenario, workers: 2, onProgress: (d, t) => { last = [d, t]; } });
    expect(last[1]).toBeGreaterThan(0);
    expect(last[0]).toBeCloseTo(last[1], 6);
    expect(p.engines.length).toBe(scenario.links.length);
  });

  it('rejects a bad worker count with one located line', () => {
    for (const bad of ['0', '-1', '2.5', 'two', '65', 0, 1.5]) expect(() => checkWorkers(bad)).toThrow(InputError);
    expect(() => checkWorkers('x')).toThrow(/^--workers: "x" is not a worker count \(allowed an integer from 1 to 64\)$/);
    expect(checkWorkers('4')).toBe(4);
  });
});
