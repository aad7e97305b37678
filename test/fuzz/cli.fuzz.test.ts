/**
 * The CLI path of the fuzzing: mutated scenario and element documents written
 * to files and given to the built CLI (`passbudget run`, `passbudget passes`)
 * as a user would. Each must exit 0 or 2, never 1; on 2, print exactly the
 * one line the library's loader gives for the same file and write nothing (no
 * output folder, no staging folder, no file); never take longer than 2 s.
 * Scenarios get a one-hour window so that the accepted ones run to the end
 * here; an accepted document whose estimated run is large (a mutation may
 * lengthen the window) is counted and not run. Counts: test/fuzz/budget.ts.
 */
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { estimateRunSize } from '../../src/jobs/runSize.js';
import { loadScenario } from '../../src/scenario/index.js';
import { CLI, removeTempDirs, tempDir } from '../jobs/helpers.js';
import { COUNTS, MAX_MS, SEED, TEST_TIMEOUT_MS } from './budget.js';
import { elementsDocArb, SCENARIO_BASES } from './docs.js';
import { buildDoc, docPlanArb } from './mutate.js';

afterAll(removeTempDirs);

interface Timed { code: number | null; stdout: string; stderr: string; ms: number }

function runTimed(args: string[]): Promise<Timed> {
  return new Promise((done, fail) => {
    const t0 = performance.now();
    const child = spawn(process.execPath, [CLI, ...args], { stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, PASSBUDGET_DEBUG: '' } });
    let stdout = '';
    let stderr = '';
    child.stdout.setEncoding('utf8').on('data', (d) => { stdout += d; });
    child.stderr.setEncoding('utf8').on('data', (d) => { stderr += d; });
    child.on('error', fail);
    child.on('close', (code) => done({ code, stdout, stderr, ms: performance.now() - t0 }));
  });
}

/** Wall time allowed for an accepted document's whole run (ms). */
const MAX_RUN_MS = 4_000;

/** Larger estimated runs are not run here (they are valid, only long). */
const MAX_LINK_STEPS = 3_000;

beforeAll(() => {
  if (!existsSync(CLI)) throw new Error(`${CLI} is missing: build with npx tsc -p . (npm test does)`);
});

describe(`passbudget run on ${COUNTS.cliScenarios} mutated scenarios (seed ${SEED + 1})`, () => {
  it('exit 0 or 2, never 1; on 2 the loader\'s line and nothing written; rejected under 2 s', async () => {
    const dir = tempDir('fuzz-cli-run');
    const short = SCENARIO_BASES.map((b) => ({ ...b, window: { ...(b as { window: object }).window, duration: '1h', end: undefined, step_s: 10 } }));
    const plans = fc.sample(fc.tuple(fc.nat({ max: short.length - 1 }), docPlanArb), { seed: SEED + 1, numRuns: COUNTS.cliScenarios });
    const tally = { rejected: 0, ran: 0, tooLarge: 0, slowest: 0 };
    for (const [i, [b, plan]] of plans.entries()) {
      const file = path.join(dir, `case-${i}.${plan.format}`);
      writeFileSync(file, buildDoc(JSON.parse(JSON.stringify(short[b])), plan));
      const out = path.join(dir, `out-${i}`);
      let expected: string | null = null;
      try {
        const s = loadScenario(file, { outDir: out });
        if (estimateRunSize(s).linkSteps > MAX_LINK_STEPS) { tally.tooLarge++; continue; }
      } catch (e) {
        if (!(e instanceof InputError)) throw e;
        expected = e.message;
      }
      const r = await runTimed(['run', file, '--out', out, '--quiet', '--no-steps']);
      const label = `${file}: ${r.stderr}`;
      tally.slowest = Math.max(tally.slowest, r.ms);
      // A rejection is the input check alone: 2 s. An accepted document runs the whole sweep and writes the
      // report; its fixed start-up (elevation tables of every link) is about 1 s idle on this machine.
      expect(r.ms, label).toBeLessThan(expected !== null ? MAX_MS : MAX_RUN_MS);
      if (expected !== null) {
        tally.rejected++;
        expect(r.code, label).toBe(2);
        expect(r.stderr, label).toBe(`passbudget: ${expected}\n`);
        expect(r.stdout).toBe('');
        expect(existsSync(out), label).toBe(false);
      } else {
        tally.ran++;
        expect(r.code, label).toBe(0);
        expect(existsSync(path.join(out, 'summary.json')), label).toBe(true);
      }
    }
    expect(readdirSync(dir).filter((e) => e.includes('.partial-'))).toEqual([]);
    console.log(`cli run fuzz: ${plans.length} documents, ${tally.rejected} rejected (exit 2), ${tally.ran} ran (exit 0), ${tally.tooLarge} accepted but not run (estimated over ${MAX_LINK_STEPS} link-steps), slowest ${tally.slowest.toFixed(0)} ms`);
  }, TEST_TIMEOUT_MS);
});

describe(`passbudget passes on ${COUNTS.cliElements} generated and mutated element files (seed ${SEED + 2})`, () => {
  it('exit 0 or 2, never 1; on 2 one line and no file; under 2 s', async () => {
    const dir = tempDir('fuzz-cli-passes');
    const docs = fc.sample(elementsDocArb, { seed: SEED + 2, numRuns: COUNTS.cliElements });
    const tally = { rejected: 0, ok: 0, slowest: 0 };
    for (const [i, d] of docs.entries()) {
      const file = path.join(dir, `case-${i}${path.extname(d.label)}`);
      writeFileSync(file, d.text);
      const out = path.join(dir, `passes-${i}.csv`);
      const r = await runTimed(['passes', '--elements', file, '--station', '68.40,17.25,120', '--start', '2026-11-20T00:00:00Z', '--duration', '6h', '--format', 'csv', '--out', out]);
      const label = `${file} (${d.kind}): ${r.stderr}`;
      tally.slowest = Math.max(tally.slowest, r.ms);
      expect(r.ms, label).toBeLessThan(MAX_MS);
      expect([0, 2], label).toContain(r.code);
      if (r.code === 2) {
        tally.rejected++;
        expect(r.stderr.trimEnd().split('\n'), label).toHaveLength(1);
        expect(r.stderr, label).toMatch(/^passbudget: /);
        expect(r.stderr, label).not.toContain('internal error');
        expect(existsSync(out), label).toBe(false);
      } else {
        tally.ok++;
        expect(existsSync(out), label).toBe(true);
      }
    }
    console.log(`cli passes fuzz: ${docs.length} documents, ${tally.rejected} rejected (exit 2), ${tally.ok} accepted (exit 0), slowest ${tally.slowest.toFixed(0)} ms`);
  }, TEST_TIMEOUT_MS);
});
