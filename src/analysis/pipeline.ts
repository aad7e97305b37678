/**
 * The run pipeline: for each satellite, find the passes over every station,
 * then sweep one time grid t_k = start + k·step over the union of those
 * passes. At each grid time the satellite is propagated once, and every
 * station in view evaluates every one of its links. Each step goes, as it is
 * made, to the caller's sink (steps.csv) and into fixed-size accumulators:
 * per pass, per UTC day, per station and for the network, and the mask and
 * rate histograms. Nothing per step is kept, so memory does not grow with
 * the window (the report's decimated series, bounded per pass, aside).
 *
 * Network rule: a satellite downlinks on a given link to one station at a
 * time. Where several stations see it at a grid time, the scenario's policy
 * picks one among those whose step is usable (best margin, or a priority
 * order); only that station's step counts for the network, so the network
 * never counts the same second twice.
 */
import type { LinkEngine } from '../budget/engine.js';
import { createLinkEngine, createStepBudget } from '../budget/engine.js';
import type { LinkSpec, StepBudget, WeatherCase } from '../budget/types.js';
import { createStationGeometry, type StationGeometry } from '../geometry/station.js';
import { createGeometrySample, type GeometrySample } from '../geometry/types.js';
import { createPropagator, type Propagator } from '../orbit/propagator.js';
import { findPasses } from '../passes/find.js';
import type { Pass } from '../passes/types.js';
import type { ResolvedScenario, ScenarioStation } from '../scenario/types.js';
import { createDailyAccumulator, NETWORK_STATION, type DailyAccumulator } from './dailyAccumulator.js';
import { createMaskHistogram, type MaskHistogram } from './maskHistogram.js';
import { chooseNetworkStation, type NetworkCandidate } from './network.js';
import { createPassAccumulator, type PassAccumulator } from './passAccumulator.js';
import { createRateHistogram, type RateHistogram } from './rateHistogram.js';
import type { DailyRow, PassLinkSummary } from './types.js';
import { judgePass } from './verdict.js';

/** One evaluated step handed to the sink; the objects are reused: copy what you keep. */
export interface StepEvent {
  passId: string;
  satellite: string;
  station: string;
  link: LinkSpec;
  timeS: number;
  step: StepBudget;
}

/** Decimated series of one pass and link, for the report (at most `seriesMaxPoints` points). */
export interface PassSeriesData {
  passId: string;
  link: string;
  timeS: number[];
  azimuthDeg: number[];
  elevationDeg: number[];
  cases: { weather: string; marginDB: number[]; ebN0DB: number[] }[];
}

export interface PipelineOptions {
  scenario: ResolvedScenario;
  /**
   * Called for every step in time order (per satellite). Return a promise only
   * when the sink needs the pipeline to wait (stream backpressure).
   */
  onStep?: (e: StepEvent) => void | Promise<void>;
  /** Keep decimated per-pass series for the report. */
  collectSeries?: boolean;
  seriesMaxPoints?: number;
  /** Replace every station's horizon mask by max(mask, this) (deg). */
  maskFloorDeg?: number;
  /** Progress callback: seconds of pass time processed and total. */
  onProgress?: (doneS: number, totalS: number) => void;
}

export interface StationLinkHistograms {
  station: string;
  link: LinkSpec;
  weather: string;
  mask: MaskHistogram;
  /** Fixed-rate links only. */
  rate: RateHistogram | null;
}

export interface PipelineResult {
  passes: Pass[];
  passLinks: PassLinkSummary[];
  daily: DailyRow[];
  histograms: StationLinkHistograms[];
  series: PassSeriesData[];
  /** Grid steps evaluated (per station in view, per link counted once per station). */
  stationSteps: number;
  /** Grid times at which the satellite was propagated. */
  gridTimes: number;
  /** (station, link) evaluations. */
  linkSteps: number;
  engines: LinkEngine[];
}

interface LinkRun {
  link: LinkSpec;
  engine: LinkEngine;
  step: StepBudget;
  daily: DailyAccumulator[]; // per case
  hists: StationLinkHistograms[]; // per case
  pass: PassAccumulator | null;
  series: PassSeriesData | null;
  seriesEvery: number;
  seriesCount: number;
}

interface StationRun {
  entry: ScenarioStation;
  geometry: StationGeometry;
  sample: GeometrySample;
  links: LinkRun[];
}

interface ActivePass {
  pass: Pass;
  passId: string;
  station: StationRun;
  kFirst: number;
  kLast: number;
}

/** Memoise the last TEME state so stations sharing a grid time propagate once. */
function sharedPropagator(inner: Propagator): Propagator {
  let lastT = NaN;
  const r = new Float64Array(3);
  const v = new Float64Array(3);
  return {
    elements: inner.elements,
    satrec: inner.satrec,
    minutesSinceEpoch: (t) => inner.minutesSinceEpoch(t),
    stateTemeAtMinutes: (m, p, q) => inner.stateTemeAtMinutes(m, p, q),
    stateTeme(t, posOut, velOut) {
      if (t !== lastT) {
        inner.stateTeme(t, r, v);
        lastT = t;
      }
      posOut[0] = r[0]; posOut[1] = r[1]; posOut[2] = r[2];
      velOut[0] = v[0]; velOut[1] = v[1]; velOut[2] = v[2];
    },
  };
}

function withMaskFloor(entry: ScenarioStation, floorDeg: number | undefined): ScenarioStation {
  if (floorDeg === undefined) return entry;
  const m = entry.station.mask;
  const mask = m.kind === 'constant'
    ? { kind: 'constant' as const, elevationDeg: Math.max(m.elevationDeg, floorDeg) }
    : { kind: 'table' as const, points: m.points.map(([a, e]) => [a, Math.max(e, floorDeg)] as const) };
  return { ...entry, station: { ...entry.station, mask } };
}

export async function runPipeline(options: PipelineOptions): Promise<PipelineResult> {
  const { scenario } = options;
  const { startS, endS, stepS } = scenario.window;
  const cases: WeatherCase[] = scenario.weatherCases;
  const seriesMax = options.seriesMaxPoints ?? 120;
  const result: PipelineResult = {
    passes: [], passLinks: [], daily: [], histograms: [], series: [], stationSteps: 0, gridTimes: 0, linkSteps: 0, engines: [],
  };
  const networkDaily: DailyAccumulator[] = [];

  for (const sat of scenario.satellites) {
    const propagator = sharedPropagator(createPropagator(sat.elements));
    const stations: StationRun[] = [];
    for (const entry0 of scenario.stations) {
      const entry = withMaskFloor(entry0, options.maskFloorDeg);
      const links = scenario.links.filter((l) => l.satellite === sat.name && l.station === entry.station.name);
      if (links.length === 0) continue;
      const runs: LinkRun[] = links.map((link) => {
        const engine = createLinkEngine({ link, climate: entry.climate, weatherCases: cases });
        result.engines.push(engine);
        const hists = cases.map((c) => {
          const h: StationLinkHistograms = {
            station: entry.station.name, link, weather: c.name,
            mask: createMaskHistogram({ station: entry.station.name, link: link.name, weather: c.name }),
            rate: link.modcod.kind === 'fixed'
              ? createRateHistogram({ station: entry.station.name, link: link.name, weather: c.name })
              : null,
          };
          result.histograms.push(h);
          return h;
        });
        return {
          link, engine, step: createStepBudget(cases),
          daily: cases.map((c) => createDailyAccumulator({ startS, endS, link, weather: c.name })),
          hists, pass: null, series: null, seriesEvery: 1, seriesCount: 0,
        };
      });
      stations.push({ entry, geometry: createStationGeometry(entry.station), sample: createGeometrySample(), links: runs });
    }
    if (stations.length === 0) continue;

    // Network accumulators, one per link name of this satellite and weather case.
    const linkNames = [...new Set(stations.flatMap((s) => s.links.map((l) => l.link.name)))];
    const netDaily = new Map<string, DailyAccumulator[]>();
    for (const name of linkNames) {
      const proto = stations.flatMap((s) => s.links).find((l) => l.link.name === name)!.link;
      const accs = cases.map((c) => createDailyAccumulator({
        startS, endS, link: proto, weather: c.name, station: NETWORK_STATION, satellite: sat.name,
      }));
      netDaily.set(name, accs);
      networkDaily.push(...accs);
    }

    // Passes at every station, then the grid intervals they cover.
    const items: ActivePass[] = [];
    for (const st of stations) {
      const passes = findPasses({ propagator, station: st.geometry.station, startS, endS });
      for (const p of passes) {
        result.passes.push(p);
        const kFirst = Math.ceil((p.aosS - startS) / stepS - 1e-9);
        const kLast = Math.floor((p.losS - startS) / stepS + 1e-9);
        items.push({ pass: p, passId: `${sat.name}/${st.entry.station.name}/${p.index}`, station: st, kFirst, kLast });
      }
    }
    items.sort((a, b) => a.pass.aosS - b.pass.aosS || a.station.entry.station.name.localeCompare(b.station.entry.station.name));
    const totalS = items.reduce((s, it) => s + it.pass.durationS, 0);
    let doneS = 0;

    const beginPass = (it: ActivePass) => {
      const p = it.pass;
      const expected = Math.max(1, it.kLast - it.kFirst + 1);
      for (const lr of it.station.links) {
        lr.engine.beginPass();
        lr.pass = createPassAccumulator({
          link: lr.link,
          pass: {
            passId: it.passId, satellite: sat.name, station: p.station, aosS: p.aosS, tcaS: p.tcaS, losS: p.losS,
            maxElevationDeg: p.maxElevationDeg, durationS: p.durationS, clippedStart: p.clippedStart, clippedEnd: p.clippedEnd,
          },
          weatherCases: cases,
        });
        if (options.collectSeries) {
          lr.seriesEvery = Math.max(1, Math.ceil(expected / seriesMax));
          lr.seriesCount = 0;
          lr.series = {
            passId: it.passId, link: lr.link.name, timeS: [], azimuthDeg: [], elevationDeg: [],
            cases: cases.map((c) => ({ weather: c.name, marginDB: [], ebN0DB: [] })),
          };
        }
      }
    };
    const endPass = (it: ActivePass) => {
      for (const lr of it.station.links) {
        const summary = lr.pass!.finish();
        result.passLinks.push(summary);
        summary.cases.forEach((c, ci) => lr.daily[ci].endPass(it.pass.aosS, c.verdict));
        if (lr.series) result.series.push(lr.series);
        lr.pass = null;
        lr.series = null;
      }
      doneS += it.pass.durationS;
      options.onProgress?.(doneS, totalS);
    };

    // Network contact = a maximal run of grid times with at least one station in view.
    const netContact = linkNames.map(() => cases.map(() => ({ startS: NaN, usableS: 0, any: false, aboveS: 0 })));
    const closeNetContact = () => {
      linkNames.forEach((name, li) => {
        const accs = netDaily.get(name)!;
        cases.forEach((_, ci) => {
          const nc = netContact[li][ci];
          if (Number.isNaN(nc.startS)) return;
          accs[ci].endPass(nc.startS, judgePass(nc.usableS, nc.aboveS, nc.any).verdict);
          nc.startS = NaN; nc.usableS = 0; nc.any = false; nc.aboveS = 0;
        });
      });
    };

    const candidates: NetworkCandidate[] = [];
    const candidateRuns: LinkRun[] = [];
    let active: ActivePass[] = [];
    let i = 0;
    let k = items.length ? items[0].kFirst : 0;
    while (i < items.length || active.length > 0) {
      if (active.length === 0) {
        closeNetContact();
        // Passes too short to hold a grid point still get a summary (no steps).
        while (i < items.length && items[i].kLast < items[i].kFirst) {
          beginPass(items[i]); endPass(items[i]); i++;
        }
        if (i >= items.length) break;
        k = Math.max(k, items[i].kFirst);
      }
      while (i < items.length && items[i].kFirst <= k) {
        const it = items[i++];
        beginPass(it);
        if (it.kLast < it.kFirst) { endPass(it); continue; }
        active.push(it);
      }
      if (active.length === 0) continue;
      const t = startS + k * stepS;
      result.gridTimes++;
      for (const it of active) {
        const st = it.station;
        st.geometry.sample(propagator, t, st.sample);
        result.stationSteps++;
        for (const lr of st.links) {
          const step = lr.engine.evaluate(st.sample, lr.step);
          result.linkSteps++;
          const el = step.elevation_deg;
          lr.pass!.add(t, stepS, el, step);
          for (let ci = 0; ci < cases.length; ci++) {
            const c = step.cases[ci];
            lr.daily[ci].add(t, stepS, c);
            const h = lr.hists[ci];
            h.mask.add(el, stepS, c.usable, c.information_rate_bps);
            if (h.rate) h.rate.add(c.c_over_n0_dbhz, stepS);
          }
          if (lr.series && lr.seriesCount++ % lr.seriesEvery === 0) {
            const s = lr.series;
            s.timeS.push(t); s.azimuthDeg.push(step.azimuth_deg); s.elevationDeg.push(el);
            for (let ci = 0; ci < cases.length; ci++) {
              s.cases[ci].marginDB.push(step.cases[ci].margin_db);
              s.cases[ci].ebN0DB.push(step.cases[ci].eb_over_n0_db);
            }
          }
          if (options.onStep) {
            const wait = options.onStep({ passId: it.passId, satellite: sat.name, station: st.entry.station.name, link: lr.link, timeS: t, step });
            if (wait) await wait;
          }
        }
      }
      // Network: per link name and case, one station at most.
      for (let li = 0; li < linkNames.length; li++) {
        const name = linkNames[li];
        const accs = netDaily.get(name)!;
        for (let ci = 0; ci < cases.length; ci++) {
          candidates.length = 0;
          candidateRuns.length = 0;
          for (const it of active) {
            const lr = it.station.links.find((l) => l.link.name === name);
            if (!lr) continue;
            const c = lr.step.cases[ci];
            candidates.push({ station: it.station.entry.station.name, marginDB: c.margin_db, usable: c.usable, rateBps: c.information_rate_bps, priority: it.station.entry.priority });
            candidateRuns.push(lr);
          }
          if (candidates.length === 0) continue;
          const nc = netContact[li][ci];
          if (Number.isNaN(nc.startS)) nc.startS = t;
          nc.aboveS += stepS;
          const chosen = chooseNetworkStation(candidates, scenario.network);
          if (chosen >= 0) {
            const lr = candidateRuns[chosen];
            accs[ci].add(t, stepS, lr.step.cases[ci], lr.link);
            nc.usableS += stepS;
            nc.any = true;
          }
        }
      }
      // Retire passes whose last grid point this was.
      const still: ActivePass[] = [];
      for (const it of active) {
        if (it.kLast <= k) endPass(it);
        else still.push(it);
      }
      active = still;
      k++;
    }
    closeNetContact();
    for (const st of stations) for (const lr of st.links) for (const d of lr.daily) result.daily.push(...d.rows());
  }
  for (const d of networkDaily) result.daily.push(...d.rows());
  result.daily.sort((a, b) =>
    a.dayUtc.localeCompare(b.dayUtc) || a.satellite.localeCompare(b.satellite) || a.link.localeCompare(b.link)
    || a.weather.localeCompare(b.weather) || (a.station === NETWORK_STATION ? 1 : 0) - (b.station === NETWORK_STATION ? 1 : 0)
    || a.station.localeCompare(b.station));
  result.passLinks.sort((a, b) => a.aosS - b.aosS || a.station.localeCompare(b.station) || a.link.localeCompare(b.link));
  return result;
}
