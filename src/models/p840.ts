/**
 * Attenuation due to clouds — ITU-R P.840: Rayleigh absorption by cloud liquid
 * water with the double-Debye permittivity of water (P.840 §2).
 */
import { slantPathFactor } from './p676.js';
import { checkAtLeast, checkRange, type Interval } from './range.js';

export const P840_VALIDITY = { frequencyGHz: [1, 1000] as Interval, elevationDeg: [0, 90] as Interval };

/** K_l (dB/km)/(g/m³) — ITU-R P.840 §2. */
export function cloudSpecificCoefficient(a: { frequencyGHz: number; temperatureK: number }): number {
  const fn = 'cloudSpecificCoefficient';
  checkRange(fn, 'frequencyGHz', a.frequencyGHz, P840_VALIDITY.frequencyGHz, 'GHz');
  checkRange(fn, 'temperatureK', a.temperatureK, [200, 330], 'K');
  const f = a.frequencyGHz;
  const th = 300 / a.temperatureK - 1;
  const e0 = 77.66 + 103.3 * th, e1 = 0.0671 * e0, e2 = 3.52;
  const fp = 20.2 - 146 * th + 316 * th * th, fs = 39.8 * fp;
  const rp = 1 + (f / fp) ** 2, rs = 1 + (f / fs) ** 2;
  const epp = (f * (e0 - e1)) / (fp * rp) + (f * (e1 - e2)) / (fs * rs);
  const ep = (e0 - e1) / rp + (e1 - e2) / rs + e2;
  const eta = (2 + ep) / epp;
  return (0.819 * f) / (epp * (1 + eta * eta));
}

/**
 * Equivalent thickness used only for the low-elevation path factor of clouds
 * (assumption of this project, no published source: a cloud layer within the
 * first ~2 km). Only matters below 5°.
 */
export const CLOUD_LOW_ELEVATION_HEIGHT_KM = 2;

/**
 * Slant cloud attenuation A = L K_l(f, 273.15 K) / sin θ (dB) — ITU-R P.840 §3,
 * stated for 5° ≤ θ ≤ 90°. Below 5° the 1/sin θ is replaced by the same
 * curved-path factor as the gases (slantPathFactor in p676.ts, matched to
 * 1/sin θ at 5°, so continuous) for a layer of CLOUD_LOW_ELEVATION_HEIGHT_KM.
 */
export function cloudAttenuation(a: { frequencyGHz: number; elevationDeg: number; liquidWaterKgM2: number }): number {
  const fn = 'cloudAttenuation';
  checkRange(fn, 'elevationDeg', a.elevationDeg, P840_VALIDITY.elevationDeg, 'deg');
  checkAtLeast(fn, 'liquidWaterKgM2', a.liquidWaterKgM2, 0, 'kg/m²');
  const kl = cloudSpecificCoefficient({ frequencyGHz: a.frequencyGHz, temperatureK: 273.15 });
  return a.liquidWaterKgM2 * kl * slantPathFactor(a.elevationDeg, CLOUD_LOW_ELEVATION_HEIGHT_KM);
}
