/**
 * The floor a run is compared with: a bare satellite.js loop (`propagate`,
 * `gstime`, `eciToEcf`, `ecfToLookAngles`) over exactly the instants a direct
 * run evaluates the orbit at: every instant the pass finder asks for on the
 * exact orbit (coarse scan, root finding, extremum search; counted by
 * wrapping the propagator) and every in-pass grid instant, per station.
 * Station by station, so the instants never all sit in memory at once (a year
 * over ten stations is tens of millions); only the satellite.js loop is timed.
 */
import { degreesToRadians, ecfToLookAngles, eciToEcf, gstime, propagate } from 'satellite.js';
import { createPropagator, type Propagator } from '../orbit/propagator.js';
import { findPasses } from '../passes/find.js';
import type { ResolvedScenario } from '../scenario/types.js';

export interface Floor {
  /** Time of the bare satellite.js loops (s), all stations. */
  seconds: number;
  scanInstants: number;
  gridInstants: number;
  instantsPerS: number;
  /** Keeps the work observable. */
  checksum: number;
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

/** The floor of the first satellite of `scenario` (the bench scenarios have one) over every station. */
export function floorOf(scenario: ResolvedScenario): Floor {
  const sat = scenario.satellites[0];
  const { startS, endS, stepS } = scenario.window;
  const satrec = createPropagator(sat.elements).satrec;
  const out: Floor = { seconds: 0, scanInstants: 0, gridInstants: 0, instantsPerS: 0, checksum: 0 };
  for (const st of scenario.stations) {
    const scan: number[] = [];
    const prop = recording(createPropagator(sat.elements), scan);
    const passes = findPasses({ propagator: prop, exactOrbit: true, station: st.station, startS, endS });
    let gridCount = 0;
    for (const p of passes) gridCount += Math.max(0, Math.floor((p.losS - startS) / stepS + 1e-9) - Math.ceil((p.aosS - startS) / stepS - 1e-9) + 1);
    const grid = new Float64Array(gridCount);
    let g = 0;
    for (const p of passes) {
      const kFirst = Math.ceil((p.aosS - startS) / stepS - 1e-9);
      const kLast = Math.floor((p.losS - startS) / stepS + 1e-9);
      for (let k = kFirst; k <= kLast; k++) grid[g++] = startS + k * stepS;
    }
    const observer = { latitude: degreesToRadians(st.station.latitudeDeg), longitude: degreesToRadians(st.station.longitudeDeg), height: st.station.heightM / 1000 };
    const scanTimes = Float64Array.from(scan);
    const t0 = process.hrtime.bigint();
    for (const times of [scanTimes, grid]) {
      for (let i = 0; i < times.length; i++) {
        const date = new Date(times[i] * 1000);
        const pv = propagate(satrec, date);
        if (!pv) continue;
        const ecf = eciToEcf(pv.position, gstime(date));
        out.checksum += ecfToLookAngles(observer, ecf).elevation;
      }
    }
    out.seconds += Number(process.hrtime.bigint() - t0) / 1e9;
    out.scanInstants += scanTimes.length;
    out.gridInstants += grid.length;
  }
  out.instantsPerS = (out.scanInstants + out.gridInstants) / out.seconds;
  return out;
}
