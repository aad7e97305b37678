/**
 * What the sweep takes and gives: its options, its result, the per-step
 * event for callers that want records, and the pieces a chunk hands back.
 */
import type { LinkEngine } from '../budget/engine.js';
import type { LinkSpec, StepBudget } from '../budget/types.js';
import type { DailyAccumulatorState } from '../analysis/dailyAccumulator.js';
import type { MaskHistogram, MaskHistogramState } from '../analysis/maskHistogram.js';
import type { RateHistogram, RateHistogramState } from '../analysis/rateHistogram.js';
import type { PassLinkTable, PassTableState } from '../analysis/passTable.js';
import type { DailyRow, PassSeries } from '../analysis/types.js';
import type { Pass } from '../passes/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import type { StepWindow } from './window.js';
import type { WhatIfChunkData } from './whatIfCollect.js';
import type { WhatIfSummaryPart } from '../analysis/whatIfSummary.js';
import type { VolumeProfiles, VolumeProfileState } from './profiles.js';

/** One evaluated step as a record (the slow path, for checks and custom sinks); the objects are reused: copy what you keep. */
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

/** Receives the steps of the sweep window by window, in row order (see window.ts). Return a promise to make the sweep wait. */
export type StepSink = (w: StepWindow) => void | Promise<void>;

export interface PipelineOptions {
  scenario: ResolvedScenario;
  /** Every step as a record, in steps.csv order (per satellite). Slow: for checks. */
  onStep?: (e: StepEvent) => void | Promise<void>;
  /** Every window of steps in columns, in steps.csv order: what the steps writers use. */
  onWindow?: StepSink;
  /** Keep decimated per-pass series (and the envelope) for the report. */
  collectSeries?: boolean;
  seriesMaxPoints?: number;
  /** With collectSeries: series only for the first this many pass-link sections in time order (default SERIES_MAX_SECTIONS). */
  seriesMaxSections?: number;
  /** Replace every station's horizon mask by max(mask, this) (deg). */
  maskFloorDeg?: number;
  /** Progress callback: seconds of pass time processed and total. */
  onProgress?: (doneS: number, totalS: number) => void;
  /** Filled with where the time goes (this thread's work). */
  timings?: SweepTimings;
  /** Collect the report's what-if columns into `whatIf` (whatIfCollect.ts); 'summary': the long-window summary. */
  collectWhatIf?: boolean | 'summary';
}

/**
 * Where a sweep's time goes (s), when asked for (PipelineOptions.timings):
 * pass search (scan, events, completing passes, with the SGP4 nodes they
 * need), the elevation tables, propagation (nodes, interpolation, TEME →
 * Earth-fixed on the grid), geometry (look angles), the budget (engines),
 * the accumulators (pass, day, network, mask, rate, envelope, series) and the
 * steps sink. Timed per window, so the clock calls cost nothing measurable.
 */
export interface SweepTimings {
  passSearchS: number;
  tablesS: number;
  propagationS: number;
  geometryS: number;
  budgetS: number;
  accumulatorsS: number;
  stepsS: number;
  /** Reducing the what-if columns to the long-window summary (analysis/whatIfSummary.ts). */
  whatIfS: number;
  /** `passbudget run` only: writing the other outputs (passes, daily, summary, calendar, report). */
  outputsS: number;
}

export function createSweepTimings(): SweepTimings {
  return { passSearchS: 0, tablesS: 0, propagationS: 0, geometryS: 0, budgetS: 0, accumulatorsS: 0, stepsS: 0, whatIfS: 0, outputsS: 0 };
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
 * where a bin saw no finite margin. Unusable steps while the mount was
 * rate-limited (keyhole, which the mask finder leaves out too) are not in
 * minDB/maxDB but in keyholeMinDB (their lowest margin per bin).
 */
export interface StationLinkEnvelope {
  station: string;
  link: string;
  weather: string;
  minDB: Float64Array;
  maxDB: Float64Array;
  keyholeMinDB: Float64Array;
}

export interface PipelineResult {
  passes: Pass[];
  /** Per pass, link and weather case, compactly (records built on demand). */
  passLinks: PassLinkTable;
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
  /** SGP4 evaluations made by the sweep (nodes when interpolating), all satellites and threads. */
  sgp4Calls: number;
  engines: LinkEngine[];
  /** With PipelineOptions.collectWhatIf: per satellite, the report's what-if columns in run order. */
  whatIf?: WhatIfSatellite[];
  /** With scenario.volumeProfileGridS: each pass-link's cumulative volume on that grid (sweep/profiles.ts). */
  profiles?: VolumeProfiles;
}

/** A satellite's what-if columns (whatIfCollect.ts), its chunks in order; `parts` index `passes`. */
export interface WhatIfSatellite {
  satIndex: number;
  satellite: string;
  /** Layout stations: name, index in scenario.stations, links (in the order of the columns). */
  stations: { name: string; stationIndex: number; links: LinkSpec[] }[];
  passes: Pass[];
  passIds: string[];
  parts: Int32Array;
  elevation: Int32Array;
  cn0: Int32Array;
  /** With collectWhatIf 'summary': the satellite's summary (parts, elevation and cn0 are then empty). */
  summary?: WhatIfSummaryPart;
}

/** What one chunk hands back: plain data and typed arrays (crosses a worker boundary). */
export interface ChunkPartial {
  satIndex: number;
  chunk: number;
  /** The chunk's passes, completed (TCA, peak, azimuths), in plan order. */
  passes: Pass[];
  passLinks: PassTableState;
  series: PassSeriesData[];
  /** Per layout station, link and case; then per link name and case for the network. */
  daily: DailyAccumulatorState[];
  /** Per layout station, link and case. */
  mask: MaskHistogramState[];
  rate: (RateHistogramState | null)[];
  /** With collectSeries: per layout station, link and case, [min | max | keyhole min] (ENVELOPE_BINS each); else empty. */
  envelope: Float64Array[];
  /** With scenario.volumeProfileGridS: the chunk's volume profiles. */
  profiles?: VolumeProfileState;
  stationSteps: number;
  gridTimes: number;
  linkSteps: number;
  sgp4Calls: number;
  /** With SweepOptions.collectWhatIf: the report's what-if columns of the chunk (only its pass ids with 'summary'). */
  whatIf?: WhatIfChunkData;
  /** With collectWhatIf 'summary': the chunk's what-if summary (analysis/whatIfSummary.ts). */
  whatIfSummary?: WhatIfSummaryPart;
}

export const ENVELOPE_BIN_DEG = 2;
export const ENVELOPE_BINS = 45;

/**
 * One step into an envelope's bins: margin m (dB) at elevation el (deg);
 * `keyhole` (unusable while the mount was rate-limited) goes to keyholeMinDB.
 * Non-finite margins and elevations outside [0°, 90°] are left out.
 */
export function envelopeAdd(minDB: Float64Array, maxDB: Float64Array, keyholeMinDB: Float64Array, el: number, m: number, keyhole: boolean): void {
  const b = envelopeBin(el);
  if (b < 0 || !Number.isFinite(m)) return;
  if (keyhole) {
    if (m < keyholeMinDB[b]) keyholeMinDB[b] = m;
    return;
  }
  if (m < minDB[b]) minDB[b] = m;
  if (m > maxDB[b]) maxDB[b] = m;
}

/** Envelope bin of an elevation (deg), −1 outside [0°, 90°] or NaN. */
export function envelopeBin(elevationDeg: number): number {
  if (!(elevationDeg >= 0 && elevationDeg <= 90)) return -1;
  return Math.min(ENVELOPE_BINS - 1, Math.floor(elevationDeg / ENVELOPE_BIN_DEG));
}
