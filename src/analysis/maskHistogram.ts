/**
 * Elevation-mask finder. A fixed-size histogram of time against elevation
 * (bins of `binDeg` from −90° to 90°) holds, per bin, the time in view, the
 * usable time and the usable volume Σ rate·Δt. Nothing per step is kept.
 *
 * A step with elevation e falls in the bin [edge_k, edge_k+1) with
 * edge_k ≤ e, so "all steps with elevation ≥ edge_k" is exactly "bins ≥ k":
 * answers at bin edges are exact, and a mask between edges only counts whole
 * bins above it (conservative: never counts a step below the mask).
 *
 * The lead feeds only steps above the station's horizon mask, so a scheduling
 * mask found here never goes below the horizon mask; with no unusable time the
 * finder returns the lowest edge that holds data (or `floorDeg` if higher).
 */
import { InputError } from '../errors.js';
import type { MaskFinding, MaskTradePoint } from './types.js';

const MIN_DEG = -90;
const MAX_DEG = 90;

export interface MaskHistogramOptions {
  binDeg?: number;
  station?: string;
  link?: string;
  weather?: string;
}

export interface MaskHistogram {
  readonly binDeg: number;
  readonly station: string;
  readonly link: string;
  readonly weather: string;
  readonly bins: number;
  /** Lower edge of bin k (deg), rounded to 1e-9° so edges print cleanly. */
  edgeDeg(k: number): number;
  /** Time in view (s), usable time (s), usable volume (bits) per bin. */
  readonly timeS: Float64Array;
  readonly usableS: Float64Array;
  readonly volumeBits: Float64Array;
  /**
   * Unusable time while the ground mount was rate-limited (keyhole near zenith, s per bin).
   * No elevation mask can remove it, so the finder leaves it out of `timeS` and reports it.
   */
  readonly keyholeS: Float64Array;
  add(elevationDeg: number, dtS: number, usable: boolean, rateBps: number, mountLimited?: boolean): void;
  /** The bin of an elevation (as `add` finds it), −1 for NaN: one search per station step, shared by its links and cases. */
  binOf(elevationDeg: number): number;
  /** `add` into a bin found with `binOf` (k ≥ 0). */
  addToBin(k: number, dtS: number, usable: boolean, rateBps: number, mountLimited: boolean): void;
  /** `addToBin` for steps 0 … n−1 of columns: bins from `binOf` (−1: skipped), usable and mount-limited flags (1/0), rates. */
  addBins(bins: Int32Array, usable: Uint8Array, rateBps: Float64Array, mountLimited: Uint8Array, n: number, dtS: number): void;
  /** The bin arrays (shared, not copied): what a chunk of a parallel run hands back. */
  exportState(): MaskHistogramState;
  /** The bins touched since the last take, copied (firstBin on), and those bins emptied: one histogram reused chunk after chunk. */
  takeState(): MaskHistogramState;
  /** Add another histogram's bins (same binDeg), bin by bin. */
  mergeState(state: MaskHistogramState): void;
}

/** Bins firstBin … firstBin + length − 1 (firstBin 0 and every bin when absent). */
export interface MaskHistogramState { binDeg: number; firstBin?: number; timeS: Float64Array; usableS: Float64Array; volumeBits: Float64Array; keyholeS: Float64Array }

/** Bin edges by bin width, shared by every histogram of that width (the values `edgeDeg` reports). */
const edgeCache = new Map<number, Float64Array>();
function edgesFor(binDeg: number, bins: number, edgeDeg: (k: number) => number): Float64Array {
  let e = edgeCache.get(binDeg);
  if (!e) { e = Float64Array.from({ length: bins + 1 }, (_, k) => edgeDeg(k)); edgeCache.set(binDeg, e); }
  return e;
}

export function createMaskHistogram(options: MaskHistogramOptions = {}): MaskHistogram {
  const binDeg = options.binDeg ?? 0.1;
  if (!(binDeg > 0 && binDeg <= 10)) {
    throw new InputError(`mask finder binDeg: ${binDeg} is out of range (allowed > 0 and ≤ 10 degrees)`);
  }
  const bins = Math.ceil((MAX_DEG - MIN_DEG) / binDeg - 1e-9);
  const edgeDeg = (k: number) => Math.round((MIN_DEG + k * binDeg) * 1e9) / 1e9;
  const edges = edgesFor(binDeg, bins, edgeDeg);
  const timeS = new Float64Array(bins);
  const usableS = new Float64Array(bins);
  const volumeBits = new Float64Array(bins);
  const keyholeS = new Float64Array(bins);
  const binOf = (e: number) => {
    if (Number.isNaN(e)) return -1;
    let k = Math.floor((e - MIN_DEG) / binDeg);
    // Rounding of the division can land one bin off; settle it against the same edges we report.
    if (k + 1 < bins && edges[k + 1] <= e) k++;
    if (k > 0 && edges[k] > e) k--;
    return Math.min(bins - 1, Math.max(0, k));
  };
  let touchedLo = bins, touchedHi = -1;
  const addBins = (kk: Int32Array, usable: Uint8Array, rateBps: Float64Array, limited: Uint8Array, n: number, dtS: number) => {
    if (!(dtS > 0)) return;
    for (let i = 0; i < n; i++) {
      const k = kk[i];
      if (k < 0) continue;
      if (k < touchedLo) touchedLo = k;
      if (k > touchedHi) touchedHi = k;
      const u = usable[i] === 1;
      // Unusable while the mount was rate-limited: kept apart (no mask removes it).
      if (limited[i] === 1 && !u) { keyholeS[k] += dtS; continue; }
      timeS[k] += dtS;
      if (u) { usableS[k] += dtS; volumeBits[k] += rateBps[i] * dtS; }
    }
  };
  const one = { k: new Int32Array(1), u: new Uint8Array(1), r: new Float64Array(1), l: new Uint8Array(1) };
  const addToBin = (k: number, dtS: number, usable: boolean, rateBps: number, mountLimited: boolean) => {
    one.k[0] = k; one.u[0] = usable ? 1 : 0; one.r[0] = rateBps; one.l[0] = mountLimited ? 1 : 0;
    addBins(one.k, one.u, one.r, one.l, 1, dtS);
  };
  return {
    binDeg,
    station: options.station ?? '',
    link: options.link ?? '',
    weather: options.weather ?? '',
    bins,
    edgeDeg,
    timeS,
    usableS,
    volumeBits,
    keyholeS,
    binOf,
    addToBin,
    addBins,
    add(elevationDeg, dtS, usable, rateBps, mountLimited = false) {
      const k = binOf(elevationDeg);
      if (k >= 0) addToBin(k, dtS, usable, rateBps, mountLimited);
    },
    exportState() {
      return { binDeg, timeS, usableS, volumeBits, keyholeS };
    },
    takeState() {
      const lo = touchedHi < 0 ? 0 : touchedLo, hi = touchedHi < 0 ? -1 : touchedHi;
      const st = {
        binDeg, firstBin: lo, timeS: timeS.slice(lo, hi + 1), usableS: usableS.slice(lo, hi + 1),
        volumeBits: volumeBits.slice(lo, hi + 1), keyholeS: keyholeS.slice(lo, hi + 1),
      };
      if (hi >= lo) { timeS.fill(0, lo, hi + 1); usableS.fill(0, lo, hi + 1); volumeBits.fill(0, lo, hi + 1); keyholeS.fill(0, lo, hi + 1); }
      touchedLo = bins; touchedHi = -1;
      return st;
    },
    mergeState(st) {
      const lo = st.firstBin ?? 0;
      const n = st.timeS.length;
      if (st.binDeg !== binDeg || lo < 0 || lo + n > bins || (st.firstBin === undefined && n !== bins)) throw new Error(`mask histogram: cannot merge ${st.binDeg}° bins into ${binDeg}° bins`);
      for (let i = 0; i < n; i++) {
        const k = lo + i;
        timeS[k] += st.timeS[i];
        usableS[k] += st.usableS[i];
        volumeBits[k] += st.volumeBits[i];
        keyholeS[k] += st.keyholeS[i];
      }
    },
  };
}

function checkFraction(fraction: number): void {
  if (!(fraction > 0 && fraction <= 1)) {
    throw new InputError(`mask finder fraction: ${fraction} is out of range (allowed > 0 and ≤ 1)`);
  }
}

/**
 * Lowest bin edge m (deg) such that, of the time with elevation ≥ m, at least
 * `fraction` is usable (fraction 1: no unusable step at or above m), with some
 * time in view at or above m. `maskDeg` is null when no edge up to 90° meets it.
 * Time-weighted; for fraction < 1, usable/total is compared with a 1e-12
 * relative allowance for summation rounding.
 */
export function findMask(hist: MaskHistogram, fraction = 1, options: { floorDeg?: number } = {}): MaskFinding {
  checkFraction(fraction);
  const floorDeg = options.floorDeg ?? -Infinity;
  // Below the lowest bin holding data every edge gives the same answer; start there.
  let lowest = 0;
  while (lowest < hist.bins && hist.timeS[lowest] === 0) lowest++;
  while (lowest < hist.bins && hist.edgeDeg(lowest) < floorDeg) lowest++;
  let total = 0;
  let usable = 0;
  let unusable = 0;
  let found = -1;
  // Running sums over bins ≥ k, from the top down; the lowest k that passes wins.
  for (let k = hist.bins - 1; k >= lowest; k--) {
    total += hist.timeS[k];
    usable += hist.usableS[k];
    unusable += hist.timeS[k] - hist.usableS[k];
    // fraction 1 is tested exactly (a bin with only usable steps has time − usable = 0 exactly).
    const ok = fraction === 1 ? unusable === 0 : usable >= fraction * total * (1 - 1e-12);
    if (total > 0 && ok) found = k;
  }
  const maskDeg = found < 0 ? null : hist.edgeDeg(found);
  let keyhole = 0;
  for (let k = Math.max(found, 0); k < hist.bins; k++) keyhole += hist.keyholeS[k];
  return { station: hist.station, link: hist.link, weather: hist.weather, fraction, maskDeg, mountLimitedExcludedS: keyhole };
}

/** Default masks of the trade: 0° to 30° in 1° steps. */
export const DEFAULT_TRADE_MASKS_DEG: readonly number[] = Array.from({ length: 31 }, (_, i) => i);

/**
 * Daily volume and usable minutes against the mask: Σ over steps with
 * elevation ≥ mask of rate·Δt (and Δt) divided by `days` (the window length in
 * days). Only whole bins with lower edge ≥ mask count, so the curve is
 * non-increasing in the mask.
 */
export function maskTrade(hist: MaskHistogram, days: number, masksDeg: readonly number[] = DEFAULT_TRADE_MASKS_DEG): MaskTradePoint[] {
  if (!(days > 0)) throw new InputError(`mask trade days: ${days} is out of range (allowed > 0)`);
  // Suffix sums from the top bin down.
  const volAbove = new Float64Array(hist.bins + 1);
  const usableAbove = new Float64Array(hist.bins + 1);
  for (let k = hist.bins - 1; k >= 0; k--) {
    volAbove[k] = volAbove[k + 1] + hist.volumeBits[k];
    usableAbove[k] = usableAbove[k + 1] + hist.usableS[k];
  }
  return masksDeg.map((maskDeg) => {
    let k = 0;
    while (k < hist.bins && hist.edgeDeg(k) < maskDeg) k++;
    return {
      station: hist.station,
      link: hist.link,
      weather: hist.weather,
      maskDeg,
      dailyVolumeBits: volAbove[k] / days,
      usableMinutesPerDay: usableAbove[k] / 60 / days,
    };
  });
}
