/**
 * Which modes of an adaptive table a step can carry. The fit rule is the one
 * the budget engine uses (PHYSICS.md §10 and §12): a mode fits when
 *   Es/N0 − L_implementation ≥ (Es/N0)_required,mode + required margin   (all dB).
 */
import type { AdaptiveMode, LinkSpec } from '../budget/types.js';

/** Fit thresholds in Es/N0 (dB) per mode: required Es/N0 + required margin + implementation loss. */
export function modeThresholdsDB(link: LinkSpec): Float64Array {
  if (link.modcod.kind !== 'adaptive') return new Float64Array(0);
  const extra = link.requiredMarginDB + link.implementationLossDB;
  return Float64Array.from(link.modcod.modes, (m: AdaptiveMode) => m.requiredEsN0DB + extra);
}

/** Information rate of each mode (b/s): R_s · η. */
export function modeRatesBps(link: LinkSpec): Float64Array {
  if (link.modcod.kind !== 'adaptive') return new Float64Array(0);
  const rs = link.modcod.symbolRateBaud;
  return Float64Array.from(link.modcod.modes, (m: AdaptiveMode) => rs * m.efficiencyBitsPerSymbol);
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
