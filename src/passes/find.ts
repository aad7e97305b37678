/**
 * Pass finder: intervals where elevation − mask(azimuth) ≥ 0 for one satellite
 * and one station, through the general event search (`findCrossings`), with
 * peak elevation and TCA (time of minimum range) by bracketed maximisation.
 */
import type { ElementSet } from '../elements/types.js';
import { InputError } from '../errors.js';
import { maskMinimumDeg } from '../geometry/mask.js';
import { createStationGeometry } from '../geometry/station.js';
import { createGeometrySample, type Station } from '../geometry/types.js';
import { createPropagator, type Propagator } from '../orbit/propagator.js';
import { findCrossings, findMaximum } from './search.js';
import { passScanStepS } from './scanstep.js';
import type { Pass } from './types.js';

export interface FindPassesOptions {
  /** Either a propagator or the element set to build one from. */
  propagator?: Propagator;
  elements?: ElementSet;
  station: Station;
  startS: number;
  endS: number;
  /** Coarse scan step (s); default from the orbit (`passScanStepS`). */
  scanStepS?: number;
  /** Root and extremum tolerance (s); default 0.005 s (the brief asks for 10 ms or better). */
  toleranceS?: number;
}

export const DEFAULT_EVENT_TOLERANCE_S = 0.005;

export function findPasses(options: FindPassesOptions): Pass[] {
  const prop = options.propagator ?? (options.elements ? createPropagator(options.elements) : null);
  if (!prop) throw new InputError('findPasses: no elements (allowed a propagator or an element set)');
  const { startS, endS } = options;
  if (!Number.isFinite(startS) || !Number.isFinite(endS) || !(endS > startS)) {
    throw new InputError(`findPasses: window end must be after its start (got ${startS} to ${endS} s)`);
  }
  const geo = createStationGeometry(options.station);
  const tol = options.toleranceS ?? DEFAULT_EVENT_TOLERANCE_S;
  const step = options.scanStepS ?? passScanStepS(prop.elements, maskMinimumDeg(geo.station.mask));
  const g = (t: number) => geo.elevationMinusMask(prop, t);
  const crossings = findCrossings(g, startS, endS, step, tol);
  const s = createGeometrySample();
  const elevation = (t: number) => geo.sample(prop, t, s).elevationDeg;
  const negRange = (t: number) => -geo.sample(prop, t, s).rangeKm;
  const azimuth = (t: number) => geo.sample(prop, t, s).azimuthDeg;
  return crossings.map((c, k) => {
    const peak = findMaximum(elevation, c.startS, c.endS, tol);
    const tca = findMaximum(negRange, c.startS, c.endS, tol);
    return {
      index: k + 1,
      satellite: prop.elements.name,
      station: geo.station.name,
      aosS: c.startS,
      tcaS: tca.timeS,
      losS: c.endS,
      durationS: c.endS - c.startS,
      maxElevationDeg: peak.value,
      aosAzimuthDeg: azimuth(c.startS),
      tcaAzimuthDeg: azimuth(tca.timeS),
      losAzimuthDeg: azimuth(c.endS),
      minRangeKm: -tca.value,
      clippedStart: c.clippedStart,
      clippedEnd: c.clippedEnd,
    };
  });
}
