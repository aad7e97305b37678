/**
 * TEME → Earth-fixed rotation by Greenwich mean sidereal time (IAU-82 GMST
 * through satellite.js `gstime`, Vallado 2004 eq. 3-45), polar motion and
 * UT1−UTC neglected (UTC is used for UT1, an error below 0.9 s of rotation,
 * i.e. under about 0.4 km at the equator; common practice for SGP4 users).
 */
import { gstime } from 'satellite.js';
import { julianDateFromUnix } from './time.js';

/** Earth rotation rate used for the Earth-fixed velocity (rad/s), PHYSICS.md §11. */
export const EARTH_ROTATION_RAD_S = 7.292115e-5;

/** GMST (rad) at Unix time `t`, from a floating-point Julian date (no Date objects). */
export function gmstRad(t: number): number {
  return gstime(julianDateFromUnix(t));
}

/**
 * Rotate a TEME state into ECEF: r_E = R3(θ) r_T and the true Earth-fixed
 * velocity v_E = R3(θ) v_T − ω⊕ × r_E. Writes into the output arrays.
 */
export function temeToEcef(
  gmst: number,
  rTeme: ArrayLike<number>, vTeme: ArrayLike<number>,
  rOut: Float64Array, vOut: Float64Array,
): void {
  const c = Math.cos(gmst);
  const s = Math.sin(gmst);
  const x = c * rTeme[0] + s * rTeme[1];
  const y = -s * rTeme[0] + c * rTeme[1];
  const z = rTeme[2];
  const vx = c * vTeme[0] + s * vTeme[1];
  const vy = -s * vTeme[0] + c * vTeme[1];
  rOut[0] = x; rOut[1] = y; rOut[2] = z;
  // −ω × r with ω = (0, 0, ω⊕): (+ω y, −ω x, 0)
  vOut[0] = vx + EARTH_ROTATION_RAD_S * y;
  vOut[1] = vy - EARTH_ROTATION_RAD_S * x;
  vOut[2] = vTeme[2];
}
