/** Which stations and links a satellite has in a scenario (cheap: no engines, no orbit). */
import type { LinkSpec } from '../budget/types.js';
import type { ResolvedScenario, ScenarioStation } from '../scenario/types.js';

export interface StationLayout {
  /** Index in scenario.stations. */
  stationIndex: number;
  /** The scenario entry with the mask floor applied. */
  entry: ScenarioStation;
  links: LinkSpec[];
}

export interface SatelliteLayout {
  satIndex: number;
  satellite: string;
  stations: StationLayout[];
  /** Link names of this satellite, first-seen order. */
  linkNames: string[];
}

function withMaskFloor(entry: ScenarioStation, floorDeg: number | undefined): ScenarioStation {
  if (floorDeg === undefined) return entry;
  const m = entry.station.mask;
  const mask = m.kind === 'constant'
    ? { kind: 'constant' as const, elevationDeg: Math.max(m.elevationDeg, floorDeg) }
    : { kind: 'table' as const, points: m.points.map(([a, e]) => [a, Math.max(e, floorDeg)] as const) };
  return { ...entry, station: { ...entry.station, mask } };
}

export function satelliteLayout(scenario: ResolvedScenario, satIndex: number, maskFloorDeg?: number): SatelliteLayout {
  const sat = scenario.satellites[satIndex];
  const stations: StationLayout[] = [];
  scenario.stations.forEach((entry0, stationIndex) => {
    const entry = withMaskFloor(entry0, maskFloorDeg);
    const links = scenario.links.filter((l) => l.satellite === sat.name && l.station === entry.station.name);
    if (links.length > 0) stations.push({ stationIndex, entry, links });
  });
  const linkNames = [...new Set(stations.flatMap((s) => s.links.map((l) => l.name)))];
  return { satIndex, satellite: sat.name, stations, linkNames };
}

/** The layouts of every satellite that has at least one station. */
export function scenarioLayouts(scenario: ResolvedScenario, maskFloorDeg?: number): SatelliteLayout[] {
  const out: SatelliteLayout[] = [];
  for (let i = 0; i < scenario.satellites.length; i++) {
    const l = satelliteLayout(scenario, i, maskFloorDeg);
    if (l.stations.length > 0) out.push(l);
  }
  return out;
}
