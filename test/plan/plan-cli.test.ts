/**
 * `passbudget plan` through the built CLI on one day of the constellation
 * demo: the files, two runs byte-identical, 1 and 2 workers byte-identical,
 * and a located error (exit 2, nothing written) for a station with no antenna.
 * Built CLI: npx tsc -p . first (npm test does).
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CLI, folderBytes, readCsv, removeTempDirs, runCli, tempDir, type CliResult } from '../jobs/helpers.js';

afterAll(removeTempDirs);
const tmp = tempDir('plan-cli');
const FLEET = path.resolve('fixtures/constellation/velka-fleet.tle');
const scenarioFile = path.join(tmp, 'one-day.yaml');
const text = readFileSync(path.resolve('fixtures/constellation/scenario.yaml'), 'utf8')
  .replace('duration: 7d', 'duration: 1d').replaceAll('elements: velka-fleet.tle', `elements: ${JSON.stringify(FLEET)}`);
writeFileSync(scenarioFile, text);
const out = (k: string) => path.join(tmp, k);
let runs: CliResult[];

beforeAll(async () => {
  if (!existsSync(CLI)) throw new Error(`${CLI} is missing: build with npx tsc -p . (npm test does)`);
  runs = [];
  // One after another: the machine has two CPUs.
  runs.push(await runCli(['plan', scenarioFile, '--out', out('a'), '--quiet']));
  runs.push(await runCli(['plan', scenarioFile, '--out', out('b'), '--quiet']));
  runs.push(await runCli(['plan', scenarioFile, '--out', out('w2'), '--quiet', '--workers', '2']));
}, 240_000);

describe('passbudget plan', () => {
  it('exits 0 quietly and writes the run\'s files and the plan\'s', () => {
    for (const r of runs) { expect(r.stderr).toBe(''); expect(r.code).toBe(0); }
    expect([...folderBytes(out('a')).keys()]).toEqual(['contacts.csv', 'contacts.ics', 'contacts.json', 'daily.csv', 'passes.csv', 'passes.ics', 'passes.json', 'plan.json', 'report.html', 'summary.json']);
  });
  it('writes byte-identical files twice, and with 1 and 2 workers', () => {
    const a = folderBytes(out('a'));
    for (const other of ['b', 'w2']) {
      const b = folderBytes(out(other));
      for (const [name, bytes] of a) expect(bytes.equals(b.get(name)!), `${other}/${name}`).toBe(true);
    }
  });
  it('lists contacts with a volume column per weather case, inside the plan\'s totals', () => {
    const t = readCsv(path.join(out('a'), 'contacts.csv'));
    expect(t.header).toEqual(['contact_id', 'satellite', 'station', 'antenna', 'pass_id', 'start_utc', 'end_utc', 'duration_s', 'booked_s', 'links',
      'volume_bits_clear', 'volume_bits_1%', 'volume_mb_clear', 'volume_mb_1%', 'cost_price_units']);
    const plan = JSON.parse(readFileSync(path.join(out('a'), 'plan.json'), 'utf8'));
    expect(t.rows.length).toBe(plan.contacts);
    const cost = t.rows.reduce((s, r) => s + Number(r.cost_price_units), 0);
    expect(cost).toBeCloseTo(plan.cost_price_units, 6);
    // The 1 % case never carries more than clear sky (more attenuation, same contact).
    for (const r of t.rows) expect(Number(r['volume_bits_1%'])).toBeLessThanOrEqual(Number(r.volume_bits_clear));
    expect(plan.gap).toBe(0);
    const report = readFileSync(path.join(out('a'), 'report.html'), 'utf8');
    expect(report).toContain('<section id="plan">');
    expect((report.match(/class="contact"/g) ?? []).length).toBe(plan.contacts);
    const ics = readFileSync(path.join(out('a'), 'contacts.ics'), 'utf8');
    expect((ics.match(/BEGIN:VEVENT/g) ?? []).length).toBe(plan.contacts);
  });
  it('refuses a station with no antenna: one located line, exit 2, no folder', async () => {
    const bad = path.join(tmp, 'bad.yaml');
    writeFileSync(bad, text.replace(/    antennas: &one-dish\n      - name: dish\n        terminals: \[s-feed, x-feed\]/, '    antennas: []').replaceAll('*one-dish', '[{ name: dish, terminals: [s-feed, x-feed] }]'));
    const r = await runCli(['plan', bad, '--out', out('bad'), '--quiet']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/bad\.yaml:\d+ stations\[0\]\.antennas: must have at least 1 item/);
    expect(existsSync(out('bad'))).toBe(false);
  });
});
