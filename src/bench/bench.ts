/**
 * `npm run bench`: wall time, throughput, floor ratio and peak memory of the
 * run at several scales. Each case runs in its own child process (so its
 * peak resident set, `process.resourceUsage().maxRSS`, is its own); the
 * table is printed and written to out/bench.json. A script, not a test:
 * numbers on a shared machine drift, so the ratios that matter (floor ratio,
 * per-day flatness, parallel speedup) are measured side by side.
 *
 * Cases:
 *   W1        the demo satellite × 3 stations × 30 days, 1-s steps, all weather
 *             cases and links, every output written (steps.csv included) to a
 *             temporary folder; floor = bare satellite.js loop over the same
 *             instants (see floor.ts), timed in the same process.
 *   window-N  the same for N = 7, 28, 112 days, steps.csv off (per-day cost).
 *   st10-wK   10 stations × 365 days, K = 1, 2 worker threads, steps.csv and
 *             report off (pipeline and the small tables only).
 *
 * Per-day cost is shown twice so flatness is judged fairly: s/day counts the
 * whole run including the fixed start-up (module load, measured as the time
 * from process start to the bench's first line, plus the elevation tables,
 * measured by building the scenario's engines once in the child before the
 * run, cold); s/day excl. start-up is (run wall − tables) / days. wall_s is
 * the run alone (from the call to its return), as before; the outputs'
 * fingerprint is taken after the clock stops, by hashing piece by piece (no
 * whole-result string, which would inflate the peak RSS measured).
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { runScenario } from '../jobs/run.js';
import { createSweeper } from '../sweep/chunk.js';
import { satelliteLayout } from '../sweep/layout.js';
import { runPipelineParallel } from '../sweep/parallel.js';
import type { PipelineResult } from '../sweep/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { benchScenario } from './scenarios.js';
import { floorInstants, floorLoop } from './floor.js';

interface BenchCase {
  id: string;
  days: number;
  stations: 3 | 10;
  workers: number;
  /** 'run': runScenario with every output; 'pipeline': the pipeline only. */
  mode: 'run' | 'pipeline';
  steps: boolean;
  withFloor: boolean;
}

interface CaseResult extends BenchCase {
  wallS: number;
  /** Module load (process start to the bench's first line) and building every engine's elevation table once (cold). */
  moduleLoadS: number;
  tablesS: number;
  /** (moduleLoadS + wallS) / days and (wallS − tablesS) / days. */
  secondsPerDayWithStartup: number;
  secondsPerDayExclStartup: number;
  linkSteps: number;
  stationSteps: number;
  gridTimes: number;
  passes: number;
  linkStepsPerS: number;
  secondsPerDay: number;
  maxRssMB: number;
  stepsCsvMB: number | null;
  reportMB: number | null;
  floor?: { seconds: number; scanInstants: number; gridInstants: number; ratio: number; instantsPerS: number };
  /** SHA-1-free fingerprint of the outputs (size and a sum), to compare serial and parallel. */
  fingerprint: string;
}

const CASES: BenchCase[] = [
  { id: 'W1', days: 30, stations: 3, workers: 1, mode: 'run', steps: true, withFloor: true },
  { id: 'window-7', days: 7, stations: 3, workers: 1, mode: 'run', steps: false, withFloor: false },
  { id: 'window-28', days: 28, stations: 3, workers: 1, mode: 'run', steps: false, withFloor: false },
  { id: 'window-112', days: 112, stations: 3, workers: 1, mode: 'run', steps: false, withFloor: false },
  { id: 'st10-w1', days: 365, stations: 10, workers: 1, mode: 'pipeline', steps: false, withFloor: false },
  { id: 'st10-w2', days: 365, stations: 10, workers: 2, mode: 'pipeline', steps: false, withFloor: false },
];

/** FNV-1a over text pieces, fed one at a time. */
function fingerprinter(): { add(text: string): void; done(): string } {
  let h = 2166136261;
  let n = 0;
  return {
    add(text) {
      n += text.length;
      for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 16777619) >>> 0;
    },
    done: () => `${n}:${h.toString(16)}`,
  };
}

function pipelineFingerprint(p: PipelineResult): string {
  const f = fingerprinter();
  for (const d of p.daily) f.add(JSON.stringify(d));
  for (const x of p.passLinks) f.add(JSON.stringify(x));
  for (const h of p.histograms) {
    f.add(h.mask.usableS.join(','));
    if (h.rate) f.add(h.rate.timeS.join(','));
  }
  return f.done();
}

/** Build every engine of the scenario once (the elevation tables): the fixed start-up besides module load. */
function tablesSeconds(scenario: ResolvedScenario): number {
  const t0 = process.hrtime.bigint();
  scenario.satellites.forEach((_, i) => {
    const layout = satelliteLayout(scenario, i);
    if (layout.stations.length > 0) createSweeper(scenario, layout);
  });
  return Number(process.hrtime.bigint() - t0) / 1e9;
}

async function runCase(c: BenchCase, moduleLoadS: number): Promise<CaseResult> {
  const scenario = benchScenario({ days: c.days, stations: c.stations });
  const tablesS = tablesSeconds(scenario);
  const tmp = mkdtempSync(path.join(tmpdir(), `passbudget-bench-${c.id}-`));
  try {
    const t0 = process.hrtime.bigint();
    let p: PipelineResult;
    let stepsCsvMB: number | null = null;
    let reportMB: number | null = null;
    if (c.mode === 'run') {
      p = (await runScenario(scenario, { outDir: path.join(tmp, 'out'), quiet: true, steps: c.steps, workers: c.workers })).pipeline;
    } else {
      p = await runPipelineParallel({ scenario, workers: c.workers });
    }
    const wallS = Number(process.hrtime.bigint() - t0) / 1e9;
    let fingerprint: string;
    if (c.mode === 'run') {
      const f = fingerprinter();
      f.add(readFileSync(path.join(tmp, 'out', 'daily.csv'), 'utf8'));
      fingerprint = f.done();
      if (c.steps) stepsCsvMB = statSync(path.join(tmp, 'out', 'steps.csv')).size / 1e6;
      reportMB = statSync(path.join(tmp, 'out', 'report.html')).size / 1e6;
    } else {
      fingerprint = pipelineFingerprint(p);
    }
    const res: CaseResult = {
      ...c, wallS, moduleLoadS, tablesS,
      secondsPerDayWithStartup: (moduleLoadS + wallS) / c.days, secondsPerDayExclStartup: (wallS - tablesS) / c.days,
      linkSteps: p.linkSteps, stationSteps: p.stationSteps, gridTimes: p.gridTimes, passes: p.passes.length,
      linkStepsPerS: p.linkSteps / wallS, secondsPerDay: wallS / c.days, maxRssMB: 0, stepsCsvMB, reportMB, fingerprint,
    };
    if (c.withFloor) {
      const inst = floorInstants(scenario);
      const f = floorLoop(scenario, inst);
      const n = inst.scanInstants + inst.gridInstants;
      res.floor = { seconds: f.seconds, scanInstants: inst.scanInstants, gridInstants: inst.gridInstants, ratio: wallS / f.seconds, instantsPerS: n / f.seconds };
    }
    res.maxRssMB = process.resourceUsage().maxRSS / 1024;
    return res;
  } finally {
    rmSync(tmp, { recursive: true, force: true });
  }
}

function table(results: CaseResult[]): string {
  const head = ['case', 'stations', 'days', 'workers', 'outputs', 'wall_s', 'start-up_s', 's/day incl. start-up', 's/day excl. start-up', 'link-steps', 'link-steps/s', 'floor_s', 'floor ratio', 'max RSS MB'];
  const rows = results.map((r) => [
    r.id, String(r.stations), String(r.days), String(r.workers),
    r.mode === 'run' ? (r.steps ? 'all' : 'all but steps.csv') : 'pipeline only',
    r.wallS.toFixed(2), (r.moduleLoadS + r.tablesS).toFixed(2), r.secondsPerDayWithStartup.toFixed(3), r.secondsPerDayExclStartup.toFixed(3), String(r.linkSteps), (r.linkStepsPerS / 1e6).toFixed(2) + 'M',
    r.floor ? r.floor.seconds.toFixed(2) : '', r.floor ? r.floor.ratio.toFixed(2) : '', r.maxRssMB.toFixed(0),
  ]);
  const w = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (r: string[]) => r.map((c, i) => (i < 5 ? c.padEnd(w[i]) : c.padStart(w[i]))).join('  ');
  return [line(head), w.map((n) => '-'.repeat(n)).join('  '), ...rows.map(line)].join('\n');
}

async function main(): Promise<void> {
  // Time from process start (performance.timeOrigin) to here: node start-up and loading the modules.
  const moduleLoadS = performance.now() / 1000;
  const args = process.argv.slice(2);
  if (args[0] === '--child') {
    const res = await runCase(JSON.parse(args[1]) as BenchCase, moduleLoadS);
    process.stdout.write(`${JSON.stringify(res)}\n`);
    return;
  }
  const only = args.length ? new Set(args) : null;
  const self = fileURLToPath(import.meta.url);
  const results: CaseResult[] = [];
  for (const c of CASES) {
    if (only && !only.has(c.id)) continue;
    process.stderr.write(`bench: ${c.id} …\n`);
    const out = execFileSync(process.execPath, [self, '--child', JSON.stringify(c)], { encoding: 'utf8', maxBuffer: 1 << 26, stdio: ['ignore', 'pipe', 'inherit'] });
    results.push(JSON.parse(out.trim().split('\n').pop()!) as CaseResult);
  }
  const lines = [table(results), ''];
  const w1 = results.find((r) => r.id === 'W1');
  if (w1?.floor) {
    lines.push(`W1 floor: ${w1.floor.scanInstants} pass-finder instants + ${w1.floor.gridInstants} in-pass grid instants, bare satellite.js loop ${(w1.floor.instantsPerS / 1e6).toFixed(2)}M instants/s; steps.csv ${w1.stepsCsvMB?.toFixed(0)} MB, report.html ${w1.reportMB?.toFixed(1)} MB`);
  }
  const win = ['window-7', 'window-28', 'window-112'].map((id) => results.find((r) => r.id === id)).filter((r): r is CaseResult => !!r);
  if (win.length > 1) {
    const spread = (per: number[]) => (Math.max(...per) - Math.min(...per)) / Math.min(...per);
    const incl = win.map((r) => r.secondsPerDayWithStartup);
    const excl = win.map((r) => r.secondsPerDayExclStartup);
    lines.push(`window scaling (${win.map((r) => r.id).join(' / ')}): s/day incl. start-up ${incl.map((x) => x.toFixed(3)).join(' / ')} (spread ${(spread(incl) * 100).toFixed(1)} %); excl. start-up ${excl.map((x) => x.toFixed(3)).join(' / ')} (spread ${(spread(excl) * 100).toFixed(1)} %)`);
  }
  const s1 = results.find((r) => r.id === 'st10-w1');
  const s2 = results.find((r) => r.id === 'st10-w2');
  if (s1 && s2) {
    lines.push(`10 stations × 365 d: speedup 2 workers / 1 = ${(s1.wallS / s2.wallS).toFixed(2)}; outputs ${s1.fingerprint === s2.fingerprint ? 'identical' : 'DIFFER'} (${s1.fingerprint} vs ${s2.fingerprint})`);
  }
  const text = lines.join('\n');
  process.stdout.write(`${text}\n`);
  mkdirSync('out', { recursive: true });
  writeFileSync(path.join('out', 'bench.json'), `${JSON.stringify({ node: process.versions.node, date: new Date().toISOString(), results, summary: lines.slice(2) }, null, 2)}\n`);
}

main().catch((err: unknown) => {
  process.stderr.write(`${err instanceof Error ? err.stack ?? err.message : String(err)}\n`);
  process.exit(1);
});
