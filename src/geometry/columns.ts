/**
 * Geometry in columns: the satellite's Earth-fixed state on a run of grid
 * times (once, whatever the number of stations), then each station's look
 * angles, range, range rate and acceleration and line of sight over its part
 * of that run. Typed arrays filled in loops; the per-instant geometry
 * (station.ts `sample`) is the same kernels on columns of length one.
 *
 * Frames: TEME (SGP4) rotated by GMST about +Z into ECEF (polar motion and
 * UT1−UTC neglected, see orbit/frames.ts); the Earth-fixed velocity is the
 * true one, R·v_TEME − ω⊕ × r_ECEF.
 */
import { EARTH_ROTATION_RAD_S, gmstRad } from '../orbit/frames.js';
import { createStateColumns, type StateColumns } from '../orbit/interpolated.js';
import { apparentElevationColumn } from './refraction.js';

const DEG = Math.PI / 180;
/** WGS-72 constants that SGP4 itself uses (Vallado et al. AIAA 2006-6753): μ (km³/s²), Earth radius (km), J2. */
const MU_KM3_S2 = 398_600.8;
const RE_KM = 6378.135;
const J2 = 0.001082616;

/** The satellite on a run of grid times: TEME state, GMST, Earth-fixed position, velocity and acceleration. */
export interface SatelliteColumns {
  capacity: number;
  /** Number of valid entries. */
  n: number;
  /** Entry i is at originS + (k0 + i)·stepS: grid time k0 + i of a grid from originS (one instant: k0 = 0, stepS = 0). */
  originS: number;
  k0: number;
  stepS: number;
  teme: StateColumns;
  cosG: Float64Array; sinG: Float64Array;
  ex: Float64Array; ey: Float64Array; ez: Float64Array;
  evx: Float64Array; evy: Float64Array; evz: Float64Array;
  /** Earth-fixed acceleration (km/s²): R a_TEME − 2 ω×v_E − ω×(ω×r_E), a_TEME two-body + J2. */
  eax: Float64Array; eay: Float64Array; eaz: Float64Array;
  /** |v_E|² (km²/s²). */
  v2: Float64Array;
}

export function createSatelliteColumns(capacity: number): SatelliteColumns {
  const f = () => new Float64Array(capacity);
  return {
    capacity, n: 0, originS: NaN, k0: 0, stepS: NaN, teme: createStateColumns(capacity), cosG: f(), sinG: f(),
    ex: f(), ey: f(), ez: f(), evx: f(), evy: f(), evz: f(), eax: f(), eay: f(), eaz: f(), v2: f(),
  };
}

/**
 * Fill the Earth-fixed part of `s` from its TEME columns (entries 0 … n−1 at
 * times originS + (k0 + i)·stepS). Gravity: two-body plus the J2 zonal term, the dominant
 * perturbation (about 1e-3 of the central term); drag and higher harmonics
 * are left out (each below ~1e-5 relative), which is ample for the Doppler rate.
 */
export function satelliteEarthFixed(s: SatelliteColumns): void {
  const { rx, ry, rz, vx, vy, vz } = s.teme;
  const w = EARTH_ROTATION_RAD_S;
  for (let i = 0; i < s.n; i++) {
    const g = gmstRad(s.originS + (s.k0 + i) * s.stepS);
    const c = Math.cos(g); const sn = Math.sin(g);
    s.cosG[i] = c; s.sinG[i] = sn;
    const x = rx[i]; const y = ry[i]; const z = rz[i];
    const ex = c * x + sn * y;
    const ey = -sn * x + c * y;
    s.ex[i] = ex; s.ey[i] = ey; s.ez[i] = z;
    // −ω × r with ω = (0, 0, ω⊕): (+ω y, −ω x, 0)
    const evx = c * vx[i] + sn * vy[i] + w * ey;
    const evy = -sn * vx[i] + c * vy[i] - w * ex;
    const evz = vz[i];
    s.evx[i] = evx; s.evy[i] = evy; s.evz[i] = evz;
    s.v2[i] = evx * evx + evy * evy + evz * evz;
    // Gravity in TEME, then a_E = R a_T − 2 ω×v_E − ω×(ω×r_E).
    const r2 = x * x + y * y + z * z;
    const rn = Math.sqrt(r2);
    const k = -MU_KM3_S2 / (r2 * rn);
    const j = (1.5 * J2 * (RE_KM * RE_KM)) / r2;
    const zz = (5 * z * z) / r2;
    const atx = k * x * (1 + j * (1 - zz));
    const aty = k * y * (1 + j * (1 - zz));
    const atz = k * z * (1 + j * (3 - zz));
    s.eax[i] = c * atx + sn * aty + 2 * w * evy + w * w * ex;
    s.eay[i] = -sn * atx + c * aty - 2 * w * evx + w * w * ey;
    s.eaz[i] = atz;
  }
}

/** A station's frame: ECEF position (km) and the rows of the ECEF → east/north/up rotation. */
export interface StationFrame {
  ecefKm: Float64Array;
  heightKm: number;
  sinLat: number; cosLat: number; sinLon: number; cosLon: number;
}

/** One station's view of the satellite over entries [from, to) of a SatelliteColumns, written at out index 0 …. */
export interface StationColumns {
  capacity: number;
  azimuthDeg: Float64Array;
  /** Geometric elevation. */
  elevationDeg: Float64Array;
  /** Apparent elevation with ITU-R P.834 refraction. */
  apparentElevationDeg: Float64Array;
  rangeKm: Float64Array;
  rangeRateKmS: Float64Array;
  rangeAccelKmS2: Float64Array;
  /** Unit line of sight from the spacecraft to the station, TEME. */
  losX: Float64Array; losY: Float64Array; losZ: Float64Array;
}

export function createStationColumns(capacity: number): StationColumns {
  const f = () => new Float64Array(capacity);
  return {
    capacity, azimuthDeg: f(), elevationDeg: f(), apparentElevationDeg: f(), rangeKm: f(), rangeRateKmS: f(),
    rangeAccelKmS2: f(), losX: f(), losY: f(), losZ: f(),
  };
}

/**
 * Look angles (azimuth from north through east), range, range rate (positive
 * receding), range acceleration d²|ρ|/dt² = (|ρ̇|² + ρ·ρ̈ − ṙ²)/|ρ| (station at
 * rest in ECEF) and the TEME line of sight, for entries [from, to) of `s`.
 */
export function stationLook(frame: StationFrame, s: SatelliteColumns, from: number, to: number, out: StationColumns): void {
  const { ecefKm, sinLat: sp, cosLat: cp, sinLon: sl, cosLon: cl, heightKm } = frame;
  const sx = ecefKm[0]; const sy = ecefKm[1]; const sz = ecefKm[2];
  for (let i = from, o = 0; i < to; i++, o++) {
    const dx = s.ex[i] - sx; const dy = s.ey[i] - sy; const dz = s.ez[i] - sz;
    const rho = Math.sqrt(dx * dx + dy * dy + dz * dz);
    const e = -sl * dx + cl * dy;
    const n = -sp * cl * dx - sp * sl * dy + cp * dz;
    const u = cp * cl * dx + cp * sl * dy + sp * dz;
    const el = Math.atan2(u, Math.sqrt(e * e + n * n)) / DEG;
    let az = Math.atan2(e, n) / DEG;
    if (az < 0) az += 360;
    const rdot = (dx * s.evx[i] + dy * s.evy[i] + dz * s.evz[i]) / rho;
    out.azimuthDeg[o] = az;
    out.elevationDeg[o] = el;
    out.rangeKm[o] = rho;
    out.rangeRateKmS[o] = rdot;
    out.rangeAccelKmS2[o] = (s.v2[i] + dx * s.eax[i] + dy * s.eay[i] + dz * s.eaz[i] - rdot * rdot) / rho;
    // Spacecraft → station in TEME: −R(−GMST) ρ / |ρ|.
    const c = s.cosG[i]; const sn = s.sinG[i];
    out.losX[o] = -(c * dx - sn * dy) / rho;
    out.losY[o] = -(sn * dx + c * dy) / rho;
    out.losZ[o] = -dz / rho;
  }
  apparentElevationColumn(heightKm, out.elevationDeg, to - from, out.apparentElevationDeg);
}
