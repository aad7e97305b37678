/**
 * Input of the HTML report: the analysis summaries plus decimated per-pass
 * time series. Everything is in memory; `passbudget report DIR` loads an
 * output folder back into this shape.
 */
import type {
  DailyRow, MaskFinding, MaskTradePoint, PassLinkSummary, PassSeries, RateTradePoint, RunSummary,
} from '../../analysis/types.js';

export type { PassSeries } from '../../analysis/types.js';
import type { WhatIfPayload } from '../../analysis/whatIf.js';
import type { WhatIfSummaryPayload } from '../../analysis/whatIfSummary.js';

/** Lowest/highest margin per elevation bin (bin centre in deg) for one link and weather case. */
export interface LinkEnvelope {
  link: string;
  weather: string;
  bins: { elevationDeg: number; minDB: number; maxDB: number }[];
}

export interface ReportInput {
  summary: RunSummary;
  passes: PassLinkSummary[];
  daily: DailyRow[];
  series: PassSeries[];
  /** Required margin per link (dB). */
  requiredMarginDB: Record<string, number>;
  /** Per station: (azimuth, elevation) polyline in degrees, azimuth 0–360. */
  horizonMasks: Record<string, [number, number][]>;
  maskTrade?: MaskTradePoint[];
  maskFindings?: MaskFinding[];
  rateTrade?: RateTradePoint[];
  generatedNote?: string;
  /**
   * Margin against elevation over every pass, per link and weather case
   * (e.g. accumulated by the pipeline from every step). Absent: pooled from
   * `series` (the passes that have one).
   */
  envelopes?: LinkEnvelope[];
  /**
   * Pass-link sections drawn in detail (charts, sky plot), the first in time
   * order (AOS, station, link); default REPORT_MAX_PASS_SECTIONS (300). Every
   * pass stays in the pass table.
   */
  maxPassSections?: number;
  /** Samples drawn per pass chart line (default 150; a 520 px chart shows no more). */
  maxChartPoints?: number;
  /** Report title (default: the scenario name). */
  title?: string;
  /** The what-if panel's data, or why the page has none (a sentence shown in its place). */
  whatIf?: WhatIfPayload | WhatIfSummaryPayload | { missing: string };
  /** Further sections (HTML, already escaped), placed after "at a glance" (e.g. the contact plan). */
  extraSections?: string[];
}
