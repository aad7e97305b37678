/**
 * `npm run bench`: wall time, throughput, floor ratio, where the time goes
 * and peak memory of the run at several scales. Each case runs in its own
 * child process (so its peak resident set, `process.resourceUsage().maxRSS`,
 * is its own, read before the floor is measured); the table is printed and
 * written to out/bench.json. A script, not a test: numbers on a shared
 * machine drift, so the ratios that matter (floor ratio, per-day flatness,
 * parallel speedup) are measured side by side.
 *
 * Cases:
 *   W1        the demo satellite × 3 stations × 30 days, 1-s steps, all weather
 *             cases and links, every output written (steps.csv included) to a
 *             temporary folder.
 *   W1-parquet  W1 with steps.parquet instead of steps.csv.
 *   W1-core   the same with no output file: the sweep and the summaries
 *             (daily statistics, mask findings) only.
 *   window-N  the run for N = 7, 28, 112 days, steps.csv off (per-day cost).
 *   st10-wK   10 stations × 365 days, K = 1, 2 worker threads, pipeline only.
 * Floor (W1, W1-core, st10): a bare satellite.js loop over the instants a
 * direct run would evaluate the orbit at (the exact-orbit pass finder's
 * instants and every in-pass grid instant, per station; see floor.ts), timed
 * in the same child process after the run; ratio = wall / floor.
 *
 * Per-day cost is shown twice so flatness is judged fairly: s/day counts the
 * whole run including the fixed start-up (module load, measured as the time
 * from process start to the bench's first line, plus the elevation tables,
 * measured by building the scenario's engines once in the child before the
 * run, cold); s/day excl. start-up is (run wall − tables) / days. wall_s is
 * the run alone (from the call to its return); the outputs' fingerprint is
 * taken after the clock stops, by hashing piece by piece.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { maskResults, runScenario } from '../jobs/run.js';
import { runSummary } from '../jobs/outputs.js';
import { createSweeper } from '../sweep/chunk.js';
import { satelliteLayout } from '../sweep/layout.js';
import { runPipelineParallel } from '../sweep/parallel.js';
import { createSweepTimings, type PipelineResult, type SweepTimings } from '../sweep/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { benchScenario } from './scenarios.js';
import { floorOf, type Floor } from './floor.js';

interface BenchCase {
  id: string;
  days: number;
  stations: 3 | 10;
  workers: number;
  /** 'run': runScenario with every output; 'core': sweep and summaries, no file; 'pipeline': the sweep only. */
  mode: 'run' | 'core' | 'pipeline';
  steps: 'csv' | 'parquet' | 'none';
  withFloor: boolean;
}

interface CaseResult extends BenchCase {
  wallS: number;
  /** Module load (process start to the bench's first line) and building every engine's elevation table once (cold). */
  moduleLoadS: number;
  tablesS: number;
  secondsPerDayWithStartup: number;
  secondsPerDayExclStartup: number;
  linkSteps: number;
  stationSteps: number;
  gridTimes: number;
  passes: number;
  sgp4Calls: number;
  linkStepsPerS: number;
  usPerLinkStep: number;
  maxRssMB: number;
  /** The steps file's size (steps.csv or steps.parquet) and the seconds spent writing its rows. */
  stepsMB: number | null;
  reportMB: number | null;
  floor?: Floor & { ratio: number };
  /** Where the time went (one worker only). */
  timings?: SweepTimings;
  fingerprint: string;
}

const CASES: BenchCase[] = [
  { id: 'W1', days: 30, stations: 3, workers: 1, mode: 'run', steps: 'csv', withFloor: true },
  { id: 'W1-parquet', days: 30, stations: 3, workers: 1, mode: 'run', steps: 'parquet', withFloor: true },
  { id: 'W1-core', days: 30, stations: 3, workers: 1, mode: 'core', steps: 'none', withFloor: true },
  { id: 'window-7', days: 7, stations: 3, workers: 1, mode: 'run', steps: 'none', withFloor: false },
  { id: 'window-28', days: 28, stations: 3, workers: 1, mode: 'run', steps: 'none', withFloor: false },
  { id: 'window-112', days: 112, stations: 3, workers: 1, mode: 'run', steps: 'none', withFloor: false },
  { id: 'st10-w1', days: 365, stations: 10, workers: 1, mode: 'pipeline', steps: 'none', withFloor: true },
  { id: 'st10-w2', days: 365, stations: 10, workers: 2, mode: 'pipeline', steps: 'none', withFloor: true },
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
  const timings = c.workers <= 1 ? createSweepTimings() : undefined;
  try {
    const t0 = process.hrtime.bigint();
    let p: PipelineResult;
    let stepsMB: number | null = null;
    let reportMB: number | null = null;
    if (c.mode === 'run') {
      p = (await runScenario(scenario, { outDir: path.join(tmp, 'out'), quiet: true, steps: c.steps, workers: c.workers, timings })).pipeline;
    } else {
      p = await runPipelineParallel({ scenario, workers: c.workers, timings });
      if (c.mode === 'core') {
        maskResults(scenario, p);
        runSummary(scenario, p.daily, []);
      }
    }
    const wallS = Number(process.hrtime.bigint() - t0) / 1e9;
    const maxRssMB = process.resourceUsage().maxRSS / 1024;
    let fingerprint: string;
    if (c.mode === 'run') {
      const f = fingerprinter();
      f.add(readFileSync(path.join(tmp, 'out', 'daily.csv'), 'utf8'));
      fingerprint = f.done();
      if (c.steps !== 'none') stepsMB = statSync(path.join(tmp, 'out', `steps.${c.steps}`)).size / 1e6;
      reportMB = statSync(path.join(tmp, 'out', 'report.html')).size / 1e6;
    } else {
      fingerprint = pipelineFingerprint(p);
    }
    const res: CaseResult = {
      ...c, wallS, moduleLoadS, tablesS,
      secondsPerDayWithStartup: (moduleLoadS + wallS) / c.days, secondsPerDayExclStartup: (wallS - tablesS) / c.days,
      linkSteps: p.linkSteps, stationSteps: p.stationSteps, gridTimes: p.gridTimes, passes: p.passes.length, sgp4Calls: p.sgp4Calls,
      linkStepsPerS: p.linkSteps / wallS, usPerLinkStep: (wallS * 1e6) / p.linkSteps, maxRssMB, stepsMB, reportMB, fingerprint,
      ...(timings ? { timings } : {}),
    };
    if (c.withFloor) {
      const f = floorOf(scenario);
      res.floor = { ...f, ratio: wallS / f.seconds };
    }
    return res;
  } finally {
    rmSync(tmp, { recursive: true, force: true });
  }
}

function table(results: CaseResult[]): string {
  const head = ['case', 'stations', 'days', 'workers', 'outputs', 'wall_s', 'start-up_s', 's/day incl. start-up', 's/day excl. start-up', 'link-steps', 'µs/link-step', 'floor_s', 'floor ratio', 'max RSS MB'];
  const outputs = { run: (r: CaseResult) => (r.steps === 'none' ? 'all but steps' : `all, steps.${r.steps}`), core: () => 'none (sweep + summaries)', pipeline: () => 'pipeline only' };
  const rows = results.map((r) => [
    r.id, String(r.stations), String(r.days), String(r.workers), outputs[r.mode](r),
    r.wallS.toFixed(2), (r.moduleLoadS + r.tablesS).toFixed(2), r.secondsPerDayWithStartup.toFixed(3), r.secondsPerDayExclStartup.toFixed(3),
    String(r.linkSteps), r.usPerLinkStep.toFixed(3),
    r.floor ? r.floor.seconds.toFixed(2) : '', r.floor ? r.floor.ratio.toFixed(2) : '', r.maxRssMB.toFixed(0),
  ]);
  const w = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (r: string[]) => r.map((c, i) => (i < 5 ? c.padEnd(w[i]) : c.padStart(w[i]))).join('  ');
  return [line(head), w.map((n) => '-'.repeat(n)).join('  '), ...rows.map(line)].join('\n');
}

function breakdown(r: CaseResult): string | null {
  const t = r.timings;
  if (!t) return null;
  const parts: [string, number][] = [
    ['pass search', t.passSearchS], ['elevation tables', t.tablesS], ['propagation', t.propagationS], ['geometry', t.geometryS],
    ['budget', t.budgetS], ['accumulators', t.accumulatorsS], ['steps rows', t.stepsS], ['what-if summary', t.whatIfS], ['other outputs', t.outputsS],
  ];
  const known = parts.reduce((s, [, v]) => s + v, 0);
  parts.push(['rest (planning, merging, start of run)', Math.max(0, r.wallS - known)]);
  return `${r.id} time: ${parts.filter(([, v]) => v > 0.0005).map(([k, v]) => `${k} ${v.toFixed(2)} s (${((100 * v) / r.wallS).toFixed(0)} %)`).join(', ')}`;
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
  for (const r of results) {
    if (!r.floor) continue;
    lines.push(`${r.id} floor: ${r.floor.scanInstants} pass-finder instants + ${r.floor.gridInstants} in-pass grid instants, bare satellite.js ${(r.floor.instantsPerS / 1e6).toFixed(2)}M instants/s; the run made ${r.sgp4Calls} SGP4 calls`
      + `${r.stepsMB !== null ? `; steps.${r.steps} ${r.stepsMB.toFixed(1)} MB written in ${r.timings ? r.timings.stepsS.toFixed(2) : '?'} s` : ''}${r.reportMB !== null ? `, report.html ${r.reportMB.toFixed(1)} MB` : ''}`);
  }
  for (const r of results) { const b = breakdown(r); if (b) lines.push(b); }
  const win = ['window-7', 'window-28', 'window-112'].map((id) => results.find((r) => r.id === id)).filter((r): r is CaseResult => !!r);
  if (win.length > 1) {
    const spread = (per: number[]) => (Math.max(...per) - Math.min(...per)) / Math.min(...per);
    const incl = win.map((r) => r.secondsPerDayWithStartup);
    const excl = win.map((r) => r.secondsPerDayExclStartup);
    lines.push(`window scaling (${win.map((r) => r.id).join(' / ')}): s/day incl. start-up ${incl.map((x) => x.toFixed(3)).join(' / ')} (spread ${(spread(incl) * 100).toFixed(1)} %); excl. start-up ${excl.map((x) => x.toFixed(3)).join(' / ')} (spread ${(spread(excl) * 100).toFixed(1)} %)`);
  }
  const csv = results.find((r) => r.id === 'W1');
  const pq = results.find((r) => r.id === 'W1-parquet');
  if (csv?.stepsMB && pq?.stepsMB) lines.push(`W1 steps file: steps.parquet ${pq.stepsMB.toFixed(1)} MB = ${((100 * pq.stepsMB) / csv.stepsMB).toFixed(1)} % of steps.csv ${csv.stepsMB.toFixed(1)} MB; outputs ${csv.fingerprint === pq.fingerprint ? 'identical' : 'DIFFER'} otherwise`);
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
