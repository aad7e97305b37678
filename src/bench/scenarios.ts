/**
 * Scenarios for the benchmark, built in code from the demo scenario: the
 * demo satellite over a longer window, and seven more invented stations at
 * varied latitudes (names, places and climates are invented; each copies the
 * terminals and links of the demo's Kaldfjell station and the climate of the
 * demo station nearest in latitude, with the latitude set to its own).
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadScenario } from '../scenario/index.js';
import type { ResolvedScenario, ScenarioStation } from '../scenario/types.js';

const here = path.dirname(fileURLToPath(import.meta.url));
/** The demo scenario file, found from dist/bench/ or src/bench/. */
export const DEMO_SCENARIO = path.resolve(here, '../../fixtures/demo/scenario.yaml');

/** Seven invented stations: name, latitude, longitude (deg), height (m). */
export const EXTRA_STATIONS: ReadonlyArray<readonly [string, number, number, number]> = [
  ['Vessrun', 78.1, 15.4, 40],
  ['Tarrow Cove', 55.2, -6.7, 60],
  ['Lomanta', 28.3, -16.5, 420],
  ['Quilbay', -12.8, -38.4, 15],
  ['Serro Alto', -33.1, -70.6, 1400],
  ['Windle Flat', -45.9, 170.2, 250],
  ['Nivenport', -67.6, -68.1, 30],
];

export interface BenchScenarioOptions {
  days: number;
  /** 3 (the demo stations) or 10 (plus EXTRA_STATIONS). */
  stations: 3 | 10;
}

function nearestClimate(stations: ScenarioStation[], latitudeDeg: number): ScenarioStation {
  let best = stations[0];
  for (const s of stations) if (Math.abs(Math.abs(s.station.latitudeDeg) - Math.abs(latitudeDeg)) < Math.abs(Math.abs(best.station.latitudeDeg) - Math.abs(latitudeDeg))) best = s;
  return best;
}

export function benchScenario(opts: BenchScenarioOptions): ResolvedScenario {
  const base = loadScenario(DEMO_SCENARIO);
  const { startS, stepS } = base.window;
  const scenario: ResolvedScenario = {
    ...base,
    name: `bench-${opts.stations}st-${opts.days}d`,
    window: { startS, endS: startS + opts.days * 86_400, stepS },
    stations: [...base.stations],
    links: [...base.links],
  };
  if (opts.stations === 10) {
    const template = base.stations[0];
    const templateLinks = base.links.filter((l) => l.station === template.station.name);
    EXTRA_STATIONS.forEach(([name, lat, lon, h], i) => {
      const climateFrom = nearestClimate(base.stations, lat);
      scenario.stations.push({
        station: { ...template.station, name, latitudeDeg: lat, longitudeDeg: lon, heightM: h },
        climate: { ...climateFrom.climate, latitudeDeg: lat, stationHeightKm: h / 1000 },
        priority: base.stations.length + i + 1,
      });
      for (const l of templateLinks) scenario.links.push({ ...l, station: name });
    });
    if (scenario.network.kind === 'priority') {
      scenario.network = { kind: 'priority', order: scenario.stations.map((s) => s.station.name) };
    }
  }
  return scenario;
}
