/**
 * Look angles, range, range rate and range acceleration of a satellite from a
 * WGS-84 station, in the Earth-fixed frame (TEME rotated by GMST; see
 * src/orbit/frames.ts), at one instant: `sample` runs the column kernels of
 * geometry/columns.ts on one entry (one implementation for the sweep and
 * for `explain`); `elevationMinusMask` and `look` are the light forms the
 * pass search evaluates. Nothing allocates per call.
 */
import { InputError } from '../errors.js';
import { EARTH_ROTATION_RAD_S, gmstRad } from '../orbit/frames.js';
import {
  createSatelliteColumns, createStationColumns, satelliteEarthFixed, stationLook, type StationFrame,
} from './columns.js';
import { maskElevationDeg, validateMask } from './mask.js';
import { apparentElevationDeg } from './refraction.js';
import type { GeometrySample, Station } from './types.js';
import { ecefToGeodetic, geodeticToEcefKm, type Geodetic } from './wgs84.js';

const DEG = Math.PI / 180;

/** Anything that gives the satellite's TEME state at a time: a Propagator (direct SGP4) or an OrbitSource. */
export interface StateSource {
  stateTeme(timeS: number, posOut: Float64Array, velOut: Float64Array): void;
}

/** Azimuth, geometric elevation (deg), range (km) and range rate (km/s): what the pass search needs. */
export interface LookAngles { azimuthDeg: number; elevationDeg: number; rangeKm: number; rangeRateKmS: number }

export interface StationGeometry {
  readonly station: Station;
  /** Station position, ECEF km. */
  readonly ecefKm: Float64Array;
  /** The frame the column kernels use (geometry/columns.ts). */
  readonly frame: StationFrame;
  /** Fill `out` with the full geometry at `timeS`; returns `out`. */
  sample(orbit: StateSource, timeS: number, out: GeometrySample): GeometrySample;
  /** Elevation minus mask at `timeS` (deg; ≥ 0 means visible), for the event search. */
  elevationMinusMask(orbit: StateSource, timeS: number): number;
  /** The same from the satellite's Earth-fixed position (km), computed once for several stations. */
  elevationMinusMaskEcef(x: number, y: number, z: number): number;
  /** Azimuth, elevation, range and range rate at `timeS` (no refraction), into `out`. */
  look(orbit: StateSource, timeS: number, out: LookAngles): LookAngles;
}

/** Check a station's fields (InputError naming `where`) and return it with a validated mask. */
export function validateStation(station: Station, where: string): Station {
  const { latitudeDeg: lat, longitudeDeg: lon, heightM: h } = station;
  if (!Number.isFinite(lat) || lat < -90 || lat > 90) throw new InputError(`${where}: latitude ${lat} out of range (allowed -90 to 90 deg)`);
  if (!Number.isFinite(lon) || lon < -180 || lon > 360) throw new InputError(`${where}: longitude ${lon} out of range (allowed -180 to 360 deg)`);
  if (!Number.isFinite(h) || h < -500 || h > 9000) throw new InputError(`${where}: height ${h} m out of range (allowed -500 to 9000 m above the WGS-84 ellipsoid)`);
  return { ...station, mask: validateMask(station.mask, `${where} mask`) };
}

export function stationFrame(station: Station): StationFrame {
  const hKm = station.heightM / 1000;
  const phi = station.latitudeDeg * DEG;
  const lam = station.longitudeDeg * DEG;
  return {
    ecefKm: geodeticToEcefKm(station.latitudeDeg, station.longitudeDeg, hKm), heightKm: hKm,
    sinLat: Math.sin(phi), cosLat: Math.cos(phi), sinLon: Math.sin(lam), cosLon: Math.cos(lam),
  };
}

export function createStationGeometry(input: Station): StationGeometry {
  const station = validateStation(input, `station ${input.name}`);
  const frame = stationFrame(station);
  const { ecefKm: ecef, heightKm: hKm, sinLat: sp, cosLat: cp, sinLon: sl, cosLon: cl } = frame;
  const mask = station.mask;
  const isConstant = mask.kind === 'constant';
  const constantMask = mask.kind === 'constant' ? mask.elevationDeg : 0;
  const onApparent = station.maskOnApparentElevation === true;
  const rT = new Float64Array(3); const vT = new Float64Array(3);
  const geo: Geodetic = { latitudeDeg: 0, longitudeDeg: 0, heightKm: 0 };
  // Columns of length one: the per-instant geometry runs the sweep's kernels.
  const sat1 = createSatelliteColumns(1);
  const stn1 = createStationColumns(1);

  /** East, north, up (km) of the satellite at t into enu, and the ECEF offset from the station into d (km) with the GMST cosine and sine. */
  const enu = new Float64Array(3);
  const d = new Float64Array(5);
  function topocentric(orbit: StateSource, t: number): void {
    orbit.stateTeme(t, rT, vT);
    const g = gmstRad(t);
    const c = Math.cos(g); const s = Math.sin(g);
    const dx = c * rT[0] + s * rT[1] - ecef[0];
    const dy = -s * rT[0] + c * rT[1] - ecef[1];
    const dz = rT[2] - ecef[2];
    d[0] = dx; d[1] = dy; d[2] = dz; d[3] = c; d[4] = s;
    enu[0] = -sl * dx + cl * dy;
    enu[1] = -sp * cl * dx - sp * sl * dy + cp * dz;
    enu[2] = cp * cl * dx + cp * sl * dy + sp * dz;
  }

  function elevationMinusMaskEcef(x: number, y: number, z: number): number {
    const dx = x - ecef[0], dy = y - ecef[1], dz = z - ecef[2];
    const e = -sl * dx + cl * dy;
    const n = -sp * cl * dx - sp * sl * dy + cp * dz;
    const u = cp * cl * dx + cp * sl * dy + sp * dz;
    let el = Math.atan2(u, Math.sqrt(e * e + n * n)) / DEG;
    if (onApparent) el = apparentElevationDeg(hKm, el);
    if (isConstant) return el - constantMask;
    const az = Math.atan2(e, n) / DEG;
    return el - maskElevationDeg(mask, az < 0 ? az + 360 : az);
  }

  function elevationMinusMask(orbit: StateSource, t: number): number {
    orbit.stateTeme(t, rT, vT);
    const g = gmstRad(t);
    const c = Math.cos(g); const s = Math.sin(g);
    return elevationMinusMaskEcef(c * rT[0] + s * rT[1], -s * rT[0] + c * rT[1], rT[2]);
  }

  function look(orbit: StateSource, t: number, out: LookAngles): LookAngles {
    topocentric(orbit, t);
    const e = enu[0]; const n = enu[1]; const u = enu[2];
    out.elevationDeg = Math.atan2(u, Math.sqrt(e * e + n * n)) / DEG;
    const az = Math.atan2(e, n) / DEG;
    out.azimuthDeg = az < 0 ? az + 360 : az;
    const rho = Math.sqrt(e * e + n * n + u * u);
    out.rangeKm = rho;
    // Range rate from the true Earth-fixed velocity R·v_T − ω⊕ × r_E (as geometry/columns.ts).
    const c = d[3], s = d[4];
    const xE = c * rT[0] + s * rT[1], yE = -s * rT[0] + c * rT[1];
    const vx = c * vT[0] + s * vT[1] + EARTH_ROTATION_RAD_S * yE;
    const vy = -s * vT[0] + c * vT[1] - EARTH_ROTATION_RAD_S * xE;
    out.rangeRateKmS = (d[0] * vx + d[1] * vy + d[2] * vT[2]) / rho;
    return out;
  }

  function sample(orbit: StateSource, t: number, out: GeometrySample): GeometrySample {
    orbit.stateTeme(t, rT, vT);
    const st = sat1.teme;
    st.rx[0] = rT[0]; st.ry[0] = rT[1]; st.rz[0] = rT[2];
    st.vx[0] = vT[0]; st.vy[0] = vT[1]; st.vz[0] = vT[2];
    sat1.n = 1; sat1.originS = t; sat1.k0 = 0; sat1.stepS = 0;
    satelliteEarthFixed(sat1);
    stationLook(frame, sat1, 0, 1, stn1);
    out.satPositionTemeKm.set(rT); out.satVelocityTemeKmS.set(vT);
    const re = out.satPositionEcefKm; const ve = out.satVelocityEcefKmS;
    re[0] = sat1.ex[0]; re[1] = sat1.ey[0]; re[2] = sat1.ez[0];
    ve[0] = sat1.evx[0]; ve[1] = sat1.evy[0]; ve[2] = sat1.evz[0];
    out.stationEcefKm[0] = ecef[0]; out.stationEcefKm[1] = ecef[1]; out.stationEcefKm[2] = ecef[2];
    out.timeS = t;
    out.azimuthDeg = stn1.azimuthDeg[0];
    out.elevationDeg = stn1.elevationDeg[0];
    out.apparentElevationDeg = stn1.apparentElevationDeg[0];
    out.rangeKm = stn1.rangeKm[0];
    out.rangeRateKmS = stn1.rangeRateKmS[0];
    out.rangeAccelKmS2 = stn1.rangeAccelKmS2[0];

    ecefToGeodetic(re[0], re[1], re[2], geo);
    const dx = re[0] - ecef[0]; const dy = re[1] - ecef[1]; const dz = re[2] - ecef[2];
    const rho = out.rangeKm;
    const rs = Math.sqrt(re[0] * re[0] + re[1] * re[1] + re[2] * re[2]);
    // Off-nadir: angle at the spacecraft between −r (geocentric nadir) and −ρ (towards the station).
    const cosEta = (re[0] * dx + re[1] * dy + re[2] * dz) / (rs * rho);
    out.altitudeKm = geo.heightKm;
    out.subLatitudeDeg = geo.latitudeDeg;
    out.subLongitudeDeg = geo.longitudeDeg;
    out.offNadirDeg = Math.acos(Math.min(1, Math.max(-1, cosEta))) / DEG;
    out.gmstRad = gmstRad(t);
    return out;
  }

  return { station, ecefKm: ecef, frame, sample, elevationMinusMask, elevationMinusMaskEcef, look };
}
