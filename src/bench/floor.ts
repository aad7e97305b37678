/**
 * The floor a run is compared with: a bare satellite.js loop (`propagate`,
 * `gstime`, `eciToEcf`, `ecfToLookAngles`) over exactly the instants the run
 * evaluates the orbit at: every instant the pass finder asked for (coarse
 * scan, root finding, extremum search; counted by wrapping the propagator)
 * and every in-pass grid instant, per station.
 */
import { degreesToRadians, ecfToLookAngles, eciToEcf, gstime, propagate } from 'satellite.js';
import { createPropagator, type Propagator } from '../orbit/propagator.js';
import { findPasses } from '../passes/find.js';
import type { ResolvedScenario } from '../scenario/types.js';

export interface FloorInstants {
  /** Per station: instants (Unix s) the pass finder evaluated, then the in-pass grid instants. */
  perStation: { station: string; latitudeDeg: number; longitudeDeg: number; heightM: number; scanTimes: Float64Array; gridTimes: Float64Array }[];
  scanInstants: number;
  gridInstants: number;
}

/** A propagator that records every instant it is asked for. */
function recording(inner: Propagator, times: number[]): Propagator {
  return {
    elements: inner.elements,
    satrec: inner.satrec,
    minutesSinceEpoch: (t) => inner.minutesSinceEpoch(t),
    stateTemeAtMinutes: (m, r, v) => inner.stateTemeAtMinutes(m, r, v),
    stateTeme(t, r, v) { times.push(t); inner.stateTeme(t, r, v); },
  };
}

/** Instants of the first satellite of `scenario` (the bench scenarios have one). */
export function floorInstants(scenario: ResolvedScenario): FloorInstants {
  const sat = scenario.satellites[0];
  const { startS, endS, stepS } = scenario.window;
  const out: FloorInstants = { perStation: [], scanInstants: 0, gridInstants: 0 };
  for (const st of scenario.stations) {
    const times: number[] = [];
    const prop = recording(createPropagator(sat.elements), times);
    const passes = findPasses({ propagator: prop, exactOrbit: true, station: st.station, startS, endS });
    const grid: number[] = [];
    for (const p of passes) {
      const kFirst = Math.ceil((p.aosS - startS) / stepS - 1e-9);
      const kLast = Math.floor((p.losS - startS) / stepS + 1e-9);
      for (let k = kFirst; k <= kLast; k++) grid.push(startS + k * stepS);
    }
    out.perStation.push({
      station: st.station.name, latitudeDeg: st.station.latitudeDeg, longitudeDeg: st.station.longitudeDeg, heightM: st.station.heightM,
      scanTimes: Float64Array.from(times), gridTimes: Float64Array.from(grid),
    });
    out.scanInstants += times.length;
    out.gridInstants += grid.length;
  }
  return out;
}

/** Time (s) of the bare satellite.js loop over the instants; `checksum` keeps the work observable. */
export function floorLoop(scenario: ResolvedScenario, inst: FloorInstants): { seconds: number; checksum: number } {
  const satrec = createPropagator(scenario.satellites[0].elements).satrec;
  let checksum = 0;
  const t0 = process.hrtime.bigint();
  for (const st of inst.perStation) {
    const observer = { latitude: degreesToRadians(st.latitudeDeg), longitude: degreesToRadians(st.longitudeDeg), height: st.heightM / 1000 };
    for (const times of [st.scanTimes, st.gridTimes]) {
      for (let i = 0; i < times.length; i++) {
        const date = new Date(times[i] * 1000);
        const pv = propagate(satrec, date);
        if (!pv) continue;
        const ecf = eciToEcf(pv.position, gstime(date));
        checksum += ecfToLookAngles(observer, ecf).elevation;
      }
    }
  }
  const seconds = Number(process.hrtime.bigint() - t0) / 1e9;
  return { seconds, checksum };
}
