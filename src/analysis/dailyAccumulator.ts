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
import { bestConstantMode, createModeFit, modeRatesBps, modeThresholdsDB, type ModeFit } from './modes.js';
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
  /**
   * Steps from..to−1 of columns (step i at originS + (k0 + i)·dtS), as `add` would take
   * them one by one: `usable` (1/0), information rate (b/s) and Es/N0 (dB);
   * `link` as in `add`. With `onlyUsable` the unusable steps are not added at
   * all (as a network feed adds only the steps a station carries).
   */
  addColumns(originS: number, k0: number, dtS: number, from: number, to: number, usable: Uint8Array, rateBps: Float64Array, esN0DB: Float64Array, link?: LinkSpec, onlyUsable?: boolean): void;
  /** Close the pass whose steps were just added: counted on the day of `aosS`. */
  endPass(aosS: number, verdict: Verdict): void;
  rows(): DailyRow[];
  /** The sums and usable runs so far (created with `exportable`; no pass may be open). */
  exportState(): DailyAccumulatorState;
  /**
   * exportState, then empty the accumulator (sums, runs and gap tracking) so
   * the next chunk can be fed into it: one accumulator reused chunk after chunk.
   */
  takeState(): DailyAccumulatorState;
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

  // Current pass: per link and day touched, the mode fit times (adaptive links only).
  let pending = new Map<LinkSpec, Map<number, ModeFit>>();
  let pendingSteps = 0;
  let fitDay = -1;
  let fitAcc: ModeFit | null = null;
  let fitLink: LinkSpec | null = null;
  const fitFor = (l: LinkSpec, d: number): ModeFit => {
    let th = thresholdCache.get(l);
    if (!th) {
      th = modeThresholdsDB(l);
      if (th.length !== nModes) throw new Error(`daily accumulator ${station}/${link.name}: link ${l.station}/${l.name} has a different mode table`);
      thresholdCache.set(l, th);
    }
    let days = pending.get(l);
    if (!days) pending.set(l, (days = new Map()));
    let f = days.get(d);
    if (!f) days.set(d, (f = createModeFit(th)));
    return f;
  };

  /**
   * The per-step rule over steps [from, to) of columns (step i at originS +
   * (k0 + i)·dtS), a day at a time, the day's sums in locals (the same
   * arithmetic in the same order as one step at a time); `add` runs it on
   * one-entry columns.
   */
  function columns(originS: number, k0: number, dtS: number, from: number, to: number,
    usable: Uint8Array, rateBps: Float64Array, es: Float64Array, l: LinkSpec, onlyUsable: boolean): void {
    dtS *= 1;
    const fixedRate = fixedRateBps * 1;
    let i = from;
    while (i < to) {
      const d = dayIndex(originS + (k0 + i) * dtS);
      const dayEndS = d === count - 1 ? Infinity : (firstDay + d + 1) * SECONDS_PER_DAY;
      let j = i + 1;
      while (j < to && originS + (k0 + j) * dtS < dayEndS) j++;
      const b = bins[d];
      // × 1: plain float64 locals (a field read as is would make the loop box every update).
      let us = b.usableS * 1, bits = (adaptive ? b.adaptiveBits : b.fixedBits) * 1;
      let fit: ModeFit | null = null;
      if (adaptive) {
        if (d !== fitDay || l !== fitLink || !fitAcc) { fitAcc = fitFor(l, d); fitDay = d; fitLink = l; }
        fit = fitAcc;
      }
      let q = i;
      while (q < j) {
        if (usable[q] !== 1) {
          if (!onlyUsable) { pendingSteps++; if (fit) fit.add(es[q], dtS); }
          q++;
          continue;
        }
        // A run of usable steps [q, r): contiguous grid times, so one usable interval.
        let r = q + 1;
        while (r < j && usable[r] === 1) r++;
        pendingSteps += r - q;
        const t = originS + (k0 + q) * dtS;
        const tLast = originS + (k0 + r - 1) * dtS;
        const endT = tLast + dtS;
        if (exportable) {
          const n = runs.length;
          if (n === 0 || t - runs[n - 1] > CONTIGUOUS_EPS_S) runs.push(t, endT);
          else if (endT > runs[n - 1]) runs[n - 1] = endT;
          touch(d);
        }
        // A run continuing the last usable interval within its day leaves the gaps as they are.
        if (d === gapDay && t >= lastUsableStartS && t - lastUsableEndS <= CONTIGUOUS_EPS_S && t - lastUsableEndS >= -CONTIGUOUS_EPS_S) {
          if (endT > lastUsableEndS) lastUsableEndS = endT;
        } else {
          usableAt(t, d, endT);
        }
        lastUsableStartS = tLast;
        for (let x = q; x < r; x++) {
          us += dtS;
          bits += (adaptive ? rateBps[x] : fixedRate) * dtS;
          if (fit) fit.add(es[x], dtS);
        }
        q = r;
      }
      b.usableS = us;
      if (adaptive) b.adaptiveBits = bits; else b.fixedBits = bits;
      i = j;
    }
  }
  const one = { usable: new Uint8Array(1), rate: new Float64Array(1), es: new Float64Array(1) };

  return {
    add(timeS, dtS, c, stepLink) {
      one.usable[0] = c.usable ? 1 : 0; one.rate[0] = c.information_rate_bps; one.es[0] = c.es_over_n0_db;
      columns(timeS, 0, dtS, 0, 1, one.usable, one.rate, one.es, stepLink ?? link, false);
    },
    addColumns(originS, k0, dtS, from, to, usable, rateBps, esN0DB, stepLink, onlyUsable = false) {
      columns(originS, k0, dtS, from, to, usable, rateBps, esN0DB, stepLink ?? link, onlyUsable);
    },
    endPass(aosS, verdict) {
      if (pending.size === 0) {
        // No mode fits to share out (a fixed-rate link, or no step): the pass count only.
        const d = dayIndex(aosS);
        if (exportable) touch(d);
        bins[d].passes++;
        if (verdict === 'usable') bins[d].usablePasses++;
        fitAcc = null; fitLink = null; fitDay = -1;
        pendingSteps = 0;
        return;
      }
      // Fit time per day touched (every link the pass's steps came from, together).
      const perDay = new Map<number, Float64Array>();
      for (const days of pending.values()) {
        for (const [d, f] of days) {
          const t = f.fitTimeS();
          const cur = perDay.get(d);
          if (!cur) perDay.set(d, t);
          else for (let i = 0; i < nModes; i++) cur[i] += t[i];
        }
      }
      const dayList = [...perDay.keys()].sort((a, b) => a - b);
      if (exportable) {
        touch(dayIndex(aosS));
        for (const d of dayList) touch(d);
      }
      const b = bins[dayIndex(aosS)];
      b.passes++;
      if (verdict === 'usable') b.usablePasses++;
      if (adaptive && dayList.length > 0) {
        const total = new Float64Array(nModes);
        for (const d of dayList) { const fit = perDay.get(d)!; for (let i = 0; i < nModes; i++) total[i] += fit[i]; }
        const best = bestConstantMode(rates, total);
        if (best >= 0) for (const d of dayList) bins[d].fixedBits += rates[best] * perDay.get(d)![best];
      }
      pending = new Map();
      fitAcc = null; fitLink = null; fitDay = -1;
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
    takeState() {
      const st = this.exportState();
      const lo = st.firstDay - firstDay;
      for (let i = 0; i < st.passes.length; i++) {
        const b = bins[lo + i];
        b.passes = 0; b.usablePasses = 0; b.usableS = 0; b.fixedBits = 0; b.adaptiveBits = 0; b.longestGapS = 0;
      }
      runs.length = 0;
      minDay = count; maxDay = -1;
      gapDay = 0; lastUsableEndS = -Infinity; lastUsableStartS = -Infinity;
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
