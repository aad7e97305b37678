/**
 * The what-if panel's data, built from the sweep's collected columns
 * (PipelineResult.whatIf) or read back from steps rows: the page's compact
 * JSON form (analysis/whatIf.ts WhatIfPayload).
 */
import { stationRank } from '../../analysis/network.js';
import { encodeIntColumn, type WhatIfLinkSpec, type WhatIfPayload } from '../../analysis/whatIf.js';
import { encodeWhatIfSummary, SUMMARY_CN0_BIN_DB, SUMMARY_ELEVATION_BIN_DEG, SUMMARY_THRESHOLD_QUANTUM_DB, type WhatIfSummaryPayload, type WhatIfSummarySatellite } from '../../analysis/whatIfSummary.js';
import type { LinkSpec } from '../../budget/types.js';
import type { ResolvedScenario } from '../../scenario/types.js';
import type { WhatIfSatellite } from '../../sweep/types.js';
import { WHATIF_CN0_QUANTUM_DB, WHATIF_ELEVATION_QUANTUM_DEG } from '../../sweep/whatIfCollect.js';

/** Longest window whose every step the report carries (days); longer windows carry the summary (analysis/whatIfSummary.ts). */
export const WHATIF_MAX_DAYS = 31;

const b64 = (bytes: Uint8Array) => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('base64');

export function whatIfLinkSpec(l: LinkSpec): WhatIfLinkSpec {
  return {
    name: l.name, direction: l.direction, station: l.station, satellite: l.satellite, modcod: l.modcod,
    requiredMarginDB: l.requiredMarginDB, implementationLossDB: l.implementationLossDB,
  };
}

/** What the sweep collects for the panel: every step (true) up to WHATIF_MAX_DAYS, the summary beyond. */
export function whatIfCollectMode(scenario: ResolvedScenario): true | 'summary' {
  return (scenario.window.endS - scenario.window.startS) / 86_400 > WHATIF_MAX_DAYS ? 'summary' : true;
}

export function whatIfPayload(scenario: ResolvedScenario, sats: readonly WhatIfSatellite[]): WhatIfPayload | WhatIfSummaryPayload {
  if (sats.some((s) => s.summary)) return whatIfSummaryPayload(scenario, sats);
  return {
    startS: scenario.window.startS, endS: scenario.window.endS, stepS: scenario.window.stepS,
    weather: scenario.weatherCases.map((w) => w.name), policy: scenario.network,
    elevationQuantumDeg: WHATIF_ELEVATION_QUANTUM_DEG, cn0QuantumDB: WHATIF_CN0_QUANTUM_DB,
    satellites: sats.map((s) => {
      const { stations, passes } = satelliteInfo(scenario, s);
      return {
        satellite: s.satellite, linkNames: linkNamesOf(s), stations, passes,
        parts: encodeIntColumn(s.parts, b64), nParts: s.parts.length,
        elevation: encodeIntColumn(s.elevation, b64), nElevation: s.elevation.length,
        cn0: encodeIntColumn(s.cn0, b64), nCn0: s.cn0.length,
      };
    }),
  };
}

function whatIfSummaryPayload(scenario: ResolvedScenario, sats: readonly WhatIfSatellite[]): WhatIfSummaryPayload {
  return {
    kind: 'summary', startS: scenario.window.startS, endS: scenario.window.endS, stepS: scenario.window.stepS,
    weather: scenario.weatherCases.map((w) => w.name), policy: scenario.network,
    thresholdQuantumDB: SUMMARY_THRESHOLD_QUANTUM_DB, elevationBinDeg: SUMMARY_ELEVATION_BIN_DEG, cn0BinDB: SUMMARY_CN0_BIN_DB,
    satellites: sats.map((s) => ({ satellite: s.satellite, linkNames: linkNamesOf(s), ...satelliteInfo(scenario, s), summary: encodeWhatIfSummary(s.summary!, b64) })),
  };
}

const linkNamesOf = (s: WhatIfSatellite) => [...new Set(s.stations.flatMap((st) => st.links.map((l) => l.name)))];

/** A satellite's stations (link rules, network ranks) and passes as the page reads them. */
function satelliteInfo(scenario: ResolvedScenario, s: WhatIfSatellite): Pick<WhatIfSummarySatellite, 'stations' | 'passes'> {
  const index = new Map(s.stations.map((st, i) => [st.name, i]));
  return {
    stations: s.stations.map((st) => {
      const entry = scenario.stations[st.stationIndex];
      const [rank0, rank1] = stationRank(scenario.network, st.name, entry.priority);
      return { name: st.name, rank0, rank1, links: st.links.map(whatIfLinkSpec) };
    }),
    passes: s.passes.map((p, i) => ({
      passId: s.passIds[i], station: index.get(p.station) ?? -1, aosS: p.aosS, losS: p.losS, tcaS: p.tcaS, durationS: p.durationS,
      maxElevationDeg: p.maxElevationDeg, clippedStart: p.clippedStart, clippedEnd: p.clippedEnd,
    })),
  };
}
