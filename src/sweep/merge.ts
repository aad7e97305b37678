/**
 * The run's accumulators, fed chunk by chunk in order, and the final order
 * of the run's tables: the same for an in-process and a parallel run.
 */
import { createDailyAccumulator, NETWORK_STATION, type DailyAccumulator } from '../analysis/dailyAccumulator.js';
import { createMaskHistogram } from '../analysis/maskHistogram.js';
import { createRateHistogram } from '../analysis/rateHistogram.js';
import { createSummaryMerger, type SummaryMerger } from '../analysis/whatIfSummary.js';
import type { DailyRow } from '../analysis/types.js';
import { PassLinkTable } from '../analysis/passTable.js';
import type { ResolvedScenario } from '../scenario/types.js';
import type { Pass } from '../passes/types.js';
import type { SatelliteLayout } from './layout.js';
import { VolumeProfiles } from './profiles.js';
import { ENVELOPE_BINS, type ChunkPartial, type PipelineResult, type StationLinkEnvelope, type StationLinkHistograms } from './types.js';

export interface SatelliteMerge {
  /** Merge chunk `part` (chunks must arrive in order 0, 1, 2, …). */
  add(part: ChunkPartial): void;
  /** Daily rows of the stations (and, separately, of the network). */
  finish(): { stationDaily: DailyRow[]; networkDaily: DailyRow[] };
}

/**
 * The run-level accumulators of one satellite. Histograms are appended to
 * `result.histograms` (station, link, case order) when created; passes,
 * passLinks, series and the step counters go into `result` as chunks merge.
 */
export function createSatelliteMerge(scenario: ResolvedScenario, layout: SatelliteLayout, result: PipelineResult): SatelliteMerge {
  const { startS, endS } = scenario.window;
  const cases = scenario.weatherCases;
  const daily: DailyAccumulator[] = [];
  const hists: StationLinkHistograms[] = [];
  const envelopes: StationLinkEnvelope[] = [];
  for (const st of layout.stations) {
    const name = st.entry.station.name;
    for (const link of st.links) {
      for (const c of cases) {
        envelopes.push({
          station: name, link: link.name, weather: c.name, minDB: new Float64Array(ENVELOPE_BINS).fill(Infinity),
          maxDB: new Float64Array(ENVELOPE_BINS).fill(-Infinity), keyholeMinDB: new Float64Array(ENVELOPE_BINS).fill(Infinity),
        });
        daily.push(createDailyAccumulator({ startS, endS, link, weather: c.name }));
        const h: StationLinkHistograms = {
          station: name, link, weather: c.name,
          mask: createMaskHistogram({ station: name, link: link.name, weather: c.name }),
          rate: link.modcod.kind === 'fixed' ? createRateHistogram({ station: name, link: link.name, weather: c.name }) : null,
        };
        hists.push(h);
        result.histograms.push(h);
      }
    }
  }
  const nStationDaily = daily.length;
  for (const name of layout.linkNames) {
    const proto = layout.stations.flatMap((s) => s.links).find((l) => l.name === name)!;
    for (const c of cases) {
      daily.push(createDailyAccumulator({ startS, endS, link: proto, weather: c.name, station: NETWORK_STATION, satellite: layout.satellite }));
    }
  }
  let next = 0;
  let envelopesKept = false;
  // What-if columns: the chunks' arrays in order, the pass numbers made satellite-wide.
  const wiPasses: Pass[] = [];
  const wiIds: string[] = [];
  const wiParts: Int32Array[] = [], wiEl: Int32Array[] = [], wiCn0: Int32Array[] = [];
  let summary: SummaryMerger | null = null;
  return {
    add(part) {
      if (part.chunk !== next) throw new Error(`pipeline merge: chunk ${part.chunk} arrived, expected ${next}`);
      next++;
      if (part.whatIfSummary) (summary ??= createSummaryMerger(layout.linkNames.length, cases.length, startS, endS)).add(part.whatIfSummary, wiPasses.length);
      if (part.whatIf) {
        const parts = part.whatIf.parts;
        for (let q = 1; q < parts.length; q += 4) parts[q] += wiPasses.length;
        for (const p of part.passes) wiPasses.push(p);
        for (const id of part.whatIf.passIds) wiIds.push(id);
        wiParts.push(parts); wiEl.push(part.whatIf.elevation); wiCn0.push(part.whatIf.cn0);
      }
      for (const p of part.passes) result.passes.push(p);
      result.passLinks.append(part.passLinks);
      if (part.profiles) result.profiles?.append(part.profiles);
      for (const s of part.series) result.series.push(s);
      part.daily.forEach((d, i) => daily[i].mergeState(d));
      part.mask.forEach((m, i) => hists[i].mask.mergeState(m));
      part.rate.forEach((r, i) => { if (r) hists[i].rate!.mergeState(r); });
      part.envelope.forEach((e, i) => {
        const t = envelopes[i];
        for (let b = 0; b < ENVELOPE_BINS; b++) {
          if (e[b] < t.minDB[b]) t.minDB[b] = e[b];
          if (e[ENVELOPE_BINS + b] > t.maxDB[b]) t.maxDB[b] = e[ENVELOPE_BINS + b];
          if (e[2 * ENVELOPE_BINS + b] < t.keyholeMinDB[b]) t.keyholeMinDB[b] = e[2 * ENVELOPE_BINS + b];
        }
      });
      if (part.envelope.length > 0 && !envelopesKept) { for (const e of envelopes) result.envelopes.push(e); envelopesKept = true; }
      result.stationSteps += part.stationSteps;
      result.gridTimes += part.gridTimes;
      result.linkSteps += part.linkSteps;
      result.sgp4Calls += part.sgp4Calls;
    },
    finish() {
      if (wiParts.length > 0) {
        (result.whatIf ??= []).push({
          satIndex: layout.satIndex, satellite: layout.satellite,
          stations: layout.stations.map((st) => ({ name: st.entry.station.name, stationIndex: st.stationIndex, links: st.links })),
          passes: wiPasses, passIds: wiIds, parts: concatInt32(wiParts), elevation: concatInt32(wiEl), cn0: concatInt32(wiCn0),
          ...(summary ? { summary: summary.finish() } : {}),
        });
      }
      const rows = daily.map((d) => d.rows());
      return { stationDaily: rows.slice(0, nStationDaily).flat(), networkDaily: rows.slice(nStationDaily).flat() };
    },
  };
}

function concatInt32(list: Int32Array[]): Int32Array {
  const out = new Int32Array(list.reduce((a, x) => a + x.length, 0));
  let o = 0;
  for (const x of list) { out.set(x, o); o += x.length; }
  return out;
}

export function emptyPipelineResult(scenario: ResolvedScenario): PipelineResult {
  return {
    passes: [], passLinks: new PassLinkTable(scenario.weatherCases.map((w) => w.name)), daily: [], histograms: [], series: [], envelopes: [], stationSteps: 0, gridTimes: 0, linkSteps: 0,
    sgp4Calls: 0, engines: [],
    ...(scenario.volumeProfileGridS ? { profiles: new VolumeProfiles(scenario.volumeProfileGridS, scenario.weatherCases.length) } : {}),
  };
}

/** The final ordering of the run's tables (the same for in-process and parallel runs). */
export function finishPipelineResult(result: PipelineResult, networkDaily: DailyRow[]): PipelineResult {
  for (const d of networkDaily) result.daily.push(d);
  result.daily.sort((a, b) =>
    a.dayUtc.localeCompare(b.dayUtc) || a.satellite.localeCompare(b.satellite) || a.link.localeCompare(b.link)
    || a.weather.localeCompare(b.weather) || (a.station === NETWORK_STATION ? 1 : 0) - (b.station === NETWORK_STATION ? 1 : 0)
    || a.station.localeCompare(b.station));
  result.passLinks.sort();
  result.passes.sort((a, b) => a.aosS - b.aosS || a.satellite.localeCompare(b.satellite) || a.station.localeCompare(b.station));
  return result;
}
