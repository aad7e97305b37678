/**
 * Determinism: two `passbudget run` processes on the same scenario, writing
 * into two folders, must give byte-identical files, all of them (steps.csv,
 * passes.csv/json, daily.csv, passes.ics, report.html, summary.json). Nothing
 * may depend on the wall clock, the output path, the process or the order in
 * which asynchronous writes complete. Built CLI: run `npx tsc -p .` first.
 */
import { existsSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CLI, PAIR, folderBytes, runCli, removeTempDirs, tempDir, type CliResult } from './helpers.js';

afterAll(removeTempDirs);

const tmp = tempDir('determinism');
const outA = path.join(tmp, 'a', 'out');
const outB = path.join(tmp, 'b', 'deeper', 'out');
let runs: CliResult[];

beforeAll(async () => {
  if (!existsSync(CLI)) throw new Error(`${CLI} is missing: build with npx tsc -p . (npm test does)`);
  runs = await Promise.all([outA, outB].map((o) => runCli(['run', PAIR, '--out', o, '--quiet'])));
});

describe('two runs of the same scenario', () => {
  it('both exit 0 with nothing on stderr', () => {
    for (const r of runs) {
      expect(r.stderr).toBe('');
      expect(r.code).toBe(0);
    }
  });

  it('write the same set of files', () => {
    const a = [...folderBytes(outA).keys()];
    expect(a).toEqual([...folderBytes(outB).keys()]);
    expect(a).toEqual(['daily.csv', 'passes.csv', 'passes.ics', 'passes.json', 'report.html', 'steps.csv', 'summary.json']);
  });

  it('with byte-identical contents, file by file', () => {
    const a = folderBytes(outA);
    const b = folderBytes(outB);
    const differ: string[] = [];
    for (const [name, bytes] of a) {
      const other = b.get(name)!;
      if (!bytes.equals(other)) {
        let i = 0;
        while (i < bytes.length && i < other.length && bytes[i] === other[i]) i++;
        const line = bytes.subarray(0, i).toString('utf8').split('\n').length;
        differ.push(`${name}: ${bytes.length} vs ${other.length} bytes, first difference at byte ${i} (line ${line})`);
      }
    }
    expect(differ).toEqual([]);
  });
});
