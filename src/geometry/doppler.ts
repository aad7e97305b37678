/** Speed of light (m/s), exact by SI definition. */
export const SPEED_OF_LIGHT_M_S = 299_792_458;
const C_KM_S = SPEED_OF_LIGHT_M_S / 1000;

/** Doppler shift (Hz) of a one-way link: Δf = −f ṙ / c (PHYSICS.md §11; first order in ṙ/c). */
export function dopplerShiftHz({ frequencyHz, rangeRateKmS }: { frequencyHz: number; rangeRateKmS: number }): number {
  return (-frequencyHz * rangeRateKmS) / C_KM_S;
}

/** Doppler rate (Hz/s): d(Δf)/dt = −f r̈ / c (PHYSICS.md §11). */
export function dopplerRateHzS({ frequencyHz, rangeAccelKmS2 }: { frequencyHz: number; rangeAccelKmS2: number }): number {
  return (-frequencyHz * rangeAccelKmS2) / C_KM_S;
}
