/**
 * Scenario inputs that used to slip through or end as internal errors: YAML
 * aliases (bombs, unresolved, self-containing), nesting past the parser's
 * limits, windows far from the element epoch, a folder given as a file, and
 * the renamed network policy. Each rejection is one `InputError` line with
 * the place in the file.
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { loadScenario, parseScenarioText } from '../../src/scenario/index.js';
import { MAX_EXPANDED_VALUES, MAX_NESTING, parseScenarioSource } from '../../src/scenario/source.js';
import { baseText, BASE_SCENARIO } from './bad-cases.js';

const dir = mkdtempSync(path.join(os.tmpdir(), 'passbudget-hardening-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function rejection(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    const msg = (e as Error).message;
    expect(msg.split('\n')).toHaveLength(1);
    return msg;
  }
  throw new Error('expected a rejection');
}

/** A YAML document of `levels` nested anchors, each a list of 9 aliases of the one before: 9^levels values. */
function aliasBomb(levels: number): string {
  const lines = ['a0: &a0 [x, x, x, x, x, x, x, x, x]'];
  for (let k = 1; k <= levels; k++) lines.push(`a${k}: &a${k} [${Array(9).fill(`*a${k - 1}`).join(', ')}]`);
  return `${lines.join('\n')}\n`;
}

describe('YAML aliases and nesting', () => {
  it('an alias bomb is refused at the alias that takes the expansion past the bound, before any value is built', () => {
    // Values counted are nodes (every scalar, list and mapping): level 0 has 10, level k has 1 + 9 × level k−1, so
    // levels 0–4 hold 74 732 with the keys and level 5 (line 6) passes 100 000 at its first alias.
    const nodes = [10];
    for (let k = 1; k <= 5; k++) nodes.push(1 + 9 * nodes[k - 1]);
    expect(nodes.slice(0, 5).reduce((a, b) => a + b, 0) + 5).toBeLessThan(MAX_EXPANDED_VALUES);
    expect(nodes.slice(0, 5).reduce((a, b) => a + b, 0) + 6 + nodes[4]).toBeGreaterThan(MAX_EXPANDED_VALUES);
    const msg = rejection(() => parseScenarioSource(aliasBomb(6), 'bomb.yaml'));
    expect(msg).toMatch(/^bomb\.yaml:6:10: YAML aliases expand the document to more than 100000 values/);
    // Four levels: a4 expands to 9^5 x's (a0 holds 9): accepted, and the values are all there.
    const ok = parseScenarioSource(aliasBomb(4), 'four.yaml').value as Record<string, unknown[]>;
    expect(JSON.stringify(ok.a4).split('"x"').length - 1).toBe(9 ** 5);
  });

  it('the same bomb inside a real scenario stops at the bomb, with no internal error', () => {
    const text = baseText('yaml').replace('name: base-check', `name: base-check\ndescription: &d0 [x, x, x, x, x, x, x, x, x]\n${
      [1, 2, 3, 4, 5, 6, 7].map((k) => `x${k}: &d${k} [${Array(9).fill(`*d${k - 1}`).join(', ')}]`).join('\n')}`);
    const msg = rejection(() => parseScenarioText(text, 'bomb.yaml', path.dirname(BASE_SCENARIO)));
    // line 5 is description (level 0), x5 on line 10 is level 5
    expect(msg).toMatch(/^bomb\.yaml:10:\d+: YAML aliases expand/);
  });

  it.each([
    ['unresolved alias', 'a: 1\nb:\n  c: *nope\n', /^u\.yaml:3:6: YAML alias \*nope has no anchor &nope before it/],
    ['alias before its anchor', 'a: *later\nb: &later 1\n', /^u\.yaml:1:4: YAML alias \*later has no anchor/],
    ['alias inside its own anchor', 'a: &x [1, *x]\n', /^u\.yaml:1:11: YAML alias \*x sits inside the value it names/],
    [`nesting past ${MAX_NESTING} levels`, `a: ${'['.repeat(70)}${']'.repeat(70)}\n`, /^u\.yaml:1:\d+: nested more than 64 levels deep/],
    ['nesting past the parser itself', `${'['.repeat(20_000)}${']'.repeat(20_000)}`, /^u\.yaml:1:\d+: nested too deeply for the YAML\/JSON parser/],
  ])('%s', (_n, text, re) => {
    expect(rejection(() => parseScenarioSource(text, 'u.yaml'))).toMatch(re);
  });

  it('plain aliases still work: one spacecraft antenna written once and used by two links', () => {
    const text = baseText('yaml')
      .replace('          antenna:\n            type: cosine-power', '          antenna: &patch\n            type: cosine-power')
      .replace('          antenna:\n            type: isotropic\n', '          antenna: *patch\n');
    expect(text).toContain('antenna: *patch');
    const s = parseScenarioText(text, 'alias.yaml', path.dirname(BASE_SCENARIO));
    const x = s.links.find((l) => l.name === 'x-dl')!;
    const sdl = s.links.find((l) => l.name === 's-dl')!;
    expect(sdl.spacecraft.antenna).toEqual(x.spacecraft.antenna);
    expect(sdl.spacecraft.antenna).toMatchObject({ kind: 'cosine-power', peakGainDBi: 10, beamwidthDeg: 50 });
  });
});

describe('window against the element epoch (epoch 2026-11-20T00:00Z)', () => {
  const withWindow = (start: string, duration: string) =>
    baseText('yaml').replace('start: 2026-11-21T00:00:00Z', `start: ${start}`).replace('duration: 2d', `duration: ${duration}`);

  it('a window ending 100 years after the epoch is refused, located at window', () => {
    const text = withWindow('2026-11-21T00:00:00Z', '36525d');
    const msg = rejection(() => parseScenarioText(text, 'w.yaml', path.dirname(BASE_SCENARIO)));
    expect(msg).toMatch(/^w\.yaml:5 window: the window ends 36526\.0 days after the element epoch of TESTSAT-1 \(2026-11-20T00:00:00\.000Z\)/);
    expect(msg).toContain('within 366 days');
  });

  it('367 days after: refused; 366 days after: accepted with a warning on the notices', () => {
    expect(rejection(() => parseScenarioText(withWindow('2026-11-20T00:00:00Z', '367d'), 'w.yaml', path.dirname(BASE_SCENARIO)))).toContain('ends 367.0 days after');
    const s = parseScenarioText(withWindow('2026-11-20T00:00:00Z', '366d'), 'w.yaml', path.dirname(BASE_SCENARIO));
    const w = s.warnings.filter((x) => x.startsWith('window: ends 366.0 days after the element epoch of TESTSAT-1'));
    expect(w).toHaveLength(1);
    expect(s.notices).toContain(w[0]);
  });

  it('a window starting 400 days before the epoch is refused too', () => {
    expect(rejection(() => parseScenarioText(withWindow('2025-10-16T00:00:00Z', '1d'), 'w.yaml', path.dirname(BASE_SCENARIO))))
      .toMatch(/window: the window starts 400\.0 days before the element epoch/);
  });

  it('30 days: no warning; 31 days: the warning', () => {
    const at = (d: string) => parseScenarioText(withWindow('2026-11-20T00:00:00Z', d), 'w.yaml', path.dirname(BASE_SCENARIO)).notices ?? [];
    expect(at('30d').filter((n) => n.startsWith('window:'))).toEqual([]);
    expect(at('31d').filter((n) => n.startsWith('window:'))).toHaveLength(1);
  });
});

describe('a folder given as a file says so', () => {
  it('element path that is a folder', () => {
    const sub = path.join(dir, 'elements-folder');
    mkdirSync(sub, { recursive: true });
    const text = baseText('yaml').replace(/elements: .*\n/, `elements: ${sub}\n`);
    const msg = rejection(() => parseScenarioText(text, 'f.yaml', dir));
    expect(msg).toMatch(/^f\.yaml:\d+ satellites\[0\]\.elements: .*elements-folder is a folder, not an element file/);
    expect(msg).not.toContain('not found');
  });
  it('scenario path that is a folder', () => {
    expect(rejection(() => loadScenario(dir))).toMatch(/cannot read the scenario file: is a folder, not a file/);
  });
});

describe('network policy highest-rate, and its old name', () => {
  const withPolicy = (p: string) => baseText('yaml').replace('  policy: priority\n  order: [Beta, Alpha]\n', `  policy: ${p}\n`);
  it('highest-rate: the rule, no warning', () => {
    const s = parseScenarioText(withPolicy('highest-rate'), 'p.yaml', path.dirname(BASE_SCENARIO));
    expect(s.network).toEqual({ kind: 'highest-rate' });
    expect(s.warnings.join(' ')).not.toContain('deprecated');
  });
  it('best-margin: the same rule, with a deprecation warning naming the line', () => {
    const s = parseScenarioText(withPolicy('best-margin'), 'p.yaml', path.dirname(BASE_SCENARIO));
    expect(s.network).toEqual({ kind: 'highest-rate' });
    const w = s.warnings.filter((x) => x.includes('deprecated'));
    expect(w).toEqual(['p.yaml:11 network.policy: best-margin is deprecated, renamed highest-rate (the rule is unchanged: highest information rate, then margin); write policy: highest-rate']);
    expect(s.notices).toEqual(w);
  });
  it('no network section: highest-rate recorded as the default', () => {
    const s = parseScenarioText(baseText('yaml').replace('network:\n  policy: priority\n  order: [Beta, Alpha]\n', ''), 'p.yaml', path.dirname(BASE_SCENARIO));
    expect(s.network.kind).toBe('highest-rate');
    expect(s.defaultsApplied.find((d) => d.path === 'network.policy')?.value).toBe('highest-rate');
  });
  it('an unknown policy lists the allowed names', () => {
    expect(rejection(() => parseScenarioText(withPolicy('fastest'), 'p.yaml', path.dirname(BASE_SCENARIO))))
      .toMatch(/^p\.yaml:11 network\.policy: must be one of highest-rate, priority, best-margin \(got "fastest"\)/);
  });
});

writeFileSync(path.join(dir, '.keep'), '');
