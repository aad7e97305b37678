/**
 * The what-if panel's data, built from the sweep's collected columns
 * (PipelineResult.whatIf) or read back from steps rows: the page's compact
 * JSON form (analysis/whatIf.ts WhatIfPayload).
 */
import { stationRank } from '../../analysis/network.js';
import { encodeIntColumn, type WhatIfLinkSpec, type WhatIfPayload } from '../../analysis/whatIf.js';
import type { LinkSpec } from '../../budget/types.js';
import type { ResolvedScenario } from '../../scenario/types.js';
import type { WhatIfSatellite } from '../../sweep/types.js';
import { WHATIF_CN0_QUANTUM_DB, WHATIF_ELEVATION_QUANTUM_DEG } from '../../sweep/whatIfCollect.js';

/** Longest window whose steps the report carries (days); longer windows get no what-if panel. */
export const WHATIF_MAX_DAYS = 31;

const b64 = (bytes: Uint8Array) => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('base64');

export function whatIfLinkSpec(l: LinkSpec): WhatIfLinkSpec {
  return {
    name: l.name, direction: l.direction, station: l.station, satellite: l.satellite, modcod: l.modcod,
    requiredMarginDB: l.requiredMarginDB, implementationLossDB: l.implementationLossDB,
  };
}

/** Why a run gets no what-if panel (null: it gets one). */
export function whatIfRefusal(scenario: ResolvedScenario): string | null {
  const days = (scenario.window.endS - scenario.window.startS) / 86_400;
  if (days > WHATIF_MAX_DAYS) {
    return `The what-if panel is left out for windows longer than ${WHATIF_MAX_DAYS} days (this one is ${days.toFixed(1)} d): it recomputes from every step, and a longer window's steps would make the page too large. Rerun a shorter window to use it.`;
  }
  return null;
}

export function whatIfPayload(scenario: ResolvedScenario, sats: readonly WhatIfSatellite[]): WhatIfPayload {
  return {
    startS: scenario.window.startS, endS: scenario.window.endS, stepS: scenario.window.stepS,
    weather: scenario.weatherCases.map((w) => w.name), policy: scenario.network,
    elevationQuantumDeg: WHATIF_ELEVATION_QUANTUM_DEG, cn0QuantumDB: WHATIF_CN0_QUANTUM_DB,
    satellites: sats.map((s) => {
      const index = new Map(s.stations.map((st, i) => [st.name, i]));
      return {
        satellite: s.satellite,
        linkNames: [...new Set(s.stations.flatMap((st) => st.links.map((l) => l.name)))],
        stations: s.stations.map((st) => {
          const entry = scenario.stations[st.stationIndex];
          const [rank0, rank1] = stationRank(scenario.network, st.name, entry.priority);
          return { name: st.name, rank0, rank1, links: st.links.map(whatIfLinkSpec) };
        }),
        passes: s.passes.map((p, i) => ({
          passId: s.passIds[i], station: index.get(p.station) ?? -1, aosS: p.aosS, losS: p.losS, tcaS: p.tcaS, durationS: p.durationS,
          maxElevationDeg: p.maxElevationDeg, clippedStart: p.clippedStart, clippedEnd: p.clippedEnd,
        })),
        parts: encodeIntColumn(s.parts, b64), nParts: s.parts.length,
        elevation: encodeIntColumn(s.elevation, b64), nElevation: s.elevation.length,
        cn0: encodeIntColumn(s.cn0, b64), nCn0: s.cn0.length,
      };
    }),
  };
}
