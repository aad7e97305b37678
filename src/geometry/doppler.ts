/** Speed of light (m/s), exact by SI definition. */
export const SPEED_OF_LIGHT_M_S = 299_792_458;
const C_KM_S = SPEED_OF_LIGHT_M_S / 1000;

/** −f x / c: the shift for x = ṙ (km/s), the rate for x = r̈ (km/s²). */
const firstOrder = (frequencyHz: number, x: number) => (-frequencyHz * x) / C_KM_S;

/** Doppler shift (Hz) of a one-way link: Δf = −f ṙ / c (PHYSICS.md §11; first order in ṙ/c). */
export function dopplerShiftHz({ frequencyHz, rangeRateKmS }: { frequencyHz: number; rangeRateKmS: number }): number {
  return firstOrder(frequencyHz, rangeRateKmS);
}

/** Doppler rate (Hz/s): d(Δf)/dt = −f r̈ / c (PHYSICS.md §11). */
export function dopplerRateHzS({ frequencyHz, rangeAccelKmS2 }: { frequencyHz: number; rangeAccelKmS2: number }): number {
  return firstOrder(frequencyHz, rangeAccelKmS2);
}

/** dopplerShiftHz and dopplerRateHzS over columns of range rate and acceleration (i < n). */
export function dopplerColumns(frequencyHz: number, rangeRateKmS: Float64Array, rangeAccelKmS2: Float64Array, n: number, shiftOut: Float64Array, rateOut: Float64Array): void {
  for (let i = 0; i < n; i++) {
    shiftOut[i] = firstOrder(frequencyHz, rangeRateKmS[i]);
    rateOut[i] = firstOrder(frequencyHz, rangeAccelKmS2[i]);
  }
}
