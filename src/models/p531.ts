/**
 * Faraday rotation through the ionosphere — ITU-R P.531 (from memory):
 * Ω = 2.36 × 10^4 · B_av · N_T / f² rad, N_T the slant electron content (el/m²),
 * f in Hz, B_av the mean longitudinal geomagnetic field (default 5 × 10^−5 T).
 * The constant is e³ / (8 π² ε0 m_e² c) in SI units.
 */
import { checkAtLeast, checkRange, type Interval } from './range.js';

export const P531_VALIDITY = { frequencyMHz: [30, 30_000] as Interval };
/** 1 TECU = 10^16 electrons/m². */
export const ELECTRONS_PER_M2_PER_TECU = 1e16;

/** Faraday rotation angle (deg, can exceed 360) — ITU-R P.531 (from memory). */
export function faradayRotationDeg(a: { frequencyMHz: number; electronContentTECU: number; magneticFieldT?: number }): number {
  checkRange('faradayRotationDeg', 'frequencyMHz', a.frequencyMHz, P531_VALIDITY.frequencyMHz, 'MHz');
  checkAtLeast('faradayRotationDeg', 'electronContentTECU', a.electronContentTECU, 0, 'TECU');
  const b = a.magneticFieldT ?? 5e-5;
  const fHz = a.frequencyMHz * 1e6;
  const rad = (2.36e4 * b * a.electronContentTECU * ELECTRONS_PER_M2_PER_TECU) / (fHz * fHz);
  return (rad * 180) / Math.PI;
}
