/**
 * Errors of a general-perturbations element set as it ages (PHYSICS.md §13;
 * from memory, rough): SGP4 is good to about 1 km near epoch and its
 * along-track error grows by about 1–3 km per day in LEO (more at low
 * altitude and at solar maximum), the cross-track error far more slowly.
 * Model (our choice, linear): e_along = e0 + r_along·|age|, e_cross = e0 + r_cross·|age|,
 * age = t − epoch in days (|age|: propagating backwards ages the set too).
 * The pointing error at a station is the error's component perpendicular to
 * the line of sight over the range; the AOS/LOS timing error is the
 * along-track error over the ground-track speed.
 */
import { checkAtLeast } from './range.js';

const DEG = Math.PI / 180;

export interface ElementErrorRates {
  /** Position error at epoch in each of the along- and cross-track directions (km). */
  atEpochKm: number;
  alongTrackKmPerDay: number;
  crossTrackKmPerDay: number;
}

/** Along- and cross-track error (km) of an element set `ageDays` old: linear growth from the error at epoch. */
export function elementErrorKm(a: ElementErrorRates & { ageDays: number }): { alongTrackKm: number; crossTrackKm: number } {
  checkAtLeast('elementErrorKm', 'atEpochKm', a.atEpochKm, 0, 'km');
  checkAtLeast('elementErrorKm', 'alongTrackKmPerDay', a.alongTrackKmPerDay, 0, 'km/day');
  checkAtLeast('elementErrorKm', 'crossTrackKmPerDay', a.crossTrackKmPerDay, 0, 'km/day');
  const age = Math.abs(a.ageDays);
  return { alongTrackKm: a.atEpochKm + a.alongTrackKmPerDay * age, crossTrackKm: a.atEpochKm + a.crossTrackKmPerDay * age };
}

/**
 * Angle (deg) at the station between where the satellite is and where the
 * elements put it: atan(|e⊥| / range), e⊥ the part of the position error
 * perpendicular to the line of sight. The along-track error lies along the
 * inertial velocity v, the cross-track error along the orbit normal r × v;
 * their perpendicular parts are combined as independent errors (root sum of
 * squares). `los` is a unit line of sight (either sense), r and v the
 * satellite's inertial position and velocity (km, km/s), in one frame.
 */
export function elementPointingErrorDeg(a: {
  alongTrackKm: number; crossTrackKm: number; rangeKm: number;
  los: ArrayLike<number>; positionKm: ArrayLike<number>; velocityKmS: ArrayLike<number>;
}): number {
  const l = a.los, r = a.positionKm, v = a.velocityKmS;
  return pointingKernel(a.alongTrackKm, a.crossTrackKm, a.rangeKm, l[0], l[1], l[2], r[0], r[1], r[2], v[0], v[1], v[2]);
}

function pointingKernel(ea: number, ec: number, range: number, lx: number, ly: number, lz: number,
  rx: number, ry: number, rz: number, vx: number, vy: number, vz: number): number {
  const vn = Math.sqrt(vx * vx + vy * vy + vz * vz);
  const hx = ry * vz - rz * vy, hy = rz * vx - rx * vz, hz = rx * vy - ry * vx;
  const hn = Math.sqrt(hx * hx + hy * hy + hz * hz);
  const ca = (lx * vx + ly * vy + lz * vz) / vn;
  const cc = (lx * hx + ly * hy + lz * hz) / hn;
  const pa2 = ea * ea * Math.max(0, 1 - ca * ca);
  const pc2 = ec * ec * Math.max(0, 1 - cc * cc);
  return Math.atan(Math.sqrt(pa2 + pc2) / range) / DEG;
}

/**
 * elementPointingErrorDeg over columns: entries [from, from + n) of the
 * satellite's TEME state against entries 0 … n−1 of the line of sight and
 * range, the errors per entry in along/cross, into out[0 … n−1].
 */
export function elementPointingErrorColumnDeg(
  rx: Float64Array, ry: Float64Array, rz: Float64Array, vx: Float64Array, vy: Float64Array, vz: Float64Array, from: number,
  losX: Float64Array, losY: Float64Array, losZ: Float64Array, rangeKm: Float64Array,
  along: Float64Array, cross: Float64Array, n: number, out: Float64Array,
): void {
  for (let i = 0; i < n; i++) {
    const j = from + i;
    out[i] = pointingKernel(along[i], cross[i], rangeKm[i], losX[i], losY[i], losZ[i], rx[j], ry[j], rz[j], vx[j], vy[j], vz[j]);
  }
}

/** WGS-84 semi-axes (km). */
const A_KM = 6378.137;
const B_KM = 6356.752314245;

/**
 * Ground-track speed (km/s): the speed of the sub-satellite point over the
 * ellipsoid, the Earth-fixed velocity's horizontal part scaled from the
 * satellite's radius to the geocentric radius of the WGS-84 ellipsoid below it.
 */
export function groundTrackSpeedKmS(a: { positionEcefKm: ArrayLike<number>; velocityEcefKmS: ArrayLike<number> }): number {
  const p = a.positionEcefKm, v = a.velocityEcefKmS;
  const x = p[0], y = p[1], z = p[2], vx = v[0], vy = v[1], vz = v[2];
  const r = Math.sqrt(x * x + y * y + z * z);
  const vr = (x * vx + y * vy + z * vz) / r;
  const vh = Math.sqrt(Math.max(0, vx * vx + vy * vy + vz * vz - vr * vr));
  const sinLat = z / r, cosLat = Math.sqrt(x * x + y * y) / r;
  const a2c = A_KM * A_KM * cosLat, b2s = B_KM * B_KM * sinLat, ac = A_KM * cosLat, bs = B_KM * sinLat;
  const re = Math.sqrt((a2c * a2c + b2s * b2s) / (ac * ac + bs * bs));
  return (vh * re) / r;
}

/** AOS/LOS uncertainty (± s): the along-track error over the ground-track speed. */
export function timingUncertaintyS(a: { alongTrackKm: number; groundTrackSpeedKmS: number }): number {
  checkAtLeast('timingUncertaintyS', 'groundTrackSpeedKmS', a.groundTrackSpeedKmS, 0, 'km/s', true);
  return a.alongTrackKm / a.groundTrackSpeedKmS;
}
