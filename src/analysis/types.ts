/**
 * What the analysis stage produces from the per-step budgets: per-pass
 * summaries, per-day aggregates, the network's delivered volume, and the
 * mask and rate trade curves. Times are Unix seconds UTC; volumes in bits.
 */

import type { WeatherTotal } from './weatherDaily.js';

export type Verdict = 'usable' | 'marginal' | 'unusable';

/** One pass, one link, one weather case. */
export interface PassCaseSummary {
  weather: string;
  /** First and last step time with margin ≥ the required margin (null when none). */
  usableStartS: number | null;
  usableEndS: number | null;
  /** Σ Δt over usable steps (s). */
  usableDurationS: number;
  minMarginDB: number;
  meanMarginDB: number;
  maxMarginDB: number;
  /**
   * Fixed-rate volume (bits): for a fixed-rate link, bit rate × usable time;
   * for an adaptive link, the best single constant mode held for the whole pass.
   */
  fixedVolumeBits: number;
  /** Adaptive-coding volume Σ R_s η Δt (bits); null for a fixed-rate link. */
  adaptiveVolumeBits: number | null;
  verdict: Verdict;
  /** The rule that produced the verdict, in words, with the numbers it used. */
  verdictRule: string;
  /** Σ Δt over steps unusable only because of the Sun's noise (margin + the C/N0 the Sun took ≥ the required margin) (s). */
  sunLostS: number;
}

export interface PassLinkSummary {
  /** Unique within a run: `<satellite>/<station>/<n>` with n the 1-based pass index at that station. */
  passId: string;
  satellite: string;
  station: string;
  link: string;
  direction: 'downlink' | 'uplink';
  aosS: number;
  tcaS: number;
  losS: number;
  maxElevationDeg: number;
  /** Time above the mask (s). */
  durationS: number;
  clippedStart: boolean;
  clippedEnd: boolean;
  /** Steps evaluated in the pass. */
  steps: number;
  /**
   * Weather as a probability (budget/weather.ts): Σ expected rate × Δt (bits), Σ closing probability × Δt (s),
   * Σ Δt (s), and the probability that the pass closes at every step that closes in clear sky, with one
   * weather state (one exceedance percentage) for the minutes of the pass: the least closing probability
   * of those steps (0 when none closes in clear sky). NaN without weather cases.
   */
  expectedVolumeBits: number;
  expectedUsableS: number;
  sweptS: number;
  closesThroughoutProbability: number;
  /** AOS/LOS uncertainty from the element-set error (± s; along-track error at TCA over the ground-track speed); NaN when not modelled. */
  timingUncertaintyS: number;
  /** Smallest angle between the Sun and the ground boresight over the pass's steps (deg); NaN when not modelled. */
  minSunSeparationDeg: number;
  /** Largest C/N0 the Sun's noise took at any step, any weather case (dB). */
  maxSunLossDB: number;
  /** maxSunLossDB ≥ SUN_AFFECTED_DB. */
  sunAffected: boolean;
  cases: PassCaseSummary[];
}

/** One UTC day, one link, one weather case, one station or the whole network (`station` = '(network)'). */
export interface DailyRow {
  dayUtc: string; // YYYY-MM-DD
  station: string;
  satellite: string;
  link: string;
  weather: string;
  passes: number;
  usablePasses: number;
  usableMinutes: number;
  fixedVolumeBits: number;
  adaptiveVolumeBits: number | null;
  /** Longest gap between usable contacts (h) within the day, counting from 00:00 and to 24:00 UTC. */
  longestGapH: number;
}

/** Data volume per day against elevation mask, for one station (or the network) and link and case. */
export interface MaskTradePoint {
  station: string;
  link: string;
  weather: string;
  maskDeg: number;
  dailyVolumeBits: number;
  usableMinutesPerDay: number;
}

/** Lowest mask at which every step (or the chosen fraction) above it meets the required margin. */
export interface MaskFinding {
  station: string;
  link: string;
  weather: string;
  fraction: number;
  /** null when no mask up to 90° meets it. */
  maskDeg: number | null;
  /**
   * Unusable time at or above the mask (s) left out because the ground mount was
   * rate-limited there (keyhole near zenith): no elevation mask removes it.
   */
  mountLimitedExcludedS?: number;
}

export interface RateTradePoint {
  station: string; // or '(network)'
  link: string;
  weather: string;
  bitRateBps: number;
  dailyVolumeBits: number;
  usableMinutesPerDay: number;
}

export interface RunTotals {
  link: string;
  weather: string;
  station: string; // or '(network)'
  passes: number;
  usablePasses: number;
  usableMinutes: number;
  fixedVolumeBits: number;
  adaptiveVolumeBits: number | null;
  /** Daily volume statistics over the days of the window (bits/day), d3-array. */
  dailyVolumeBits: { mean: number; median: number; p10: number; p90: number };
}

export interface RunSummary {
  scenario: string;
  scenarioFile: string;
  window: { startUtc: string; endUtc: string; stepS: number; days: number };
  satellites: string[];
  stations: string[];
  links: string[];
  weatherCases: string[];
  networkPolicy: string;
  totals: RunTotals[];
  models: { name: string; source: string }[];
  software: { name: string; version: string }[];
  defaultsApplied: { path: string; value: string; reason: string }[];
  warnings: string[];
  inputsSha256: string;
  files: string[];
  cautions: string[];
  /** Per station link: expected volume per day over the year's weather, availability (weatherDaily.ts). */
  weatherProbability?: WeatherTotal[];
  /** Required margin per link name (dB), for the report. */
  requiredMarginDB?: Record<string, number>;
  /** Horizon mask per station as an (azimuth, elevation) polyline (deg), for the report. */
  horizonMasks?: Record<string, [number, number][]>;
}

/** Decimated time series of one pass and link, for the report (bounded number of points). */
export interface PassSeries {
  passId: string;
  link: string;
  /** Unix seconds UTC. */
  timeS: number[];
  azimuthDeg: number[];
  elevationDeg: number[];
  cases: { weather: string; marginDB: number[]; ebN0DB: number[] }[];
}
