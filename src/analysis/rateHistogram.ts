/**
 * Data-rate finder for fixed-rate links. A fixed-size histogram of time
 * against C/N0 (bins of `binDB` over [minDBHz, maxDBHz)) is filled per step;
 * a step closes at bit rate R when (PHYSICS.md §10)
 *   C/N0 − 10 log10 R − (Eb/N0)_required − L_implementation ≥ required margin.
 * A bin counts as closing only when its lower edge meets that threshold, so
 * the histogram never counts a step that would not close; it may miss steps in
 * the one bin that straddles the threshold (at most `binDB` of conservatism).
 * C/N0 below minDBHz never closes; at or above maxDBHz it goes to a last, open
 * bin whose lower edge is the first bin edge at or above maxDBHz.
 */
import { InputError } from '../errors.js';
import type { RateTradePoint } from './types.js';

export interface RateHistogramOptions {
  binDB?: number;
  minDBHz?: number;
  maxDBHz?: number;
  station?: string;
  link?: string;
  weather?: string;
  /**
   * Hold only the bins in use (grown as C/N0 values arrive) instead of all of
   * them: a link's C/N0 spans tens of dB of the 150 dB range, so a sweep's
   * per-chunk histograms take a fraction of the memory. `timeS` is then built
   * on demand.
   */
  growable?: boolean;
}

export interface RateHistogram {
  readonly binDB: number;
  readonly minDBHz: number;
  /** Number of bins, the last being the open bin [maxDBHz, ∞). */
  readonly bins: number;
  readonly station: string;
  readonly link: string;
  readonly weather: string;
  /** Lower edge of bin k (dBHz), rounded to 1e-9 dB. */
  edgeDBHz(k: number): number;
  /** Time per bin (s). */
  readonly timeS: Float64Array;
  /** Time with C/N0 below minDBHz or NaN (s): never closes. */
  readonly underflowS: number;
  add(cOverN0DBHz: number, dtS: number): void;
  /** `add` for entries [from, to) of a column. */
  addColumn(cOverN0DBHz: Float64Array, from: number, to: number, dtS: number): void;
  /** The bins (shared, not copied) and the underflow: what a chunk of a parallel run hands back. */
  exportState(): RateHistogramState;
  /** Add another histogram's bins (same binning), bin by bin. */
  mergeState(state: RateHistogramState): void;
  /** The bins touched since the last take, copied (firstBin on), and the histogram emptied: one histogram reused chunk after chunk. */
  takeState(): RateHistogramState;
}

/** Bins firstBin … firstBin + length − 1 (firstBin 0 and every bin when absent). */
export interface RateHistogramState { binDB: number; minDBHz: number; firstBin?: number; timeS: Float64Array; underflowS: number }

/** Bin edges by binning, shared by every histogram with it (the values `edgeDBHz` reports). */
const edgeCache = new Map<string, Float64Array>();
function edgesFor(binDB: number, minDBHz: number, bins: number, edgeDBHz: (k: number) => number): Float64Array {
  const key = `${binDB}|${minDBHz}|${bins}`;
  let e = edgeCache.get(key);
  if (!e) { e = Float64Array.from({ length: bins + 1 }, (_, k) => edgeDBHz(k)); edgeCache.set(key, e); }
  return e;
}

export function createRateHistogram(options: RateHistogramOptions = {}): RateHistogram {
  const binDB = options.binDB ?? 0.01;
  const minDBHz = options.minDBHz ?? 0;
  const maxDBHz = options.maxDBHz ?? 150;
  if (!(binDB > 0 && binDB <= 1)) throw new InputError(`rate finder binDB: ${binDB} is out of range (allowed > 0 and ≤ 1 dB)`);
  if (!(Number.isFinite(minDBHz) && Number.isFinite(maxDBHz) && maxDBHz > minDBHz)) {
    throw new InputError(`rate finder C/N0 range: [${minDBHz}, ${maxDBHz}] dBHz is empty (allowed finite min < max)`);
  }
  const bins = Math.ceil((maxDBHz - minDBHz) / binDB - 1e-9) + 1;
  const edgeDBHz = (k: number) => Math.round((minDBHz + k * binDB) * 1e9) / 1e9;
  const growable = options.growable === true;
  // Bins base … base + store.length − 1 (all of them unless growable).
  let store = new Float64Array(growable ? 0 : bins);
  let base = 0;
  const edges = edgesFor(binDB, minDBHz, bins, edgeDBHz);
  let underflowS = 0;
  let touchedLo = bins, touchedHi = -1;
  const grow = (k: number) => {
    const lo = Math.max(0, Math.min(base, k) - 256);
    const hi = Math.min(bins, Math.max(base + store.length, k + 1) + 256);
    const next = new Float64Array(hi - lo);
    next.set(store, base - lo);
    store = next;
    base = lo;
  };
  const addColumn = (cOverN0DBHz: Float64Array, from: number, to: number, dtS: number): void => {
    if (!(dtS > 0)) return;
    for (let i = from; i < to; i++) {
      const x = cOverN0DBHz[i];
      if (!(x >= minDBHz)) { underflowS += dtS; continue; }
      let k = Math.min(bins - 1, Math.floor((x - minDBHz) / binDB));
      // Settle rounding against the reported edges: the lower edge must not exceed the value.
      if (k + 1 < bins && edges[k + 1] <= x) k++;
      if (k > 0 && edges[k] > x) k--;
      if (k < touchedLo) touchedLo = k;
      if (k > touchedHi) touchedHi = k;
      if (k < base || k >= base + store.length) grow(k);
      store[k - base] += dtS;
    }
  };
  const one = new Float64Array(1);
  const add = (cOverN0DBHz: number, dtS: number): void => { one[0] = cOverN0DBHz; addColumn(one, 0, 1, dtS); };
  return {
    binDB,
    minDBHz,
    bins,
    station: options.station ?? '',
    link: options.link ?? '',
    weather: options.weather ?? '',
    edgeDBHz,
    get timeS() {
      if (!growable) return store;
      const full = new Float64Array(bins);
      full.set(store, base);
      return full;
    },
    get underflowS() {
      return underflowS;
    },
    add,
    addColumn,
    exportState() {
      return { binDB, minDBHz, timeS: this.timeS, underflowS };
    },
    takeState() {
      const lo = touchedHi < 0 ? 0 : touchedLo, hi = touchedHi < 0 ? -1 : touchedHi;
      const st = { binDB, minDBHz, firstBin: lo, timeS: store.slice(lo - base, hi + 1 - base), underflowS };
      if (hi >= lo) store.fill(0, lo - base, hi + 1 - base);
      underflowS = 0;
      touchedLo = bins; touchedHi = -1;
      return st;
    },
    mergeState(st) {
      const lo = st.firstBin ?? 0;
      const n = st.timeS.length;
      if (st.binDB !== binDB || st.minDBHz !== minDBHz || lo < 0 || lo + n > bins || (st.firstBin === undefined && n !== bins)) {
        throw new Error('rate histogram: cannot merge a histogram with other bins');
      }
      if (n > 0 && (lo < base || lo + n > base + store.length)) { grow(lo); grow(lo + n - 1); }
      for (let i = 0; i < n; i++) store[lo + i - base] += st.timeS[i];
      underflowS += st.underflowS;
    },
  };
}

export interface RateRequirement {
  requiredEbN0DB: number;
  implementationLossDB: number;
  requiredMarginDB: number;
}

/** C/N0 (dBHz) a step needs to close at `bitRateBps`. */
export function closingCOverN0DBHz(bitRateBps: number, req: RateRequirement): number {
  return 10 * Math.log10(bitRateBps) + req.requiredEbN0DB + req.implementationLossDB + req.requiredMarginDB;
}

/** Daily volume R × closing time / days and closing minutes per day, for each candidate rate. */
export function rateTrade(hist: RateHistogram, req: RateRequirement, ratesBps: readonly number[], days: number): RateTradePoint[] {
  if (!(days > 0)) throw new InputError(`rate trade days: ${days} is out of range (allowed > 0)`);
  for (const r of ratesBps) {
    if (!(r > 0 && Number.isFinite(r))) throw new InputError(`rate finder candidate rates: ${r} b/s is not a rate (allowed finite numbers > 0)`);
  }
  const above = new Float64Array(hist.bins + 1);
  const timeS = hist.timeS;
  for (let k = hist.bins - 1; k >= 0; k--) above[k] = above[k + 1] + timeS[k];
  return ratesBps.map((bitRateBps) => {
    const need = closingCOverN0DBHz(bitRateBps, req);
    // First bin whose lower edge meets the threshold (binary search on the monotone edges).
    let lo = 0;
    let hi = hist.bins;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (hist.edgeDBHz(mid) >= need) hi = mid;
      else lo = mid + 1;
    }
    const closingS = above[lo];
    return {
      station: hist.station,
      link: hist.link,
      weather: hist.weather,
      bitRateBps,
      dailyVolumeBits: (bitRateBps * closingS) / days,
      usableMinutesPerDay: closingS / 60 / days,
    };
  });
}

/** The point with the largest daily volume (ties: the lower rate); null when none delivers anything. */
export function bestRate(points: readonly RateTradePoint[]): RateTradePoint | null {
  let best: RateTradePoint | null = null;
  for (const p of points) {
    if (!(p.dailyVolumeBits > 0)) continue;
    if (!best || p.dailyVolumeBits > best.dailyVolumeBits || (p.dailyVolumeBits === best.dailyVolumeBits && p.bitRateBps < best.bitRateBps)) best = p;
  }
  return best;
}
