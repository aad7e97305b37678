/**
 * Spacecraft attitude and antenna mounting: the angle at the spacecraft between
 * its antenna boresight and the direction to the station, per step, from the
 * TEME vectors of a GeometrySample. No allocation: module-level scratch vectors.
 *
 * Frames:
 * - TEME: SGP4 output frame. The station's ECEF position is rotated into TEME
 *   by GMST about +Z (the inverse of r_ECEF = R3(GMST) r_TEME; polar motion neglected,
 *   as in the geometry stage).
 * - Nadir-pointing body frame (our definition, documented in types.ts):
 *   +Z toward geocentric nadir (−r̂_sat), +X along the component of the TEME
 *   velocity perpendicular to +Z, +Y = Z × X. Geocentric (not geodetic) nadir,
 *   so against the SMAD spherical-Earth off-nadir angle the difference is the
 *   ellipsoid's (up to ~0.2° between geocentric and geodetic verticals).
 */
import type { SatelliteColumns, StationColumns } from '../geometry/columns.js';
import type { GeometrySample } from '../geometry/types.js';
import type { SpacecraftPointing } from './types.js';

const RAD = Math.PI / 180;

const stnTeme = new Float64Array(3);
const los = new Float64Array(3);

/** Station position in TEME (km): ECEF rotated by −GMST about Z. */
export function stationTemeKm(sample: GeometrySample, out: Float64Array = stnTeme): Float64Array {
  const g = sample.gmstRad;
  const c = Math.cos(g), s = Math.sin(g);
  const e = sample.stationEcefKm;
  out[0] = c * e[0] - s * e[1];
  out[1] = s * e[0] + c * e[1];
  out[2] = e[2];
  return out;
}

/** Unit line of sight from spacecraft to station in TEME, written into `out`. */
export function lineOfSightTeme(sample: GeometrySample, out: Float64Array = los): Float64Array {
  const st = stationTemeKm(sample);
  const r = sample.satPositionTemeKm;
  const x = st[0] - r[0], y = st[1] - r[1], z = st[2] - r[2];
  const n = Math.hypot(x, y, z);
  out[0] = x / n; out[1] = y / n; out[2] = z / n;
  return out;
}

/** Angle (deg) between two unit vectors, robust at small angles (atan2 of |a×b| and a·b). */
export function angleBetweenDeg(ax: number, ay: number, az: number, bx: number, by: number, bz: number): number {
  const cx = ay * bz - az * by, cy = az * bx - ax * bz, cz = ax * by - ay * bx;
  return Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), ax * bx + ay * by + az * bz) / RAD;
}

/** Normalised copy of a body-frame or TEME boresight; rejects the zero vector. */
export function unitVector(v: readonly [number, number, number]): [number, number, number] {
  const n = Math.hypot(v[0], v[1], v[2]);
  return [v[0] / n, v[1] / n, v[2] / n];
}

/**
 * Geometric off-boresight angle (deg) of the station seen from the spacecraft
 * antenna, from the TEME state (r, v) and the unit line of sight u to the
 * station. `boresight` is the unit boresight (body frame for nadir, TEME for
 * inertial; ignored for tracking, which is 0° by definition: ideal tracking).
 * The attitude error is not included here: the engine turns it into a
 * separate pointing loss.
 */
function offBoresightDeg(
  kind: SpacecraftPointing['kind'], b: readonly number[],
  rx: number, ry: number, rz: number, vx: number, vy: number, vz: number, ux: number, uy: number, uz: number,
): number {
  if (kind === 'tracking') return 0;
  if (kind === 'inertial') return angleBetweenDeg(b[0], b[1], b[2], ux, uy, uz);
  // Nadir-pointing body frame in TEME.
  const rn = Math.sqrt(rx * rx + ry * ry + rz * rz);
  const zx = -rx / rn, zy = -ry / rn, zz = -rz / rn;
  if (b[0] === 0 && b[1] === 0 && b[2] === 1) return angleBetweenDeg(zx, zy, zz, ux, uy, uz);
  const vzc = vx * zx + vy * zy + vz * zz;
  let xx = vx - vzc * zx, xy = vy - vzc * zy, xz = vz - vzc * zz;
  const xn = Math.sqrt(xx * xx + xy * xy + xz * xz);
  xx /= xn; xy /= xn; xz /= xn;
  const yx = zy * xz - zz * xy, yy = zz * xx - zx * xz, yz = zx * xy - zy * xx;
  const bx = b[0] * xx + b[1] * yx + b[2] * zx;
  const by = b[0] * xy + b[1] * yy + b[2] * zy;
  const bz = b[0] * xz + b[1] * yz + b[2] * zz;
  return angleBetweenDeg(bx, by, bz, ux, uy, uz);
}

/** The off-boresight angle of one instant (a GeometrySample), e.g. for `explain` and the checks. */
export function spacecraftOffBoresightDeg(
  pointing: SpacecraftPointing,
  boresight: readonly number[],
  sample: GeometrySample,
): number {
  if (pointing.kind === 'tracking') return 0;
  const u = lineOfSightTeme(sample);
  const r = sample.satPositionTemeKm, v = sample.satVelocityTemeKmS;
  return offBoresightDeg(pointing.kind, boresight, r[0], r[1], r[2], v[0], v[1], v[2], u[0], u[1], u[2]);
}

/**
 * The same angle over a run of steps: satellite entries satFrom … satFrom+n−1
 * (TEME state) and station entries 0 … n−1 (line of sight), into out[0 … n−1].
 */
export function spacecraftOffBoresightColumn(
  pointing: SpacecraftPointing, boresight: readonly number[],
  sat: SatelliteColumns, satFrom: number, stn: StationColumns, n: number, out: Float64Array,
): void {
  const kind = pointing.kind;
  if (kind === 'tracking') { out.fill(0, 0, n); return; }
  const { rx, ry, rz, vx, vy, vz } = sat.teme;
  const ux = stn.losX, uy = stn.losY, uz = stn.losZ;
  const b0 = boresight[0], b1 = boresight[1], b2 = boresight[2];
  // One loop per case, each with only small inlinable calls (a per-step call returning a number costs a boxed result).
  if (kind === 'inertial') {
    for (let i = 0; i < n; i++) out[i] = angleBetweenDeg(b0, b1, b2, ux[i], uy[i], uz[i]);
  } else if (b0 === 0 && b1 === 0 && b2 === 1) {
    for (let i = 0; i < n; i++) {
      const j = satFrom + i;
      const x = rx[j], y = ry[j], z = rz[j];
      const rn = Math.sqrt(x * x + y * y + z * z);
      out[i] = angleBetweenDeg(-x / rn, -y / rn, -z / rn, ux[i], uy[i], uz[i]);
    }
  } else {
    for (let i = 0; i < n; i++) {
      const j = satFrom + i;
      out[i] = offBoresightDeg(kind, boresight, rx[j], ry[j], rz[j], vx[j], vy[j], vz[j], ux[i], uy[i], uz[i]);
    }
  }
}

/** Angle (deg) between two directions given as (azimuth, elevation) in degrees (haversine form). */
export function azElSeparationDeg(az1Deg: number, el1Deg: number, az2Deg: number, el2Deg: number): number {
  const dEl = (el2Deg - el1Deg) * RAD, dAz = (az2Deg - az1Deg) * RAD;
  const s1 = Math.sin(dEl / 2), s2 = Math.sin(dAz / 2);
  const h = s1 * s1 + Math.cos(el1Deg * RAD) * Math.cos(el2Deg * RAD) * s2 * s2;
  return 2 * Math.asin(Math.sqrt(Math.min(1, Math.max(0, h)))) / RAD;
}
