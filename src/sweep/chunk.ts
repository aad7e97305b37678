/**
 * Sweeping one chunk of a satellite's plan, in columns.
 *
 * The chunk's passes come in groups that overlap in time (a group is a run of
 * grid times with at least one station in view). Each group is swept in
 * windows of at most WINDOW_STEPS grid times:
 *   1. the satellite's state on the window's grid times, once for all
 *      stations (orbit nodes → interpolated TEME → Earth-fixed, geometry/columns.ts);
 *   2. per pass in view, the station's look angles over its part of the window;
 *   3. per link of that station, the whole budget over those steps (the
 *      engine's evaluateColumns), then the pass, day, mask, rate, envelope and
 *      series accumulators fed from the columns;
 *   4. the network: per grid time, link and weather case, the one station
 *      that carries the satellite (analysis/network.ts rule);
 *   5. the steps sink (steps.csv and the like) gets the window's columns.
 * Nothing per step outlives its window; the per-pass engine state (the
 * rate-limited mount) carries from one window to the next.
 */
import type { LinkColumns } from '../budget/linkColumns.js';
import { createLinkColumns, readStep } from '../budget/linkColumns.js';
import type { ElevationTable } from '../budget/atmosphere.js';
import { createLinkEngine, createStepBudget, type LinkEngine } from '../budget/engine.js';
import { createEffectsShare } from '../budget/effects.js';
import type { LinkSpec, WeatherCase } from '../budget/types.js';
import {
  createSatelliteColumns, createStationColumns, satelliteEarthFixed, stationLook, type StationColumns,
} from '../geometry/columns.js';
import { createStationGeometry, type StationGeometry } from '../geometry/station.js';
import { completePass, createOrbit } from '../passes/find.js';
import type { Pass } from '../passes/types.js';
import type { OrbitSource } from '../orbit/interpolated.js';
import { gmstRad, temeToEcef } from '../orbit/frames.js';
import { elementErrorKm, groundTrackSpeedKmS, timingUncertaintyS } from '../models/index.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { createDailyAccumulator, type DailyAccumulator } from '../analysis/dailyAccumulator.js';
import { createMaskHistogram, type MaskHistogram } from '../analysis/maskHistogram.js';
import { stationRank } from '../analysis/network.js';
import { createNetworkFeed, type InView } from './network.js';
import { createPassAccumulator, type PassAccumulator } from '../analysis/passAccumulator.js';
import { PassLinkTable } from '../analysis/passTable.js';
import { createRateHistogram, type RateHistogram } from '../analysis/rateHistogram.js';
import type { SatelliteLayout } from './layout.js';
import type { PlannedPass } from './plan.js';
import { envelopeAdd, ENVELOPE_BINS, type ChunkPartial, type SweepTimings, type PassSeriesData, type StepEvent, type StepSink } from './types.js';
import { forEachRow, WINDOW_STEPS, type StepPart, type StepWindow } from './window.js';
import { createWhatIfCollector, WHATIF_CN0_QUANTUM_DB, WHATIF_ELEVATION_QUANTUM_DEG } from './whatIfCollect.js';
import { summariseWhatIf } from '../analysis/whatIfSummary.js';
import { ProfileBuilder, VolumeProfiles } from './profiles.js';

export interface SweepOptions {
  /** Steps in columns, window by window. */
  onWindow?: StepSink;
  /** Steps as records (slow; for checks). */
  onStep?: (e: StepEvent) => void | Promise<void>;
  collectSeries?: boolean;
  seriesMaxPoints?: number;
  /** Called after each pass with its duration (s). */
  onPassDone?: (durationS: number) => void;
  /** Filled with where the time goes. */
  timings?: SweepTimings;
  /**
   * Collect the report's what-if columns (whatIfCollect.ts) into the chunk's `whatIf`; 'summary': reduce them
   * to the long-window summary (analysis/whatIfSummary.ts) in `whatIfSummary`, keeping only the pass ids.
   */
  collectWhatIf?: boolean | 'summary';
}

export interface Sweeper {
  layout: SatelliteLayout;
  engines: LinkEngine[];
  orbit: OrbitSource;
  sweepChunk(items: readonly PlannedPass[], chunk: number, options: SweepOptions): Promise<ChunkPartial>;
}

interface LinkRun {
  link: LinkSpec;
  engine: LinkEngine;
  station: string;
  /** Finished pass accumulators of this link, to be reset and reused. */
  accPool: PassAccumulator[];
  daily: DailyAccumulator[]; // per case
  mask: MaskHistogram[]; // per case
  rate: (RateHistogram | null)[]; // per case
  envelope: Float64Array[]; // per case, when collecting series: [min | max | keyhole min]
}

interface StationRun {
  name: string;
  geometry: StationGeometry;
  rank0: number;
  rank1: number;
  links: LinkRun[];
  /** Per SatelliteLayout.linkNames index: index into `links`, or −1. */
  byName: number[];
  /** Per link: the first link of the station with the same spacecraft pointing (its off-boresight angles are shared). */
  pointingOf: number[];
  /** Free column buffers of this station (station columns and one LinkColumns per link). */
  free: Slot[];
  /** The station's mask is tested on apparent (refracted) elevation. */
  maskOnApparent: boolean;
}

/** Column buffers of one pass in one window: station columns, one LinkColumns per link, mask bins, shared spacecraft off-boresight angles. */
interface Slot { stn: StationColumns; cols: LinkColumns[]; bins: Int32Array; scOff: Float64Array[] }

/** A pass being swept. */
interface ItemRun {
  item: PlannedPass;
  pass: Pass;
  st: StationRun;
  acc: PassAccumulator[]; // per link
  series: (PassSeriesData | null)[]; // per link
  seriesEvery: number;
  seriesCount: number[];
  /** Index of the pass in the chunk's `passes`. */
  passNo: number;
  /** Per link, with volume profiles asked for (scenario.volumeProfileGridS). */
  prof: ProfileBuilder[] | null;
}

function emptyEnvelope(): Float64Array {
  const e = new Float64Array(3 * ENVELOPE_BINS);
  e.fill(Infinity, 0, ENVELOPE_BINS);
  e.fill(-Infinity, ENVELOPE_BINS, 2 * ENVELOPE_BINS);
  e.fill(Infinity, 2 * ENVELOPE_BINS);
  return e;
}

/**
 * Engines, geometry and reusable columns for one satellite. The expensive
 * part is the engines' elevation tables; `tables` (one per layout station and
 * link, in that order, e.g. `sweeper.engines.map((e) => e.table)` of a
 * sweeper built elsewhere) skips building them.
 */
export function createSweeper(scenario: ResolvedScenario, layout: SatelliteLayout, tables?: readonly ElevationTable[], orbit?: OrbitSource): Sweeper {
  const { startS, endS, stepS } = scenario.window;
  const cases: WeatherCase[] = scenario.weatherCases;
  const nCases = cases.length;
  const sat = scenario.satellites[layout.satIndex];
  const satOrbit = orbit ?? createOrbit(sat.elements, scenario.window, scenario.exactOrbit);
  const engines: LinkEngine[] = [];
  const effectsShare = createEffectsShare();
  const stations: StationRun[] = layout.stations.map((st) => {
    const links: LinkRun[] = st.links.map((link) => {
      const engine = createLinkEngine({
        link, climate: st.entry.climate, weatherCases: cases, table: tables?.[engines.length],
        elementError: sat.elementError, sun: scenario.sun ?? undefined, effectsShare,
      });
      engines.push(engine);
      // Accumulators (made at the first chunk) live as long as the sweeper; each chunk takes (and empties) its share.
      return { link, engine, station: st.entry.station.name, accPool: [], daily: [], mask: [], rate: [], envelope: [] };
    });
    const [rank0, rank1] = stationRank(scenario.network, st.entry.station.name, st.entry.priority);
    return {
      name: st.entry.station.name, geometry: createStationGeometry(st.entry.station), rank0, rank1, links,
      byName: layout.linkNames.map((n) => links.findIndex((l) => l.link.name === n)), free: [],
      maskOnApparent: st.entry.station.maskOnApparentElevation === true,
      pointingOf: links.map((l) => links.findIndex((m) => m.engine.spacecraftPointingKey === l.engine.spacecraftPointingKey)),
    };
  });
  const nLinks = layout.linkNames.length;
  const protoLink = layout.linkNames.map((n) => stations.flatMap((s) => s.links).find((l) => l.link.name === n)!.link);
  const satCols = createSatelliteColumns(WINDOW_STEPS);
  satCols.originS = startS; satCols.stepS = stepS;
  const acquire = (st: StationRun): Slot => st.free.pop() ?? {
    stn: createStationColumns(WINDOW_STEPS), cols: st.links.map(() => createLinkColumns(WINDOW_STEPS, nCases)), bins: new Int32Array(WINDOW_STEPS),
    scOff: st.links.map(() => new Float64Array(WINDOW_STEPS)),
  };
  const tcaPos = new Float64Array(3), tcaVel = new Float64Array(3), ecefPos = new Float64Array(3), ecefVel = new Float64Array(3);
  /** AOS/LOS uncertainty (± s) of a pass: the along-track element error at TCA over the ground-track speed there. */
  const passTimingUncertaintyS = (tcaS: number): number => {
    const ee = sat.elementError;
    if (!ee) return NaN;
    satOrbit.stateTeme(tcaS, tcaPos, tcaVel);
    temeToEcef(gmstRad(tcaS), tcaPos, tcaVel, ecefPos, ecefVel);
    const { alongTrackKm } = elementErrorKm({ ...ee, ageDays: ee.ageDays ?? (tcaS - ee.epochS) / 86_400 });
    return timingUncertaintyS({ alongTrackKm, groundTrackSpeedKmS: groundTrackSpeedKmS({ positionEcefKm: ecefPos, velocityEcefKmS: ecefVel }) });
  };
  const net = createNetworkFeed({ startS, endS, stepS, cases, linkNames: layout.linkNames, protoLinks: protoLink, satellite: sat.name, policy: scenario.network });
  /** The accumulators, made when the first chunk is swept (a sweeper built only for its engines has none). */
  const makeAccumulators = () => {
    for (const st of stations) {
      for (const lr of st.links) {
        if (lr.daily.length > 0) continue;
        lr.daily = cases.map((c) => createDailyAccumulator({ startS, endS, link: lr.link, weather: c.name, exportable: true }));
        lr.mask = cases.map((c) => createMaskHistogram({ station: lr.station, link: lr.link.name, weather: c.name }));
        lr.rate = cases.map((c) => (lr.link.modcod.kind === 'fixed' ? createRateHistogram({ station: lr.station, link: lr.link.name, weather: c.name, growable: true }) : null));
      }
    }
  };

  async function sweepChunk(items: readonly PlannedPass[], chunk: number, o: SweepOptions): Promise<ChunkPartial> {
    const seriesMax = o.seriesMaxPoints ?? 120;
    const sgp4Before = satOrbit.sgp4Calls;
    const passTable = new PassLinkTable(cases.map((c) => c.name));
    const profGridS = scenario.volumeProfileGridS;
    const profiles = profGridS ? new VolumeProfiles(profGridS, nCases) : null;
    const full = o.onWindow !== undefined || o.onStep !== undefined;
    const part: ChunkPartial = {
      satIndex: layout.satIndex, chunk, passes: [], passLinks: { weather: [], strings: [], n: 0, text: new Int32Array(0), times: new Float64Array(0), ints: new Int32Array(0), caseNums: new Float64Array(0), caseInts: new Int32Array(0), weatherNums: new Float64Array(0) }, series: [], daily: [], mask: [], rate: [], envelope: [],
      stationSteps: 0, gridTimes: 0, linkSteps: 0, sgp4Calls: 0,
    };
    makeAccumulators();
    const whatIf = o.collectWhatIf ? createWhatIfCollector() : null;
    for (const st of stations) for (const lr of st.links) lr.envelope = o.collectSeries ? cases.map(() => emptyEnvelope()) : [];
    net.begin();

    const T = o.timings;
    let clock = T ? performance.now() : 0;
    /** Add the time since the last lap to one of the timings. */
    const lap = (key: keyof SweepTimings) => { if (!T) return; const now = performance.now(); T[key] += (now - clock) / 1000; clock = now; };
    const begin = (it: PlannedPass): ItemRun => {
      const st = stations[it.station];
      lap('accumulatorsS');
      const pass = completePass(satOrbit, st.geometry, it.crossing, it.index);
      lap('passSearchS');
      part.passes.push(pass);
      whatIf?.pass(it.passId);
      const expected = Math.max(1, it.kLast - it.kFirst + 1);
      const run: ItemRun = {
        item: it, pass, st, acc: [], series: [], seriesEvery: Math.max(1, Math.ceil(expected / seriesMax)), seriesCount: st.links.map(() => 0),
        passNo: part.passes.length - 1,
        prof: profGridS ? st.links.map(() => new ProfileBuilder(startS, profGridS, nCases)) : null,
      };
      const info = {
        passId: it.passId, satellite: sat.name, station: st.name, aosS: pass.aosS, tcaS: pass.tcaS, losS: pass.losS,
        maxElevationDeg: pass.maxElevationDeg, durationS: pass.durationS, clippedStart: pass.clippedStart, clippedEnd: pass.clippedEnd,
        timingUncertaintyS: passTimingUncertaintyS(pass.tcaS),
      };
      for (const lr of st.links) {
        lr.engine.beginPass();
        const reused = lr.accPool.pop();
        if (reused) reused.reset(info);
        run.acc.push(reused ?? createPassAccumulator({ link: lr.link, pass: info, weatherCases: cases }));
        run.series.push(o.collectSeries && it.seriesLinks?.includes(lr.link.name) ? {
          passId: it.passId, link: lr.link.name, timeS: [], azimuthDeg: [], elevationDeg: [],
          cases: cases.map((c) => ({ weather: c.name, marginDB: [], ebN0DB: [] })),
        } : null);
      }
      return run;
    };
    const end = (run: ItemRun) => {
      run.st.links.forEach((lr, l) => {
        const summary = run.acc[l].finish();
        lr.accPool.push(run.acc[l]);
        passTable.push(summary);
        if (run.prof && profiles) profiles.push(run.item.passId, lr.link.name, run.prof[l].finish());
        summary.cases.forEach((c, ci) => lr.daily[ci].endPass(run.pass.aosS, c.verdict));
        const s = run.series[l];
        if (s) part.series.push(s);
      });
      o.onPassDone?.(run.pass.durationS);
    };
    /** What the accumulators take from one pass-link over its part of a window. */
    const accumulate = (run: ItemRun, l: number, slot: Slot, k0: number, n: number) => {
      const lr = run.st.links[l];
      const cols = slot.cols[l];
      run.acc[l].addColumns(cols, 0, n, startS, k0, stepS);
      run.prof?.[l].add(cols, n, k0, stepS);
      const el = slot.stn.elevationDeg;
      const limited = cols.mountLimited;
      for (let ci = 0; ci < nCases; ci++) {
        const c = cols.cases[ci];
        lr.daily[ci].addColumns(startS, k0, stepS, 0, n, c.usable, c.informationRateBps, c.esN0DB);
        lr.mask[ci].addBins(slot.bins, c.usable, c.informationRateBps, limited, n, stepS);
        lr.rate[ci]?.addColumn(c.cOverN0DBHz, 0, n, stepS);
        if (lr.envelope.length > 0) {
          const env = lr.envelope[ci];
          const lo = env.subarray(0, ENVELOPE_BINS), hi = env.subarray(ENVELOPE_BINS, 2 * ENVELOPE_BINS), kh = env.subarray(2 * ENVELOPE_BINS);
          // Keyhole steps (unusable while the mount was rate-limited) apart: no elevation mask removes them (the mask finder leaves them out too).
          for (let i = 0; i < n; i++) envelopeAdd(lo, hi, kh, el[i], c.marginDB[i], limited[i] === 1 && c.usable[i] === 0);
        }
      }
      const s = run.series[l];
      if (s) {
        const every = run.seriesEvery;
        let count = run.seriesCount[l];
        for (let i = 0; i < n; i++, count++) {
          if (count % every !== 0) continue;
          s.timeS.push(startS + (k0 + i) * stepS); s.azimuthDeg.push(slot.stn.azimuthDeg[i]); s.elevationDeg.push(el[i]);
          for (let ci = 0; ci < nCases; ci++) {
            s.cases[ci].marginDB.push(cols.cases[ci].marginDB[i]);
            s.cases[ci].ebN0DB.push(cols.cases[ci].ebN0DB[i]);
          }
        }
        run.seriesCount[l] = count;
      }
    };

    /** One station in view for a link over a window: per grid time the candidate parts. */
    interface Active extends InView { run: ItemRun; slot: Slot }

    const stepRecord = o.onStep ? createStepBudget(cases) : null;
    const event: StepEvent | null = o.onStep ? { passId: '', satellite: sat.name, station: '', link: protoLink[0], timeS: NaN, step: stepRecord! } : null;
    const emit = async (active: Active[], w0: number, w1: number) => {
      if (!o.onWindow && !o.onStep) return;
      const parts: StepPart[] = [];
      for (const x of active) {
        x.run.st.links.forEach((lr, l) => parts.push({
          passId: x.run.item.passId, satellite: sat.name, station: x.run.st.name, link: lr.link, modeNames: lr.engine.modeNames,
          k0: x.k0, n: x.n, stn: x.slot.stn, cols: x.slot.cols[l],
        }));
      }
      const w: StepWindow = { startS, stepS, k0: w0, k1: w1, parts };
      if (o.onWindow) { const wait = o.onWindow(w); if (wait) await wait; }
      if (o.onStep && event && stepRecord) {
        await forEachRow(w, (p, i, t) => {
          readStep(p.stn, p.cols, i, t, p.modeNames, stepRecord);
          event.passId = p.passId; event.station = p.station; event.link = p.link; event.timeS = t;
          return o.onStep!(event);
        });
      }
    };

    // Groups: passes whose grid intervals overlap or touch one after another.
    let i = 0;
    while (i < items.length) {
      const it = items[i];
      if (it.kLast < it.kFirst) { end(begin(it)); i++; continue; } // a pass too short to hold a grid point
      const group: PlannedPass[] = [it];
      let maxLast = it.kLast;
      let j = i + 1;
      while (j < items.length && (items[j].kLast < items[j].kFirst || items[j].kFirst <= maxLast)) {
        if (items[j].kLast >= items[j].kFirst) { group.push(items[j]); if (items[j].kLast > maxLast) maxLast = items[j].kLast; }
        j++;
      }
      // Step-less passes inside the group's span are summarised in order too.
      for (let q = i + 1; q < j; q++) if (items[q].kLast < items[q].kFirst) end(begin(items[q]));
      const K0 = it.kFirst;
      const runs = new Map<PlannedPass, ItemRun>();
      for (let w0 = K0; w0 <= maxLast; w0 += WINDOW_STEPS) {
        const w1 = Math.min(w0 + WINDOW_STEPS, maxLast + 1);
        const n = w1 - w0;
        satCols.n = n; satCols.k0 = w0;
        lap('accumulatorsS');
        satOrbit.fillGrid(w0, n, satCols.teme);
        satelliteEarthFixed(satCols);
        lap('propagationS');
        part.gridTimes += n;
        const active: Active[] = [];
        for (const g of group) {
          if (g.kFirst >= w1 || g.kLast < w0) continue;
          let run = runs.get(g);
          if (!run) { run = begin(g); runs.set(g, run); }
          const a = Math.max(g.kFirst, w0), b = Math.min(g.kLast + 1, w1), m = b - a;
          const slot = acquire(run.st);
          lap('accumulatorsS');
          stationLook(run.st.geometry.frame, satCols, a - w0, b - w0, slot.stn);
          lap('geometryS');
          const mh = run.st.links[0].mask[0];
          for (let q = 0; q < m; q++) slot.bins[q] = mh.binOf(slot.stn.elevationDeg[q]);
          part.stationSteps += m;
          for (let l = 0; l < run.st.links.length; l++) {
            const p = run.st.pointingOf[l];
            const engine = run.st.links[l].engine;
            if (p === l) engine.spacecraftOffBoresight(satCols, a - w0, slot.stn, m, slot.scOff[l]);
            engine.evaluateColumns(satCols, a - w0, slot.stn, m, slot.cols[l], full, slot.scOff[p]);
            lap('budgetS');
            part.linkSteps += m;
            accumulate(run, l, slot, a, m);
            lap('accumulatorsS');
          }
          if (whatIf) whatIf.add(run.item.station, run.passNo, a, m, slot.stn, run.st.maskOnApparent, slot.cols, run.st.links.length);
          active.push({ run, slot, k0: a, n: m, station: run.st, cols: slot.cols });
        }
        net.window(active, w0, w1);
        lap('accumulatorsS');
        await emit(active, w0, w1);
        lap('stepsS');
        for (const x of active) {
          x.run.st.free.push(x.slot);
          if (x.run.item.kLast < w1) { end(x.run); runs.delete(x.run.item); }
        }
      }
      net.closeContact();
      i = j;
    }

    // The chunk's share of each accumulator (each is emptied for the next chunk).
    for (const st of stations) {
      for (const lr of st.links) {
        for (let ci = 0; ci < nCases; ci++) {
          part.daily.push(lr.daily[ci].takeState());
          part.mask.push(lr.mask[ci].takeState());
          const rh = lr.rate[ci];
          part.rate.push(rh ? rh.takeState() : null);
          if (lr.envelope.length > 0) part.envelope.push(lr.envelope[ci]);
        }
        lr.envelope = [];
      }
    }
    for (const st of net.takeStates()) part.daily.push(st);
    part.sgp4Calls = satOrbit.sgp4Calls - sgp4Before;
    part.passLinks = passTable.exportState();
    if (whatIf) {
      const d = whatIf.take();
      if (o.collectWhatIf === 'summary') {
        lap('accumulatorsS');
        const { startS, endS, stepS } = scenario.window;
        part.whatIfSummary = summariseWhatIf({
          startS, endS, stepS, nCases, elevationQuantumDeg: WHATIF_ELEVATION_QUANTUM_DEG, cn0QuantumDB: WHATIF_CN0_QUANTUM_DB,
          linkNames: layout.linkNames, stations: layout.stations, passes: part.passes, parts: d.parts, elevation: d.elevation, cn0: d.cn0,
        });
        part.whatIf = { parts: new Int32Array(0), elevation: new Int32Array(0), cn0: new Int32Array(0), passIds: d.passIds };
        lap('whatIfS');
      } else {
        part.whatIf = d;
      }
    }
    if (profiles) part.profiles = profiles.exportState();
    return part;
  }

  return { layout, engines, orbit: satOrbit, sweepChunk };
}
