/**
 * `passbudget passes` end to end through the built CLI (dist/, built by
 * `npm test` or `npx tsc -p .`): a table of malformed inputs, each of which
 * must exit 2 with one located line on stderr, no stack trace, and no output
 * file; and the CSV/JSON field set on a good run.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { withTleChecksum } from '../../src/elements/checksum.js';

const main = path.resolve('dist/cli/main.js');
const tmp = mkdtempSync(path.join(tmpdir(), 'passbudget-passes-'));
const L1 = '1 99981U 26901A   26324.00000000  .00001200  00000-0  15000-3 0  9993';
const L2 = '2 99981  97.4000 123.4567 0011000  90.0000 270.1234 15.22000000  1052';
const DEMO = 'fixtures/demo/orbilux-3.tle';

function file(name: string, text: string): string {
  const p = path.join(tmp, name);
  writeFileSync(p, text);
  return p;
}
/** Run the CLI asynchronously, so the cases of a concurrent block overlap their start-up. */
function run(args: string[]): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((done, fail) => {
    const child = spawn(process.execPath, [main, 'passes', ...args], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = ''; let stderr = '';
    child.stdout.setEncoding('utf8').on('data', (d) => { stdout += d; });
    child.stderr.setEncoding('utf8').on('data', (d) => { stderr += d; });
    child.on('error', fail);
    child.on('close', (code) => done({ code, stdout, stderr }));
  });
}

const omm = JSON.parse(readFileSync('fixtures/tle/orbilux-3.omm.json', 'utf8'));
const badFiles = {
  checksum: file('checksum.tle', `${L1.slice(0, 68)}7\n${L2}\n`),
  short: file('short.tle', `${L1}\n${L2.slice(0, 50)}\n`),
  mismatch: file('mismatch.tle', `${L1}\n${withTleChecksum(`2 99982${L2.slice(7, 68)}`)}\n`),
  // A TLE cannot hold e >= 1 in its implied-decimal field; written with a point, it is refused there.
  eccTle: file('ecc.tle', `${L1}\n${withTleChecksum(`${L2.slice(0, 26)}1.00000${L2.slice(33, 68)}`)}\n`),
  eccOmm: file('ecc.json', JSON.stringify([{ ...omm[0], ECCENTRICITY: 1.05 }], null, 2)),
  meanMotion: file('n0.tle', `${L1}\n${withTleChecksum(`${L2.slice(0, 52)} 0.00000000${L2.slice(63, 68)}`)}\n`),
  json: file('broken.json', '[\n  { "OBJECT_NAME": "X",\n  ]\n'),
  xml: file('ecc.xml', readFileSync('fixtures/tle/orbilux-3.omm.xml', 'utf8').replace('<ECCENTRICITY>0.0011', '<ECCENTRICITY>1.05')),
};
const st = ['--station', '68.40,17.25,120'];

const cases: { name: string; args: string[]; where: RegExp }[] = [
  { name: 'bad checksum', args: ['--elements', badFiles.checksum, ...st], where: /checksum\.tle:1:69: checksum is 7/ },
  { name: 'short line', args: ['--elements', badFiles.short, ...st], where: /short\.tle:2:51: element line is 50 characters/ },
  { name: 'mismatched catalogue numbers', args: ['--elements', badFiles.mismatch, ...st], where: /mismatch\.tle:2:3: catalogue number 99982 does not match/ },
  { name: 'eccentricity >= 1 in a TLE (correct checksum)', args: ['--elements', badFiles.eccTle, ...st], where: /ecc\.tle:2:27: eccentricity/ },
  { name: 'eccentricity >= 1 in OMM JSON', args: ['--elements', badFiles.eccOmm, ...st], where: /ecc\.json:\d+:5: ECCENTRICITY is 1\.05 \(allowed 0 <= e < 1\)/ },
  { name: 'eccentricity >= 1 in OMM XML', args: ['--elements', badFiles.xml, ...st], where: /ecc\.xml:22:11: ECCENTRICITY is "1\.05" \(allowed 0 <= e < 1\)/ },
  { name: 'a folder as elements file', args: ['--elements', tmp, ...st], where: /cannot read the elements file: is a folder, not a file/ },
  { name: 'mean motion 0 (correct checksum)', args: ['--elements', badFiles.meanMotion, ...st], where: /n0\.tle:2:53: mean motion is 0/ },
  { name: 'broken JSON', args: ['--elements', badFiles.json, ...st], where: /broken\.json:3:3: not valid JSON/ },
  { name: 'missing elements file', args: ['--elements', path.join(tmp, 'nope.tle'), ...st], where: /nope\.tle: cannot read the elements file: not found \(allowed/ },
  { name: 'bad start date', args: ['--elements', DEMO, ...st, '--start', '2026-11-31T00:00:00Z'], where: /^passbudget: --start: not an ISO-8601 date-time/ },
  { name: 'bad end date', args: ['--elements', DEMO, ...st, '--end', 'tomorrow'], where: /^passbudget: --end: not an ISO-8601/ },
  { name: 'end before start', args: ['--elements', DEMO, ...st, '--start', '2026-11-21T00:00:00Z', '--end', '2026-11-20T00:00:00Z'], where: /^passbudget: --end: .* is not after the window start/ },
  { name: 'end and duration together', args: ['--elements', DEMO, ...st, '--end', '2026-11-21T00:00:00Z', '--duration', '1d'], where: /^passbudget: --end: given together with --duration/ },
  { name: 'bad duration', args: ['--elements', DEMO, ...st, '--duration', '3 fortnights'], where: /^passbudget: --duration: not a duration/ },
  { name: 'unknown flag', args: ['--elements', DEMO, ...st, '--frobnicate'], where: /unknown option '--frobnicate'/ },
  { name: 'latitude 91', args: ['--elements', DEMO, '--station', '91,17.25,120'], where: /^passbudget: --station 91,17\.25,120: latitude 91 out of range \(allowed -90 to 90/ },
  { name: 'station not numbers', args: ['--elements', DEMO, '--station', 'north,east'], where: /^passbudget: --station north,east: station "north,east" is not LAT,LON/ },
  { name: 'no station', args: ['--elements', DEMO], where: /^passbudget: --station: at least one station/ },
  { name: 'too many station names', args: ['--elements', DEMO, ...st, '--station-name', 'A', '--station-name', 'B'], where: /^passbudget: --station-name: 2 names for 1 stations/ },
  { name: 'bad mask', args: ['--elements', DEMO, ...st, '--mask', 'low'], where: /^passbudget: --mask: "low" is not a mask elevation/ },
  { name: 'mask 95', args: ['--elements', DEMO, ...st, '--mask', '95'], where: /^passbudget: --mask: "95" is not a mask elevation \(allowed -5 to 89/ },
  { name: 'unknown format', args: ['--elements', DEMO, ...st, '--format', 'xml'], where: /^passbudget: --format: unknown format "xml" \(allowed table, csv, json\)/ },
  { name: 'bad tz', args: ['--elements', DEMO, ...st, '--tz', 'Mars/Olympus'], where: /^passbudget: --tz: unknown time zone "Mars\/Olympus"/ },
  { name: 'out folder missing', args: ['--elements', DEMO, ...st, '--out', path.join(tmp, 'no-such-dir', 'p.csv')], where: /^passbudget: --out: folder .* does not exist/ },
];

describe.concurrent('passbudget passes: malformed input', () => {
  it('the CLI is built', () => {
    expect(existsSync(main), `missing ${main}: run "npm run build" (or "npx tsc -p .") before these tests`).toBe(true);
  });
  it.each(cases.map((c, i) => ({ ...c, i })))('$name -> exit 2, one located line, no output file', async ({ args, where, i }) => {
    if (!existsSync(main)) throw new Error(`missing ${main}: run "npm run build" first`);
    const out = path.join(tmp, `out-${i}.csv`);
    const hasOut = args.includes('--out');
    const r = await run(hasOut ? args : [...args, '--out', out, '--format', args.includes('--format') ? args[args.indexOf('--format') + 1] : 'csv']);
    expect(r.code).toBe(2);
    const lines = r.stderr.trimEnd().split('\n');
    expect(lines.length, r.stderr).toBe(1);
    expect(lines[0]).toMatch(where);
    expect(r.stderr).not.toMatch(/\n\s+at |Error:/);
    expect(r.stdout).toBe('');
    expect(existsSync(out)).toBe(false);
  });
});

describe('passbudget passes: good runs', () => {
  it('OMM XML, OMM JSON and the TLE of the same elements give the same passes, byte for byte', async () => {
    const args = ['--station', 'Kaldfjell=68.40,17.25,120', '--station', 'Maraka=0.45,37.6,1600', '--mask', '5', '--start', '2026-11-20T00:00:00Z', '--duration', '48h', '--format', 'csv'];
    const [x, j, t] = await Promise.all(['fixtures/tle/orbilux-3.omm.xml', 'fixtures/tle/orbilux-3.omm.json', DEMO].map((f) => run(['--elements', f, ...args])));
    expect(x.code, x.stderr).toBe(0);
    expect(x.stdout.split('\n').length).toBeGreaterThan(10);
    expect(x.stdout).toBe(t.stdout);
    expect(j.stdout).toBe(t.stdout);
  });

  it('CSV to a file carries exactly the pass fields; JSON the same; epoch warning on stderr', async () => {
    const csvPath = path.join(tmp, 'passes.csv');
    const r = await run(['--elements', DEMO, '--station', 'Kaldfjell=68.40,17.25,120', '--mask', '5', '--duration', '24h', '--format', 'csv', '--out', csvPath]);
    expect(r.code, r.stderr).toBe(0);
    const csv = readFileSync(csvPath, 'utf8').trim().split('\n');
    expect(csv[0]).toBe('satellite,station,aos_utc,tca_utc,los_utc,duration_s,max_elevation_deg,aos_azimuth_deg,tca_azimuth_deg,los_azimuth_deg,min_range_km,clipped_start,clipped_end');
    expect(csv.length).toBeGreaterThan(8);
    expect(csv[1]).toMatch(/^ORBILUX-3,Kaldfjell,2026-11-20T\d\d:\d\d:\d\d\.\d{3}Z,/);
    const j = await run(['--elements', DEMO, '--station', 'Kaldfjell=68.40,17.25,120', '--mask', '5', '--duration', '24h', '--format', 'json']);
    const rows = JSON.parse(j.stdout);
    expect(rows.length).toBe(csv.length - 1);
    expect(Object.keys(rows[0])).toEqual(csv[0].split(','));
    expect(rows[0].aos_utc).toBe(csv[1].split(',')[2]);
    const w = await run(['--elements', DEMO, ...st, '--start', '2026-12-05T00:00:00Z', '--duration', '2h']);
    expect(w.code).toBe(0);
    expect(w.stderr).toMatch(/warning: ORBILUX-3 \(99981\): window starts 15\.0 days after the element epoch/);
    const t = await run(['--elements', DEMO, ...st, '--duration', '6h', '--tz', 'Europe/Oslo']);
    expect(t.code).toBe(0);
    expect(t.stdout).toMatch(/AOS \(Europe\/Oslo\)/);
    expect(t.stdout).toMatch(/2026-11-20 01:\d\d:\d\d \+01:00/);
  });
});
