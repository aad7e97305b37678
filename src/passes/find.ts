/**
 * Pass finder: intervals where elevation − mask(azimuth) ≥ 0 for one satellite
 * and one station, through the general event search (`scanEvents`,
 * `assembleCrossings`), with peak elevation and TCA (time of minimum range)
 * by bracketed maximisation.
 *
 * The orbit is interpolated between SGP4 nodes (orbit/interpolated.ts) unless
 * `exactOrbit`; the coarse scan then steps on the nodes themselves (its step
 * rounded to a multiple or divisor of the node spacing), so the scan costs no
 * SGP4 call of its own. The scan grid is fixed by the window, so the search
 * can be cut into pieces of the window (`PassSearch.events`), searched apart
 * (in worker threads) and joined (`assemblePasses`) with the same result.
 */
import type { ElementSet } from '../elements/types.js';
import { InputError } from '../errors.js';
import { maskMaximumDeg, maskMinimumDeg, maskSlopeDegPerDeg } from '../geometry/mask.js';
import { createStationGeometry, type LookAngles, type StateSource, type StationGeometry } from '../geometry/station.js';
import type { Station } from '../geometry/types.js';
import { exactOrbit, interpolatedOrbit, type OrbitSource } from '../orbit/interpolated.js';
import { createPropagator, type Propagator } from '../orbit/propagator.js';
import {
  assembleCrossings, findMaximum, findRoot, scanGrid, scanEvents, type Crossing, type CrossingEvent, type ScanGrid,
} from './search.js';
import { belowMaskRateBoundDegS, passScanStepS } from './scanstep.js';
import type { Pass } from './types.js';

export interface FindPassesOptions {
  /** The orbit to search (as the run builds it: `createOrbit`); else one is built from a propagator or an element set. */
  orbit?: OrbitSource;
  propagator?: Propagator;
  elements?: ElementSet;
  /** With a propagator or element set: SGP4 at every instant instead of interpolating between nodes. */
  exactOrbit?: boolean;
  /** With a propagator or element set: the grid step the nodes are tied to (s); default 1. */
  gridStepS?: number;
  station: Station;
  startS: number;
  endS: number;
  /** Coarse scan step (s); default from the orbit (`passScanStepS`), tied to the node spacing. */
  scanStepS?: number;
  /** Root and extremum tolerance (s); default 0.5 ms (each event within 0.25 ms of its root, so the interpolated and the exact orbit agree to 0.5 ms). */
  toleranceS?: number;
}

export const DEFAULT_EVENT_TOLERANCE_S = 0.0005;
/** Half-width of the first bracket of the peak-elevation search, around TCA (s). */
const PEAK_NEAR_TCA_S = 5;

/** The orbit a run uses for one element set: nodes tied to the grid (startS, stepS), or SGP4 at every instant. */
export function createOrbit(elements: ElementSet | Propagator, grid: { startS: number; stepS: number }, exact = false): OrbitSource {
  const prop = 'satrec' in elements ? elements : createPropagator(elements);
  return exact ? exactOrbit(prop, grid.startS, grid.stepS) : interpolatedOrbit(prop, { originS: grid.startS, stepS: grid.stepS });
}

/**
 * Scan step on the orbit's nodes: the rule's step rounded down to a multiple
 * of the node spacing, or, when it is shorter than the spacing, to a divisor
 * of it; within 10 % of the spacing the spacing itself (the rule's tenth of a
 * central pass is a margin, not a limit: a ninth keeps g unimodal as well).
 */
export function nodeScanStepS(ruleStepS: number, nodeSpacingS: number): number {
  if (!Number.isFinite(nodeSpacingS)) return ruleStepS;
  if (ruleStepS >= 0.9 * nodeSpacingS) return Math.max(1, Math.floor(ruleStepS / nodeSpacingS + 1e-9)) * nodeSpacingS;
  return nodeSpacingS / Math.ceil(nodeSpacingS / ruleStepS - 1e-9);
}

/** One station's search over a window: the pieces are searched with `events`, joined with `assemblePasses`. */
export interface PassSearch {
  orbit: StateSource & { elements: ElementSet };
  geo: StationGeometry;
  grid: ScanGrid;
  toleranceS: number;
  /** Events of scan intervals [i0, i1) (see search.ts scanEvents); `samples(i)`: g at scan time i when the caller has it. */
  events(i0: number, i1: number, samples?: (i: number) => number): { events: CrossingEvent[]; firstAbove: boolean };
  /** Scan indices [i0, i1) whose sample times lie in [fromS, toS) (the last piece takes toS = endS inclusive). */
  range(fromS: number, toS: number): [number, number];
}

export function passSearch(orbit: OrbitSource, station: Station, startS: number, endS: number, opts: { scanStepS?: number; toleranceS?: number } = {}): PassSearch {
  if (!Number.isFinite(startS) || !Number.isFinite(endS) || !(endS > startS)) {
    throw new InputError(`findPasses: window end must be after its start (got ${startS} to ${endS} s)`);
  }
  const geo = createStationGeometry(station);
  const tol = opts.toleranceS ?? DEFAULT_EVENT_TOLERANCE_S;
  const step = opts.scanStepS ?? nodeScanStepS(passScanStepS(orbit.elements, maskMinimumDeg(geo.station.mask)), orbit.nodeSpacingS);
  const grid = scanGrid(startS, endS, step);
  const g = (t: number) => geo.elevationMinusMask(orbit, t);
  const mask = geo.station.mask;
  const rate = belowMaskRateBoundDegS(orbit.elements, geo.station.heightM / 1000, maskMaximumDeg(mask), maskSlopeDegPerDeg(mask));
  return {
    orbit, geo, grid, toleranceS: tol,
    events: (i0, i1, samples) => scanEvents(g, grid, i0, i1, tol, rate, samples),
    range(fromS, toS) {
      const idx = (t: number) => Math.min(grid.n, Math.max(0, Math.ceil((t - startS) / step - 1e-9)));
      return [idx(fromS), toS >= endS ? grid.n : idx(toS)];
    },
  };
}

/** AOS/LOS intervals (not yet completed) from the events of every piece, in any order. */
export function assemblePasses(search: PassSearch, events: CrossingEvent[], firstAbove: boolean): Crossing[] {
  return assembleCrossings(events, firstAbove, search.grid.startS, search.grid.endS);
}

/**
 * A pass from its AOS/LOS interval: peak elevation by bracketed maximisation;
 * TCA, the time of minimum range, as the root of the range rate (well
 * conditioned, where the range itself is flat to millimetres over tens of
 * milliseconds), or the nearer end when the range does not turn within the
 * interval (a clipped pass); the azimuths there.
 */
export function completePass(
  orbit: StateSource & { elements: ElementSet }, geo: StationGeometry, c: Crossing, index: number, toleranceS = DEFAULT_EVENT_TOLERANCE_S,
): Pass {
  const la: LookAngles = { azimuthDeg: NaN, elevationDeg: NaN, rangeKm: NaN, rangeRateKmS: NaN };
  const elevation = (t: number) => geo.look(orbit, t, la).elevationDeg;
  const rangeRate = (t: number) => geo.look(orbit, t, la).rangeRateKmS;
  const range = (t: number) => geo.look(orbit, t, la).rangeKm;
  const azimuth = (t: number) => geo.look(orbit, t, la).azimuthDeg;
  const ra = rangeRate(c.startS), rb = rangeRate(c.endS);
  let tcaS: number;
  if (ra < 0 && rb > 0) tcaS = findRoot(rangeRate, c.startS, c.endS, ra, rb, toleranceS);
  else if (ra >= 0 && rb >= 0) tcaS = c.startS;
  else if (ra <= 0 && rb <= 0) tcaS = c.endS;
  else tcaS = range(c.startS) <= range(c.endS) ? c.startS : c.endS; // receding then approaching: the nearer end
  const tca = { timeS: tcaS, value: -range(tcaS) };
  // The peak elevation is within a fraction of a second of TCA (exactly at it on a sphere at constant
  // height): search ±PEAK_NEAR_TCA_S around it first, the whole pass when the maximum is at that bracket's edge.
  const lo = Math.max(c.startS, tcaS - PEAK_NEAR_TCA_S), hi = Math.min(c.endS, tcaS + PEAK_NEAR_TCA_S);
  let peak = findMaximum(elevation, lo, hi, toleranceS);
  if ((lo > c.startS && peak.timeS - lo < 2 * toleranceS) || (hi < c.endS && hi - peak.timeS < 2 * toleranceS)) {
    peak = findMaximum(elevation, c.startS, c.endS, toleranceS);
  }
  return {
    index,
    satellite: orbit.elements.name,
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
}

export function findPasses(options: FindPassesOptions): Pass[] {
  const source = options.propagator ?? options.elements;
  if (!options.orbit && !source) throw new InputError('findPasses: no elements (allowed an orbit, a propagator or an element set)');
  const { startS, endS } = options;
  if (!Number.isFinite(startS) || !Number.isFinite(endS) || !(endS > startS)) {
    throw new InputError(`findPasses: window end must be after its start (got ${startS} to ${endS} s)`);
  }
  const orbit = options.orbit ?? createOrbit(source!, { startS, stepS: options.gridStepS ?? 1 }, options.exactOrbit === true);
  const search = passSearch(orbit, options.station, startS, endS, { scanStepS: options.scanStepS, toleranceS: options.toleranceS });
  const { events, firstAbove } = search.events(0, search.grid.n);
  return assemblePasses(search, events, firstAbove).map((c, k) => completePass(orbit, search.geo, c, k + 1, search.toleranceS));
}
