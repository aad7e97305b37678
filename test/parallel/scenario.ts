/** Small copies of the demo scenario (invented satellite and stations) for the parallel and memory checks. */
import path from 'node:path';
import { loadScenario, type ResolvedScenario } from '../../src/scenario/index.js';

export const DEMO = path.resolve(process.cwd(), 'fixtures/demo/scenario.yaml');

/** The demo over `days` days from its start. */
export function smallScenario(days: number): ResolvedScenario {
  const s = loadScenario(DEMO);
  return { ...s, window: { ...s.window, endS: s.window.startS + days * 86_400 } };
}

/** One station (the first), one link (UHF), clear sky only: cheap per day, for long windows. */
export function lightScenario(days: number): ResolvedScenario {
  const s = smallScenario(days);
  const station = s.stations[0];
  return {
    ...s,
    stations: [station],
    links: s.links.filter((l) => l.station === station.station.name && l.name === 'uhf-tm'),
    weatherCases: s.weatherCases.slice(0, 1),
  };
}
