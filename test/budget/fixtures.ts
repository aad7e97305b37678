/**
 * Hand-built inputs for the budget tests: an invented link ("TESTLINK", spacecraft
 * "KESTREL-9", station "STN-ALPHA"), an invented climate, and GeometrySamples
 * filled by hand on a spherical Earth (no propagator), with GMST = 0 so TEME = ECEF.
 */
import { createGeometrySample, type GeometrySample } from '../../src/geometry/types.js';
import type { Climate, LinkSpec, WeatherCase } from '../../src/budget/types.js';

export const R_KM = 6378.137;
export const MU_KM3_S2 = 398_600.4418;
const RAD = Math.PI / 180;

export function baseLink(over: Partial<LinkSpec> = {}): LinkSpec {
  return {
    name: 'TESTLINK',
    satellite: 'KESTREL-9',
    station: 'STN-ALPHA',
    direction: 'downlink',
    frequencyGHz: 8.2,
    spacecraft: {
      antenna: { kind: 'isotropic', gainDBi: 3 },
      polarisation: { axialRatio: 1, tiltDeg: 0 },
      txPowerDBW: 10,
      lineLossDB: 1,
      pointing: { kind: 'tracking', attitudeErrorDeg: 0 },
    },
    ground: {
      antenna: { kind: 'parabolic', diameterM: 3, efficiency: 0.6 },
      polarisation: { axialRatio: 1, tiltDeg: 0 },
      lineLossDB: 0,
      receiver: { noiseFigureDB: 1, feedLossDB: 0.3, spilloverK: 10, environment: 'none', antennaTemperatureK: 100 },
      pointing: { kind: 'track', pointingErrorDeg: 0 },
    },
    modcod: { kind: 'fixed', bitRateBps: 1e6, modulation: 'bpsk', coding: 'conv-r1/2-k7', requiredEbN0DB: 4.4, bitsPerSymbol: 0.5 },
    implementationLossDB: 1,
    otherLossesDB: 0.5,
    requiredMarginDB: 3,
    ...over,
  };
}

/** Invented mid-latitude climate; rain and clouds present, so every term is exercised. */
export function baseClimate(over: Partial<Climate> = {}): Climate {
  return {
    latitudeDeg: 20,
    stationHeightKm: 0.2,
    pressureDryHPa: 990,
    temperatureK: 290,
    waterVapourDensityGM3: 9,
    nWet: 45,
    rainRate001MmH: 50,
    rainHeightKm: 4.5,
    cloudLiquidWaterKgM2: 0.8,
    clearSkyCloudLiquidWaterKgM2: 0,
    meanRadiatingTemperatureK: 275,
    ...over,
  };
}

export const CASES: WeatherCase[] = [
  { name: 'clear', exceedancePercent: null },
  { name: 'p1', exceedancePercent: 1 },
  { name: 'p0.1', exceedancePercent: 0.1 },
];

/**
 * Spherical-Earth sample: station at (R, 0, 0) (up = +x, east = +y, north = +z),
 * satellite at `rSat` (km, TEME = ECEF), velocity `vSat`. Azimuth, elevation and
 * range are computed from the vectors; apparent elevation = geometric + `refractionDeg`.
 */
export function sampleFromVectors(
  rSat: readonly number[], vSat: readonly number[], timeS = 0, refractionDeg = 0, out: GeometrySample = createGeometrySample(),
): GeometrySample {
  const dx = rSat[0] - R_KM, dy = rSat[1], dz = rSat[2];
  const range = Math.hypot(dx, dy, dz);
  const el = Math.asin(dx / range) / RAD;
  let az = Math.atan2(dy, dz) / RAD;
  if (az < 0) az += 360;
  const rn = Math.hypot(rSat[0], rSat[1], rSat[2]);
  out.timeS = timeS;
  out.elevationDeg = el;
  out.apparentElevationDeg = el + refractionDeg;
  out.azimuthDeg = az;
  out.rangeKm = range;
  out.rangeRateKmS = (dx * vSat[0] + dy * vSat[1] + dz * vSat[2]) / range;
  out.rangeAccelKmS2 = 0;
  out.altitudeKm = rn - R_KM;
  out.subLatitudeDeg = Math.asin(rSat[2] / rn) / RAD;
  out.subLongitudeDeg = Math.atan2(rSat[1], rSat[0]) / RAD;
  // At the spacecraft, between −r̂ and the line of sight to the station.
  const cosN = (-(rSat[0] * -dx) - rSat[1] * -dy - rSat[2] * -dz) / (rn * range);
  out.offNadirDeg = Math.acos(Math.min(1, cosN)) / RAD;
  out.gmstRad = 0;
  out.satPositionTemeKm.set(rSat);
  out.satVelocityTemeKmS.set(vSat);
  out.satPositionEcefKm.set(rSat);
  out.satVelocityEcefKmS.set(vSat);
  out.stationEcefKm.set([R_KM, 0, 0]);
  return out;
}

/** Satellite at altitude `altitudeKm` seen at elevation `elevationDeg` due north; velocity along +y (east), circular speed. */
export function sampleAtElevation(elevationDeg: number, altitudeKm = 500, timeS = 0): GeometrySample {
  const s = Math.sin(elevationDeg * RAD), c = Math.cos(elevationDeg * RAD);
  const d = -R_KM * s + Math.sqrt(R_KM * R_KM * s * s + 2 * R_KM * altitudeKm + altitudeKm * altitudeKm);
  const r = [R_KM + d * s, 0, d * c];
  const v = Math.sqrt(MU_KM3_S2 / (R_KM + altitudeKm));
  return sampleFromVectors(r, [0, v, 0], timeS);
}

/**
 * A synthetic circular polar pass: orbit plane containing the z axis and the
 * direction of longitude `offsetDeg` from the station, so the ground track passes
 * R·offset km from the station (0 = straight overhead). Samples every `stepS`
 * while the elevation is ≥ 0.
 */
export function syntheticPass(offsetDeg: number, altitudeKm = 500, stepS = 1): GeometrySample[] {
  const a = R_KM + altitudeKm;
  const w = Math.sqrt(MU_KM3_S2 / a ** 3);
  const cb = Math.cos(offsetDeg * RAD), sb = Math.sin(offsetDeg * RAD);
  const out: GeometrySample[] = [];
  for (let t = -1200; t <= 1200; t += stepS) {
    const ph = w * t;
    const r = [a * Math.cos(ph) * cb, a * Math.cos(ph) * sb, a * Math.sin(ph)];
    const v = [-a * w * Math.sin(ph) * cb, -a * w * Math.sin(ph) * sb, a * w * Math.cos(ph)];
    const s = sampleFromVectors(r, v, t);
    if (s.elevationDeg >= 0) out.push(s);
  }
  return out;
}
