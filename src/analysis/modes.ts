/**
 * Which modes of an adaptive table a step can carry. The fit rule is the one
 * the budget engine uses (PHYSICS.md §10 and §12): a mode fits when
 *   Es/N0 − L_implementation ≥ (Es/N0)_required,mode + required margin   (all dB).
 */
import type { AdaptiveMode, LinkSpec } from '../budget/types.js';

const thresholdsCache = new WeakMap<LinkSpec, { extra: number; modes: readonly AdaptiveMode[]; th: Float64Array }>();
const ratesCache = new WeakMap<LinkSpec, { rs: number; modes: readonly AdaptiveMode[]; rates: Float64Array }>();

/**
 * Fit thresholds in Es/N0 (dB) per mode: required Es/N0 + required margin +
 * implementation loss. The same array for the same link (do not modify it).
 */
export function modeThresholdsDB(link: LinkSpec): Float64Array {
  if (link.modcod.kind !== 'adaptive') return new Float64Array(0);
  const extra = link.requiredMarginDB + link.implementationLossDB;
  const modes = link.modcod.modes;
  const hit = thresholdsCache.get(link);
  if (hit && hit.extra === extra && hit.modes === modes) return hit.th;
  const th = Float64Array.from(modes, (m: AdaptiveMode) => m.requiredEsN0DB + extra);
  thresholdsCache.set(link, { extra, modes, th });
  return th;
}

/** Information rate of each mode (b/s): R_s · η. The same array for the same link (do not modify it). */
export function modeRatesBps(link: LinkSpec): Float64Array {
  if (link.modcod.kind !== 'adaptive') return new Float64Array(0);
  const rs = link.modcod.symbolRateBaud;
  const modes = link.modcod.modes;
  const hit = ratesCache.get(link);
  if (hit && hit.rs === rs && hit.modes === modes) return hit.rates;
  const rates = Float64Array.from(modes, (m: AdaptiveMode) => rs * m.efficiencyBitsPerSymbol);
  ratesCache.set(link, { rs, modes, rates });
  return rates;
}

/**
 * Index of the best single constant mode given the time each mode fitted:
 * argmax of rate_i × time_i (first index on ties); −1 when no mode ever fits.
 * DVB-S2 efficiency is not monotone in required Es/N0 (e.g. 16APSK 3/4 needs
 * less Es/N0 than 8PSK 8/9 yet carries more), so every mode is tracked.
 */
export function bestConstantMode(ratesBps: Float64Array, fitTimeS: Float64Array): number {
  let best = -1;
  let bestBits = 0;
  for (let i = 0; i < ratesBps.length; i++) {
    const bits = ratesBps[i] * fitTimeS[i];
    if (bits > bestBits) {
      bestBits = bits;
      best = i;
    }
  }
  return best;
}

/**
 * Time each mode fits (Es/N0 ≥ its threshold), accumulated by rank: a step
 * with r of the (sorted) thresholds at or below its Es/N0 adds its Δt to rank
 * r, and mode i's fit time is the time of every rank above its place in the
 * order. One search per step (hunting from the last rank: Es/N0 moves
 * slowly within a pass) instead of one comparison per mode.
 */
export interface ModeFit {
  add(esN0DB: number, dtS: number): void;
  /** Fit time per mode (s), in the link's mode order. */
  fitTimeS(): Float64Array;
  /** Add another accumulator's times (same thresholds). */
  addFrom(other: ModeFit): void;
  /** Zero the times. */
  clear(): void;
  /** Time per rank (0 … modes), for addFrom. */
  readonly rankS: Float64Array;
}

/** The sorted thresholds and their order, once per thresholds array (a pass creates one fit per case and day). */
const sortedCache = new WeakMap<Float64Array, { order: Int32Array; sorted: Float64Array }>();

export function createModeFit(thresholdsDB: Float64Array): ModeFit {
  const n = thresholdsDB.length;
  let spec = sortedCache.get(thresholdsDB);
  if (!spec) {
    const order = Int32Array.from({ length: n }, (_, i) => i).sort((a, b) => thresholdsDB[a] - thresholdsDB[b] || a - b);
    spec = { order, sorted: Float64Array.from(order, (i) => thresholdsDB[i]) };
    sortedCache.set(thresholdsDB, spec);
  }
  const { order, sorted } = spec;
  const rankS = new Float64Array(n + 1);
  let r = 0;
  return {
    rankS,
    add(es, dt) {
      // r = number of sorted thresholds ≤ es (NaN: none).
      if (!(es === es)) { rankS[0] += dt; return; }
      while (r > 0 && !(sorted[r - 1] <= es)) r--;
      while (r < n && sorted[r] <= es) r++;
      rankS[r] += dt;
    },
    fitTimeS() {
      const out = new Float64Array(n);
      let above = 0;
      for (let p = n - 1; p >= 0; p--) {
        above += rankS[p + 1];
        out[order[p]] = above;
      }
      return out;
    },
    addFrom(other) {
      for (let i = 0; i <= n; i++) rankS[i] += other.rankS[i];
    },
    clear() { rankS.fill(0); },
  };
}
