/** Rain height — ITU-R P.839. */
import { checkRange } from './range.js';

/** h_R = h_0 + 0.36 km, h_0 the mean annual 0 °C isotherm height — ITU-R P.839-4 §2. */
export function rainHeightKm(a: { isothermHeightKm: number }): number {
  if (!Number.isFinite(a.isothermHeightKm)) {
    throw new RangeError(`rainHeightKm: isothermHeightKm = ${a.isothermHeightKm} is outside finite km`);
  }
  return a.isothermHeightKm + 0.36;
}

/**
 * Fallback 0 °C isotherm height (km) when the P.839 digital map is not at hand:
 * the latitude rule of an older P.839 edition (from memory, rough; the run must
 * name it as a default). North: 5 km up to 23°, then −0.075 km per degree;
 * south: 5 km down to 21° S, then 5 + 0.1 (φ + 21) km; never below 0.
 */
export function defaultIsothermHeightKm(a: { latitudeDeg: number }): number {
  checkRange('defaultIsothermHeightKm', 'latitudeDeg', a.latitudeDeg, [-90, 90], 'deg');
  const phi = a.latitudeDeg;
  let h: number;
  if (phi > 23) h = 5 - 0.075 * (phi - 23);
  else if (phi >= -21) h = 5;
  else h = 5 + 0.1 * (phi + 21);
  return Math.max(h, 0);
}
