/**
 * TEME → Earth-fixed rotation by Greenwich mean sidereal time (IAU-82 GMST,
 * Vallado 2004 eq. 3-45, the formula of satellite.js `gstime`), polar motion
 * and UT1−UTC neglected (UTC is used for UT1, an error below 0.9 s of
 * rotation, i.e. under about 0.4 km at the equator; common practice for SGP4
 * users).
 */

/** 2000-01-01T12:00:00 (JD 2451545.0, the epoch of eq. 3-45) as Unix seconds, UTC for UT1 as above. */
const J2000_UNIX_S = 946_728_000;
const TWO_PI = 2 * Math.PI;
const DEG = Math.PI / 180;

/** Earth rotation rate used for the Earth-fixed velocity (rad/s), PHYSICS.md §11. */
export const EARTH_ROTATION_RAD_S = 7.292115e-5;

/**
 * GMST (rad, 0–2π) at Unix time `t`: eq. 3-45 with T_UT1 counted from
 * seconds since J2000 rather than from a Julian date, whose float64
 * resolution today (~40 µs) would step the Earth's rotation by ~2 cm at the
 * equator (agrees with satellite.js `gstime` to that resolution).
 */
export function gmstRad(t: number): number {
  const tut1 = (t - J2000_UNIX_S) / (86_400 * 36_525);
  let s = -6.2e-6 * tut1 * tut1 * tut1 + 0.093104 * tut1 * tut1 + (876_600 * 3600 + 8_640_184.812866) * tut1 + 67_310.54841; // s
  s = ((s * DEG) / 240) % TWO_PI; // 360°/86 400 s = 1/240 ° per s
  return s < 0 ? s + TWO_PI : s;
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
