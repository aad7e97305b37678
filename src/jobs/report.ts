/**
 * `rebuildReport(dir)`: read a run's output folder back (summary.json,
 * passes.json, daily.csv, and when present mask.csv/mask.json, rate.csv and
 * steps.csv for the per-pass series) and write report.html again, atomically.
 */
import { createReadStream, existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { parse } from 'csv-parse';
import { parse as parseSync } from 'csv-parse/sync';
import type { DailyRow, MaskFinding, MaskTradePoint, PassLinkSummary, RateTradePoint, Verdict } from '../analysis/types.js';
import { megabytesToBits } from '../analysis/units.js';
import { InputError } from '../errors.js';
import { writeFileAtomic } from '../output/atomic.js';
import { maskFindingsFromJson, summaryFromJson } from '../output/json.js';
import { renderReport, REPORT_MAX_PASS_SECTIONS } from '../output/report/index.js';
import type { LinkEnvelope, PassSeries, ReportInput } from '../output/report/types.js';
import { envelopeAdd, ENVELOPE_BINS, type StationLinkEnvelope } from '../sweep/types.js';
import { linkEnvelopes } from './run.js';

const SERIES_MAX_POINTS = 120;

function readJson<T>(file: string): T {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (e) {
    throw new InputError(`${file}: cannot read (${(e as NodeJS.ErrnoException).code ?? 'read error'}; allowed an output folder written by passbudget run)`);
  }
  try {
    return JSON.parse(text) as T;
  } catch (e) {
    throw new InputError(`${file}: not valid JSON (${(e as Error).message})`);
  }
}

function readCsv(file: string): Record<string, string>[] {
  try {
    return parseSync(readFileSync(file), { columns: true, skip_empty_lines: true }) as Record<string, string>[];
  } catch (e) {
    throw new InputError(`${file}: cannot read as CSV (${(e as Error).message.split('\n')[0]})`);
  }
}

const time = (iso: string | null | undefined): number | null => (iso ? Date.parse(iso) / 1000 : null);
const num = (s: string | undefined): number => (s === undefined || s === '' ? NaN : Number(s));

interface PassJson {
  pass_id: string; satellite: string; station: string; link: string; direction: 'downlink' | 'uplink';
  aos_utc: string; tca_utc: string; los_utc: string; max_elevation_deg: number; duration_s: number;
  clipped_start: boolean; clipped_end: boolean; steps: number;
  weather: {
    weather: string; usable_start_utc: string | null; usable_end_utc: string | null; usable_duration_s: number;
    min_margin_db: number | null; mean_margin_db: number | null; max_margin_db: number | null;
    fixed_volume_bits: number; adaptive_volume_bits: number | null; verdict: Verdict; verdict_rule: string;
    sun_lost_s?: number | null;
  }[];
  timing_uncertainty_s?: number | null; min_sun_separation_deg?: number | null; max_sun_loss_db?: number | null; sun_affected?: boolean;
}

export function passesFromJson(list: PassJson[]): PassLinkSummary[] {
  return list.map((p) => ({
    passId: p.pass_id, satellite: p.satellite, station: p.station, link: p.link, direction: p.direction,
    aosS: time(p.aos_utc)!, tcaS: time(p.tca_utc)!, losS: time(p.los_utc)!,
    maxElevationDeg: p.max_elevation_deg, durationS: p.duration_s, clippedStart: p.clipped_start, clippedEnd: p.clipped_end,
    steps: p.steps,
    timingUncertaintyS: p.timing_uncertainty_s ?? NaN, minSunSeparationDeg: p.min_sun_separation_deg ?? NaN,
    maxSunLossDB: p.max_sun_loss_db ?? 0, sunAffected: p.sun_affected ?? false,
    cases: p.weather.map((c) => ({
      weather: c.weather, usableStartS: time(c.usable_start_utc), usableEndS: time(c.usable_end_utc),
      usableDurationS: c.usable_duration_s,
      minMarginDB: c.min_margin_db ?? NaN, meanMarginDB: c.mean_margin_db ?? NaN, maxMarginDB: c.max_margin_db ?? NaN,
      fixedVolumeBits: c.fixed_volume_bits, adaptiveVolumeBits: c.adaptive_volume_bits,
      verdict: c.verdict, verdictRule: c.verdict_rule, sunLostS: c.sun_lost_s ?? 0,
    })),
  }));
}

export function dailyFromCsv(rows: Record<string, string>[]): DailyRow[] {
  return rows.map((r) => ({
    dayUtc: r.day_utc, station: r.station, satellite: r.satellite, link: r.link, weather: r.weather,
    passes: num(r.passes), usablePasses: num(r.usable_passes), usableMinutes: num(r.usable_min),
    fixedVolumeBits: megabytesToBits(num(r.fixed_volume_mb)),
    adaptiveVolumeBits: r.adaptive_volume_mb === '' ? null : megabytesToBits(num(r.adaptive_volume_mb)),
    longestGapH: num(r.longest_gap_h),
  }));
}

/**
 * From steps.csv, streamed (never held whole): decimated series for the pass
 * sections the report draws (the first REPORT_MAX_PASS_SECTIONS pass-links in
 * the report's order, which passes.json already has), and the margin envelope
 * over every step — the same bounded data `passbudget run` hands the report.
 */
async function fromSteps(file: string, passes: PassLinkSummary[], weather: string[]): Promise<{ series: PassSeries[]; envelopes: LinkEnvelope[] }> {
  const every = new Map<string, number>();
  for (const p of passes.slice(0, REPORT_MAX_PASS_SECTIONS)) every.set(`${p.passId}|${p.link}`, Math.max(1, Math.ceil(p.steps / SERIES_MAX_POINTS)));
  const series = new Map<string, PassSeries & { n: number }>();
  const envelopes: StationLinkEnvelope[] = [];
  const envOf = new Map<string, StationLinkEnvelope[]>();
  const parser = createReadStream(file).pipe(parse({ columns: true }));
  for await (const r of parser as AsyncIterable<Record<string, string>>) {
    const el = num(r.elevation_deg);
    const linkKey = `${r.station}|${r.link}`;
    let envs = envOf.get(linkKey);
    if (!envs) {
      envs = weather.map((w) => ({
        station: r.station, link: r.link, weather: w,
        minDB: new Float64Array(ENVELOPE_BINS).fill(Infinity), maxDB: new Float64Array(ENVELOPE_BINS).fill(-Infinity),
        keyholeMinDB: new Float64Array(ENVELOPE_BINS).fill(Infinity),
      }));
      envOf.set(linkKey, envs);
      envelopes.push(...envs);
    }
    const limited = r.mount_limited === 'true';
    weather.forEach((w, i) => {
      const e = envs![i];
      envelopeAdd(e.minDB, e.maxDB, e.keyholeMinDB, el, num(r[`margin_db_${w}`]), limited && r[`usable_${w}`] !== 'true');
    });
    const key = `${r.pass_id}|${r.link}`;
    const step = every.get(key);
    if (step === undefined) continue;
    let s = series.get(key);
    if (!s) {
      s = { passId: r.pass_id, link: r.link, timeS: [], azimuthDeg: [], elevationDeg: [], cases: weather.map((w) => ({ weather: w, marginDB: [], ebN0DB: [] })), n: 0 };
      series.set(key, s);
    }
    if (s.n++ % step !== 0) continue;
    s.timeS.push(Date.parse(r.time_utc) / 1000);
    s.azimuthDeg.push(num(r.azimuth_deg));
    s.elevationDeg.push(el);
    weather.forEach((w, i) => {
      s!.cases[i].marginDB.push(num(r[`margin_db_${w}`]));
      s!.cases[i].ebN0DB.push(num(r[`eb_over_n0_db_${w}`]));
    });
  }
  return { series: [...series.values()].map(({ n: _n, ...s }) => s), envelopes: linkEnvelopes(envelopes) };
}

export async function loadReportInput(dirIn: string): Promise<ReportInput> {
  const dir = resolve(dirIn);
  if (!existsSync(join(dir, 'summary.json'))) {
    throw new InputError(`${dirIn}: no summary.json here (allowed an output folder written by passbudget run)`);
  }
  const summary = summaryFromJson(readJson<unknown>(join(dir, 'summary.json')), join(dir, 'summary.json'));
  const passes = passesFromJson(readJson<PassJson[]>(join(dir, 'passes.json')));
  const daily = dailyFromCsv(readCsv(join(dir, 'daily.csv')));
  const steps = existsSync(join(dir, 'steps.csv')) ? await fromSteps(join(dir, 'steps.csv'), passes, summary.weatherCases) : null;
  const series = steps?.series ?? [];
  let maskTrade: MaskTradePoint[] | undefined;
  let maskFindings: MaskFinding[] | undefined;
  let rateTrade: RateTradePoint[] | undefined;
  if (existsSync(join(dir, 'mask.csv'))) {
    maskTrade = readCsv(join(dir, 'mask.csv')).map((r) => ({
      station: r.station, link: r.link, weather: r.weather, maskDeg: num(r.mask_deg),
      dailyVolumeBits: megabytesToBits(num(r.daily_volume_mb)), usableMinutesPerDay: num(r.usable_min_per_day),
    }));
  }
  if (existsSync(join(dir, 'mask.json'))) {
    maskFindings = maskFindingsFromJson(readJson<unknown>(join(dir, 'mask.json')), join(dir, 'mask.json'));
  }
  if (existsSync(join(dir, 'rate.csv'))) {
    rateTrade = readCsv(join(dir, 'rate.csv')).map((r) => ({
      station: r.station, link: r.link, weather: r.weather, bitRateBps: num(r.bit_rate_bps),
      dailyVolumeBits: megabytesToBits(num(r.daily_volume_mb)), usableMinutesPerDay: num(r.usable_min_per_day),
    }));
  }
  return {
    summary, passes, daily, series,
    requiredMarginDB: summary.requiredMarginDB ?? {},
    horizonMasks: summary.horizonMasks ?? {},
    maskTrade, maskFindings, rateTrade,
    ...(steps && steps.envelopes.length > 0 ? { envelopes: steps.envelopes } : {}),
  };
}

/** Rebuild `report.html` in an output folder; returns its path. */
export async function rebuildReport(dir: string): Promise<string> {
  const input = await loadReportInput(dir);
  const file = join(resolve(dir), 'report.html');
  writeFileAtomic(file, renderReport(input));
  return file;
}
