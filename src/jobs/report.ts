/**
 * `rebuildReport(dir)`: read a run's output folder back (summary.json,
 * passes.json, daily.csv, and when present mask.csv/mask.json, rate.csv and
 * steps.csv for the per-pass series) and write report.html again, atomically.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { parse as parseSync } from 'csv-parse/sync';
import type { DailyRow, MaskFinding, MaskTradePoint, PassLinkSummary, RateTradePoint, Verdict } from '../analysis/types.js';
import { megabytesToBits } from '../analysis/units.js';
import { InputError } from '../errors.js';
import { writeFileAtomic } from '../output/atomic.js';
import { findStepsFile, readStepRecords, type StepRecord } from '../output/stepsRead.js';
import { maskFindingsFromJson, summaryFromJson } from '../output/json.js';
import { renderReport, REPORT_MAX_PASS_SECTIONS } from '../output/report/index.js';
import type { LinkEnvelope, PassSeries, ReportInput } from '../output/report/types.js';
import { envelopeAdd, ENVELOPE_BINS, type StationLinkEnvelope } from '../sweep/types.js';
import { linkEnvelopes } from './run.js';
import type { RunSummary } from '../analysis/types.js';
import type { WhatIfPayload } from '../analysis/whatIf.js';
import { summariseWhatIf, type WhatIfSummaryPayload } from '../analysis/whatIfSummary.js';
import type { Pass } from '../passes/types.js';
import { loadScenario } from '../scenario/index.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { scenarioLayouts } from '../sweep/layout.js';
import type { WhatIfSatellite } from '../sweep/types.js';
import { WHATIF_CN0_QUANTUM_DB, WHATIF_ELEVATION_QUANTUM_DEG, WHATIF_MISSING } from '../sweep/whatIfCollect.js';
import { whatIfCollectMode, whatIfPayload } from '../output/report/whatIfData.js';
import { cellNumber as num } from '../output/csv.js';

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

interface PassJson {
  pass_id: string; satellite: string; station: string; link: string; direction: 'downlink' | 'uplink';
  aos_utc: string; tca_utc: string; los_utc: string; max_elevation_deg: number; duration_s: number;
  clipped_start: boolean; clipped_end: boolean; steps: number;
  expected_volume_bits?: number | null; expected_usable_s?: number | null; swept_s?: number | null; closes_throughout_probability?: number | null;
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
    expectedVolumeBits: p.expected_volume_bits ?? NaN, expectedUsableS: p.expected_usable_s ?? NaN,
    sweptS: p.swept_s ?? NaN, closesThroughoutProbability: p.closes_throughout_probability ?? NaN,
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
 * From the steps file (csv or parquet), streamed (never held whole): decimated series for the pass
 * sections the report draws (the first REPORT_MAX_PASS_SECTIONS pass-links in
 * the report's order, which passes.json already has), and the margin envelope
 * over every step — the same bounded data `passbudget run` hands the report.
 */
async function fromSteps(rows: AsyncIterable<StepRecord>, passes: PassLinkSummary[], weather: string[], onRow?: (r: StepRecord) => void): Promise<{ series: PassSeries[]; envelopes: LinkEnvelope[] }> {
  const every = new Map<string, number>();
  for (const p of passes.slice(0, REPORT_MAX_PASS_SECTIONS)) every.set(`${p.passId}|${p.link}`, Math.max(1, Math.ceil(p.steps / SERIES_MAX_POINTS)));
  const series = new Map<string, PassSeries & { n: number }>();
  const envelopes: StationLinkEnvelope[] = [];
  const envOf = new Map<string, StationLinkEnvelope[]>();
  for await (const r of rows) {
    onRow?.(r);
    const el = r.elevationDeg;
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
    weather.forEach((_w, i) => {
      const e = envs![i];
      const c = r.cases[i];
      envelopeAdd(e.minDB, e.maxDB, e.keyholeMinDB, el, c.marginDB, r.mountLimited && !c.usable);
    });
    const key = `${r.passId}|${r.link}`;
    const step = every.get(key);
    if (step === undefined) continue;
    let s = series.get(key);
    if (!s) {
      s = { passId: r.passId, link: r.link, timeS: [], azimuthDeg: [], elevationDeg: [], cases: weather.map((w) => ({ weather: w, marginDB: [], ebN0DB: [] })), n: 0 };
      series.set(key, s);
    }
    if (s.n++ % step !== 0) continue;
    s.timeS.push(r.timeS);
    s.azimuthDeg.push(r.azimuthDeg);
    s.elevationDeg.push(el);
    weather.forEach((_w, i) => {
      s!.cases[i].marginDB.push(r.cases[i].marginDB);
      s!.cases[i].ebN0DB.push(r.cases[i].ebN0DB);
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
  const stepsFile = findStepsFile(dir);
  // The what-if panel's columns come from the steps rows; its rules need the run's scenario (link rates, codes, margins).
  const wi = stepsFile ? whatIfFromSteps(summary, passes) : { missing: whatIfMissing(dirIn, 'no steps.csv or steps.parquet (the run had --no-steps or output.steps: none)') };
  const steps = stepsFile
    ? await fromSteps(readStepRecords(stepsFile.file, stepsFile.format, summary.weatherCases), passes, summary.weatherCases, 'onRow' in wi ? wi.onRow : undefined)
    : null;
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
    whatIf: 'onRow' in wi ? wi.finish() : wi,
  };
}

/** Rebuild `report.html` in an output folder; returns its path and, when the page has no what-if panel, why. */
export async function rebuildReport(dir: string): Promise<string> {
  return (await rebuildReportWithNotes(dir)).file;
}

export async function rebuildReportWithNotes(dir: string): Promise<{ file: string; whatIfMissing: string | null }> {
  const input = await loadReportInput(dir);
  const file = join(resolve(dir), 'report.html');
  writeFileAtomic(file, renderReport(input));
  return { file, whatIfMissing: input.whatIf && 'missing' in input.whatIf ? input.whatIf.missing : null };
}

function whatIfMissing(dir: string, what: string): string {
  return `No what-if panel: ${dir} has ${what}; it needs the per-step columns (steps.csv) and the run's scenario file. The panel of the report written by passbudget run has neither need.`;
}

/**
 * The what-if columns read back from the steps rows (one part per pass: mask
 * elevation, C/N0 per station link and case), with the link rules and
 * station ranks from the run's scenario file (named in summary.json).
 * Elevation is the steps' elevation_deg (geometric): for a station whose
 * mask is on apparent elevation the rebuilt panel's mask floor is tested on
 * geometric elevation (the run's own report uses the apparent one).
 */
function whatIfFromSteps(summary: RunSummary, passes: PassLinkSummary[]):
  { missing: string } | { onRow: (r: StepRecord) => void; finish: () => WhatIfPayload | WhatIfSummaryPayload | { missing: string } } {
  let scenario: ResolvedScenario;
  try {
    scenario = loadScenario(summary.scenarioFile);
  } catch (e) {
    return { missing: whatIfMissing(summary.scenarioFile, `no readable scenario (${(e as Error).message.split('\n')[0]})`) };
  }
  const qEl = 1 / WHATIF_ELEVATION_QUANTUM_DEG, qC = 1 / WHATIF_CN0_QUANTUM_DB;
  const q = (x: number, k: number) => (Number.isFinite(x) ? Math.round(x * k) : WHATIF_MISSING);
  const layouts = scenarioLayouts(scenario);
  const passInfo = new Map(passes.map((p) => [p.passId, p]));
  interface Acc { k0: number; el: number[]; cn0: Map<string, number[][]> }
  const byPass = new Map<string, Acc>();
  const { startS, stepS } = scenario.window;
  const cases = scenario.weatherCases.map((w) => w.name);
  // The steps file's cases are the run's (summary.json); the scenario's are matched to them by name.
  const inFile = cases.map((w) => summary.weatherCases.indexOf(w));
  return {
    onRow(r) {
      let a = byPass.get(r.passId);
      if (!a) { a = { k0: Math.round((r.timeS - startS) / stepS), el: [], cn0: new Map() }; byPass.set(r.passId, a); }
      let cols = a.cn0.get(r.link);
      if (!cols) { cols = cases.map(() => []); a.cn0.set(r.link, cols); }
      if (cols[0].length === a.el.length) a.el.push(q(r.elevationDeg, qEl));
      cases.forEach((_w, ci) => { const k = inFile[ci]; cols![ci].push(k < 0 ? WHATIF_MISSING : q(r.cases[k].cOverN0DBHz, qC)); });
    },
    finish() {
      const sats: WhatIfSatellite[] = layouts.map((layout) => {
        const stationIndex = new Map(layout.stations.map((st, i) => [st.entry.station.name, i]));
        const parts: number[] = [], el: number[] = [], cn0: number[] = [];
        const list: Pass[] = [], ids: string[] = [];
        for (const [id, a] of byPass) {
          const p = passInfo.get(id);
          if (!p || p.satellite !== layout.satellite) continue;
          const s = stationIndex.get(p.station);
          if (s === undefined) continue;
          const n = a.el.length;
          parts.push(s, list.length, a.k0, n);
          list.push({ index: 0, satellite: p.satellite, station: p.station, aosS: p.aosS, tcaS: p.tcaS, losS: p.losS, durationS: p.durationS,
            maxElevationDeg: p.maxElevationDeg, aosAzimuthDeg: NaN, tcaAzimuthDeg: NaN, losAzimuthDeg: NaN, minRangeKm: NaN, clippedStart: p.clippedStart, clippedEnd: p.clippedEnd });
          ids.push(id);
          for (const x of a.el) el.push(x);
          for (const link of layout.stations[s].links) {
            const cols = a.cn0.get(link.name);
            for (let ci = 0; ci < cases.length; ci++) for (let i = 0; i < n; i++) cn0.push(cols?.[ci][i] ?? WHATIF_MISSING);
          }
        }
        const sat: WhatIfSatellite = {
          satIndex: layout.satIndex, satellite: layout.satellite,
          stations: layout.stations.map((st) => ({ name: st.entry.station.name, stationIndex: st.stationIndex, links: st.links })),
          passes: list, passIds: ids, parts: Int32Array.from(parts), elevation: Int32Array.from(el), cn0: Int32Array.from(cn0),
        };
        if (whatIfCollectMode(scenario) !== 'summary') return sat;
        // A long window: the summary, from the whole satellite at once (the run makes it chunk by chunk; the same sums).
        const { endS } = scenario.window;
        const summary = summariseWhatIf({
          startS, endS, stepS, nCases: cases.length, elevationQuantumDeg: WHATIF_ELEVATION_QUANTUM_DEG, cn0QuantumDB: WHATIF_CN0_QUANTUM_DB,
          linkNames: layout.linkNames, stations: layout.stations, passes: list, parts: sat.parts, elevation: sat.elevation, cn0: sat.cn0,
        });
        return { ...sat, parts: new Int32Array(0), elevation: new Int32Array(0), cn0: new Int32Array(0), summary };
      });
      return whatIfPayload(scenario, sats);
    },
  };
}
