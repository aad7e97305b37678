/**
 * Streaming per-UTC-day aggregate for one (satellite, station or network,
 * link, weather case). Memory is one small record per day of the window (and,
 * during a pass, one fit-time counter per adaptive mode per day the pass
 * touches); steps are never stored.
 *
 * Conventions (documented choices):
 *   - A step at time t with interval Δt stands for [t, t + Δt) and belongs
 *     wholly to the UTC day of t, so a pass across midnight splits exactly by
 *     step time.
 *   - A pass counts on the UTC day of its AOS (a pass clipped at the window
 *     start has AOS = window start). It is a usable pass when its verdict is
 *     `usable`.
 *   - For an adaptive link, the fixed (single best mode) volume of a pass is
 *     chosen over the whole pass, then split by day by the time that mode fitted
 *     in each day, so daily rows sum to the pass summary.
 *   - Longest gap: the longest stretch within the day with no usable interval,
 *     measured from 00:00 UTC (or the window start) to 24:00 UTC (or the window
 *     end); a usable interval running past midnight covers the next day's start.
 */
import type { CaseBudget, LinkSpec } from '../budget/types.js';
import { InputError } from '../errors.js';
import { SECONDS_PER_DAY } from '../orbit/time.js';
import type { DailyRow, Verdict } from './types.js';
import { bestConstantMode, modeRatesBps, modeThresholdsDB } from './modes.js';
import { utcDayLabel, utcDaysOfWindow, utcDayNumber } from './utcDay.js';

/** Station label of network rows. */
export const NETWORK_STATION = '(network)';

/** Two usable intervals closer than this (s) are one contact: absorbs rounding of t_k + Δt vs t_{k+1}. */
const CONTIGUOUS_EPS_S = 1e-6;

export interface DailyAccumulatorOptions {
  startS: number;
  endS: number;
  /** Link whose rate or mode table sets the volumes; its name labels the rows. */
  link: LinkSpec;
  weather: string;
  /** Defaults to `link.station`; use NETWORK_STATION for the network aggregate. */
  station?: string;
  /** Defaults to `link.satellite`. */
  satellite?: string;
  /**
   * Record the usable runs (contiguous usable intervals) so `exportState` can
   * hand them to another accumulator: a chunk of a parallel run. Costs two
   * numbers per usable contact.
   */
  exportable?: boolean;
}

/**
 * What a chunk's accumulator hands to the run's accumulator (`mergeState`):
 * the per-day sums of the days it touched and its usable runs, from which the
 * receiving accumulator works out the longest gaps exactly as `add` would.
 * Plain typed arrays, so it crosses a worker boundary as is.
 */
export interface DailyAccumulatorState {
  /** UTC day number (days since 1970-01-01) of index 0 of the arrays. */
  firstDay: number;
  passes: Float64Array;
  usablePasses: Float64Array;
  usableS: Float64Array;
  fixedBits: Float64Array;
  adaptiveBits: Float64Array;
  /** Usable runs in time order: start (first usable step) and end (last step + Δt), flattened (s). */
  runs: Float64Array;
}

/** Only the fields of a CaseBudget the aggregate reads. */
export type DailyStepCase = Pick<CaseBudget, 'usable' | 'information_rate_bps' | 'es_over_n0_db'>;

export interface DailyAccumulator {
  /**
   * One step of this case. `link` overrides the creation link for the mode-fit
   * thresholds (network feeds: the chosen station's link of the same name).
   */
  add(timeS: number, dtS: number, c: DailyStepCase, link?: LinkSpec): void;
  /** Close the pass whose steps were just added: counted on the day of `aosS`. */
  endPass(aosS: number, verdict: Verdict): void;
  rows(): DailyRow[];
  /** The sums and usable runs so far (created with `exportable`; no pass may be open). */
  exportState(): DailyAccumulatorState;
  /**
   * Add a chunk's state. Chunks must come in time order and not overlap; the
   * sums add, the runs feed the gap tracking as their steps would have.
   */
  mergeState(state: DailyAccumulatorState): void;
}

interface DayBin {
  passes: number;
  usablePasses: number;
  usableS: number;
  fixedBits: number;
  adaptiveBits: number;
  longestGapS: number;
}

export function createDailyAccumulator(options: DailyAccumulatorOptions): DailyAccumulator {
  const { startS, endS, link, weather } = options;
  if (!(Number.isFinite(startS) && Number.isFinite(endS) && endS > startS)) {
    throw new InputError(`daily window: start ${startS} s is not before end ${endS} s (allowed start < end, both finite)`);
  }
  const station = options.station ?? link.station;
  const satellite = options.satellite ?? link.satellite;
  const adaptive = link.modcod.kind === 'adaptive';
  const fixedRateBps = link.modcod.kind === 'fixed' ? link.modcod.bitRateBps : 0;
  const rates = modeRatesBps(link);
  const nModes = rates.length;
  const { firstDay, count } = utcDaysOfWindow(startS, endS);
  const bins: DayBin[] = Array.from({ length: count }, () => ({
    passes: 0, usablePasses: 0, usableS: 0, fixedBits: 0, adaptiveBits: 0, longestGapS: 0,
  }));
  const thresholdCache = new Map<LinkSpec, Float64Array>([[link, modeThresholdsDB(link)]]);

  const dayIndex = (t: number) => Math.min(count - 1, Math.max(0, utcDayNumber(t) - firstDay));
  const dayStart = (d: number) => Math.max(startS, (firstDay + d) * SECONDS_PER_DAY);
  const dayEnd = (d: number) => Math.min(endS, (firstDay + d + 1) * SECONDS_PER_DAY);

  // Gap tracking: the day being scanned and the end of the last usable interval.
  let gapDay = 0;
  let lastUsableEndS = -Infinity;
  let lastUsableStartS = -Infinity;
  const gapRef = (d: number) => Math.max(dayStart(d), lastUsableEndS);
  const closeGapDaysBefore = (d: number) => {
    for (; gapDay < d; gapDay++) {
      const b = bins[gapDay];
      b.longestGapS = Math.max(b.longestGapS, dayEnd(gapDay) - gapRef(gapDay), 0);
    }
  };

  // Usable runs for exportState (only when exportable).
  const exportable = options.exportable === true;
  const runs: number[] = [];
  let minDay = count;
  let maxDay = -1;
  const touch = (d: number) => { if (d < minDay) minDay = d; if (d > maxDay) maxDay = d; };
  /** The gap bookkeeping of a usable interval starting at `timeS` (the first step of a run, or any usable step). */
  const usableAt = (timeS: number, d: number, endS2: number) => {
    if (timeS < lastUsableStartS) {
      throw new Error(`daily accumulator ${station}/${link.name}: usable step at ${timeS} s is before ${lastUsableStartS} s`);
    }
    closeGapDaysBefore(d);
    const gap = timeS - gapRef(d);
    if (gap > CONTIGUOUS_EPS_S && gap > bins[d].longestGapS) bins[d].longestGapS = gap;
    lastUsableStartS = timeS;
    lastUsableEndS = Math.max(lastUsableEndS, endS2);
  };

  // Current pass: per day touched, fit time of each mode (adaptive links only).
  let pending = new Map<number, Float64Array>();
  let pendingSteps = 0;

  return {
    add(timeS, dtS, c, stepLink) {
      pendingSteps++;
      const d = dayIndex(timeS);
      const b = bins[d];
      if (c.usable) {
        if (exportable) {
          const n = runs.length;
          if (n === 0 || timeS - runs[n - 1] > CONTIGUOUS_EPS_S) runs.push(timeS, timeS + dtS);
          else if (timeS + dtS > runs[n - 1]) runs[n - 1] = timeS + dtS;
          touch(d);
        }
        usableAt(timeS, d, timeS + dtS);
        b.usableS += dtS;
        if (adaptive) b.adaptiveBits += c.information_rate_bps * dtS;
        else b.fixedBits += fixedRateBps * dtS;
      }
      if (adaptive) {
        const l = stepLink ?? link;
        let th = thresholdCache.get(l);
        if (!th) {
          th = modeThresholdsDB(l);
          if (th.length !== nModes) throw new Error(`daily accumulator ${station}/${link.name}: link ${l.station}/${l.name} has a different mode table`);
          thresholdCache.set(l, th);
        }
        let fit = pending.get(d);
        if (!fit) pending.set(d, (fit = new Float64Array(nModes)));
        const es = c.es_over_n0_db;
        for (let i = 0; i < nModes; i++) if (es >= th[i]) fit[i] += dtS;
      }
    },
    endPass(aosS, verdict) {
      if (exportable) {
        touch(dayIndex(aosS));
        for (const d of pending.keys()) touch(d);
      }
      const b = bins[dayIndex(aosS)];
      b.passes++;
      if (verdict === 'usable') b.usablePasses++;
      if (adaptive && pending.size > 0) {
        const total = new Float64Array(nModes);
        for (const fit of pending.values()) for (let i = 0; i < nModes; i++) total[i] += fit[i];
        const best = bestConstantMode(rates, total);
        if (best >= 0) for (const [d, fit] of pending) bins[d].fixedBits += rates[best] * fit[best];
      }
      pending = new Map();
      pendingSteps = 0;
    },
    exportState() {
      if (!exportable) throw new Error(`daily accumulator ${station}/${link.name}: exportState() needs the exportable option`);
      if (pendingSteps > 0) throw new Error(`daily accumulator ${station}/${link.name}: exportState() with a pass open`);
      const lo = maxDay < 0 ? 0 : minDay;
      const n = maxDay < 0 ? 0 : maxDay - minDay + 1;
      const st: DailyAccumulatorState = {
        firstDay: firstDay + lo,
        passes: new Float64Array(n), usablePasses: new Float64Array(n), usableS: new Float64Array(n),
        fixedBits: new Float64Array(n), adaptiveBits: new Float64Array(n), runs: Float64Array.from(runs),
      };
      for (let i = 0; i < n; i++) {
        const b = bins[lo + i];
        st.passes[i] = b.passes; st.usablePasses[i] = b.usablePasses; st.usableS[i] = b.usableS;
        st.fixedBits[i] = b.fixedBits; st.adaptiveBits[i] = b.adaptiveBits;
      }
      return st;
    },
    mergeState(st) {
      const off = st.firstDay - firstDay;
      const n = st.passes.length;
      if (n > 0 && (off < 0 || off + n > count)) {
        throw new Error(`daily accumulator ${station}/${link.name}: merged days ${st.firstDay}..${st.firstDay + n - 1} outside the window`);
      }
      for (let i = 0; i < n; i++) {
        const b = bins[off + i];
        b.passes += st.passes[i]; b.usablePasses += st.usablePasses[i]; b.usableS += st.usableS[i];
        b.fixedBits += st.fixedBits[i]; b.adaptiveBits += st.adaptiveBits[i];
      }
      for (let r = 0; r < st.runs.length; r += 2) usableAt(st.runs[r], dayIndex(st.runs[r]), st.runs[r + 1]);
    },
    rows() {
      if (pendingSteps > 0) {
        throw new Error(`daily accumulator ${station}/${link.name}: ${pendingSteps} step(s) added after the last endPass()`);
      }
      closeGapDaysBefore(count);
      return bins.map((b, d) => ({
        dayUtc: utcDayLabel(firstDay + d),
        station,
        satellite,
        link: link.name,
        weather,
        passes: b.passes,
        usablePasses: b.usablePasses,
        usableMinutes: b.usableS / 60,
        fixedVolumeBits: b.fixedBits,
        adaptiveVolumeBits: adaptive ? b.adaptiveBits : null,
        longestGapH: b.longestGapS / 3600,
      }));
    },
  };
}
