/** Horizon mask: a constant elevation, or (azimuth, elevation) pairs interpolated linearly, wrapping at 360°. */
export type HorizonMask =
  | { kind: 'constant'; elevationDeg: number }
  | { kind: 'table'; points: ReadonlyArray<readonly [azimuthDeg: number, elevationDeg: number]> };

/** A ground station on the WGS-84 ellipsoid. */
export interface Station {
  name: string;
  latitudeDeg: number;
  longitudeDeg: number;
  /** Height above the WGS-84 ellipsoid (m). */
  heightM: number;
  mask: HorizonMask;
  /** When true the mask applies to apparent (refracted) elevation; default geometric. */
  maskOnApparentElevation?: boolean;
}

export type Vec3 = Float64Array; // length 3

/**
 * Geometry of one satellite seen from one station at one instant.
 * Produced by the geometry stage into a reused object (no allocation per step).
 * Frames: TEME (SGP4 output) and ECEF (TEME rotated by GMST; polar motion neglected).
 */
export interface GeometrySample {
  timeS: number;
  azimuthDeg: number;
  /** Geometric elevation (no refraction). */
  elevationDeg: number;
  /** Apparent elevation with ITU-R P.834 refraction. */
  apparentElevationDeg: number;
  rangeKm: number;
  /** d(range)/dt, positive receding, from the true Earth-fixed velocity. */
  rangeRateKmS: number;
  /** d²(range)/dt² (km/s²), for the Doppler rate. */
  rangeAccelKmS2: number;
  altitudeKm: number;
  subLatitudeDeg: number;
  subLongitudeDeg: number;
  /** Angle at the spacecraft between nadir and the station direction. */
  offNadirDeg: number;
  gmstRad: number;
  satPositionTemeKm: Vec3;
  satVelocityTemeKmS: Vec3;
  satPositionEcefKm: Vec3;
  /** True Earth-fixed velocity: R·v_TEME − ω⊕ × r_ECEF. */
  satVelocityEcefKmS: Vec3;
  stationEcefKm: Vec3;
}

export function createGeometrySample(): GeometrySample {
  return {
    timeS: NaN, azimuthDeg: NaN, elevationDeg: NaN, apparentElevationDeg: NaN, rangeKm: NaN,
    rangeRateKmS: NaN, rangeAccelKmS2: NaN, altitudeKm: NaN, subLatitudeDeg: NaN, subLongitudeDeg: NaN,
    offNadirDeg: NaN, gmstRad: NaN,
    satPositionTemeKm: new Float64Array(3), satVelocityTemeKmS: new Float64Array(3),
    satPositionEcefKm: new Float64Array(3), satVelocityEcefKmS: new Float64Array(3),
    stationEcefKm: new Float64Array(3),
  };
}
