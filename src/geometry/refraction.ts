/**
 * Tropospheric refraction of the elevation angle, ITU-R P.834 (§1, mean
 * annual global reference atmosphere; formula from memory):
 *   τ(h, θ) = 1 / [1.314 + 0.6437 θ + 0.02869 θ² + h (0.2305 + 0.09428 θ + 0.01096 θ²) + 0.008583 h²]  (deg)
 * with h the station height (km) and θ the apparent elevation (deg). About
 * 0.76° at the horizon, 0.19° at 5°, 0.09° at 10° for h = 0.
 */
export function refractionDeg(heightKm: number, apparentElevationDeg: number): number {
  const t = apparentElevationDeg;
  const h = heightKm;
  return 1 / (1.314 + 0.6437 * t + 0.02869 * t * t + h * (0.2305 + 0.09428 * t + 0.01096 * t * t) + 0.008583 * h * h);
}

/**
 * Below this geometric elevation the bending is held at its value here: the
 * formula has a pole at about −11° and is meant for rays near or above the
 * horizon. Holding it keeps the apparent elevation continuous.
 */
export const REFRACTION_FLOOR_GEOMETRIC_DEG = -1;

/**
 * Apparent elevation θ0 from geometric elevation θ: solves θ0 − τ(h, θ0) = θ
 * by fixed-point iteration (|dτ/dθ0| < 0.5 for θ0 ≥ −1°, so it contracts).
 */
export function apparentElevationDeg(heightKm: number, geometricElevationDeg: number): number {
  one[0] = geometricElevationDeg;
  apparentElevationColumn(heightKm, one, 1, one);
  return one[0];
}
const one = new Float64Array(1);

/** apparentElevationDeg for geometric elevations el[0 … n−1] at one station height, into out (may be el). */
export function apparentElevationColumn(heightKm: number, el: Float64Array, n: number, out: Float64Array): void {
  for (let i = 0; i < n; i++) out[i] = apparent(heightKm, el[i]);
}

function apparent(heightKm: number, geometricElevationDeg: number): number {
  const hk = Math.max(0, heightKm);
  const g = Math.max(geometricElevationDeg, REFRACTION_FLOOR_GEOMETRIC_DEG);
  let app = g + refractionDeg(hk, Math.max(g, 0));
  for (let i = 0; i < 30; i++) {
    const next = g + refractionDeg(hk, app);
    if (Math.abs(next - app) < 1e-10) { app = next; break; }
    app = next;
  }
  return geometricElevationDeg + (app - g);
}
