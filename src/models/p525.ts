/** Free-space basic transmission loss — ITU-R P.525. */

import { C_M_S } from './constants.js';

// 20 log10(4π · 1e3 m · 1e9 Hz / c): the constant for d in km and f in GHz.
const FSL_CONSTANT_DB = 20 * Math.log10((4 * Math.PI * 1e12) / C_M_S);
// 20 log10 x = (20 / ln 10) ln x: Math.log is several times cheaper than Math.log10 in V8 (equal to ~1 ulp).
const TWENTY_OVER_LN10 = 20 / Math.LN10;
const fsl = (distanceKm: number, frequencyGHz: number) => FSL_CONSTANT_DB + TWENTY_OVER_LN10 * Math.log(distanceKm * frequencyGHz);

/**
 * L_fs = 20 log10(4π d f / c) dB — ITU-R P.525 §2 (written there as
 * 92.45 + 20 log f(GHz) + 20 log d(km)). No allocation; arguments must be > 0
 * (not checked here: this is called per step; a non-positive distance gives −Infinity/NaN).
 */
export function freeSpaceLossDB(a: { distanceKm: number; frequencyGHz: number }): number {
  return fsl(a.distanceKm, a.frequencyGHz);
}

/** freeSpaceLossDB for distances d[i] (km), i < n, at one frequency, into out (the same formula, looped). */
export function freeSpaceLossColumnDB(distanceKm: Float64Array, frequencyGHz: number, n: number, out: Float64Array): void {
  for (let i = 0; i < n; i++) out[i] = fsl(distanceKm[i], frequencyGHz);
}
