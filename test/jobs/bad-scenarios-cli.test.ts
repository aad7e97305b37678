/**
 * Scenario validation at the command line: every case of the scenario
 * helper's bad-scenario catalogue (test/scenario/bad-cases.ts) given to
 * `passbudget run BAD --out DIR` must
 *   - exit with code 2,
 *   - print exactly one line on stderr, naming the file, the line and the
 *     scenario path (`FILE:LINE path: …`; a YAML/JSON syntax error names
 *     `FILE:LINE:COL`), with no stack trace, and nothing on stdout;
 *   - create no output folder, and leave an existing one untouched.
 * Built CLI: run `npx tsc -p .` first (npm test does).
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeBadCases, type WrittenBadCase } from '../scenario/bad-cases.js';
import { CLI, mapLimit, runCli, removeTempDirs, tempDir, type CliResult } from './helpers.js';

afterAll(removeTempDirs);

const tmp = tempDir('bad-cli');
const cases: WrittenBadCase[] = writeBadCases(path.join(tmp, 'cases'));
/** Cases also run against an existing output folder holding a sentinel file. */
const SENTINEL_EVERY = 6;
const SENTINEL = 'keep-me.txt';
const SENTINEL_TEXT = 'an earlier run left this here\n';

interface Outcome { c: WrittenBadCase; fresh: string; fr: CliResult; kept?: string; kr?: CliResult }
let outcomes: Outcome[];

beforeAll(async () => {
  if (!existsSync(CLI)) throw new Error(`${CLI} is missing: build with npx tsc -p . (npm test does)`);
  outcomes = await mapLimit(cases, 3, async (c, i) => {
    const fresh = path.join(tmp, 'out', `fresh-${i}`);
    const fr = await runCli(['run', c.file, '--out', fresh, '--quiet']);
    if (i % SENTINEL_EVERY !== 0) return { c, fresh, fr };
    const kept = path.join(tmp, 'out', `kept-${i}`);
    mkdirSync(kept, { recursive: true });
    writeFileSync(path.join(kept, SENTINEL), SENTINEL_TEXT);
    const kr = await runCli(['run', c.file, '--out', kept, '--quiet']);
    return { c, fresh, fr, kept, kr };
  });
});

function checkOneLine(c: WrittenBadCase, r: CliResult): void {
  const label = `${c.name}: stderr ${JSON.stringify(r.stderr)}`;
  expect(r.code, label).toBe(2);
  expect(r.stdout, label).toBe('');
  expect(r.stderr.endsWith('\n'), label).toBe(true);
  const lines = r.stderr.slice(0, -1).split('\n');
  expect(lines, label).toHaveLength(1);
  const line = lines[0];
  expect(line.startsWith('passbudget: '), label).toBe(true);
  expect(line, label).not.toMatch(/internal error|\bat .+:\d+:\d+\)?$|Error:|ZodError/);
  const where = c.path === null ? `${c.file}:${c.line}:` : `${c.file}:${c.line} ${c.path}:`;
  expect(line, label).toContain(where);
  for (const w of c.contains) expect(line, label).toContain(w);
}

describe('passbudget run on a bad scenario', () => {
  it('the catalogue is large enough to mean something', () => {
    expect(cases.length).toBeGreaterThanOrEqual(20);
  });

  it.each(cases.map((c, i) => [c.name, i] as const))('%s: exit 2, one located line, no output folder', (_name, i) => {
    const o = outcomes[i];
    checkOneLine(o.c, o.fr);
    expect(existsSync(o.fresh), `${o.c.name}: ${o.fresh} must not exist`).toBe(false);
  });

  it('no staging folder or partial file is left beside the output folders', () => {
    // The only entries are the sentinel folders this test made (staging would be `.NAME.partial-*`).
    const entries = readdirSync(path.join(tmp, 'out')).sort();
    expect(entries).toEqual(outcomes.filter((o) => o.kept).map((o) => path.basename(o.kept!)).sort());
  });

  it('an existing output folder keeps exactly its sentinel file', () => {
    const withSentinel = outcomes.filter((o) => o.kept);
    expect(withSentinel.length).toBeGreaterThanOrEqual(5);
    for (const o of withSentinel) {
      checkOneLine(o.c, o.kr!);
      expect(readdirSync(o.kept!), o.c.name).toEqual([SENTINEL]);
      expect(readFileSync(path.join(o.kept!, SENTINEL), 'utf8'), o.c.name).toBe(SENTINEL_TEXT);
    }
  });
});
