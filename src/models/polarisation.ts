/** Polarisation mismatch. */

/** Loss reported for (near-)orthogonal polarisations (dB): the formula gives +∞; stated clamp of this project. */
export const MAX_POLARISATION_LOSS_DB = 40;
const MIN_PLF = 10 ** (-MAX_POLARISATION_LOSS_DB / 10);

/**
 * Polarisation loss (dB) between two elliptical polarisations with signed voltage
 * axial ratios r_t, r_r (|r| ≥ 1; + right-hand, − left-hand, ±Infinity linear) and
 * major-axis tilt difference Δτ:
 * PLF = 1/2 + [4 r_t r_r + (r_t² − 1)(r_r² − 1) cos 2Δτ] / [2 (r_t² + 1)(r_r² + 1)]
 * (common textbook form, e.g. Stutzman, Polarization in Electromagnetic Systems),
 * evaluated in ρ = 1/r so linear (ρ = 0) needs no special case. Loss = −10 log10 PLF,
 * clamped at MAX_POLARISATION_LOSS_DB (opposite-sense circular would be infinite).
 * No allocation. |r| < 1 gives NaN-free but meaningless results; callers validate once.
 */
export function polarisationLossDB(a: { axialRatioTx: number; axialRatioRx: number; tiltDifferenceDeg: number }): number {
  const pt = 1 / a.axialRatioTx, pr = 1 / a.axialRatioRx;
  const c2 = Math.cos((2 * a.tiltDifferenceDeg * Math.PI) / 180);
  const plf = 0.5 + (4 * pt * pr + (1 - pt * pt) * (1 - pr * pr) * c2) / (2 * (1 + pt * pt) * (1 + pr * pr));
  return plf > MIN_PLF ? -10 * Math.log10(plf) : MAX_POLARISATION_LOSS_DB;
}

/** Throws RangeError unless |axialRatio| ≥ 1 (±Infinity = linear). For scenario validation. */
export function checkAxialRatio(name: string, axialRatio: number): void {
  if (!(Math.abs(axialRatio) >= 1)) {
    throw new RangeError(`polarisationLossDB: ${name} = ${axialRatio} is outside |r| ≥ 1 (±1 circular, ±Infinity linear)`);
  }
}
