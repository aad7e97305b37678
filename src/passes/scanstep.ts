/**
 * Coarse scan step for the pass search, derived from the orbit.
 *
 * The shortest pass that matters is the one that crosses the station's
 * visibility circle through its centre at perigee, the fastest point of the
 * orbit. On a spherical Earth (Wertz & Larson, SMAD) a satellite at height h
 * is above elevation ε out to the Earth central angle
 *   λ = 90° − ε − η,  sin η = R cos ε / (R + h),
 * so that pass lasts about 2λ / ω_p, ω_p = n (1 + e)² / (1 − e²)^{3/2} the
 * angular rate at perigee (Earth rotation ignored: it lengthens or shortens
 * passes by a few per cent). Passes off the centre are shorter and can be
 * arbitrarily short, so the scan does not rely on catching a sample inside
 * every pass: elevation has a single maximum per pass and per orbit, and
 * `findCrossings` maximises around every sampled local maximum that stays below
 * the mask. That is exact as long as g is unimodal over two scan steps around
 * its peaks, which a step of a tenth of the longest pass duration keeps with a
 * wide margin even with azimuth-dependent masks (whose features are crossed
 * in about that time only by near-overhead passes, which are not short).
 */
import type { ElementSet } from '../elements/types.js';

const MU_KM3_S2 = 398_600.8; // WGS-72, as SGP4 (Vallado et al. AIAA 2006-6753)
const R_KM = 6378.135;
const DEG = Math.PI / 180;

/** Duration (s) of a central pass above `minElevationDeg`, at perigee height and rate. */
export function centralPassDurationS(elements: ElementSet, minElevationDeg: number): number {
  const n = (elements.meanMotionRevPerDay * 2 * Math.PI) / 86_400; // rad/s
  const e = elements.eccentricity;
  const a = Math.cbrt(MU_KM3_S2 / (n * n));
  const h = Math.max(100, a * (1 - e) - R_KM);
  const eps = minElevationDeg * DEG;
  const eta = Math.asin((R_KM * Math.cos(eps)) / (R_KM + h));
  const lam = Math.PI / 2 - eps - eta;
  const rate = (n * (1 + e) ** 2) / (1 - e * e) ** 1.5;
  return (2 * lam) / rate;
}

/** Scan step (s): a tenth of the central pass duration, kept within [5 s, 300 s]. */
export function passScanStepS(elements: ElementSet, minElevationDeg: number): number {
  return Math.min(300, Math.max(5, centralPassDurationS(elements, minElevationDeg) / 10));
}

const OMEGA_EARTH_RAD_S = 7.292115e-5;

/**
 * An upper bound (deg/s) of |d(elevation − mask)/dt| while the satellite is
 * below the mask (elevation < the mask's highest point ε_m): the line of
 * sight turns at most at |v|/ρ, with |v| ≤ the perigee speed plus the Earth's
 * rotation at apogee radius (the Earth-fixed velocity), and ρ at least the
 * slant range at elevation ε_m to an altitude 10 % below perigee height (a
 * margin for drag); the mask's own change adds its steepest slope S (deg per
 * deg of azimuth) times the azimuth rate, ≤ (|v|/ρ)/cos ε_m; 5 % on top for
 * refraction when the mask is on apparent elevation. The pass search uses it
 * to skip maxima below the mask that cannot reach it (search.ts).
 */
export function belowMaskRateBoundDegS(elements: ElementSet, stationHeightKm: number, maskMaxDeg: number, maskSlopeDegPerDeg: number): number {
  const n = (elements.meanMotionRevPerDay * 2 * Math.PI) / 86_400;
  const e = elements.eccentricity;
  const a = Math.cbrt(MU_KM3_S2 / (n * n));
  const vMax = Math.sqrt((MU_KM3_S2 * (1 + e)) / (a * (1 - e))) + OMEGA_EARTH_RAD_S * a * (1 + e);
  const h = Math.max(50, 0.9 * (a * (1 - e) - R_KM) - Math.max(0, stationHeightKm));
  const em = Math.min(89, Math.max(0, maskMaxDeg)) * DEG;
  const rho = Math.sqrt((R_KM + h) ** 2 - (R_KM * Math.cos(em)) ** 2) - R_KM * Math.sin(em);
  const losRate = vMax / rho;
  return 1.05 * (losRate / DEG) * (1 + maskSlopeDegPerDeg / Math.cos(em));
}
