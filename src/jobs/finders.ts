/**
 * `maskScenario` and `rateScenario`: the elevation-mask and data-rate finders.
 * Both run the pipeline without writing steps and read its histograms:
 * mask — usable time and volume binned by elevation (0.1°), so any candidate
 * mask's daily volume and the lowest mask that meets the margin follow
 * exactly; rate — time binned by C/N0 (0.01 dB), so the closing time at any
 * fixed bit rate follows without re-running the budget.
 */
import { runPipeline } from '../sweep/pipeline.js';
import type { PipelineResult } from '../sweep/types.js';
import { bestRate, rateTrade } from '../analysis/rateHistogram.js';
import { bitsToMegabytes } from '../analysis/units.js';
import type { MaskFinding, MaskTradePoint, RateTradePoint } from '../analysis/types.js';
import { InputError } from '../errors.js';
import { writeFilesAtomic } from '../output/atomic.js';
import { csvText, fmt } from '../output/csv.js';
import { jsonText, maskJson } from '../output/json.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { defaultOutDir, maskResults } from './run.js';
import { createProgress } from './progress.js';

export interface FinderOptions { outDir?: string; quiet?: boolean }

async function pipelineOnly(scenario: ResolvedScenario, quiet: boolean): Promise<PipelineResult> {
  const progress = createProgress({ quiet, label: scenario.name });
  try {
    return await runPipeline({ scenario, onProgress: progress.update });
  } finally {
    progress.done();
  }
}

export const MASK_COLUMNS = ['station', 'link', 'weather', 'mask_deg', 'daily_volume_mb', 'usable_min_per_day'];

export interface MaskResult { outDir: string; files: string[]; trade: MaskTradePoint[]; findings: MaskFinding[] }

export async function maskScenario(scenario: ResolvedScenario, opts: FinderOptions & { fraction?: number } = {}): Promise<MaskResult> {
  const fraction = opts.fraction ?? scenario.maskFraction;
  if (!(fraction > 0 && fraction <= 1)) throw new InputError(`--fraction: ${fraction} is out of range (allowed 0 < fraction ≤ 1)`);
  const outDir = defaultOutDir(scenario, opts.outDir);
  const p = await pipelineOnly({ ...scenario, maskFraction: fraction }, opts.quiet === true);
  const { trade, findings } = maskResults({ ...scenario, maskFraction: fraction }, p);
  const files = writeFilesAtomic(outDir, [
    ['mask.csv', await csvText(MASK_COLUMNS, trade.map((t) => [
      t.station, t.link, t.weather, t.maskDeg, fmt(bitsToMegabytes(t.dailyVolumeBits), 6), fmt(t.usableMinutesPerDay, 3),
    ]))],
    ['mask.json', jsonText(maskJson(scenario.name, fraction, findings))],
  ]);
  return { outDir, files, trade, findings };
}

export function formatMaskResult(r: MaskResult): string {
  const lines = ['lowest elevation mask at which the steps above it meet the required margin', ''];
  const head = ['station', 'link', 'weather', 'fraction', 'mask_deg', 'keyhole_s_excluded'];
  const rows = r.findings.map((f) => [f.station, f.link, f.weather, f.fraction.toFixed(2), f.maskDeg === null ? 'none ≤ 90' : f.maskDeg.toFixed(1), String(Math.round(f.mountLimitedExcludedS ?? 0))]);
  lines.push(...table(head, rows, [false, false, false, true, true, true]));
  lines.push('', 'Never below the station horizon mask; per station, without network arbitration.');
  lines.push('keyhole_s_excluded: unusable seconds above the mask while the mount was rate-limited (near zenith);');
  lines.push('no elevation mask removes them, so the finder leaves them out (they stay in steps.csv as mount_limited).');
  lines.push(`files in ${r.outDir}:`, ...r.files.map((f) => `  ${f}`));
  return lines.join('\n');
}

export const RATE_COLUMNS = ['station', 'link', 'weather', 'bit_rate_bps', 'daily_volume_mb', 'usable_min_per_day'];

export interface RateResult { outDir: string; files: string[]; trade: RateTradePoint[]; best: RateTradePoint[] }

export async function rateScenario(scenario: ResolvedScenario, opts: FinderOptions & { ratesBps?: number[] } = {}): Promise<RateResult> {
  const rates = [...(opts.ratesBps ?? scenario.rateCandidatesBps)].sort((a, b) => a - b);
  if (rates.length === 0) throw new InputError('rate finder: no bit rates to try (give rate_finder.bit_rates_bps in the scenario or --rates)');
  if (!scenario.links.some((l) => l.modcod.kind === 'fixed')) {
    throw new InputError(`${scenario.file}: the rate finder needs at least one fixed-rate link (all links are adaptive)`);
  }
  const outDir = defaultOutDir(scenario, opts.outDir);
  const p = await pipelineOnly(scenario, opts.quiet === true);
  const days = (scenario.window.endS - scenario.window.startS) / 86_400;
  const trade: RateTradePoint[] = [];
  const best: RateTradePoint[] = [];
  for (const h of p.histograms) {
    if (!h.rate || h.link.modcod.kind !== 'fixed') continue;
    const pts = rateTrade(h.rate, {
      requiredEbN0DB: h.link.modcod.requiredEbN0DB,
      implementationLossDB: h.link.implementationLossDB,
      requiredMarginDB: h.link.requiredMarginDB,
    }, rates, days);
    trade.push(...pts);
    const b = bestRate(pts);
    if (b) best.push(b);
  }
  const files = writeFilesAtomic(outDir, [
    ['rate.csv', await csvText(RATE_COLUMNS, trade.map((t) => [
      t.station, t.link, t.weather, t.bitRateBps, fmt(bitsToMegabytes(t.dailyVolumeBits), 6), fmt(t.usableMinutesPerDay, 3),
    ]))],
  ]);
  return { outDir, files, trade, best };
}

export function formatRateResult(r: RateResult): string {
  const lines = ['bit rate that maximises daily data volume (fixed-rate links; per station, without network arbitration)', ''];
  const head = ['station', 'link', 'weather', 'best_bit_rate_bps', 'daily_volume_mb', 'usable_min_per_day'];
  const highest = Math.max(...r.trade.map((t) => t.bitRateBps));
  const lowest = Math.min(...r.trade.map((t) => t.bitRateBps));
  const edge = (b: RateTradePoint) => (b.bitRateBps === highest ? ' *' : b.bitRateBps === lowest ? ' +' : '');
  const rows = r.best.map((b) => [b.station, b.link, b.weather, `${b.bitRateBps}${edge(b)}`, bitsToMegabytes(b.dailyVolumeBits).toFixed(3), b.usableMinutesPerDay.toFixed(1)]);
  lines.push(...table(head, rows, [false, false, false, true, true, true]));
  if (r.best.some((b) => edge(b) === ' *')) lines.push('* the highest rate tried: the best rate may lie above it (widen --rates)');
  if (r.best.some((b) => edge(b) === ' +')) lines.push('+ the lowest rate tried: the best rate may lie below it (widen --rates)');
  lines.push('', `files in ${r.outDir}:`, ...r.files.map((f) => `  ${f}`));
  return lines.join('\n');
}

function table(head: string[], rows: string[][], numeric: boolean[]): string[] {
  const w = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (r: string[]) => r.map((c, i) => (numeric[i] ? c.padStart(w[i]) : c.padEnd(w[i]))).join('  ');
  return [line(head), w.map((x) => '-'.repeat(x)).join('  '), ...rows.map(line)];
}

