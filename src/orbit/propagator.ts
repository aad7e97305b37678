/**
 * SGP4/SDP4 propagation through satellite.js (Vallado et al., AIAA 2006-6753,
 * "improved" mode, WGS-72 constants as in the reference code). Time is Unix
 * seconds (float64) mapped to minutes since the element epoch in floating
 * point; never through millisecond Dates (1 ms ≈ 7.5 m along track).
 */
import { json2satrec, sgp4, twoline2satrec, type OMMJsonObject, type SatRec } from 'satellite.js';
import { PropagationError } from '../errors.js';
import type { ElementSet } from '../elements/types.js';
import { sgp4ErrorText } from './errors.js';
import { formatIsoUtc } from './time.js';

export interface Propagator {
  readonly elements: ElementSet;
  readonly satrec: SatRec;
  /** Minutes since the element epoch of Unix time `timeS` (float). */
  minutesSinceEpoch(timeS: number): number;
  /** TEME position (km) and velocity (km/s) at Unix time `timeS`; throws PropagationError. */
  stateTeme(timeS: number, posOut: Float64Array, velOut: Float64Array): void;
  /** Same, at `tsinceMin` minutes since epoch (the verification vectors are tabulated so). */
  stateTemeAtMinutes(tsinceMin: number, posOut: Float64Array, velOut: Float64Array): void;
}

function ommObject(e: ElementSet): OMMJsonObject {
  return {
    OBJECT_NAME: e.name,
    OBJECT_ID: e.internationalDesignator,
    EPOCH: formatIsoUtc(e.epochUnixS).replace(/Z$/, ''),
    MEAN_MOTION: e.meanMotionRevPerDay,
    ECCENTRICITY: e.eccentricity,
    INCLINATION: e.inclinationDeg,
    RA_OF_ASC_NODE: e.raanDeg,
    ARG_OF_PERICENTER: e.argOfPerigeeDeg,
    MEAN_ANOMALY: e.meanAnomalyDeg,
    NORAD_CAT_ID: e.catalogNumberValue,
    ELEMENT_SET_NO: e.elementSetNumber,
    REV_AT_EPOCH: e.revolutionNumber,
    BSTAR: e.bstarPerEarthRadius,
    MEAN_MOTION_DOT: e.meanMotionDotRevPerDay2,
    MEAN_MOTION_DDOT: e.meanMotionDdotRevPerDay3,
  };
}

function failure(e: ElementSet, code: number, tsinceMin: number): PropagationError {
  const when = formatIsoUtc(e.epochUnixS + tsinceMin * 60);
  return new PropagationError(
    `${e.source.file}:${e.source.line} ${e.name} (${e.catalogNumber}): SGP4 failed at ${when} `
    + `(${tsinceMin.toFixed(6)} min since epoch) with error ${code}: ${sgp4ErrorText(code)}`,
  );
}

/**
 * Build a propagator for one element set: `twoline2satrec` from the TLE lines
 * when present, else `json2satrec` from the OMM fields. An error that SGP4's
 * initialisation already reports (e.g. mean eccentricity) is thrown here.
 */
export function createPropagator(elements: ElementSet): Propagator {
  const satrec = elements.tleLines
    ? twoline2satrec(elements.tleLines[0], elements.tleLines[1])
    : json2satrec(ommObject(elements));
  if (satrec.error !== 0 && satrec.error !== undefined) throw failure(elements, satrec.error, 0);
  const epoch = elements.epochUnixS;
  let lastMin = NaN;
  const lastR = new Float64Array(3);
  const lastV = new Float64Array(3);

  function atMinutes(m: number, r: Float64Array, v: Float64Array): void {
    // Callers evaluating several stations at one instant hit this one-entry cache.
    if (m !== lastMin) {
      const pv = sgp4(satrec, m);
      if (pv === null || satrec.error !== 0) throw failure(elements, satrec.error, m);
      const p = pv.position;
      const w = pv.velocity;
      lastR[0] = p.x; lastR[1] = p.y; lastR[2] = p.z;
      lastV[0] = w.x; lastV[1] = w.y; lastV[2] = w.z;
      lastMin = m;
    }
    r[0] = lastR[0]; r[1] = lastR[1]; r[2] = lastR[2];
    v[0] = lastV[0]; v[1] = lastV[1]; v[2] = lastV[2];
  }

  return {
    elements,
    satrec,
    minutesSinceEpoch: (t) => (t - epoch) / 60,
    stateTeme: (t, r, v) => atMinutes((t - epoch) / 60, r, v),
    stateTemeAtMinutes: atMinutes,
  };
}
