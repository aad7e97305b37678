/** Every bad scenario of the catalogue is one InputError line naming file, line and path. */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { loadScenario } from '../../src/scenario/index.js';
import { BAD_CASES, baseText, writeBadCases } from './bad-cases.js';

const dir = mkdtempSync(path.join(os.tmpdir(), 'passbudget-bad-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const cases = writeBadCases(dir);

describe('bad scenarios', () => {
  it('the catalogue has at least 20 cases with distinct names', () => {
    expect(BAD_CASES.length).toBeGreaterThanOrEqual(20);
    expect(new Set(BAD_CASES.map((c) => c.name)).size).toBe(BAD_CASES.length);
  });

  it('the unedited base scenario loads in both formats (so each failure comes from its edit)', () => {
    const y = path.join(dir, 'base.yaml');
    const j = path.join(dir, 'base.json');
    writeFileSync(y, baseText('yaml'));
    writeFileSync(j, baseText('json'));
    expect(loadScenario(y).links).toHaveLength(4);
    expect(loadScenario(j).links).toHaveLength(4);
  });

  it.each(cases.map((c) => [c.name, c] as const))('%s', (_name, c) => {
    let err: unknown;
    try {
      loadScenario(c.file);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    const msg = (err as InputError).message;
    expect(msg.split('\n')).toHaveLength(1);
    if (c.path === null) expect(msg.startsWith(`${c.file}:${c.line}:`)).toBe(true);
    else expect(msg.startsWith(`${c.file}:${c.line} ${c.path}: `), msg).toBe(true);
    for (const w of c.contains) expect(msg).toContain(w);
  });
});
