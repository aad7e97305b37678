/**
 * The budget of one (satellite, station, link) at one instant of a resolved
 * scenario: the library behind `passbudget explain`. The instant is given
 * directly, or as pass N of the scenario window at its TCA or at the first
 * time (rising side) it reaches an elevation. When the instant lies inside a
 * pass, the steps from AOS are evaluated first (scenario step) so that the
 * mount state (rate-limited lag) is the one a full run would have.
 */
import { InputError } from '../errors.js';
import { createStationGeometry } from '../geometry/station.js';
import { createGeometrySample, type GeometrySample } from '../geometry/types.js';
import { formatIsoUtc } from '../orbit/time.js';
import { createOrbit, findPasses } from '../passes/find.js';
import type { Pass } from '../passes/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { createLinkEngine, createStepBudget, type LinkEngine } from './engine.js';
import type { ExplainLine } from './explain.js';
import type { StepBudget } from './types.js';

export type InstantSpec =
  | { kind: 'at'; timeS: number }
  | { kind: 'tca'; pass: number }
  | { kind: 'elevation'; pass: number; elevationDeg: number };

export interface InstantBudget {
  engine: LinkEngine;
  sample: GeometrySample;
  step: StepBudget;
  lines: ExplainLine[];
  /** The pass containing the instant, if any. */
  pass: Pass | null;
  warnings: string[];
}

function pick<T>(items: T[], name: string, key: (t: T) => string, flag: string, file: string): T {
  const hit = items.find((t) => key(t) === name);
  if (!hit) {
    const names = [...new Set(items.map(key))];
    throw new InputError(`${flag}: no ${flag.slice(2)} ${JSON.stringify(name)} in ${file} (allowed ${names.map((n) => JSON.stringify(n)).join(', ') || 'none'})`);
  }
  return hit;
}

/** Time (s) in [a, b] where f crosses `level` upward, f(a) < level ≤ f(b); bisection to 1 ms. */
function bisectUp(f: (t: number) => number, a: number, b: number, level: number): number {
  let lo = a, hi = b;
  while (hi - lo > 1e-3) {
    const m = (lo + hi) / 2;
    if (f(m) >= level) hi = m; else lo = m;
  }
  return hi;
}

export function budgetAtInstant(
  scenario: ResolvedScenario, names: { satellite: string; station: string; link: string }, instant: InstantSpec,
): InstantBudget {
  const file = scenario.file;
  const sat = pick(scenario.satellites, names.satellite, (s) => s.name, '--satellite', file);
  const stn = pick(scenario.stations, names.station, (s) => s.station.name, '--station', file);
  const candidates = scenario.links.filter((l) => l.satellite === sat.name && l.station === stn.station.name);
  const link = pick(candidates, names.link, (l) => l.name, '--link', `${file} for ${sat.name} at ${stn.station.name}`);
  const engine = createLinkEngine({
    link, climate: stn.climate, weatherCases: scenario.weatherCases, elementError: sat.elementError, sun: scenario.sun ?? undefined,
  });
  // The run's own orbit (interpolated between SGP4 nodes unless exact_orbit), so the numbers are steps.csv's.
  const prop = createOrbit(sat.elements, scenario.window, scenario.exactOrbit);
  const geo = createStationGeometry(stn.station);
  const sample = createGeometrySample();
  const warnings: string[] = [];
  const { startS, endS, stepS } = scenario.window;

  let timeS: number;
  let pass: Pass | null = null;
  if (instant.kind === 'at') {
    timeS = instant.timeS;
    // The pass containing the instant, to recover the mount state from AOS: numbered as in the
    // scenario window when the instant is inside it, else searched in the 3 h before.
    const inWindow = timeS >= startS && timeS <= endS;
    const around = findPasses({
      orbit: prop, station: stn.station, startS: inWindow ? startS : timeS - 3 * 3600, endS: inWindow ? endS : timeS + 60,
    });
    pass = around.find((p) => p.aosS <= timeS && timeS <= p.losS) ?? null;
    if (!pass) warnings.push(`${formatIsoUtc(timeS)} is not inside a pass of ${sat.name} over ${stn.station.name} (the budget is shown anyway)`);
  } else {
    const passes = findPasses({ orbit: prop, station: stn.station, startS, endS });
    if (!(Number.isInteger(instant.pass) && instant.pass >= 1 && instant.pass <= passes.length)) {
      throw new InputError(`--pass: ${instant.pass} is not a pass of ${sat.name} over ${stn.station.name} in the scenario window (allowed 1–${passes.length})`);
    }
    pass = passes[instant.pass - 1];
    if (instant.kind === 'tca') {
      timeS = pass.tcaS;
    } else {
      const p = pass;
      const el = (t: number) => geo.sample(prop, t, sample).elevationDeg;
      const aosEl = el(p.aosS);
      const peakT = p.tcaS;
      const target = instant.elevationDeg;
      if (!(target >= aosEl - 1e-6 && target <= p.maxElevationDeg)) {
        throw new InputError(`--at-elevation: ${target}° is outside pass ${instant.pass} (allowed ${aosEl.toFixed(2)}° at AOS to ${p.maxElevationDeg.toFixed(2)}° at the peak)`);
      }
      // Rising side: first time the elevation reaches the target between AOS and the peak.
      const tPeak = el(peakT) >= target ? peakT : p.losS;
      timeS = target <= aosEl ? p.aosS : bisectUp(el, p.aosS, tPeak, target);
    }
  }

  engine.beginPass();
  if (pass) {
    // The mount's state as the run has it: the run's grid steps from the pass's first one up to the instant.
    const step = createStepBudget(scenario.weatherCases);
    for (let k = Math.ceil((pass.aosS - startS) / stepS - 1e-9); startS + k * stepS < timeS - 1e-9; k++) {
      engine.evaluate(geo.sample(prop, startS + k * stepS, sample), step);
    }
  }
  geo.sample(prop, timeS, sample);
  const step = createStepBudget(scenario.weatherCases);
  const lines = engine.explain(sample, step);
  return { engine, sample, step, lines, pass, warnings };
}
