/**
 * The plan of a satellite's sweep: its passes over every station (AOS/LOS),
 * their grid intervals, and the chunks the sweep is cut into.
 *
 * Passes are searched in slabs of the window (PASS_SLAB_S each), every
 * station of the satellite per slab on one orbit (the scan steps on the
 * orbit's nodes, so a slab costs about one SGP4 call per node spacing). A
 * slab's events are those of its part of each station's fixed scan grid, so
 * the slabs together give exactly the events of one search over the window
 * (passes/find.ts), whichever thread searched which slab. Completing a pass
 * (TCA, peak, azimuths) is left to the chunk that sweeps it.
 *
 * Chunks: the sweep of each satellite is cut into CHUNKS_PER_SATELLITE pieces
 * at grid times where no station sees it (so no pass and no network contact
 * crosses a cut), chosen from the passes alone. Each chunk is swept into
 * fresh accumulators whose state is then merged into the run's, chunk after
 * chunk, so floating-point sums and output files are the same for any number
 * of worker threads.
 */
import { assembleCrossings, scanTime, type Crossing, type CrossingEvent } from '../passes/search.js';
import { gmstRad } from '../orbit/frames.js';
import { passSearch, type PassSearch } from '../passes/find.js';
import type { OrbitSource } from '../orbit/interpolated.js';
import type { ResolvedScenario } from '../scenario/types.js';
import type { SatelliteLayout } from './layout.js';

/** Chunks per satellite: fixed (not tied to the worker count) so every run merges the same partial sums. */
export const CHUNKS_PER_SATELLITE = 24;
/** Length of a pass-search slab (s). */
export const PASS_SLAB_S = 86_400;
/** Default cap on the pass-link sections whose series are kept for the report. */
export const SERIES_MAX_SECTIONS = 300;

/** A pass to sweep: its AOS/LOS interval and grid steps kFirst … kLast (none when kLast < kFirst). */
export interface PlannedPass {
  /** Index in SatelliteLayout.stations. */
  station: number;
  /** 1-based pass number at that station. */
  index: number;
  crossing: Crossing;
  passId: string;
  kFirst: number;
  kLast: number;
  /** Names of the links whose series are kept for this pass (set by selectSeries). */
  seriesLinks?: string[];
}

export interface SatellitePlan {
  /** All passes in sweep order (AOS, then station name). */
  items: PlannedPass[];
  /** Chunk c is items[chunkStarts[c] .. chunkStarts[c + 1]). */
  chunkStarts: number[];
  /** Σ pass durations (s), for progress. */
  totalS: number;
}

export function slabCount(scenario: ResolvedScenario): number {
  const { startS, endS } = scenario.window;
  return Math.max(1, Math.ceil((endS - startS) / PASS_SLAB_S - 1e-9));
}

/** The events of one slab, per layout station. */
export interface SlabEvents {
  slab: number;
  stations: { events: CrossingEvent[]; firstAbove: boolean }[];
}

/** Searches one satellite's stations slab by slab, on one orbit. */
export interface PassSearcher {
  searchSlab(slab: number): SlabEvents;
}

export function createPassSearcher(scenario: ResolvedScenario, layout: SatelliteLayout, orbit: OrbitSource): PassSearcher {
  const { startS, endS } = scenario.window;
  const searches: PassSearch[] = layout.stations.map((st) => passSearch(orbit, st.entry.station, startS, endS));
  // Stations on the same scan grid share the satellite's Earth-fixed position at each scan time.
  const shared = new Map<number, { lo: number; hi: number; x: Float64Array; y: Float64Array; z: Float64Array }>();
  const r = new Float64Array(3), v = new Float64Array(3);
  const positions = (s: PassSearch, i0: number, i1: number) => {
    const step = s.grid.stepS;
    const lo = Math.max(0, i0 - 1), hi = Math.min(s.grid.n, i1 + 1);
    let p = shared.get(step);
    if (!p || p.lo !== lo || p.hi !== hi) {
      const n = hi - lo + 1;
      p = { lo, hi, x: new Float64Array(n), y: new Float64Array(n), z: new Float64Array(n) };
      for (let i = lo; i <= hi; i++) {
        const t = scanTime(s.grid, i);
        orbit.stateTeme(t, r, v);
        const g = gmstRad(t), c = Math.cos(g), sn = Math.sin(g);
        p.x[i - lo] = c * r[0] + sn * r[1]; p.y[i - lo] = -sn * r[0] + c * r[1]; p.z[i - lo] = r[2];
      }
      shared.set(step, p);
    }
    return p;
  };
  return {
    searchSlab(slab) {
      const from = startS + slab * PASS_SLAB_S;
      const to = slab + 1 >= slabCount(scenario) ? endS : startS + (slab + 1) * PASS_SLAB_S;
      shared.clear();
      return {
        slab,
        stations: searches.map((s) => {
          const [i0, i1] = s.range(from, to);
          const p = positions(s, i0, i1);
          const geo = s.geo;
          return s.events(i0, i1, (i) => geo.elevationMinusMaskEcef(p.x[i - p.lo], p.y[i - p.lo], p.z[i - p.lo]));
        }),
      };
    },
  };
}

/** The plan from every slab's events (slabs in any order). */
export function planFromSlabs(scenario: ResolvedScenario, layout: SatelliteLayout, slabs: readonly SlabEvents[], chunks = CHUNKS_PER_SATELLITE): SatellitePlan {
  const { startS, endS, stepS } = scenario.window;
  const ordered = [...slabs].sort((a, b) => a.slab - b.slab);
  if (ordered.length !== slabCount(scenario) || ordered.some((s, i) => s.slab !== i)) {
    throw new Error(`pass plan of ${layout.satellite}: slabs ${ordered.map((s) => s.slab).join(',')} do not cover the window`);
  }
  const items: PlannedPass[] = [];
  layout.stations.forEach((st, si) => {
    const events = ordered.flatMap((s) => s.stations[si].events);
    const crossings = assembleCrossings(events, ordered[0].stations[si].firstAbove, startS, endS);
    crossings.forEach((c, j) => {
      const kFirst = Math.ceil((c.startS - startS) / stepS - 1e-9);
      const kLast = Math.floor((c.endS - startS) / stepS + 1e-9);
      items.push({ station: si, index: j + 1, crossing: c, passId: `${layout.satellite}/${st.entry.station.name}/${j + 1}`, kFirst, kLast });
    });
  });
  const name = (it: PlannedPass) => layout.stations[it.station].entry.station.name;
  items.sort((a, b) => a.crossing.startS - b.crossing.startS || name(a).localeCompare(name(b)));
  const totalS = items.reduce((s, it) => s + (it.crossing.endS - it.crossing.startS), 0);
  return { items, chunkStarts: chunkStarts(items, chunks), totalS };
}

/** The whole plan in this thread. */
export function planSatellite(scenario: ResolvedScenario, layout: SatelliteLayout, orbit: OrbitSource, chunks = CHUNKS_PER_SATELLITE): SatellitePlan {
  const searcher = createPassSearcher(scenario, layout, orbit);
  const slabs: SlabEvents[] = [];
  for (let s = 0; s < slabCount(scenario); s++) slabs.push(searcher.searchSlab(s));
  return planFromSlabs(scenario, layout, slabs, chunks);
}

/**
 * Mark the first `maxSections` pass-link sections of the run, in the report's
 * order (AOS, station name, link name), as the ones whose series are kept.
 */
export function selectSeries(plans: readonly { layout: SatelliteLayout; plan: SatellitePlan }[], maxSections: number): void {
  const all: { aosS: number; station: string; link: string; item: PlannedPass }[] = [];
  for (const { layout, plan } of plans) {
    for (const it of plan.items) {
      it.seriesLinks = [];
      const st = layout.stations[it.station];
      for (const l of st.links) all.push({ aosS: it.crossing.startS, station: st.entry.station.name, link: l.name, item: it });
    }
  }
  if (!(maxSections > 0)) return;
  all.sort((a, b) => a.aosS - b.aosS || a.station.localeCompare(b.station) || a.link.localeCompare(b.link));
  for (let i = 0; i < Math.min(maxSections, all.length); i++) all[i].item.seriesLinks!.push(all[i].link);
}

/**
 * Cut points: before a pass that has grid steps and starts after every earlier
 * pass's last grid step (no station in view in between), at the first such
 * point past each 1/chunks of the grid steps.
 */
export function chunkStarts(items: readonly PlannedPass[], chunks: number): number[] {
  const steps = (it: PlannedPass) => Math.max(0, it.kLast - it.kFirst + 1);
  const total = items.reduce((s, it) => s + steps(it), 0);
  const starts = [0];
  let done = 0;
  let maxLast = -Infinity;
  for (let i = 0; i < items.length; i++) {
    const it = items[i];
    const n = steps(it);
    if (i > 0 && n > 0 && it.kFirst > maxLast && done >= (total * starts.length) / chunks) starts.push(i);
    done += n;
    if (n > 0 && it.kLast > maxLast) maxLast = it.kLast;
  }
  starts.push(items.length);
  return starts;
}
