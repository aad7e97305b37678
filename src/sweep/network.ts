/**
 * The network in a sweep: per grid time, link and weather case, the one
 * station that carries the satellite (analysis/network.ts rule: eligibility,
 * outranking, tie-breaks), fed to the network's daily accumulators; a network
 * contact is a maximal run of grid times with a station in view for that
 * link, judged like a pass when it ends. Works on a window's columns.
 */
import { createDailyAccumulator, NETWORK_STATION, type DailyAccumulator, type DailyAccumulatorState } from '../analysis/dailyAccumulator.js';
import { networkEligible, networkOutranks } from '../analysis/network.js';
import { judgePass } from '../analysis/verdict.js';
import type { LinkColumns } from '../budget/linkColumns.js';
import type { LinkSpec, WeatherCase } from '../budget/types.js';
import type { NetworkPolicy } from '../scenario/types.js';
import { WINDOW_STEPS } from './window.js';

/** A station in view over part of a window: grid steps k0 … k0+n−1, its links' columns. */
export interface InView {
  k0: number;
  n: number;
  station: {
    /** Per link name: index into `links` and `cols`, or −1. */
    byName: number[];
    rank0: number;
    rank1: number;
    links: { link: LinkSpec }[];
  };
  cols: LinkColumns[];
}

export interface NetworkFeed {
  /** Start a chunk: the accumulators made on first use, the contacts closed. */
  begin(): void;
  /** The window [w0, w1) with the stations in view, in arbitration order. */
  window(inView: InView[], w0: number, w1: number): void;
  /** A group of passes ended: close each link's contact. */
  closeContact(): void;
  /** The chunk's share of the network's daily accumulators (per link name, then case), each emptied. */
  takeStates(): DailyAccumulatorState[];
}

export function createNetworkFeed(o: {
  startS: number; endS: number; stepS: number; cases: readonly WeatherCase[]; linkNames: readonly string[];
  protoLinks: readonly LinkSpec[]; satellite: string; policy: NetworkPolicy;
}): NetworkFeed {
  const { startS, endS, stepS, cases, policy } = o;
  const nLinks = o.linkNames.length, nCases = cases.length;
  let daily: DailyAccumulator[][] = [];
  const contact = o.linkNames.map(() => cases.map(() => ({ startS: NaN, usableS: 0, any: false, aboveS: 0 })));
  const clear = (nc: (typeof contact)[number][number]) => { nc.startS = NaN; nc.usableS = 0; nc.any = false; nc.aboveS = 0; };
  const chosen = {
    usable: new Uint8Array(WINDOW_STEPS), any: new Uint8Array(WINDOW_STEPS), rate: new Float64Array(WINDOW_STEPS), margin: new Float64Array(WINDOW_STEPS),
    es: new Float64Array(WINDOW_STEPS), from: new Int32Array(WINDOW_STEPS), index: new Int32Array(WINDOW_STEPS),
    rank0: new Float64Array(WINDOW_STEPS), rank1: new Float64Array(WINDOW_STEPS),
  };
  const cands: InView[] = [];
  const cl: number[] = [];

  return {
    begin() {
      if (daily.length === 0) {
        daily = o.protoLinks.map((link) => cases.map((c) => createDailyAccumulator({
          startS, endS, link, weather: c.name, station: NETWORK_STATION, satellite: o.satellite, exportable: true,
        })));
      }
      for (const row of contact) for (const nc of row) clear(nc);
    },
    closeContact() {
      for (let li = 0; li < nLinks; li++) {
        for (let ci = 0; ci < nCases; ci++) {
          const nc = contact[li][ci];
          if (Number.isNaN(nc.startS)) continue;
          daily[li][ci].endPass(nc.startS, judgePass(nc.usableS, nc.aboveS, nc.any).verdict);
          clear(nc);
        }
      }
    },
    takeStates() {
      return daily.flatMap((row) => row.map((a) => a.takeState()));
    },
    window(active, w0, w1) {
      for (let li = 0; li < nLinks; li++) {
        cands.length = 0; cl.length = 0;
        for (const x of active) {
          const l = x.station.byName[li];
          if (l >= 0) { cands.push(x); cl.push(l); }
        }
        if (cands.length === 0) continue;
        for (let ci = 0; ci < nCases; ci++) {
          const nc = contact[li][ci];
          const acc = daily[li][ci];
          if (cands.length === 1) {
            // One station in view: it carries the link at every usable step (a usable step always has a
            // margin to compare, so usable is eligible under either policy).
            const x = cands[0], l = cl[0];
            const c = x.cols[l].cases[ci];
            if (Number.isNaN(nc.startS)) nc.startS = startS + x.k0 * stepS;
            let above = nc.aboveS * 1, used = nc.usableS * 1, any = false;
            const usable = c.usable, dt = stepS * 1;
            for (let i = 0; i < x.n; i++) { above += dt; if (usable[i] === 1) { used += dt; any = true; } }
            nc.aboveS = above; nc.usableS = used; if (any) nc.any = true;
            acc.addColumns(startS, x.k0, stepS, 0, x.n, usable, c.informationRateBps, c.esN0DB, x.station.links[l].link, true);
            continue;
          }
          // Several stations: per grid time the one the rule picks (candidates in order, each over its own
          // steps, a later one taking a step only when it outranks the best so far: the rule's tie-breaks),
          // gathered into columns and fed to the network's daily accumulator a run of equal links at a time.
          const nw = w1 - w0;
          chosen.usable.fill(0, 0, nw);
          chosen.any.fill(0, 0, nw);
          chosen.from.fill(-1, 0, nw);
          for (let a = 0; a < cands.length; a++) {
            const x = cands[a];
            const c = x.cols[cl[a]].cases[ci];
            const usable = c.usable, margin = c.marginDB, rate = c.informationRateBps;
            const r0 = x.station.rank0, r1 = x.station.rank1;
            const off = x.k0 - w0;
            for (let i = 0; i < x.n; i++) {
              const q = off + i;
              chosen.any[q] = 1;
              const m = margin[i];
              if (!networkEligible(policy, usable[i] === 1, m)) continue;
              const r = rate[i];
              const f = chosen.from[q];
              if (f >= 0 && !networkOutranks(policy, r, m, r0, r1, chosen.rate[q], chosen.margin[q], chosen.rank0[q], chosen.rank1[q])) continue;
              chosen.from[q] = a; chosen.index[q] = i; chosen.rate[q] = r; chosen.margin[q] = m; chosen.rank0[q] = r0; chosen.rank1[q] = r1;
            }
          }
          for (let q = 0; q < nw; q++) {
            if (chosen.any[q] !== 1) continue;
            if (Number.isNaN(nc.startS)) nc.startS = startS + (w0 + q) * stepS;
            nc.aboveS += stepS;
            const f = chosen.from[q];
            if (f < 0) continue;
            chosen.usable[q] = 1;
            chosen.es[q] = cands[f].cols[cl[f]].cases[ci].esN0DB[chosen.index[q]];
            nc.usableS += stepS;
            nc.any = true;
          }
          for (let q = 0; q < nw;) {
            if (chosen.usable[q] !== 1) { q++; continue; }
            const a = chosen.from[q];
            let r = q + 1;
            while (r < nw && chosen.usable[r] === 1 && chosen.from[r] === a) r++;
            const x = cands[a];
            acc.addColumns(startS, w0, stepS, q, r, chosen.usable, chosen.rate, chosen.es, x.station.links[cl[a]].link, true);
            q = r;
          }
        }
      }
    },
  };
}
