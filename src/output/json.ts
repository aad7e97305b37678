/**
 * The JSON outputs, in one place: the TypeScript records are camelCase, the
 * files are snake_case with the unit in every name that has one, as the CSV
 * columns are (`usable_passes`, `fixed_volume_bits`, `step_s`,
 * `required_margin_db`). Each writer here has its reader beside it, so
 * `passbudget report DIR` reads exactly what `run` and `mask` wrote.
 * Maps keyed by user names (links, stations) keep their keys as given.
 */
import type { MaskFinding, RunSummary, RunTotals } from '../analysis/types.js';
import type { WeatherTotal } from '../analysis/weatherDaily.js';
import type { ExplainLine } from '../budget/explain.js';
import { InputError } from '../errors.js';
import { passRows } from '../passes/table.js';
import type { Pass } from '../passes/types.js';

/** JSON text with two-space indent and a final newline; non-finite numbers become null. */
export function jsonText(value: unknown): string {
  return `${JSON.stringify(value, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`;
}

const orNaN = (v: unknown): number => (typeof v === 'number' ? v : NaN);

// ---------------------------------------------------------------- summary.json

export interface SummaryTotalsJson {
  link: string; weather: string; station: string;
  passes: number; usable_passes: number; usable_min: number;
  fixed_volume_bits: number; adaptive_volume_bits: number | null;
  daily_volume_bits: { mean: number | null; median: number | null; p10: number | null; p90: number | null };
}

export interface SummaryJson {
  scenario: string;
  scenario_file: string;
  window: { start_utc: string; end_utc: string; step_s: number; duration_d: number };
  satellites: string[];
  stations: string[];
  links: string[];
  weather_cases: string[];
  network_policy: string;
  totals: SummaryTotalsJson[];
  models: { name: string; source: string }[];
  software: { name: string; version: string }[];
  defaults_applied: { path: string; value: string; reason: string }[];
  warnings: string[];
  inputs_sha256: string;
  files: string[];
  cautions: string[];
  required_margin_db?: Record<string, number>;
  /** Per station link: weather as a probability (analysis/weatherDaily.ts). */
  weather_probability?: WeatherTotalJson[];
  /** Per station, the horizon as [azimuth_deg, elevation_deg] points. */
  horizon_masks_deg?: Record<string, [number, number][]>;
}

export interface WeatherTotalJson {
  satellite: string; station: string; link: string; passes: number;
  expected_volume_bits_per_day: number; availability_fraction: number | null; expected_passes_closing_throughout_per_day: number;
}

function weatherTotalJson(t: WeatherTotal): WeatherTotalJson {
  return {
    satellite: t.satellite, station: t.station, link: t.link, passes: t.passes,
    expected_volume_bits_per_day: t.expectedVolumeBitsPerDay,
    availability_fraction: Number.isFinite(t.availabilityFraction) ? t.availabilityFraction : null,
    expected_passes_closing_throughout_per_day: t.expectedPassesClosingThroughoutPerDay,
  };
}

function totalsJson(t: RunTotals): SummaryTotalsJson {
  const d = t.dailyVolumeBits;
  return {
    link: t.link, weather: t.weather, station: t.station,
    passes: t.passes, usable_passes: t.usablePasses, usable_min: t.usableMinutes,
    fixed_volume_bits: t.fixedVolumeBits, adaptive_volume_bits: t.adaptiveVolumeBits,
    daily_volume_bits: { mean: d.mean, median: d.median, p10: d.p10, p90: d.p90 },
  };
}

/** summary.json from the run's summary record. */
export function summaryJson(s: RunSummary): SummaryJson {
  return {
    scenario: s.scenario,
    scenario_file: s.scenarioFile,
    window: { start_utc: s.window.startUtc, end_utc: s.window.endUtc, step_s: s.window.stepS, duration_d: s.window.days },
    satellites: s.satellites,
    stations: s.stations,
    links: s.links,
    weather_cases: s.weatherCases,
    network_policy: s.networkPolicy,
    totals: s.totals.map(totalsJson),
    ...(s.weatherProbability ? { weather_probability: s.weatherProbability.map(weatherTotalJson) } : {}),
    models: s.models,
    software: s.software,
    defaults_applied: s.defaultsApplied,
    warnings: s.warnings,
    inputs_sha256: s.inputsSha256,
    files: s.files,
    cautions: s.cautions,
    ...(s.requiredMarginDB ? { required_margin_db: s.requiredMarginDB } : {}),
    ...(s.horizonMasks ? { horizon_masks_deg: s.horizonMasks } : {}),
  };
}

/** The summary record back from summary.json text; `file` names it in messages. */
export function summaryFromJson(value: unknown, file: string): RunSummary {
  const o = value as Partial<SummaryJson> & Record<string, unknown>;
  if (o === null || typeof o !== 'object' || Array.isArray(o)) throw new InputError(`${file}: not a summary record (allowed summary.json written by passbudget run)`);
  if ('scenarioFile' in o || 'weatherCases' in o) {
    throw new InputError(`${file}: written by an older passbudget (camelCase keys such as scenarioFile; allowed the snake_case summary.json of this version: run the scenario again)`);
  }
  for (const key of ['scenario', 'window', 'weather_cases', 'totals', 'links', 'stations'] as const) {
    if (o[key] === undefined) throw new InputError(`${file}: lacks ${key} (allowed summary.json written by passbudget run)`);
  }
  const w = o.window as SummaryJson['window'];
  return {
    scenario: String(o.scenario),
    scenarioFile: String(o.scenario_file ?? ''),
    window: { startUtc: w.start_utc, endUtc: w.end_utc, stepS: w.step_s, days: w.duration_d },
    satellites: o.satellites ?? [],
    stations: o.stations ?? [],
    links: o.links ?? [],
    weatherCases: o.weather_cases ?? [],
    networkPolicy: String(o.network_policy ?? ''),
    totals: (o.totals ?? []).map((t) => ({
      link: t.link, weather: t.weather, station: t.station,
      passes: t.passes, usablePasses: t.usable_passes, usableMinutes: t.usable_min,
      fixedVolumeBits: t.fixed_volume_bits, adaptiveVolumeBits: t.adaptive_volume_bits,
      dailyVolumeBits: {
        mean: orNaN(t.daily_volume_bits?.mean), median: orNaN(t.daily_volume_bits?.median),
        p10: orNaN(t.daily_volume_bits?.p10), p90: orNaN(t.daily_volume_bits?.p90),
      },
    })),
    ...(o.weather_probability ? {
      weatherProbability: o.weather_probability.map((t) => ({
        satellite: t.satellite, station: t.station, link: t.link, passes: t.passes,
        expectedVolumeBitsPerDay: t.expected_volume_bits_per_day, availabilityFraction: orNaN(t.availability_fraction),
        expectedPassesClosingThroughoutPerDay: t.expected_passes_closing_throughout_per_day,
      })),
    } : {}),
    models: o.models ?? [],
    software: o.software ?? [],
    defaultsApplied: o.defaults_applied ?? [],
    warnings: o.warnings ?? [],
    inputsSha256: String(o.inputs_sha256 ?? ''),
    files: o.files ?? [],
    cautions: o.cautions ?? [],
    ...(o.required_margin_db ? { requiredMarginDB: o.required_margin_db } : {}),
    ...(o.horizon_masks_deg ? { horizonMasks: o.horizon_masks_deg } : {}),
  };
}

// ---------------------------------------------------------------- mask.json

export interface MaskFindingJson {
  station: string; link: string; weather: string; fraction: number;
  mask_deg: number | null; mount_limited_excluded_s: number;
}

export interface MaskJson { scenario: string; fraction: number; findings: MaskFindingJson[] }

export function maskJson(scenario: string, fraction: number, findings: readonly MaskFinding[]): MaskJson {
  return {
    scenario,
    fraction,
    findings: findings.map((f) => ({
      station: f.station, link: f.link, weather: f.weather, fraction: f.fraction, mask_deg: f.maskDeg,
      mount_limited_excluded_s: f.mountLimitedExcludedS ?? 0,
    })),
  };
}

export function maskFindingsFromJson(value: unknown, file: string): MaskFinding[] {
  const m = value as Partial<MaskJson> | null;
  if (!m || typeof m !== 'object' || !Array.isArray(m.findings)) throw new InputError(`${file}: lacks findings (allowed mask.json written by passbudget mask)`);
  return m.findings.map((f) => ({
    station: f.station, link: f.link, weather: f.weather, fraction: f.fraction, maskDeg: f.mask_deg,
    mountLimitedExcludedS: f.mount_limited_excluded_s,
  }));
}

// ---------------------------------------------------------------- explain --format json

/** The pass an explained instant falls in, as in `passbudget passes --format json`, with its number. */
export function explainPassJson(p: Pass | null): Record<string, unknown> | null {
  return p === null ? null : { pass_number: p.index, ...passRows([p])[0] };
}

export function explainTermsJson(lines: readonly ExplainLine[]): Record<string, unknown>[] {
  return lines.map((l) => ({
    section: l.section, term: l.term, values: l.values, per_case: l.perCase, unit: l.unit, sign: l.sign, digits: l.digits, source: l.source,
  }));
}
