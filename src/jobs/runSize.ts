/**
 * The size of a run, estimated before it starts and cheaply (no propagation,
 * no pass search): grid steps of the window, link-steps in view, and the
 * bytes of steps.csv.
 *
 * Time in view is estimated by geometry, per satellite and station: the
 * orbit is taken as circular at the semi-major axis of its mean motion
 * (Kepler's third law), its sub-satellite point spends time in latitude as a
 * circular orbit of that inclination does (uniform argument of latitude) and
 * is spread evenly in longitude (the Earth turns under the orbit), and the
 * station sees it while it is inside the cap of Earth-central angle
 * λ = arccos(R cos ε / r) − ε around the station (spherical Earth, SMAD
 * relations; ε the station's mask, the mean of a mask table). The share of
 * time inside the cap is averaged over the argument of latitude. It is the
 * long-run average: a window of a day or two may differ by tens of percent.
 */
import type { ElementSet } from '../elements/types.js';
import type { HorizonMask } from '../geometry/types.js';
import { stepsChoice, type ResolvedScenario, type StepsChoice } from '../scenario/types.js';
import { formatBytes } from '../output/atomic.js';
import { stepColumns } from './outputs.js';

/** Earth's gravitational parameter (km³/s², WGS-84) and equatorial radius (km, WGS-84). */
const MU_KM3_S2 = 398_600.4418;
const EARTH_RADIUS_KM = 6378.137;
const DEG = Math.PI / 180;

/** Semi-major axis (km) of the mean motion (rev/day), Kepler's third law. */
export function semiMajorAxisKm(meanMotionRevPerDay: number): number {
  const n = (meanMotionRevPerDay * 2 * Math.PI) / 86_400;
  return Math.cbrt(MU_KM3_S2 / (n * n));
}

/** Earth-central angle (rad) of the visibility cap at mask elevation ε for an orbit of radius r (spherical Earth). */
export function capAngleRad(orbitRadiusKm: number, maskDeg: number): number {
  const e = maskDeg * DEG;
  const c = (EARTH_RADIUS_KM / orbitRadiusKm) * Math.cos(e);
  if (c >= 1) return 0;
  return Math.max(0, Math.acos(c) - e);
}

/** A mask as one elevation (deg): the constant, or the mean of the table's points. */
export function meanMaskDeg(mask: HorizonMask): number {
  if (mask.kind === 'constant') return mask.elevationDeg;
  return mask.points.reduce((s, p) => s + p[1], 0) / mask.points.length;
}

/**
 * Long-run share of time (0–1) that a satellite on a circular orbit of radius
 * `orbitRadiusKm` and inclination `inclinationDeg` is above `maskDeg` at a
 * station at geodetic latitude `latitudeDeg` (the geometry of the module
 * comment, averaged over 720 values of the argument of latitude).
 */
export function timeInViewFraction(orbitRadiusKm: number, inclinationDeg: number, latitudeDeg: number, maskDeg: number): number {
  const lambda = capAngleRad(orbitRadiusKm, maskDeg);
  if (lambda <= 0) return 0;
  const cosL = Math.cos(lambda);
  const sinI = Math.sin(inclinationDeg * DEG);
  const phiS = latitudeDeg * DEG;
  const N = 720;
  let sum = 0;
  for (let k = 0; k < N; k++) {
    const u = ((k + 0.5) / N) * 2 * Math.PI;
    const phi = Math.asin(sinI * Math.sin(u));
    const den = Math.cos(phi) * Math.cos(phiS);
    // cos Δλ ≥ c: the longitudes at latitude φ within angle λ of the station.
    const c = den > 1e-12 ? (cosL - Math.sin(phi) * Math.sin(phiS)) / den : (Math.sin(phi) * Math.sin(phiS) >= cosL ? -1 : 2);
    sum += c <= -1 ? 1 : c >= 1 ? 0 : Math.acos(c) / Math.PI;
  }
  return sum / N;
}

/** Time-in-view share of one element set at one station (see `timeInViewFraction`). */
export function elementsInViewFraction(e: ElementSet, latitudeDeg: number, maskDeg: number): number {
  return timeInViewFraction(semiMajorAxisKm(e.meanMotionRevPerDay), e.inclinationDeg, latitudeDeg, maskDeg);
}

/** Average bytes of one numeric steps.csv field with its comma (the demo run's steps.csv averages 6.7). */
export const STEPS_CSV_BYTES_PER_NUMBER = 7;
/** steps.parquet's size as a share of steps.csv's (measured on the demo week and the 30-day benchmark W1; see the README). */
export const STEPS_PARQUET_SHARE = 0.17;

export interface RunSize {
  /** Instants of the time grid over the whole window (start + k·step). */
  gridSteps: number;
  /** Estimated (instant, station, link) evaluations in view: the rows of steps.csv. */
  linkSteps: number;
  /** Estimated steps.csv size (bytes), whether or not it is written. */
  stepsCsvBytes: number;
  /** The per-step file of this run (none: not written) and its estimated size (bytes). */
  steps: StepsChoice;
  stepsBytes: number;
  /** Links (satellite × station × link). */
  links: number;
  /** How the estimate was made, one phrase. */
  method: string;
}

export function estimateRunSize(scenario: ResolvedScenario, opts: { steps?: boolean | StepsChoice } = {}): RunSize {
  const { startS, endS, stepS } = scenario.window;
  const gridSteps = Math.floor((endS - startS) / stepS) + 1;
  const fields = stepColumns(scenario.weatherCases).length - 5;
  const sat = new Map(scenario.satellites.map((s) => [s.name, s.elements]));
  const st = new Map(scenario.stations.map((s) => [s.station.name, s.station]));
  const share = new Map<string, number>();
  let linkSteps = 0;
  let bytes = 0;
  for (const l of scenario.links) {
    const e = sat.get(l.satellite);
    const s = st.get(l.station);
    if (!e || !s) continue;
    const key = `${l.satellite}\u0000${l.station}`;
    let f = share.get(key);
    if (f === undefined) { f = elementsInViewFraction(e, s.latitudeDeg, meanMaskDeg(s.mask)); share.set(key, f); }
    const rows = f * gridSteps;
    linkSteps += rows;
    // pass_id is "satellite/station/n"; then time, the three names and the numeric fields.
    const fixed = (l.satellite.length + l.station.length + 5) + 25 + (l.satellite.length + 1) + (l.station.length + 1) + (l.name.length + 1);
    bytes += rows * (fixed + STEPS_CSV_BYTES_PER_NUMBER * fields);
  }
  const steps = opts.steps === undefined ? scenario.output.steps : stepsChoice(opts.steps);
  return {
    gridSteps,
    linkSteps: Math.round(linkSteps),
    stepsCsvBytes: Math.round(bytes),
    steps,
    stepsBytes: Math.round(steps === 'parquet' ? bytes * STEPS_PARQUET_SHARE : steps === 'csv' ? bytes : 0),
    links: scenario.links.length,
    method: 'time in view from each orbit\'s altitude and inclination and each station\'s latitude and mask, circular-orbit geometry',
  };
}

const count = (n: number) => (n >= 1e9 ? `${(n / 1e9).toFixed(2)} G` : n >= 1e6 ? `${(n / 1e6).toFixed(2)} M` : n >= 1e4 ? `${(n / 1e3).toFixed(1)} k` : String(Math.round(n)));

/** The one line printed before a run: `run size: …`. */
export function formatRunSize(r: RunSize, stepS: number): string {
  const steps = r.steps === 'parquet'
    ? `steps.parquet about ${formatBytes(r.stepsBytes)} (steps.csv would be about ${formatBytes(r.stepsCsvBytes)})`
    : r.steps === 'csv'
      ? `steps.csv about ${formatBytes(r.stepsCsvBytes)}`
      : `steps not written (steps.csv would be about ${formatBytes(r.stepsCsvBytes)})`;
  return `run size: ${count(r.gridSteps)} grid steps of ${stepS} s; about ${count(r.linkSteps)} link-steps in view over ${r.links} link${r.links === 1 ? '' : 's'}; ${steps} (estimated: ${r.method})`;
}
