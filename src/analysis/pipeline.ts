/**
 * The run pipeline: for each satellite, find the passes over every station,
 * then sweep one time grid t_k = start + k·step over the union of those
 * passes. At each grid time the satellite is propagated once, and every
 * station in view evaluates every one of its links. Each step goes, as it is
 * made, to the caller's sink (steps.csv) and into fixed-size accumulators:
 * per pass, per UTC day, per station and for the network, and the mask and
 * rate histograms. Nothing per step is kept, so memory does not grow with
 * the window (the per-pass and per-day summaries aside).
 *
 * Report series, bounded by design: with `collectSeries` the decimated
 * series (≤ seriesMaxPoints points) are kept only for the first
 * `seriesMaxSections` pass-link sections of the run in time order (AOS, then
 * station, then link name: the report's order), SERIES_MAX_SECTIONS = 300 by
 * default, chosen before the sweep from the plan. The report's margin-against-
 * elevation envelope, which covers every pass, is accumulated instead as a
 * fixed-size table per station, link and case (lowest and highest margin of
 * every step per 2° elevation bin).
 *
 * Network rule: a satellite downlinks on a given link to one station at a
 * time. Where several stations see it at a grid time, the scenario's policy
 * picks one among those whose step is usable (best margin, or a priority
 * order); only that station's step counts for the network, so the network
 * never counts the same second twice.
 *
 * Chunks: the sweep of each satellite is cut into CHUNKS_PER_SATELLITE pieces
 * at grid times where no station sees it (so no pass and no network contact
 * crosses a cut), chosen from the passes alone. Each chunk is swept into
 * fresh accumulators whose state is then merged into the run's, chunk after
 * chunk. A parallel run (src/jobs/workerRun.ts) sweeps the same chunks on
 * worker threads and merges them in the same order, so its floating-point
 * sums, and therefore its output files, are identical to the in-process run
 * whatever the number of workers.
 */
import type { ElevationTable } from '../budget/atmosphere.js';
import type { LinkEngine } from '../budget/engine.js';
import { createLinkEngine, createStepBudget } from '../budget/engine.js';
import type { LinkSpec, StepBudget, WeatherCase } from '../budget/types.js';
import { createStationGeometry, type StationGeometry } from '../geometry/station.js';
import { createGeometrySample, type GeometrySample } from '../geometry/types.js';
import { createPropagator, type Propagator } from '../orbit/propagator.js';
import { findPasses } from '../passes/find.js';
import type { Pass } from '../passes/types.js';
import type { ResolvedScenario, ScenarioStation } from '../scenario/types.js';
import {
  createDailyAccumulator, NETWORK_STATION, type DailyAccumulator, type DailyAccumulatorState,
} from './dailyAccumulator.js';
import { createMaskHistogram, type MaskHistogram, type MaskHistogramState } from './maskHistogram.js';
import { chooseNetworkStation, type NetworkCandidate } from './network.js';
import { createPassAccumulator, type PassAccumulator } from './passAccumulator.js';
import { createRateHistogram, type RateHistogram, type RateHistogramState } from './rateHistogram.js';
import type { DailyRow, PassLinkSummary, PassSeries } from './types.js';
import { internVerdictSentence, judgePass } from './verdict.js';

/** One evaluated step handed to the sink; the objects are reused: copy what you keep. */
export interface StepEvent {
  passId: string;
  satellite: string;
  station: string;
  link: LinkSpec;
  timeS: number;
  step: StepBudget;
}

/** Decimated series of one pass and link, for the report (at most `seriesMaxPoints` points). */
export type PassSeriesData = PassSeries;

export interface PipelineOptions {
  scenario: ResolvedScenario;
  /**
   * Called for every step in time order (per satellite). Return a promise only
   * when the sink needs the pipeline to wait (stream backpressure).
   */
  onStep?: (e: StepEvent) => void | Promise<void>;
  /** Keep decimated per-pass series for the report. */
  collectSeries?: boolean;
  seriesMaxPoints?: number;
  /** With collectSeries: series only for the first this many pass-link sections in time order (default SERIES_MAX_SECTIONS). */
  seriesMaxSections?: number;
  /** Replace every station's horizon mask by max(mask, this) (deg). */
  maskFloorDeg?: number;
  /** Progress callback: seconds of pass time processed and total. */
  onProgress?: (doneS: number, totalS: number) => void;
}

export interface StationLinkHistograms {
  station: string;
  link: LinkSpec;
  weather: string;
  mask: MaskHistogram;
  /** Fixed-rate links only. */
  rate: RateHistogram | null;
}

/**
 * Lowest and highest margin (dB) of every step per elevation bin
 * [k·ENVELOPE_BIN_DEG, (k+1)·ENVELOPE_BIN_DEG), the last bin closed at 90°
 * (the bins of d3-array `bin` with thresholds every 2° over [0, 90]); +∞/−∞
 * where a bin saw no finite margin.
 */
export interface StationLinkEnvelope {
  station: string;
  link: string;
  weather: string;
  minDB: Float64Array;
  maxDB: Float64Array;
}

export interface PipelineResult {
  passes: Pass[];
  passLinks: PassLinkSummary[];
  daily: DailyRow[];
  histograms: StationLinkHistograms[];
  series: PassSeriesData[];
  /** With collectSeries: per station, link and case (empty otherwise). */
  envelopes: StationLinkEnvelope[];
  /** Grid steps evaluated (per station in view, per link counted once per station). */
  stationSteps: number;
  /** Grid times at which the satellite was propagated. */
  gridTimes: number;
  /** (station, link) evaluations. */
  linkSteps: number;
  engines: LinkEngine[];
}

/** Chunks per satellite: fixed (not tied to the worker count) so every run merges the same partial sums. */
export const CHUNKS_PER_SATELLITE = 24;

/** Default cap on the pass-link sections whose series are kept for the report (see the file comment). */
export const SERIES_MAX_SECTIONS = 300;

export const ENVELOPE_BIN_DEG = 2;
export const ENVELOPE_BINS = 45;

/** Envelope bin of an elevation (deg), −1 outside [0°, 90°] or NaN. */
export function envelopeBin(elevationDeg: number): number {
  if (!(elevationDeg >= 0 && elevationDeg <= 90)) return -1;
  return Math.min(ENVELOPE_BINS - 1, Math.floor(elevationDeg / ENVELOPE_BIN_DEG));
}

// ---------------------------------------------------------------------------
// Layout: which stations and links a satellite has (cheap, no engines).

export interface StationLayout {
  /** Index in scenario.stations. */
  stationIndex: number;
  /** The scenario entry with the mask floor applied. */
  entry: ScenarioStation;
  links: LinkSpec[];
}

export interface SatelliteLayout {
  satIndex: number;
  satellite: string;
  stations: StationLayout[];
  /** Link names of this satellite, first-seen order. */
  linkNames: string[];
}

function withMaskFloor(entry: ScenarioStation, floorDeg: number | undefined): ScenarioStation {
  if (floorDeg === undefined) return entry;
  const m = entry.station.mask;
  const mask = m.kind === 'constant'
    ? { kind: 'constant' as const, elevationDeg: Math.max(m.elevationDeg, floorDeg) }
    : { kind: 'table' as const, points: m.points.map(([a, e]) => [a, Math.max(e, floorDeg)] as const) };
  return { ...entry, station: { ...entry.station, mask } };
}

export function satelliteLayout(scenario: ResolvedScenario, satIndex: number, maskFloorDeg?: number): SatelliteLayout {
  const sat = scenario.satellites[satIndex];
  const stations: StationLayout[] = [];
  scenario.stations.forEach((entry0, stationIndex) => {
    const entry = withMaskFloor(entry0, maskFloorDeg);
    const links = scenario.links.filter((l) => l.satellite === sat.name && l.station === entry.station.name);
    if (links.length > 0) stations.push({ stationIndex, entry, links });
  });
  const linkNames = [...new Set(stations.flatMap((s) => s.links.map((l) => l.name)))];
  return { satIndex, satellite: sat.name, stations, linkNames };
}

// ---------------------------------------------------------------------------
// Plan: the passes and the chunks (cheap: orbit and geometry only).

/** A pass with its grid interval; `station` indexes SatelliteLayout.stations. */
export interface PlannedPass {
  station: number;
  pass: Pass;
  passId: string;
  kFirst: number;
  kLast: number;
  /** Names of the links whose series are kept for this pass (set by selectSeries). */
  seriesLinks?: string[];
}

export interface SatellitePlan {
  /** Passes per layout station, in the order findPasses returned them. */
  passesByStation: Pass[][];
  /** All passes in sweep order (AOS, then station name). */
  items: PlannedPass[];
  /** Chunk c is items[chunkStarts[c] .. chunkStarts[c + 1]). */
  chunkStarts: number[];
  /** Σ pass durations (s), for progress. */
  totalS: number;
}

/** The passes of layout station `stationIndex` (orbit and geometry only; what a worker thread can do for the plan). */
export function findStationPasses(scenario: ResolvedScenario, layout: SatelliteLayout, stationIndex: number): Pass[] {
  const { startS, endS } = scenario.window;
  const propagator = createPropagator(scenario.satellites[layout.satIndex].elements);
  return findPasses({ propagator, station: layout.stations[stationIndex].entry.station, startS, endS });
}

export function planSatellite(scenario: ResolvedScenario, layout: SatelliteLayout, chunks = CHUNKS_PER_SATELLITE): SatellitePlan {
  return planFromPasses(scenario, layout, layout.stations.map((_, si) => findStationPasses(scenario, layout, si)), chunks);
}

/** The plan from each layout station's passes (as findStationPasses returns them). */
export function planFromPasses(scenario: ResolvedScenario, layout: SatelliteLayout, passesByStation: Pass[][], chunks = CHUNKS_PER_SATELLITE): SatellitePlan {
  const { startS, stepS } = scenario.window;
  const sat = scenario.satellites[layout.satIndex];
  const items: PlannedPass[] = [];
  layout.stations.forEach((st, si) => {
    const passes = passesByStation[si];
    for (const p of passes) {
      const kFirst = Math.ceil((p.aosS - startS) / stepS - 1e-9);
      const kLast = Math.floor((p.losS - startS) / stepS + 1e-9);
      items.push({ station: si, pass: p, passId: `${sat.name}/${st.entry.station.name}/${p.index}`, kFirst, kLast });
    }
  });
  const name = (it: PlannedPass) => layout.stations[it.station].entry.station.name;
  items.sort((a, b) => a.pass.aosS - b.pass.aosS || name(a).localeCompare(name(b)));
  const totalS = items.reduce((s, it) => s + it.pass.durationS, 0);
  return { passesByStation, items, chunkStarts: chunkStarts(items, chunks), totalS };
}

/**
 * Mark the first `maxSections` pass-link sections of the run, in the report's
 * order (AOS, station name, link name), as the ones whose series are kept.
 */
export function selectSeries(plans: readonly { layout: SatelliteLayout; plan: SatellitePlan }[], maxSections: number): void {
  const all: { aosS: number; station: string; link: string; item: PlannedPass }[] = [];
  for (const { layout, plan } of plans) {
    for (const it of plan.items) {
      it.seriesLinks = [];
      const st = layout.stations[it.station];
      for (const l of st.links) all.push({ aosS: it.pass.aosS, station: st.entry.station.name, link: l.name, item: it });
    }
  }
  if (!(maxSections > 0)) return;
  all.sort((a, b) => a.aosS - b.aosS || a.station.localeCompare(b.station) || a.link.localeCompare(b.link));
  for (let i = 0; i < Math.min(maxSections, all.length); i++) all[i].item.seriesLinks!.push(all[i].link);
}

/**
 * Cut points: before a pass that has grid steps and starts after every earlier
 * pass's last grid step (no station in view in between), at the first such
 * point past each 1/chunks of the grid steps.
 */
export function chunkStarts(items: readonly PlannedPass[], chunks: number): number[] {
  const steps = (it: PlannedPass) => Math.max(0, it.kLast - it.kFirst + 1);
  const total = items.reduce((s, it) => s + steps(it), 0);
  const starts = [0];
  let done = 0;
  let maxLast = -Infinity;
  for (let i = 0; i < items.length; i++) {
    const it = items[i];
    const n = steps(it);
    if (i > 0 && n > 0 && it.kFirst > maxLast && done >= (total * starts.length) / chunks) starts.push(i);
    done += n;
    if (n > 0 && it.kLast > maxLast) maxLast = it.kLast;
  }
  starts.push(items.length);
  return starts;
}

// ---------------------------------------------------------------------------
// Sweep: one chunk into fresh accumulators.

/** What one chunk hands back: plain data and typed arrays (crosses a worker boundary). */
export interface ChunkPartial {
  satIndex: number;
  chunk: number;
  passLinks: PassLinkSummary[];
  series: PassSeriesData[];
  /** Per layout station, link and case; then per link name and case for the network. */
  daily: DailyAccumulatorState[];
  /** Per layout station, link and case. */
  mask: MaskHistogramState[];
  rate: (RateHistogramState | null)[];
  /** With collectSeries: per layout station, link and case, [min (ENVELOPE_BINS) | max (ENVELOPE_BINS)]; else empty. */
  envelope: Float64Array[];
  stationSteps: number;
  gridTimes: number;
  linkSteps: number;
}

interface LinkRun {
  link: LinkSpec;
  engine: LinkEngine;
  step: StepBudget;
  daily: DailyAccumulator[]; // per case
  mask: MaskHistogram[]; // per case
  rate: (RateHistogram | null)[]; // per case
  envelope: Float64Array[]; // per case, when collecting series
  pass: PassAccumulator | null;
  series: PassSeriesData | null;
  seriesEvery: number;
  seriesCount: number;
}

interface StationRun {
  name: string;
  priority: number;
  geometry: StationGeometry;
  sample: GeometrySample;
  links: LinkRun[];
  /** Per SatelliteLayout.linkNames index: this station's run of that link, or null. */
  byName: (LinkRun | null)[];
}

export interface SweepOptions {
  onStep?: (e: StepEvent) => void | Promise<void>;
  collectSeries?: boolean;
  seriesMaxPoints?: number;
  /** Called after each pass with its duration (s). */
  onPassDone?: (durationS: number) => void;
}

export interface Sweeper {
  layout: SatelliteLayout;
  engines: LinkEngine[];
  sweepChunk(items: readonly PlannedPass[], chunk: number, options: SweepOptions): Promise<ChunkPartial>;
}

/** Memoise the last TEME state so stations sharing a grid time propagate once. */
function sharedPropagator(inner: Propagator): Propagator {
  let lastT = NaN;
  const r = new Float64Array(3);
  const v = new Float64Array(3);
  return {
    elements: inner.elements,
    satrec: inner.satrec,
    minutesSinceEpoch: (t) => inner.minutesSinceEpoch(t),
    stateTemeAtMinutes: (m, p, q) => inner.stateTemeAtMinutes(m, p, q),
    stateTeme(t, posOut, velOut) {
      if (t !== lastT) {
        inner.stateTeme(t, r, v);
        lastT = t;
      }
      posOut[0] = r[0]; posOut[1] = r[1]; posOut[2] = r[2];
      velOut[0] = v[0]; velOut[1] = v[1]; velOut[2] = v[2];
    },
  };
}

/**
 * Engines, geometry and reusable records for one satellite. The expensive
 * part is the engines' elevation tables; `tables` (one per layout station and
 * link, in that order, e.g. `sweeper.engines.map((e) => e.table)` of a
 * sweeper built elsewhere) skips building them.
 */
export function createSweeper(scenario: ResolvedScenario, layout: SatelliteLayout, tables?: readonly ElevationTable[]): Sweeper {
  const { startS, endS, stepS } = scenario.window;
  const cases: WeatherCase[] = scenario.weatherCases;
  const nCases = cases.length;
  const sat = scenario.satellites[layout.satIndex];
  const propagator = sharedPropagator(createPropagator(sat.elements));
  const engines: LinkEngine[] = [];
  const stations: StationRun[] = layout.stations.map((st) => {
    const links: LinkRun[] = st.links.map((link) => {
      const engine = createLinkEngine({ link, climate: st.entry.climate, weatherCases: cases, table: tables?.[engines.length] });
      engines.push(engine);
      return {
        link, engine, step: createStepBudget(cases), daily: [], mask: [], rate: [], envelope: [],
        pass: null, series: null, seriesEvery: 1, seriesCount: 0,
      };
    });
    return {
      name: st.entry.station.name, priority: st.entry.priority,
      geometry: createStationGeometry(st.entry.station), sample: createGeometrySample(), links,
      byName: layout.linkNames.map((n) => links.find((l) => l.link.name === n) ?? null),
    };
  });
  const nLinks = layout.linkNames.length;
  const protoLink = layout.linkNames.map((n) => stations.flatMap((s) => s.links).find((l) => l.link.name === n)!.link);
  // Pooled network candidates (one per station), refilled at every grid time.
  const pool: NetworkCandidate[] = stations.map(() => ({ station: '', marginDB: NaN, usable: false, rateBps: 0, priority: 0 }));
  const candidates: NetworkCandidate[] = [];
  const candidateRuns: LinkRun[] = [];
  const event: StepEvent = { passId: '', satellite: sat.name, station: '', link: protoLink[0], timeS: NaN, step: stations[0]?.links[0]?.step };

  async function sweepChunk(items: readonly PlannedPass[], chunk: number, o: SweepOptions): Promise<ChunkPartial> {
    const seriesMax = o.seriesMaxPoints ?? 120;
    const part: ChunkPartial = {
      satIndex: layout.satIndex, chunk, passLinks: [], series: [], daily: [], mask: [], rate: [], envelope: [],
      stationSteps: 0, gridTimes: 0, linkSteps: 0,
    };
    // Fresh accumulators for this chunk.
    for (const st of stations) {
      for (const lr of st.links) {
        lr.daily = cases.map((c) => createDailyAccumulator({ startS, endS, link: lr.link, weather: c.name, exportable: true }));
        lr.mask = cases.map((c) => createMaskHistogram({ station: st.name, link: lr.link.name, weather: c.name }));
        lr.rate = cases.map((c) => (lr.link.modcod.kind === 'fixed' ? createRateHistogram({ station: st.name, link: lr.link.name, weather: c.name }) : null));
        lr.envelope = o.collectSeries ? cases.map(() => emptyEnvelope()) : [];
      }
    }
    const netDaily = protoLink.map((link) => cases.map((c) => createDailyAccumulator({
      startS, endS, link, weather: c.name, station: NETWORK_STATION, satellite: sat.name, exportable: true,
    })));

    const beginPass = (it: PlannedPass) => {
      const p = it.pass;
      const expected = Math.max(1, it.kLast - it.kFirst + 1);
      for (const lr of stations[it.station].links) {
        lr.engine.beginPass();
        lr.pass = createPassAccumulator({
          link: lr.link,
          pass: {
            passId: it.passId, satellite: sat.name, station: p.station, aosS: p.aosS, tcaS: p.tcaS, losS: p.losS,
            maxElevationDeg: p.maxElevationDeg, durationS: p.durationS, clippedStart: p.clippedStart, clippedEnd: p.clippedEnd,
          },
          weatherCases: cases,
        });
        if (o.collectSeries && it.seriesLinks?.includes(lr.link.name)) {
          lr.seriesEvery = Math.max(1, Math.ceil(expected / seriesMax));
          lr.seriesCount = 0;
          lr.series = {
            passId: it.passId, link: lr.link.name, timeS: [], azimuthDeg: [], elevationDeg: [],
            cases: cases.map((c) => ({ weather: c.name, marginDB: [], ebN0DB: [] })),
          };
        }
      }
    };
    const endPass = (it: PlannedPass) => {
      for (const lr of stations[it.station].links) {
        const summary = lr.pass!.finish();
        part.passLinks.push(summary);
        summary.cases.forEach((c, ci) => lr.daily[ci].endPass(it.pass.aosS, c.verdict));
        if (lr.series) part.series.push(lr.series);
        lr.pass = null;
        lr.series = null;
      }
      o.onPassDone?.(it.pass.durationS);
    };

    // Network contact = a maximal run of grid times with at least one station in view.
    const netContact = layout.linkNames.map(() => cases.map(() => ({ startS: NaN, usableS: 0, any: false, aboveS: 0 })));
    const closeNetContact = () => {
      for (let li = 0; li < nLinks; li++) {
        for (let ci = 0; ci < nCases; ci++) {
          const nc = netContact[li][ci];
          if (Number.isNaN(nc.startS)) continue;
          netDaily[li][ci].endPass(nc.startS, judgePass(nc.usableS, nc.aboveS, nc.any).verdict);
          nc.startS = NaN; nc.usableS = 0; nc.any = false; nc.aboveS = 0;
        }
      }
    };

    let active: PlannedPass[] = [];
    let still: PlannedPass[] = [];
    let i = 0;
    let k = items.length ? items[0].kFirst : 0;
    while (i < items.length || active.length > 0) {
      if (active.length === 0) {
        closeNetContact();
        // Passes too short to hold a grid point still get a summary (no steps).
        while (i < items.length && items[i].kLast < items[i].kFirst) {
          beginPass(items[i]); endPass(items[i]); i++;
        }
        if (i >= items.length) break;
        k = Math.max(k, items[i].kFirst);
      }
      while (i < items.length && items[i].kFirst <= k) {
        const it = items[i++];
        beginPass(it);
        if (it.kLast < it.kFirst) { endPass(it); continue; }
        active.push(it);
      }
      if (active.length === 0) continue;
      const t = startS + k * stepS;
      part.gridTimes++;
      for (let a = 0; a < active.length; a++) {
        const it = active[a];
        const st = stations[it.station];
        st.geometry.sample(propagator, t, st.sample);
        part.stationSteps++;
        for (let l = 0; l < st.links.length; l++) {
          const lr = st.links[l];
          const step = lr.engine.evaluate(st.sample, lr.step);
          part.linkSteps++;
          const el = step.elevation_deg;
          lr.pass!.add(t, stepS, el, step);
          for (let ci = 0; ci < nCases; ci++) {
            const c = step.cases[ci];
            lr.daily[ci].add(t, stepS, c);
            lr.mask[ci].add(el, stepS, c.usable, c.information_rate_bps, step.mount_limited);
            const rh = lr.rate[ci];
            if (rh) rh.add(c.c_over_n0_dbhz, stepS);
          }
          if (lr.envelope.length > 0) {
            const b = envelopeBin(el);
            if (b >= 0) {
              for (let ci = 0; ci < nCases; ci++) {
                const m = step.cases[ci].margin_db;
                if (!Number.isFinite(m)) continue;
                const env = lr.envelope[ci];
                if (m < env[b]) env[b] = m;
                if (m > env[ENVELOPE_BINS + b]) env[ENVELOPE_BINS + b] = m;
              }
            }
          }
          if (lr.series && lr.seriesCount++ % lr.seriesEvery === 0) {
            const s = lr.series;
            s.timeS.push(t); s.azimuthDeg.push(step.azimuth_deg); s.elevationDeg.push(el);
            for (let ci = 0; ci < nCases; ci++) {
              s.cases[ci].marginDB.push(step.cases[ci].margin_db);
              s.cases[ci].ebN0DB.push(step.cases[ci].eb_over_n0_db);
            }
          }
          if (o.onStep) {
            event.passId = it.passId; event.station = st.name; event.link = lr.link; event.timeS = t; event.step = step;
            const wait = o.onStep(event);
            if (wait) await wait;
          }
        }
      }
      // Network: per link name and case, one station at most.
      for (let li = 0; li < nLinks; li++) {
        for (let ci = 0; ci < nCases; ci++) {
          candidates.length = 0;
          candidateRuns.length = 0;
          for (let a = 0; a < active.length; a++) {
            const st = stations[active[a].station];
            const lr = st.byName[li];
            if (!lr) continue;
            const c = lr.step.cases[ci];
            const cand = pool[candidates.length];
            cand.station = st.name; cand.marginDB = c.margin_db; cand.usable = c.usable; cand.rateBps = c.information_rate_bps; cand.priority = st.priority;
            candidates.push(cand);
            candidateRuns.push(lr);
          }
          if (candidates.length === 0) continue;
          const nc = netContact[li][ci];
          if (Number.isNaN(nc.startS)) nc.startS = t;
          nc.aboveS += stepS;
          const chosen = chooseNetworkStation(candidates, scenario.network);
          if (chosen >= 0) {
            const lr = candidateRuns[chosen];
            netDaily[li][ci].add(t, stepS, lr.step.cases[ci], lr.link);
            nc.usableS += stepS;
            nc.any = true;
          }
        }
      }
      // Retire passes whose last grid point this was.
      still.length = 0;
      for (const it of active) {
        if (it.kLast <= k) endPass(it);
        else still.push(it);
      }
      [active, still] = [still, active];
      k++;
    }
    closeNetContact();

    for (const st of stations) {
      for (const lr of st.links) {
        for (let ci = 0; ci < nCases; ci++) {
          part.daily.push(lr.daily[ci].exportState());
          part.mask.push(lr.mask[ci].exportState());
          const rh = lr.rate[ci];
          part.rate.push(rh ? rh.exportState() : null);
          if (lr.envelope.length > 0) part.envelope.push(lr.envelope[ci]);
        }
        lr.daily = []; lr.mask = []; lr.rate = []; lr.envelope = [];
      }
    }
    for (const accs of netDaily) for (const a of accs) part.daily.push(a.exportState());
    return part;
  }

  return { layout, engines, sweepChunk };
}

function emptyEnvelope(): Float64Array {
  const e = new Float64Array(2 * ENVELOPE_BINS);
  e.fill(Infinity, 0, ENVELOPE_BINS);
  e.fill(-Infinity, ENVELOPE_BINS);
  return e;
}

// ---------------------------------------------------------------------------
// Merge: the run's accumulators, fed chunk by chunk in order.

export interface SatelliteMerge {
  /** Merge chunk `part` (chunks must arrive in order 0, 1, 2, …). */
  add(part: ChunkPartial): void;
  /** Daily rows of the stations (and, separately, of the network). */
  finish(): { stationDaily: DailyRow[]; networkDaily: DailyRow[] };
}

/**
 * The run-level accumulators of one satellite. Histograms are appended to
 * `result.histograms` (station, link, case order) when created; passLinks,
 * series and the step counters go into `result` as chunks merge.
 */
export function createSatelliteMerge(scenario: ResolvedScenario, layout: SatelliteLayout, result: PipelineResult): SatelliteMerge {
  const { startS, endS } = scenario.window;
  const cases = scenario.weatherCases;
  const daily: DailyAccumulator[] = [];
  const hists: StationLinkHistograms[] = [];
  const envelopes: StationLinkEnvelope[] = [];
  for (const st of layout.stations) {
    const name = st.entry.station.name;
    for (const link of st.links) {
      for (const c of cases) {
        envelopes.push({ station: name, link: link.name, weather: c.name, minDB: new Float64Array(ENVELOPE_BINS).fill(Infinity), maxDB: new Float64Array(ENVELOPE_BINS).fill(-Infinity) });
        daily.push(createDailyAccumulator({ startS, endS, link, weather: c.name }));
        const h: StationLinkHistograms = {
          station: name, link, weather: c.name,
          mask: createMaskHistogram({ station: name, link: link.name, weather: c.name }),
          rate: link.modcod.kind === 'fixed' ? createRateHistogram({ station: name, link: link.name, weather: c.name }) : null,
        };
        hists.push(h);
        result.histograms.push(h);
      }
    }
  }
  const nStationDaily = daily.length;
  for (const name of layout.linkNames) {
    const proto = layout.stations.flatMap((s) => s.links).find((l) => l.name === name)!;
    for (const c of cases) {
      daily.push(createDailyAccumulator({ startS, endS, link: proto, weather: c.name, station: NETWORK_STATION, satellite: layout.satellite }));
    }
  }
  let next = 0;
  let envelopesKept = false;
  return {
    add(part) {
      if (part.chunk !== next) throw new Error(`pipeline merge: chunk ${part.chunk} arrived, expected ${next}`);
      next++;
      for (const p of part.passLinks) {
        // Summaries from a worker arrive as structured clones, each with its own copy of the
        // rule sentence; point them back at the one shared copy (a year of passes otherwise
        // holds tens of MB of identical strings).
        for (const c of p.cases) c.verdictRule = internVerdictSentence(c.verdictRule);
        result.passLinks.push(p);
      }
      for (const s of part.series) result.series.push(s);
      part.daily.forEach((d, i) => daily[i].mergeState(d));
      part.mask.forEach((m, i) => hists[i].mask.mergeState(m));
      part.rate.forEach((r, i) => { if (r) hists[i].rate!.mergeState(r); });
      part.envelope.forEach((e, i) => {
        const t = envelopes[i];
        for (let b = 0; b < ENVELOPE_BINS; b++) {
          if (e[b] < t.minDB[b]) t.minDB[b] = e[b];
          if (e[ENVELOPE_BINS + b] > t.maxDB[b]) t.maxDB[b] = e[ENVELOPE_BINS + b];
        }
      });
      if (part.envelope.length > 0 && !envelopesKept) { for (const e of envelopes) result.envelopes.push(e); envelopesKept = true; }
      result.stationSteps += part.stationSteps;
      result.gridTimes += part.gridTimes;
      result.linkSteps += part.linkSteps;
    },
    finish() {
      const rows = daily.map((d) => d.rows());
      return { stationDaily: rows.slice(0, nStationDaily).flat(), networkDaily: rows.slice(nStationDaily).flat() };
    },
  };
}

export function emptyPipelineResult(): PipelineResult {
  return { passes: [], passLinks: [], daily: [], histograms: [], series: [], envelopes: [], stationSteps: 0, gridTimes: 0, linkSteps: 0, engines: [] };
}

/** The final ordering of the run's tables (the same for in-process and parallel runs). */
export function finishPipelineResult(result: PipelineResult, networkDaily: DailyRow[]): PipelineResult {
  for (const d of networkDaily) result.daily.push(d);
  result.daily.sort((a, b) =>
    a.dayUtc.localeCompare(b.dayUtc) || a.satellite.localeCompare(b.satellite) || a.link.localeCompare(b.link)
    || a.weather.localeCompare(b.weather) || (a.station === NETWORK_STATION ? 1 : 0) - (b.station === NETWORK_STATION ? 1 : 0)
    || a.station.localeCompare(b.station));
  result.passLinks.sort((a, b) => a.aosS - b.aosS || a.station.localeCompare(b.station) || a.link.localeCompare(b.link));
  return result;
}

export async function runPipeline(options: PipelineOptions): Promise<PipelineResult> {
  const { scenario } = options;
  const result = emptyPipelineResult();
  const networkDaily: DailyRow[] = [];
  // Plan every satellite first (cheap), so the report's series can be chosen over the whole run.
  const plans: { layout: SatelliteLayout; plan: SatellitePlan }[] = [];
  for (let satIndex = 0; satIndex < scenario.satellites.length; satIndex++) {
    const layout = satelliteLayout(scenario, satIndex, options.maskFloorDeg);
    if (layout.stations.length === 0) continue;
    plans.push({ layout, plan: planSatellite(scenario, layout) });
  }
  if (options.collectSeries) selectSeries(plans, options.seriesMaxSections ?? SERIES_MAX_SECTIONS);
  for (const { layout, plan } of plans) {
    const sweeper = createSweeper(scenario, layout);
    for (const e of sweeper.engines) result.engines.push(e);
    const merge = createSatelliteMerge(scenario, layout, result);
    for (const ps of plan.passesByStation) for (const p of ps) result.passes.push(p);
    let doneS = 0;
    const sweep: SweepOptions = {
      onStep: options.onStep,
      collectSeries: options.collectSeries,
      seriesMaxPoints: options.seriesMaxPoints,
      onPassDone: (d) => { doneS += d; options.onProgress?.(doneS, plan.totalS); },
    };
    for (let c = 0; c + 1 < plan.chunkStarts.length; c++) {
      merge.add(await sweeper.sweepChunk(plan.items.slice(plan.chunkStarts[c], plan.chunkStarts[c + 1]), c, sweep));
    }
    const rows = merge.finish();
    for (const d of rows.stationDaily) result.daily.push(d);
    for (const d of rows.networkDaily) networkDaily.push(d);
  }
  return finishPipelineResult(result, networkDaily);
}
