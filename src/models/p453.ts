/** Radio refractive index — ITU-R P.453: wet term of the refractivity. */
import { checkRange, type Interval } from './range.js';

/** Saturation-pressure coefficients over water, valid −40 °C to +50 °C (ITU-R P.453 §1, water coefficients). */
export const P453_VALIDITY = { temperatureC: [-40, 50] as Interval, relativeHumidityPercent: [0, 100] as Interval };

/** e_s = 6.1121 exp(17.502 t / (t + 240.97)) hPa over water — ITU-R P.453 §1 (enhancement factor EF omitted, ≈ 1.004). */
export function saturationVapourPressureHPa(a: { temperatureC: number }): number {
  checkRange('saturationVapourPressureHPa', 'temperatureC', a.temperatureC, P453_VALIDITY.temperatureC, '°C');
  const t = a.temperatureC;
  return 6.1121 * Math.exp((17.502 * t) / (t + 240.97));
}

/** N_wet = 3.732 × 10^5 e / T² (N-units), e = H e_s / 100 — ITU-R P.453 §1. */
export function wetRefractivity(a: { temperatureC: number; relativeHumidityPercent: number }): number {
  checkRange('wetRefractivity', 'relativeHumidityPercent', a.relativeHumidityPercent, P453_VALIDITY.relativeHumidityPercent, '%');
  const e = (a.relativeHumidityPercent * saturationVapourPressureHPa(a)) / 100;
  const T = a.temperatureC + 273.15;
  return (3.732e5 * e) / (T * T);
}
