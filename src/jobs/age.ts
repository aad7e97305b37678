/**
 * `elementAgeScenario`: daily data volume and usable passes against the age
 * of the element sets, 0 to N days (default 14). Each age is a full sweep of
 * the scenario with every satellite's element age held at that value at every
 * step (the pointing error of program-track antennas follows it), so the
 * question "how old may the elements be before the passes fail" reads off one
 * table per station, link and weather case, and for the network.
 */
import { runTotals } from '../analysis/stats.js';
import { bitsToMegabytes } from '../analysis/units.js';
import { InputError } from '../errors.js';
import { writeFilesAtomic } from '../output/atomic.js';
import { csvText, fmt } from '../output/csv.js';
import { jsonText } from '../output/json.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { runPipeline } from '../sweep/pipeline.js';
import { createProgress } from './progress.js';
import { defaultOutDir } from './run.js';

export interface ElementAgePoint {
  station: string;
  link: string;
  weather: string;
  elementAgeDays: number;
  dailyVolumeBits: number;
  usablePassesPerDay: number;
  passesPerDay: number;
  usableMinutesPerDay: number;
}

export interface ElementAgeOptions { outDir?: string; quiet?: boolean; maxAgeDays?: number; stepDays?: number }

export interface ElementAgeResult { outDir: string; files: string[]; points: ElementAgePoint[] }

export const AGE_COLUMNS = ['station', 'link', 'weather', 'element_age_days', 'daily_volume_mb', 'usable_passes_per_day', 'passes_per_day', 'usable_min_per_day'];

/** The ages swept (days): 0, step, 2·step, … up to max. */
export function elementAges(maxAgeDays = 14, stepDays = 1): number[] {
  if (!(maxAgeDays >= 0 && maxAgeDays <= 60)) throw new InputError(`--max-days: ${maxAgeDays} is out of range (allowed 0 to 60 days)`);
  if (!(stepDays > 0 && stepDays <= maxAgeDays + 1e-9) && maxAgeDays > 0) throw new InputError(`--step-days: ${stepDays} is out of range (allowed 0 < step ≤ --max-days)`);
  const n = maxAgeDays === 0 ? 0 : Math.floor(maxAgeDays / stepDays + 1e-9);
  return Array.from({ length: n + 1 }, (_, i) => Number((i * stepDays).toFixed(9)));
}

/** The scenario with every satellite's element age held at `ageDays`. */
export function withElementAge(scenario: ResolvedScenario, ageDays: number): ResolvedScenario {
  return {
    ...scenario,
    satellites: scenario.satellites.map((s) => (s.elementError ? { ...s, elementError: { ...s.elementError, ageDays } } : s)),
  };
}

export async function elementAgeScenario(scenario: ResolvedScenario, opts: ElementAgeOptions = {}): Promise<ElementAgeResult> {
  const ages = elementAges(opts.maxAgeDays, opts.stepDays);
  if (!scenario.satellites.some((s) => s.elementError)) throw new InputError(`${scenario.file}: no satellite has an element_error (nothing to vary)`);
  const outDir = defaultOutDir(scenario, opts.outDir);
  const days = (scenario.window.endS - scenario.window.startS) / 86_400;
  const points: ElementAgePoint[] = [];
  const progress = createProgress({ quiet: opts.quiet === true, label: `${scenario.name} element age` });
  try {
    for (const [k, age] of ages.entries()) {
      const p = await runPipeline({
        scenario: withElementAge(scenario, age),
        onProgress: (done, total) => progress.update(k * total + done, ages.length * total),
      });
      for (const t of runTotals(p.daily)) {
        points.push({
          station: t.station, link: t.link, weather: t.weather, elementAgeDays: age,
          dailyVolumeBits: (t.adaptiveVolumeBits ?? t.fixedVolumeBits) / days,
          usablePassesPerDay: t.usablePasses / days, passesPerDay: t.passes / days, usableMinutesPerDay: t.usableMinutes / days,
        });
      }
    }
  } finally {
    progress.done();
  }
  points.sort((a, b) => a.station.localeCompare(b.station) || a.link.localeCompare(b.link) || a.weather.localeCompare(b.weather) || a.elementAgeDays - b.elementAgeDays);
  const files = writeFilesAtomic(outDir, [
    ['element_age.csv', await csvText(AGE_COLUMNS, points.map((q) => [
      q.station, q.link, q.weather, q.elementAgeDays, fmt(bitsToMegabytes(q.dailyVolumeBits), 6),
      fmt(q.usablePassesPerDay, 3), fmt(q.passesPerDay, 3), fmt(q.usableMinutesPerDay, 3),
    ]))],
    ['element_age.json', jsonText({
      scenario: scenario.name,
      note: 'every satellite\'s element age held at element_age_days at every step; element_error rates as in the scenario (defaults from memory, rough)',
      element_error: scenario.satellites.map((s) => ({
        satellite: s.name,
        at_epoch_km: s.elementError?.atEpochKm ?? null,
        along_track_km_per_day: s.elementError?.alongTrackKmPerDay ?? null,
        cross_track_km_per_day: s.elementError?.crossTrackKmPerDay ?? null,
      })),
      points: points.map((q) => ({
        station: q.station, link: q.link, weather: q.weather, element_age_days: q.elementAgeDays,
        daily_volume_mb: Number(bitsToMegabytes(q.dailyVolumeBits).toFixed(6)),
        usable_passes_per_day: Number(q.usablePassesPerDay.toFixed(3)), passes_per_day: Number(q.passesPerDay.toFixed(3)),
        usable_min_per_day: Number(q.usableMinutesPerDay.toFixed(3)),
      })),
    })],
  ]);
  return { outDir, files, points };
}

/** The network rows as a table: per link and weather case, daily volume (MB) and usable passes per day against age. */
export function formatElementAgeResult(r: ElementAgeResult): string {
  const net = r.points.filter((p) => p.station === '(network)');
  const ages = [...new Set(net.map((p) => p.elementAgeDays))];
  const keys = [...new Set(net.map((p) => `${p.link}\u0000${p.weather}`))];
  const lines = ['daily volume (MB) / usable passes per day against element age (network; per station in element_age.csv)', ''];
  const head = ['age_d', ...keys.map((k) => k.replace('\u0000', ' '))];
  const rows = ages.map((a) => [String(a), ...keys.map((k) => {
    const p = net.find((q) => q.elementAgeDays === a && `${q.link}\u0000${q.weather}` === k);
    return p ? `${bitsToMegabytes(p.dailyVolumeBits).toFixed(0)} / ${p.usablePassesPerDay.toFixed(1)}` : '';
  })]);
  const w = head.map((h, i) => Math.max(h.length, ...rows.map((x) => x[i].length)));
  const line = (x: string[]) => x.map((c, i) => c.padStart(w[i])).join('  ');
  lines.push(line(head), w.map((x) => '-'.repeat(x)).join('  '), ...rows.map(line));
  lines.push('', `files in ${r.outDir}:`, ...r.files.map((f) => `  ${f}`));
  return lines.join('\n');
}
