/**
 * Look angles, range, range rate and range acceleration of a satellite from a
 * WGS-84 station, in the Earth-fixed frame (TEME rotated by GMST; see
 * src/orbit/frames.ts). All work happens in preallocated arrays: `sample`
 * and `elevationMinusMask` allocate nothing per call (satellite.js's own
 * result objects aside).
 */
import { InputError } from '../errors.js';
import { EARTH_ROTATION_RAD_S, gmstRad, temeToEcef } from '../orbit/frames.js';
import type { Propagator } from '../orbit/propagator.js';
import { maskElevationDeg, validateMask } from './mask.js';
import { apparentElevationDeg } from './refraction.js';
import type { GeometrySample, Station } from './types.js';
import { ecefToGeodetic, geodeticToEcefKm, type Geodetic } from './wgs84.js';

const DEG = Math.PI / 180;
/** WGS-72 constants that SGP4 itself uses (Vallado et al. AIAA 2006-6753): μ (km³/s²), Earth radius (km), J2. */
const MU_KM3_S2 = 398_600.8;
const RE_KM = 6378.135;
const J2 = 0.001082616;

export interface StationGeometry {
  readonly station: Station;
  /** Station position, ECEF km. */
  readonly ecefKm: Float64Array;
  /** Fill `out` with the full geometry at `timeS`; returns `out`. */
  sample(propagator: Propagator, timeS: number, out: GeometrySample): GeometrySample;
  /** Elevation minus mask at `timeS` (deg; ≥ 0 means visible), for the event search. */
  elevationMinusMask(propagator: Propagator, timeS: number): number;
}

/** Check a station's fields (InputError naming `where`) and return it with a validated mask. */
export function validateStation(station: Station, where: string): Station {
  const { latitudeDeg: lat, longitudeDeg: lon, heightM: h } = station;
  if (!Number.isFinite(lat) || lat < -90 || lat > 90) throw new InputError(`${where}: latitude ${lat} out of range (allowed -90 to 90 deg)`);
  if (!Number.isFinite(lon) || lon < -180 || lon > 360) throw new InputError(`${where}: longitude ${lon} out of range (allowed -180 to 360 deg)`);
  if (!Number.isFinite(h) || h < -500 || h > 9000) throw new InputError(`${where}: height ${h} m out of range (allowed -500 to 9000 m above the WGS-84 ellipsoid)`);
  return { ...station, mask: validateMask(station.mask, `${where} mask`) };
}

/**
 * Gravity acceleration in TEME (km/s²): two-body plus the J2 zonal term,
 * the dominant perturbation (about 1e-3 of the central term); drag and
 * higher harmonics are left out (each below ~1e-5 relative).
 */
function gravityTeme(r: Float64Array, out: Float64Array): void {
  const x = r[0]; const y = r[1]; const z = r[2];
  const r2 = x * x + y * y + z * z;
  const rn = Math.sqrt(r2);
  const k = -MU_KM3_S2 / (r2 * rn);
  const j = 1.5 * J2 * (RE_KM * RE_KM) / r2;
  const zz = (5 * z * z) / r2;
  out[0] = k * x * (1 + j * (1 - zz));
  out[1] = k * y * (1 + j * (1 - zz));
  out[2] = k * z * (1 + j * (3 - zz));
}

export function createStationGeometry(input: Station): StationGeometry {
  const station = validateStation(input, `station ${input.name}`);
  const hKm = station.heightM / 1000;
  const ecef = geodeticToEcefKm(station.latitudeDeg, station.longitudeDeg, hKm);
  const phi = station.latitudeDeg * DEG;
  const lam = station.longitudeDeg * DEG;
  const sp = Math.sin(phi); const cp = Math.cos(phi);
  const sl = Math.sin(lam); const cl = Math.cos(lam);
  const mask = station.mask;
  const isConstant = mask.kind === 'constant';
  const constantMask = mask.kind === 'constant' ? mask.elevationDeg : 0;
  const onApparent = station.maskOnApparentElevation === true;
  const rT = new Float64Array(3); const vT = new Float64Array(3);
  const rE = new Float64Array(3); const vE = new Float64Array(3);
  const aT = new Float64Array(3);
  const geo: Geodetic = { latitudeDeg: 0, longitudeDeg: 0, heightKm: 0 };

  function elevationMinusMask(prop: Propagator, t: number): number {
    prop.stateTeme(t, rT, vT);
    const g = gmstRad(t);
    const c = Math.cos(g); const s = Math.sin(g);
    const dx = c * rT[0] + s * rT[1] - ecef[0];
    const dy = -s * rT[0] + c * rT[1] - ecef[1];
    const dz = rT[2] - ecef[2];
    const e = -sl * dx + cl * dy;
    const n = -sp * cl * dx - sp * sl * dy + cp * dz;
    const u = cp * cl * dx + cp * sl * dy + sp * dz;
    let el = Math.atan2(u, Math.hypot(e, n)) / DEG;
    if (onApparent) el = apparentElevationDeg(hKm, el);
    if (isConstant) return el - constantMask;
    const az = Math.atan2(e, n) / DEG;
    return el - maskElevationDeg(mask, az < 0 ? az + 360 : az);
  }

  function sample(prop: Propagator, t: number, out: GeometrySample): GeometrySample {
    const r = out.satPositionTemeKm; const v = out.satVelocityTemeKmS;
    const re = out.satPositionEcefKm; const ve = out.satVelocityEcefKmS;
    prop.stateTeme(t, r, v);
    const g = gmstRad(t);
    temeToEcef(g, r, v, re, ve);
    out.stationEcefKm[0] = ecef[0]; out.stationEcefKm[1] = ecef[1]; out.stationEcefKm[2] = ecef[2];
    const dx = re[0] - ecef[0]; const dy = re[1] - ecef[1]; const dz = re[2] - ecef[2];
    const rho = Math.sqrt(dx * dx + dy * dy + dz * dz);
    const e = -sl * dx + cl * dy;
    const n = -sp * cl * dx - sp * sl * dy + cp * dz;
    const u = cp * cl * dx + cp * sl * dy + sp * dz;
    const el = Math.atan2(u, Math.hypot(e, n)) / DEG;
    let az = Math.atan2(e, n) / DEG;
    if (az < 0) az += 360;
    const rdot = (dx * ve[0] + dy * ve[1] + dz * ve[2]) / rho;

    // Earth-fixed acceleration: a_E = R a_T − 2 ω×v_E − ω×(ω×r_E), ω = (0, 0, ω⊕).
    gravityTeme(r, aT);
    const c = Math.cos(g); const s = Math.sin(g);
    const w = EARTH_ROTATION_RAD_S;
    const ax = c * aT[0] + s * aT[1] + 2 * w * ve[1] + w * w * re[0];
    const ay = -s * aT[0] + c * aT[1] - 2 * w * ve[0] + w * w * re[1];
    const az3 = aT[2];
    const v2 = ve[0] * ve[0] + ve[1] * ve[1] + ve[2] * ve[2];
    // d²|ρ|/dt² = (|ρ̇|² + ρ·ρ̈ − ṙ²) / |ρ| with the station at rest in ECEF.
    const rddot = (v2 + dx * ax + dy * ay + dz * az3 - rdot * rdot) / rho;

    ecefToGeodetic(re[0], re[1], re[2], geo);
    const rs = Math.sqrt(re[0] * re[0] + re[1] * re[1] + re[2] * re[2]);
    // Off-nadir: angle at the spacecraft between −r (geocentric nadir) and −ρ (towards the station).
    const cosEta = (re[0] * dx + re[1] * dy + re[2] * dz) / (rs * rho);

    out.timeS = t;
    out.azimuthDeg = az;
    out.elevationDeg = el;
    out.apparentElevationDeg = apparentElevationDeg(hKm, el);
    out.rangeKm = rho;
    out.rangeRateKmS = rdot;
    out.rangeAccelKmS2 = rddot;
    out.altitudeKm = geo.heightKm;
    out.subLatitudeDeg = geo.latitudeDeg;
    out.subLongitudeDeg = geo.longitudeDeg;
    out.offNadirDeg = Math.acos(Math.min(1, Math.max(-1, cosEta))) / DEG;
    out.gmstRad = g;
    return out;
  }

  return { station, ecefKm: ecef, sample, elevationMinusMask };
}
