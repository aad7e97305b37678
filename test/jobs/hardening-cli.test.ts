/**
 * `passbudget run` at the edges, through the built CLI: the run-size line
 * (checked against the run's own steps.csv), notices on stderr even with
 * --quiet, a full disk (a 1 MB tmpfs, when this machine lets the test mount
 * one) and an unwritable folder (exit 1, one line naming the folder, no
 * staging left), stale staging folders of a killed run removed at the next
 * run, --version and the examples at the end of every --help.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { STAGING_MARKER } from '../../src/output/atomic.js';
import { CLI, ROOT, removeTempDirs, runCli, tempDir, writeDemoCopy } from './helpers.js';

afterAll(removeTempDirs);

const tmp = tempDir('hardening-cli');
let sixHours: string;

beforeAll(() => {
  if (!existsSync(CLI)) throw new Error(`${CLI} is missing: build with npx tsc -p . (npm test does)`);
  sixHours = writeDemoCopy(tmp, '6h');
});

const oneLine = (s: string) => s.trimEnd().split('\n');

describe('the run-size line', () => {
  it('before sweeping: grid steps exact, link-steps and steps.csv bytes within 15 % of what a 1-day run wrote', async () => {
    // The estimate is a long-run average of time in view; one day (15 orbits) is within 10 % of it for the demo.
    mkdirSync(path.join(tmp, 'day'));
    const out = path.join(tmp, 'size');
    const r = await runCli(['run', writeDemoCopy(path.join(tmp, 'day'), '1d'), '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const line = r.stderr.split('\n').find((l) => l.startsWith('passbudget: run size: '));
    expect(line, r.stderr).toBeDefined();
    // 1 d at 1 s: 86 401 instants of the grid (both ends included).
    expect(line).toContain('86.4 k grid steps of 1 s');
    expect(line).toContain('estimated: time in view from each orbit');
    const m = /about ([\d.]+)( k)? link-steps in view over 8 links; steps\.csv about ([\d.]+) MB/.exec(line!);
    expect(m, line).not.toBeNull();
    const rows = readFileSync(path.join(out, 'steps.csv'), 'utf8').trimEnd().split('\n').length - 1;
    const bytes = readFileSync(path.join(out, 'steps.csv')).length;
    expect(Math.abs(Number(m![1]) * (m![2] ? 1e3 : 1) / rows - 1)).toBeLessThan(0.15);
    expect(Math.abs(Number(m![3]) * 1e6 / bytes - 1)).toBeLessThan(0.15);
  });

  it('not with --quiet; with --no-steps it says steps.csv is not written', async () => {
    const q = await runCli(['run', sixHours, '--out', path.join(tmp, 'quiet'), '--quiet', '--no-steps']);
    expect(q.code).toBe(0);
    expect(q.stderr).toBe('');
    const n = await runCli(['run', sixHours, '--out', path.join(tmp, 'nosteps'), '--no-steps']);
    expect(n.stderr).toMatch(/steps not written \(steps\.csv would be about [\d.]+ MB\)/);
  });

  it('with --steps parquet: steps.parquet and its estimate, within 25 % of what a 1-day run wrote', async () => {
    mkdirSync(path.join(tmp, 'day-pq'));
    const out = path.join(tmp, 'size-pq');
    const r = await runCli(['run', writeDemoCopy(path.join(tmp, 'day-pq'), '1d'), '--out', out, '--steps', 'parquet']);
    expect(r.code, r.stderr).toBe(0);
    const m = /steps\.parquet about ([\d.]+) MB \(steps\.csv would be about [\d.]+ MB\)/.exec(r.stderr);
    expect(m, r.stderr).not.toBeNull();
    expect(existsSync(path.join(out, 'steps.csv'))).toBe(false);
    const bytes = readFileSync(path.join(out, 'steps.parquet')).length;
    expect(Math.abs(Number(m![1]) * 1e6 / bytes - 1)).toBeLessThan(0.25);
  });

  it('--steps with an unknown format: one line naming the allowed ones, exit 2, no output folder', async () => {
    const out = path.join(tmp, 'bad-steps');
    const r = await runCli(['run', sixHours, '--out', out, '--steps', 'xlsx']);
    expect(r.code).toBe(2);
    expect(oneLine(r.stderr)).toEqual(['passbudget: --steps: "xlsx" is not a steps format (allowed: csv, parquet, none)']);
    expect(existsSync(out)).toBe(false);
  });
});

describe('notices on stderr, even with --quiet', () => {
  it('the deprecated policy name: on stderr and in summary.json warnings', async () => {
    const text = readFileSync(sixHours, 'utf8').replace(/network:\n(\s+)policy: \S+/, 'network:\n$1policy: best-margin');
    const file = path.join(tmp, 'old-policy.yaml');
    writeFileSync(file, text.includes('policy: best-margin') ? text : `${text}network:\n  policy: best-margin\n`);
    const out = path.join(tmp, 'old-policy');
    const r = await runCli(['run', file, '--out', out, '--quiet', '--no-steps']);
    expect(r.code, r.stderr).toBe(0);
    expect(oneLine(r.stderr)).toHaveLength(1);
    expect(r.stderr).toMatch(/^passbudget: warning: .*network\.policy: best-margin is deprecated, renamed highest-rate/);
    const summary = JSON.parse(readFileSync(path.join(out, 'summary.json'), 'utf8')) as { warnings: string[]; network_policy: string };
    expect(summary.warnings.some((w) => w.includes('best-margin is deprecated'))).toBe(true);
    expect(summary.network_policy).toContain('highest information rate, then margin');
  });
});

describe('bad input and failed writes: one line, the right exit code, nothing left behind', () => {
  it('an alias bomb: exit 2, located, no output folder', async () => {
    const lines = ['a0: &a0 [x, x, x, x, x, x, x, x, x]'];
    for (let k = 1; k <= 8; k++) lines.push(`a${k}: &a${k} [${Array(9).fill(`*a${k - 1}`).join(', ')}]`);
    const file = path.join(tmp, 'bomb.yaml');
    writeFileSync(file, `${lines.join('\n')}\n`);
    const out = path.join(tmp, 'bomb-out');
    const r = await runCli(['run', file, '--out', out]);
    expect(r.code).toBe(2);
    expect(oneLine(r.stderr)).toHaveLength(1);
    expect(r.stderr).toMatch(new RegExp(`^passbudget: ${file.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')}:6:\\d+: YAML aliases expand`));
    expect(r.stderr).not.toContain('internal error');
    expect(existsSync(out)).toBe(false);
  });

  it('an output folder under a file (unwritable): exit 1, one line naming the folder, not an internal error', async () => {
    const blocker = path.join(tmp, 'a-file');
    writeFileSync(blocker, 'x');
    const r = await runCli(['run', sixHours, '--out', path.join(blocker, 'out'), '--quiet']);
    expect(r.code).toBe(1);
    expect(oneLine(r.stderr)).toHaveLength(1);
    expect(r.stderr).toMatch(/^passbudget: .*a-file\/out: cannot create the folder .*a-file: a file stands where a folder should go/);
    expect(r.stderr).not.toContain('internal error');
  });

  describe('a full disk (1 MB tmpfs)', () => {
    const mnt = path.join(tmp, 'small-disk');
    let mounted = false;
    beforeAll(() => {
      mkdirSync(mnt, { recursive: true });
      mounted = spawnSync('mount', ['-t', 'tmpfs', '-o', 'size=1m', 'tmpfs', mnt]).status === 0;
      if (!mounted) console.warn(`SKIPPED full-disk check: cannot mount a tmpfs at ${mnt} (needs root)`);
    });
    afterAll(() => { if (mounted) spawnSync('umount', [mnt]); });

    it('exit 1, one line with the folder, the file, the cause and the space needed; earlier outputs kept; no staging', async ({ skip }) => {
      if (!mounted) skip();
      const out = path.join(mnt, 'run');
      mkdirSync(out);
      writeFileSync(path.join(out, 'earlier.txt'), 'from an earlier run\n');
      const r = await runCli(['run', sixHours, '--out', out, '--quiet']);
      expect(r.code, r.stderr).toBe(1);
      expect(oneLine(r.stderr)).toHaveLength(1);
      expect(r.stderr).toMatch(new RegExp(`^passbudget: ${out.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')}: cannot write steps\\.csv: no space left on the device \\(.*written before it failed; the run needs about [\\d.]+ MB for steps\\.csv`));
      expect(r.stderr).not.toContain('internal error');
      expect(readdirSync(mnt)).toEqual(['run']);
      expect(readdirSync(out)).toEqual(['earlier.txt']);
    });
  });
});

describe('stale staging folders', () => {
  it('a run killed with SIGKILL leaves its marked staging folder; the next run into the same place removes it, and only it', async () => {
    mkdirSync(path.join(tmp, 'kill'));
    const scenario = writeDemoCopy(path.join(tmp, 'kill'), '1d');
    const out = path.join(tmp, 'kill', 'out');
    // A staging folder without the marker (not ours) and one whose run is alive (this test's process): both stay.
    const foreign = path.join(tmp, 'kill', '.out.partial-foreign');
    const alive = path.join(tmp, 'kill', '.out.partial-alive');
    mkdirSync(foreign);
    mkdirSync(alive);
    writeFileSync(path.join(alive, STAGING_MARKER), JSON.stringify({ tool: 'passbudget', pid: process.pid, host: hostname(), startedUtc: '' }));
    const child = spawn(process.execPath, [CLI, 'run', scenario, '--out', out, '--quiet'], { cwd: ROOT, stdio: 'ignore' });
    const staging = () => readdirSync(path.dirname(out)).filter((e) => e.startsWith('.out.partial-') && e !== path.basename(foreign) && e !== path.basename(alive));
    for (let i = 0; i < 200 && staging().length === 0; i++) await new Promise((r) => setTimeout(r, 10));
    await new Promise((r) => setTimeout(r, 150));
    child.kill('SIGKILL');
    await new Promise((r) => child.on('close', r));
    const left = staging();
    expect(left).toHaveLength(1);
    const marker = JSON.parse(readFileSync(path.join(path.dirname(out), left[0], STAGING_MARKER), 'utf8')) as { tool: string; pid: number };
    expect(marker).toMatchObject({ tool: 'passbudget', pid: child.pid });
    expect(existsSync(out)).toBe(false);

    const r = await runCli(['run', scenario, '--out', out, '--quiet', '--no-steps']);
    expect(r.code, r.stderr).toBe(0);
    expect(staging()).toEqual([]);
    expect(existsSync(foreign)).toBe(true);
    expect(existsSync(alive)).toBe(true);
    expect(existsSync(path.join(out, 'summary.json'))).toBe(true);
  });
});

describe('--version and the examples in --help', () => {
  it('--version prints the package version', async () => {
    const pkg = JSON.parse(readFileSync(path.join(ROOT, 'package.json'), 'utf8')) as { version: string };
    for (const flag of ['--version', '-V']) {
      const r = await runCli([flag]);
      expect(r.code).toBe(0);
      expect(r.stdout).toBe(`${pkg.version}\n`);
    }
  });
  it.each(['run', 'passes', 'explain', 'mask', 'rate', 'schema', 'report', ''])('passbudget %s --help ends with examples that name the command', async (cmd) => {
    const r = await runCli(cmd ? [cmd, '--help'] : ['--help']);
    expect(r.code).toBe(0);
    const tail = r.stdout.slice(r.stdout.lastIndexOf('Examples:'));
    expect(r.stdout).toContain('\nExamples:\n');
    expect(tail).toMatch(new RegExp(`\\$ passbudget ${cmd || 'run'} `));
  });
});
