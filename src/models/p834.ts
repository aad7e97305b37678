/**
 * Tropospheric refraction of the elevation angle — ITU-R P.834 (from memory):
 * τ(h, θ) = 1 / [1.314 + 0.6437 θ + 0.02869 θ² + h (0.2305 + 0.09428 θ + 0.01096 θ²) + 0.008583 h²] deg,
 * θ the free-space (true) elevation in degrees, h the station height in km.
 * P.834 gives it for 0 ≤ h ≤ 3 km and low elevations; above 10° we keep using it
 * (τ < 0.1°, ≈ 0.003° at 90°, a harmless overestimate of a negligible term).
 * Below 0° it is accepted down to −1° (a satellite just below the geometric
 * horizon can appear above it); the formula's pole lies near −2.3°.
 */
import { checkRange, type Interval } from './range.js';

export const P834_VALIDITY = { elevationDeg: [-1, 90] as Interval, heightKm: [0, 3] as Interval };

/** Refraction correction τ (deg) to add to the true elevation — ITU-R P.834 (from memory). */
export function refractionDeg(a: { elevationDeg: number; heightKm: number }): number {
  checkRange('refractionDeg', 'elevationDeg', a.elevationDeg, P834_VALIDITY.elevationDeg, 'deg');
  checkRange('refractionDeg', 'heightKm', a.heightKm, P834_VALIDITY.heightKm, 'km');
  const t = a.elevationDeg, h = a.heightKm;
  return 1 / (1.314 + 0.6437 * t + 0.02869 * t * t + h * (0.2305 + 0.09428 * t + 0.01096 * t * t) + 0.008583 * h * h);
}

/** Apparent elevation θ + τ(h, θ) (deg), capped at 90° — ITU-R P.834 (from memory). */
export function apparentElevationDeg(a: { elevationDeg: number; heightKm: number }): number {
  return Math.min(90, a.elevationDeg + refractionDeg(a));
}
