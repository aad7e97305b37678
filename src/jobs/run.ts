/**
 * `runScenario`: the main job. Runs the pipeline over a resolved scenario and
 * writes steps.csv (streamed), passes.csv/json, daily.csv, summary.json,
 * passes.ics and report.html into the output folder, atomically: everything
 * goes to a staging folder first and is renamed into place only when the whole
 * run has succeeded.
 */
import { resolve, join } from 'node:path';
import { NETWORK_STATION } from '../analysis/dailyAccumulator.js';
import { findMask, maskTrade } from '../analysis/maskHistogram.js';
import { ENVELOPE_BIN_DEG, ENVELOPE_BINS, type PipelineResult, type StationLinkEnvelope, type SweepTimings } from '../sweep/types.js';
import { bitsToMegabytes } from '../analysis/units.js';
import type { MaskFinding, MaskTradePoint, PassLinkSummary, RunSummary } from '../analysis/types.js';
import { epochWarning } from '../elements/index.js';
import { AtomicOutputDir } from '../output/atomic.js';
import { csvText } from '../output/csv.js';
import { jsonText, summaryJson } from '../output/json.js';
import { renderCalendar } from '../output/ics.js';
import { renderReport } from '../output/report/index.js';
import { whatIfCollectMode, whatIfPayload } from '../output/report/whatIfData.js';
import type { LinkEnvelope, ReportInput } from '../output/report/types.js';
import { stepsChoice, type ResolvedScenario, type StepsChoice } from '../scenario/types.js';
import {
  DAILY_COLUMNS, PASS_COLUMNS, dailyRows, passJson, passRows, runSummary,
} from './outputs.js';
import { runPipelineParallel } from '../sweep/parallel.js';
import { createProgress } from './progress.js';
import { estimateRunSize } from './runSize.js';
import { STEPS_FILE } from '../output/stepsSink.js';

export interface RunOptions {
  /** Output folder; default the scenario's `output.dir`, else `out/<scenario name>` under the working directory. */
  outDir?: string;
  quiet?: boolean;
  /** The per-step file: csv, parquet or none (true = csv, false = none; default: the scenario's output.steps). */
  steps?: boolean | StepsChoice;
  /** Worker threads for the sweep (default 1: in this thread); outputs are identical for any count. */
  workers?: number;
  /** With one worker: filled with where the time goes (the benchmark). */
  timings?: SweepTimings;
  /**
   * More outputs from the sweep's result (the plan job): files written beside
   * the run's (listed in summary.json) and sections for report.html.
   */
  extra?: (pipeline: PipelineResult) => Promise<ExtraOutputs>;
}

export interface ExtraOutputs { files: { name: string; text: string }[]; reportSections: string[] }

export interface RunResult {
  outDir: string;
  files: string[];
  summary: RunSummary;
  pipeline: PipelineResult;
  maskTrade: MaskTradePoint[];
  maskFindings: MaskFinding[];
}

export function defaultOutDir(scenario: ResolvedScenario, outDir?: string): string {
  return resolve(outDir ?? scenario.output.dir ?? join('out', scenario.name));
}

export function elementWarnings(scenario: ResolvedScenario): string[] {
  const w: string[] = [];
  for (const s of scenario.satellites) {
    const msg = epochWarning(s.elements, scenario.window.startS);
    if (msg) w.push(msg);
  }
  return w;
}

/** Mask trade curves and findings from the pipeline's histograms (per station, link and case). */
export function maskResults(scenario: ResolvedScenario, p: PipelineResult): { trade: MaskTradePoint[]; findings: MaskFinding[] } {
  const days = (scenario.window.endS - scenario.window.startS) / 86_400;
  const trade: MaskTradePoint[] = [];
  const findings: MaskFinding[] = [];
  for (const h of p.histograms) {
    trade.push(...maskTrade(h.mask, days));
    findings.push(findMask(h.mask, 1));
    if (scenario.maskFraction < 1) findings.push(findMask(h.mask, scenario.maskFraction));
  }
  return { trade, findings };
}

/** Per-link required margins and per-station horizon polylines, kept in summary.json for the report. */
export function reportContext(scenario: ResolvedScenario): Pick<ReportInput, 'requiredMarginDB' | 'horizonMasks'> {
  const requiredMarginDB: Record<string, number> = {};
  for (const l of scenario.links) requiredMarginDB[l.name] = l.requiredMarginDB;
  const horizonMasks: Record<string, [number, number][]> = {};
  for (const s of scenario.stations) {
    const m = s.station.mask;
    horizonMasks[s.station.name] = m.kind === 'constant'
      ? [[0, m.elevationDeg], [360, m.elevationDeg]]
      : [...m.points.map(([a, e]) => [a, e] as [number, number]), [m.points[0][0] + 360, m.points[0][1]]];
  }
  return { requiredMarginDB, horizonMasks };
}

/** The pipeline's per-station envelopes pooled per link and weather case (lowest of the lows, highest of the highs). */
export function linkEnvelopes(envelopes: readonly StationLinkEnvelope[]): LinkEnvelope[] {
  const out = new Map<string, { link: string; weather: string; minDB: Float64Array; maxDB: Float64Array }>();
  for (const e of envelopes) {
    const key = `${e.link}\u0000${e.weather}`;
    let t = out.get(key);
    if (!t) { t = { link: e.link, weather: e.weather, minDB: new Float64Array(ENVELOPE_BINS).fill(Infinity), maxDB: new Float64Array(ENVELOPE_BINS).fill(-Infinity) }; out.set(key, t); }
    for (let b = 0; b < ENVELOPE_BINS; b++) {
      t.minDB[b] = Math.min(t.minDB[b], e.minDB[b]);
      t.maxDB[b] = Math.max(t.maxDB[b], e.maxDB[b]);
    }
  }
  return [...out.values()].map((t) => ({
    link: t.link, weather: t.weather,
    bins: Array.from(t.minDB, (lo, b) => ({ elevationDeg: (b + 0.5) * ENVELOPE_BIN_DEG, minDB: lo, maxDB: t.maxDB[b] })).filter((b) => Number.isFinite(b.minDB)),
  }));
}

export function reportInput(
  scenario: ResolvedScenario, summary: RunSummary, p: PipelineResult,
  extra: Pick<ReportInput, 'maskTrade' | 'maskFindings' | 'rateTrade'> = {},
  passLinks: PassLinkSummary[] = p.passLinks.toArray(),
): ReportInput {
  return {
    summary, passes: passLinks, daily: p.daily, series: p.series, ...reportContext(scenario), ...extra,
    ...(p.envelopes.length > 0 ? { envelopes: linkEnvelopes(p.envelopes) } : {}),
    whatIf: p.whatIf ? whatIfPayload(scenario, p.whatIf) : { missing: 'The run collected no what-if columns.' },
  };
}

/**
 * One warning line when any pass-link had the Sun in the ground beam
 * (C/N0 cost ≥ SUN_AFFECTED_DB at some step): how many, the worst, and the
 * seconds lost in its first weather case; null when none.
 */
export function sunWarning(passLinks: readonly PassLinkSummary[]): string | null {
  const hit = passLinks.filter((p) => p.sunAffected);
  if (hit.length === 0) return null;
  const worst = hit.reduce((a, b) => (b.maxSunLossDB > a.maxSunLossDB ? b : a));
  const lostS = hit.reduce((t, p) => t + (p.cases[0]?.sunLostS ?? 0), 0);
  return `Sun in the beam: ${hit.length} pass-link${hit.length > 1 ? 's' : ''} lost C/N0 to the Sun's noise (worst ${worst.maxSunLossDB.toFixed(1)} dB, ${worst.passId} ${worst.link}, `
    + `${worst.minSunSeparationDeg.toFixed(2)}° from the Sun); ${lostS.toFixed(0)} s unusable because of it in the ${hit[0].cases[0]?.weather ?? 'first'} case (see sun_affected and sun_lost_s in passes.csv; quiet-Sun brightness from memory, rough)`;
}

export async function runScenario(scenario: ResolvedScenario, opts: RunOptions = {}): Promise<RunResult> {
  const outDir = defaultOutDir(scenario, opts.outDir);
  const steps = opts.steps === undefined ? scenario.output.steps : stepsChoice(opts.steps);
  const stepsFile = steps === 'none' ? null : STEPS_FILE[steps];
  const warnings = elementWarnings(scenario);
  const size = estimateRunSize(scenario, { steps });
  // Files other than the steps file are small next to it; the estimate names its share, the part that fills disks.
  const out = new AtomicOutputDir(outDir, stepsFile ? { estimatedBytes: size.stepsBytes, estimateNote: `for ${stepsFile}, estimated before the run` } : {});
  const progress = createProgress({ quiet: opts.quiet === true, label: scenario.name });
  try {
    // steps rows are written by output/stepsSink.ts (steps.csv byte-identical to stepRow + csv-stringify, much faster; or steps.parquet);
    // with workers > 1 the sweep runs on worker threads, outputs identical to the in-process run.
    const pipeline = await runPipelineParallel({
      scenario,
      workers: opts.workers,
      collectSeries: true,
      collectWhatIf: whatIfCollectMode(scenario),
      stepsOut: stepsFile ? out.stream(stepsFile) : null,
      stepsFormat: steps === 'none' ? undefined : steps,
      onProgress: progress.update,
      timings: opts.timings,
    });
    progress.done();
    const outputsT0 = performance.now();

    const { trade, findings } = maskResults(scenario, pipeline);
    // The pass records, built once from the compact table for the outputs that list them.
    const passLinks = pipeline.passLinks.toArray();
    const sunLine = sunWarning(passLinks);
    if (sunLine) warnings.push(sunLine);
    out.writeFile('passes.csv', await csvText(PASS_COLUMNS, passRows(passLinks)));
    out.writeFile('passes.json', `${JSON.stringify(passJson(passLinks), null, 2)}\n`);
    out.writeFile('daily.csv', await csvText(DAILY_COLUMNS, dailyRows(pipeline.daily, passLinks)));
    // DTSTAMP is the window start, not the wall clock, so two runs give identical files.
    out.writeFile('passes.ics', renderCalendar(passLinks, { dtstampS: scenario.window.startS, calendarName: `${scenario.name} usable windows` }));
    const extra = opts.extra ? await opts.extra(pipeline) : null;
    for (const f of extra?.files ?? []) out.writeFile(f.name, f.text);
    const fileNames = [...(stepsFile ? [stepsFile] : []), 'passes.csv', 'passes.json', 'daily.csv', 'passes.ics', ...(extra?.files ?? []).map((f) => f.name), 'report.html', 'summary.json'];
    const summary = { ...runSummary(scenario, pipeline.daily, fileNames, warnings, passLinks), ...reportContext(scenario) };
    const report = reportInput(scenario, summary, pipeline, { maskTrade: trade, maskFindings: findings }, passLinks);
    if (extra?.reportSections.length) report.extraSections = extra.reportSections;
    out.writeFile('report.html', renderReport(report));
    out.writeFile('summary.json', jsonText(summaryJson(summary)));
    const files = out.commit();
    if (opts.timings) opts.timings.outputsS += (performance.now() - outputsT0) / 1000;
    return { outDir, files, summary, pipeline, maskTrade: trade, maskFindings: findings };
  } catch (err) {
    progress.done();
    out.discard();
    throw out.explain(err);
  }
}

/**
 * Expected volume per day over an average year's weather beside the fixed cases' mean MB/day, per
 * link and station, and the availability (share of in-view time the link is expected to close).
 */
function weatherTable(s: RunSummary): string[] {
  const w = s.weatherProbability ?? [];
  if (w.length === 0) return [];
  const head = ['link', 'station', ...s.weatherCases.map((c) => `MB/day ${c}`), 'MB/day expected', 'availability %', 'passes/day closing throughout'];
  const rows = w.map((t) => [
    t.link, t.station,
    ...s.weatherCases.map((c) => {
      const f = s.totals.find((x) => x.link === t.link && x.station === t.station && x.weather === c);
      return f ? bitsToMegabytes(f.dailyVolumeBits.mean).toFixed(2) : '';
    }),
    bitsToMegabytes(t.expectedVolumeBitsPerDay).toFixed(2),
    Number.isFinite(t.availabilityFraction) ? (100 * t.availabilityFraction).toFixed(2) : '',
    t.expectedPassesClosingThroughoutPerDay.toFixed(2),
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const fmtRow = (r: string[]) => r.map((c, i) => (i >= 2 ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join('  ');
  return [
    '', 'Weather as a probability (ITU-R P.618-13 inverted over 0.001–5 % of an average year; one weather state per pass):',
    fmtRow(head), widths.map((x) => '-'.repeat(x)).join('  '), ...rows.map(fmtRow),
  ];
}

/** The terminal summary: per link and weather case, each station and the network. */
export function formatRunSummary(r: RunResult): string {
  const s = r.summary;
  const lines: string[] = [];
  lines.push(`passbudget: ${s.scenario}  ${s.window.startUtc} → ${s.window.endUtc}  (${s.window.days.toFixed(2)} d, step ${s.window.stepS} s)`);
  lines.push(`network policy: ${s.networkPolicy}`);
  const head = ['link', 'weather', 'station', 'passes', 'usable', 'usable min/day', 'MB/day mean', 'MB/day p10', 'MB/day p90'];
  const rows: string[][] = [];
  const ordered = [...s.totals].sort((a, b) =>
    a.link.localeCompare(b.link) || s.weatherCases.indexOf(a.weather) - s.weatherCases.indexOf(b.weather)
    || (a.station === NETWORK_STATION ? 1 : 0) - (b.station === NETWORK_STATION ? 1 : 0) || a.station.localeCompare(b.station));
  for (const t of ordered) {
    rows.push([
      t.link, t.weather, t.station, String(t.passes), String(t.usablePasses),
      (t.usableMinutes / s.window.days).toFixed(1),
      bitsToMegabytes(t.dailyVolumeBits.mean).toFixed(2),
      bitsToMegabytes(t.dailyVolumeBits.p10).toFixed(2),
      bitsToMegabytes(t.dailyVolumeBits.p90).toFixed(2),
    ]);
  }
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const numeric = head.map((_, i) => i >= 3);
  const fmtRow = (r: string[]) => r.map((c, i) => (numeric[i] ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join('  ');
  lines.push('');
  lines.push(fmtRow(head));
  lines.push(widths.map((w) => '-'.repeat(w)).join('  '));
  let prev = '';
  for (const r of rows) {
    const key = `${r[0]}|${r[1]}`;
    if (prev && key !== prev) lines.push('');
    prev = key;
    lines.push(fmtRow(r));
  }
  lines.push(...weatherTable(s));
  lines.push('');
  lines.push('MB = 10^6 bytes. "usable" counts passes judged usable (see passes.csv verdict_rule).');
  for (const w of s.warnings) lines.push(`warning: ${w}`);
  if (s.defaultsApplied.length) lines.push(`${s.defaultsApplied.length} defaults applied (listed in summary.json and the report).`);
  lines.push('Planning estimates only; transmitting needs licences and frequency coordination; RF exposure per local regulations.');
  lines.push(`files in ${r.outDir}:`);
  for (const f of r.files) lines.push(`  ${f}`);
  return lines.join('\n');
}
