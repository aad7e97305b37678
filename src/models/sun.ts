/**
 * The Sun's apparent place, low-precision formula of the Astronomical Almanac
 * (PHYSICS.md §13; from memory: written down from the Almanac's "low
 * precision formulas for the Sun", stated there good to about 0.01° over
 * 1950–2050). Right ascension and declination are of date (true equator,
 * equinox of date, aberration included through the formula's mean longitude).
 */
const DEG = Math.PI / 180;

/** Unix time of JD 2451545.0 (J2000.0, 2000-01-01T12:00 on the TT scale used as UTC here: the offset is added separately). */
const J2000_UNIX_S = 946_728_000;

/**
 * TT − UTC (s) since 2017-01-01: TAI − UTC = 37 s (no leap second since) plus
 * TT − TAI = 32.184 s (IERS Bulletin C; from memory). A leap second would
 * change the Sun's place by 0.0003°, far below the formula's accuracy.
 */
export const TT_MINUS_UTC_S = 69.184;

/** Diameter of the solar disc as seen from the Earth (deg), about 0.53° (PHYSICS.md §13; optical disc, mean distance). */
export const SUN_DISC_DIAMETER_DEG = 0.533;

export interface SolarPosition {
  /** Apparent right ascension of date, 0–360° (deg). */
  rightAscensionDeg: number;
  /** Apparent declination of date (deg). */
  declinationDeg: number;
  /** Earth–Sun distance (astronomical units). */
  distanceAu: number;
}

/** Years 1950–2100 (the formula's stated span with a margin; outside it the error grows with the years). */
const VALID_FROM_S = -631_152_000; // 1950-01-01
const VALID_TO_S = 4_102_444_800; // 2100-01-01

/**
 * The Sun's apparent right ascension, declination and distance at a UTC
 * instant (Unix seconds): Astronomical Almanac low-precision formula
 * (n = JD(TT) − 2451545; L, g, λ, ε, α, δ, R as in PHYSICS.md §13).
 */
export function solarPosition(timeUtcS: number): SolarPosition {
  if (!(timeUtcS >= VALID_FROM_S && timeUtcS <= VALID_TO_S)) {
    throw new RangeError(`solarPosition: timeUtcS = ${timeUtcS} is outside 1950–2100 (allowed ${VALID_FROM_S} … ${VALID_TO_S} s)`);
  }
  const out = { rightAscensionDeg: NaN, declinationDeg: NaN, distanceAu: NaN };
  solarPlace(timeUtcS, out);
  return out;
}

/** solarPosition without the range check and without allocating (for column loops). */
export function solarPlace(timeUtcS: number, out: SolarPosition): SolarPosition {
  const n = (timeUtcS + TT_MINUS_UTC_S - J2000_UNIX_S) / 86_400;
  const L = 280.460 + 0.9856474 * n;
  const g = (357.528 + 0.9856003 * n) * DEG;
  const lambda = (L + 1.915 * Math.sin(g) + 0.020 * Math.sin(2 * g)) * DEG;
  const eps = (23.439 - 0.0000004 * n) * DEG;
  const sl = Math.sin(lambda);
  let ra = Math.atan2(Math.cos(eps) * sl, Math.cos(lambda)) / DEG;
  if (ra < 0) ra += 360;
  out.rightAscensionDeg = ra;
  out.declinationDeg = Math.asin(Math.sin(eps) * sl) / DEG;
  out.distanceAu = 1.00014 - 0.01671 * Math.cos(g) - 0.00014 * Math.cos(2 * g);
  return out;
}

const scratch: SolarPosition = { rightAscensionDeg: NaN, declinationDeg: NaN, distanceAu: NaN };
/**
 * Unit vector toward the Sun in the equatorial frame of date (x to the
 * equinox, z to the pole), into out[o … o+2]. Used as TEME: TEME's mean
 * equinox differs from the true one by the equation of the equinoxes, at most
 * about 0.005° (from memory), below the formula's 0.01°.
 */
export function sunDirection(timeUtcS: number, out: Float64Array, o = 0): void {
  solarPlace(timeUtcS, scratch);
  const a = scratch.rightAscensionDeg * DEG, d = scratch.declinationDeg * DEG;
  const cd = Math.cos(d);
  out[o] = cd * Math.cos(a);
  out[o + 1] = cd * Math.sin(a);
  out[o + 2] = Math.sin(d);
}
