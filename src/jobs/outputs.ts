/**
 * The run's output tables: column lists and row builders for steps.csv,
 * passes.csv/json and daily.csv, and the summary.json record. Units are in
 * every column name; times are ISO-8601 UTC with milliseconds; volumes are
 * given in bits and in MB (10^6 bytes).
 */
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { bitsToMegabytes } from '../analysis/units.js';
import { runTotals } from '../analysis/stats.js';
import { NETWORK_STATION } from '../analysis/dailyAccumulator.js';
import { weatherDayOf, weatherDays, weatherTotals } from '../analysis/weatherDaily.js';
import type { DailyRow, PassLinkSummary, RunSummary } from '../analysis/types.js';
import { fmt, type CsvCell } from '../output/csv.js';
import { STANDING_CAUTIONS } from '../output/report/header.js';
import { formatIsoUtc } from '../orbit/time.js';
import type { ResolvedScenario } from '../scenario/types.js';

/** The standing cautions, worded once (the report shows the same list). */
export const CAUTIONS: readonly string[] = STANDING_CAUTIONS;

export { decimalsFor, STEP_FIELDS, CASE_FIELDS, stepColumns, stepRow } from '../output/stepsColumns.js';

export const PASS_COLUMNS = [
  'pass_id', 'satellite', 'station', 'link', 'direction', 'weather',
  'aos_utc', 'tca_utc', 'los_utc', 'max_elevation_deg', 'duration_s', 'clipped_start', 'clipped_end', 'steps',
  'usable_start_utc', 'usable_end_utc', 'usable_duration_s',
  'min_margin_db', 'mean_margin_db', 'max_margin_db',
  'fixed_volume_bits', 'fixed_volume_mb', 'adaptive_volume_bits', 'adaptive_volume_mb',
  'verdict', 'verdict_rule',
  'expected_volume_bits', 'expected_volume_mb', 'expected_usable_s', 'closes_throughout_probability',
  'timing_uncertainty_s', 'min_sun_separation_deg', 'max_sun_loss_db', 'sun_affected', 'sun_lost_s',
];

const iso = (t: number | null) => (t === null ? '' : formatIsoUtc(t));

export function passRows(passes: Iterable<PassLinkSummary>): CsvCell[][] {
  const rows: CsvCell[][] = [];
  for (const p of passes) {
    for (const c of p.cases) {
      rows.push([
        p.passId, p.satellite, p.station, p.link, p.direction, c.weather,
        iso(p.aosS), iso(p.tcaS), iso(p.losS), fmt(p.maxElevationDeg, 3), fmt(p.durationS, 3), p.clippedStart, p.clippedEnd, p.steps,
        iso(c.usableStartS), iso(c.usableEndS), fmt(c.usableDurationS, 3),
        fmt(c.minMarginDB, 3), fmt(c.meanMarginDB, 3), fmt(c.maxMarginDB, 3),
        fmt(c.fixedVolumeBits, 0), fmt(bitsToMegabytes(c.fixedVolumeBits), 6),
        c.adaptiveVolumeBits === null ? '' : fmt(c.adaptiveVolumeBits, 0),
        c.adaptiveVolumeBits === null ? '' : fmt(bitsToMegabytes(c.adaptiveVolumeBits), 6),
        c.verdict, c.verdictRule,
        fmt(p.expectedVolumeBits, 0), fmt(bitsToMegabytes(p.expectedVolumeBits), 6), fmt(p.expectedUsableS, 3), fmt(p.closesThroughoutProbability, 6),
        fmt(p.timingUncertaintyS, 3), fmt(p.minSunSeparationDeg, 3), fmt(p.maxSunLossDB, 3), p.sunAffected, fmt(c.sunLostS, 3),
      ]);
    }
  }
  return rows;
}

const round = (x: number, d: number) => (Number.isFinite(x) ? Number(x.toFixed(d)) : null);

/** passes.json: the pass summaries with ISO times and both volume units. */
export function passJson(passes: Iterable<PassLinkSummary>): unknown[] {
  return Array.from(passes, (p) => ({
    pass_id: p.passId, satellite: p.satellite, station: p.station, link: p.link, direction: p.direction,
    aos_utc: iso(p.aosS), tca_utc: iso(p.tcaS), los_utc: iso(p.losS),
    max_elevation_deg: round(p.maxElevationDeg, 3), duration_s: round(p.durationS, 3),
    clipped_start: p.clippedStart, clipped_end: p.clippedEnd, steps: p.steps,
    expected_volume_bits: round(p.expectedVolumeBits, 0), expected_volume_mb: round(bitsToMegabytes(p.expectedVolumeBits), 6),
    expected_usable_s: round(p.expectedUsableS, 3), swept_s: round(p.sweptS, 3),
    closes_throughout_probability: round(p.closesThroughoutProbability, 6),
    timing_uncertainty_s: round(p.timingUncertaintyS, 3), min_sun_separation_deg: round(p.minSunSeparationDeg, 3),
    max_sun_loss_db: round(p.maxSunLossDB, 3), sun_affected: p.sunAffected,
    weather: p.cases.map((c) => ({
      weather: c.weather,
      usable_start_utc: c.usableStartS === null ? null : iso(c.usableStartS),
      usable_end_utc: c.usableEndS === null ? null : iso(c.usableEndS),
      usable_duration_s: round(c.usableDurationS, 3),
      min_margin_db: round(c.minMarginDB, 3), mean_margin_db: round(c.meanMarginDB, 3), max_margin_db: round(c.maxMarginDB, 3),
      fixed_volume_bits: round(c.fixedVolumeBits, 0), fixed_volume_mb: round(bitsToMegabytes(c.fixedVolumeBits), 6),
      adaptive_volume_bits: c.adaptiveVolumeBits === null ? null : round(c.adaptiveVolumeBits, 0),
      adaptive_volume_mb: c.adaptiveVolumeBits === null ? null : round(bitsToMegabytes(c.adaptiveVolumeBits), 6),
      verdict: c.verdict, verdict_rule: c.verdictRule, sun_lost_s: round(c.sunLostS, 3),
    })),
  }));
}

export const DAILY_COLUMNS = [
  'day_utc', 'satellite', 'station', 'link', 'weather', 'passes', 'usable_passes', 'usable_min',
  'fixed_volume_mb', 'adaptive_volume_mb', 'longest_gap_h',
  'expected_volume_mb', 'availability_fraction',
];

/**
 * daily.csv rows; with `passes`, each station row also carries the link's expected volume over the year's
 * weather and its availability that day (weatherDaily.ts: passes by AOS day; the same on every weather-case
 * row, empty on network rows).
 */
export function dailyRows(daily: readonly DailyRow[], passes: Iterable<PassLinkSummary> = []): CsvCell[][] {
  const days = weatherDays(passes);
  return daily.map((d) => {
    const w = d.station === NETWORK_STATION ? undefined : weatherDayOf(days, d.dayUtc, d.satellite, d.station, d.link);
    const none = d.station === NETWORK_STATION || days.size === 0;
    return [
      d.dayUtc, d.satellite, d.station, d.link, d.weather, d.passes, d.usablePasses, fmt(d.usableMinutes, 3),
      fmt(bitsToMegabytes(d.fixedVolumeBits), 6),
      d.adaptiveVolumeBits === null ? '' : fmt(bitsToMegabytes(d.adaptiveVolumeBits), 6),
      fmt(d.longestGapH, 3),
      none ? '' : fmt(bitsToMegabytes(w?.expectedVolumeBits ?? 0), 6),
      none || !w || !(w.sweptS > 0) ? '' : fmt(w.expectedUsableS / w.sweptS, 6),
    ];
  });
}

/** The published models the engine composes, for the provenance record. */
export const MODELS_USED = [
  { name: 'SGP4/SDP4', source: 'satellite.js; Vallado et al., Revisiting Spacetrack Report #3, AIAA 2006-6753' },
  { name: 'Free-space loss', source: 'ITU-R P.525' },
  { name: 'Gaseous attenuation', source: 'ITU-R P.676-13 Annex 1 (specific), P.676-12 Annex 2 (slant path, equivalent heights)' },
  { name: 'Rain specific attenuation', source: 'ITU-R P.838-3' },
  { name: 'Rain attenuation', source: 'ITU-R P.618-13 §2.2.1.1' },
  { name: 'Rain height', source: 'ITU-R P.839 (h_R = h_0 + 0.36 km)' },
  { name: 'Cloud attenuation', source: 'ITU-R P.840' },
  { name: 'Scintillation', source: 'ITU-R P.618-13 §2.4.1, wet refractivity ITU-R P.453' },
  { name: 'Total attenuation', source: 'ITU-R P.618-13 §2.5' },
  { name: 'Weather as a probability', source: 'ITU-R P.618-13 §2.2.1.1, §2.4.1, §2.5 inverted for the exceedance percentage (tabulated over 0.001–5 %)' },
  { name: 'Sky noise', source: 'ITU-R P.618 §3 (brightness temperature from attenuation)' },
  { name: 'External noise', source: 'ITU-R P.372 galactic and man-made (from memory)' },
  { name: 'Refraction', source: 'ITU-R P.834 (from memory)' },
  { name: 'Antennas', source: 'aperture gain G = η(πD/λ)², θ3dB ≈ 70λ/D, 12(θ/θ3dB)² pointing loss (common practice)' },
  { name: 'Sun position', source: 'Astronomical Almanac low-precision formula (about 0.01°; from memory)' },
  { name: 'Sun noise', source: 'quiet-Sun brightness against frequency (from memory, rough) × activity factor, 0.533° disc weighted by the ground pattern' },
  { name: 'Element-set error', source: 'linear along/cross-track growth from epoch (rates from memory, rough unless given); pointing error atan(e⊥/range), AOS/LOS ± along-track error / ground-track speed' },
  { name: 'Polarisation mismatch', source: 'elliptical polarisation loss factor (textbook form)' },
  { name: 'Modulation and coding', source: 'uncoded BER closed forms; coding profiles and DVB-S2 EN 302 307-1 Table 13 (from memory)' },
];

/** A dependency's version from its package.json, found beside its resolved entry point (exports maps hide `pkg/package.json`). */
function packageVersion(name: string): string {
  try {
    const require = createRequire(import.meta.url);
    let dir = dirname(require.resolve(name));
    for (let i = 0; i < 5; i++) {
      const file = join(dir, 'package.json');
      if (existsSync(file)) {
        const pkg = JSON.parse(readFileSync(file, 'utf8')) as { name?: string; version: string };
        if (pkg.name === name) return pkg.version;
      }
      dir = dirname(dir);
    }
  } catch { /* fall through */ }
  return 'unknown';
}

export function softwareVersions(): { name: string; version: string }[] {
  const require = createRequire(import.meta.url);
  let own = 'unknown';
  try { own = (require('../../package.json') as { version: string }).version; } catch { /* not packaged */ }
  return [
    { name: 'passbudget', version: own },
    { name: 'satellite.js', version: packageVersion('satellite.js') },
    { name: 'luxon', version: packageVersion('luxon') },
    { name: 'node', version: process.versions.node },
  ];
}

export function runSummary(
  scenario: ResolvedScenario, daily: readonly DailyRow[], files: string[], extraWarnings: string[] = [], passes?: Iterable<PassLinkSummary>,
): RunSummary {
  const { startS, endS, stepS } = scenario.window;
  const weather = passes ? weatherTotals(passes, (endS - startS) / 86_400) : [];
  return {
    scenario: scenario.name,
    scenarioFile: scenario.file,
    window: { startUtc: formatIsoUtc(startS), endUtc: formatIsoUtc(endS), stepS, days: (endS - startS) / 86_400 },
    satellites: scenario.satellites.map((s) => s.name),
    stations: scenario.stations.map((s) => s.station.name),
    links: [...new Set(scenario.links.map((l) => l.name))],
    weatherCases: scenario.weatherCases.map((w) => w.name),
    networkPolicy: scenario.network.kind === 'priority'
      ? `priority order: ${scenario.network.order.join(' > ')}`
      : 'best link at each step (highest information rate, then margin)',
    totals: runTotals(daily),
    ...(weather.length > 0 ? { weatherProbability: weather } : {}),
    models: MODELS_USED,
    software: softwareVersions(),
    defaultsApplied: scenario.defaultsApplied,
    warnings: [...scenario.warnings, ...extraWarnings],
    inputsSha256: scenario.inputsSha256,
    files,
    cautions: [...CAUTIONS],
  };
}
