/**
 * The what-if panel for windows too long to carry every step (beyond
 * WHATIF_MAX_DAYS): the run's per-step columns (sweep/whatIfCollect.ts)
 * reduced, chunk by chunk, to
 *   - histograms per station (and for the network), link, weather case and
 *     UTC day of the steps by elevation bin (1°, the mask-tested elevation)
 *     and C/N0 bin (0.25 dB): the daily volumes, usable minutes and the worst
 *     margin are recomputed from these, each bin's steps taken as spread
 *     evenly across it (the rule applied at 8 points across the bin);
 *   - per pass (and per network contact), link, case and whole-degree mask
 *     m: the C/N0 of the K-th best step above m, where K is the fewest usable
 *     steps the verdict rule (analysis/verdict.ts) calls usable for that
 *     pass's time above m. The usable test is monotone in C/N0, so the pass
 *     is usable under a change exactly when that step is: usable-pass counts
 *     are exact (that C/N0 to 0.001 dB) for masks in whole degrees.
 * The network's histograms take, per grid time with a station in view, the
 * in-view station with the highest C/N0 (its elevation for the mask): exact
 * for fixed-rate links under either policy and for adaptive links under
 * highest-rate when the stations share the link's rule; under a priority
 * policy an adaptive link's network rate is the best station's (an upper
 * bound). A network contact's thresholds take, per mask, the best station
 * above it, and a mask that splits a contact gives each part its own. A
 * raised mask moves no pass to another day (the run's AOS day).
 * Browser-clean: the page bundles this module and applies the run's own
 * per-step rule (budget/caseRule.ts) to the bins.
 */
import { applyCaseRule, createCaseRule } from '../budget/caseRule.js';
import type { NetworkPolicy } from '../scenario/types.js';
import { utcDayLabel, utcDayNumber, utcDaysOfWindow } from './utcDay.js';
import { DEFAULT_VERDICT_RULE, type VerdictRule } from './verdict.js';
import { NETWORK_STATION } from './dailyAccumulator.js';
import type { DailyRow } from './types.js';
import { caseColumns, changedLink, checkLinkChange, decodeIntColumn, encodeIntColumn, maskRuns, packDaily, passSteps, sumDailyRows, type WhatIfChange, type WhatIfDaily, type WhatIfData, type WhatIfLinkSpec, type WhatIfPassInfo, type WhatIfResult } from './whatIf.js';

/** Bin widths of the summary's histograms. */
export const SUMMARY_ELEVATION_BIN_DEG = 1;
export const SUMMARY_CN0_BIN_DB = 0.25;
/** Quantum of the pass thresholds (dB). */
export const SUMMARY_THRESHOLD_QUANTUM_DB = 0.001;
/** An integer that is no value (a step with no C/N0, a pass that can never be usable). */
const MISSING = -2147483648;
/** A network contact's value at a mask that splits it (its parts follow as items of their own). */
const SPLIT = -2147483647;
/** Points per C/N0 bin at which the page applies the rule. */
const SUB = 8;
const EL_OFF = 1000, CN_OFF = 1_000_000, CN_SPAN = 2_000_001;

/** What a satellite's (or one chunk's) per-step columns are summarised from. */
export interface SummaryInput {
  startS: number;
  endS: number;
  stepS: number;
  nCases: number;
  elevationQuantumDeg: number;
  cn0QuantumDB: number;
  /** The satellite's link names (the index `link` of groups and items). */
  linkNames: readonly string[];
  /** Layout stations: their links' names in column order. */
  stations: readonly { links: readonly { name: string }[] }[];
  /** The passes the parts index (AOS, LOS, time above the mask). */
  passes: readonly { aosS: number; losS: number; durationS: number }[];
  parts: Int32Array;
  elevation: Int32Array;
  cn0: Int32Array;
  rule?: VerdictRule;
  /** C/N0 bin width (dB; default SUMMARY_CN0_BIN_DB), a multiple of cn0QuantumDB. */
  cn0BinDB?: number;
}

/** A summary (of a chunk, or merged): plain typed arrays. */
export interface WhatIfSummaryPart {
  /** Per group: series (layout station, −1 for the network), link, case, day index, cell count (5 integers). */
  groups: Int32Array;
  /** Per cell of the groups in order: elevation bin (whole degrees), C/N0 bin (in units of the bin width, cn0BinDB), steps. */
  cellEl: Int32Array;
  cellCn: Int32Array;
  cellCount: Int32Array;
  /**
   * Per pass or contact item: series, link, case, day index, pass number (−1 for a network contact; −2 − j for
   * the part of a contact that mask index j splits, counted at that mask only), first mask mA, values nM (7 integers).
   */
  items: Int32Array;
  /** Per item, nM values (C/N0 in SUMMARY_THRESHOLD_QUANTUM_DB units, MISSING: never usable, SPLIT: see the parts): value 0 with the run's mask (or any mask ≤ mA), value j with mask mA + j. */
  tStar: Int32Array;
}

/** The fewest usable steps whose time passes the verdict rule's "usable" test for `aboveS` above the mask. */
function neededSteps(aboveS: number, stepS: number, rule: VerdictRule, sums: number[]): number {
  // sums[k]: k steps' time summed as the accumulators add it (one step at a time), extended as needed; the first k that passes.
  const ok = (k: number) => k >= 1 && sums[k] >= rule.minUsableS && sums[k] >= rule.minUsableFraction * aboveS;
  const guess = Math.max(1, Math.ceil(Math.max(rule.minUsableS, rule.minUsableFraction * aboveS) / stepS) + 2);
  while (sums.length <= guess) sums.push(sums[sums.length - 1] + stepS);
  let lo = 0, hi = guess;
  while (!ok(hi)) { hi *= 2; while (sums.length <= hi) sums.push(sums[sums.length - 1] + stepS); }
  // The sums increase with k: bisect for the first k that passes.
  while (hi - lo > 1) { const mid = (lo + hi) >> 1; if (ok(mid)) hi = mid; else lo = mid; }
  return hi;
}

/** Per whole-degree mask from floor(min elevation): the K-th best C/N0 above it (the items' tStar values). */
function thresholds(elBin: Int32Array, n: number, cn: Int32Array, need: Int32Array, mA: number, nM: number, tPer: number, out: number[]): void {
  // Masks from the highest down: the steps above each added as the mask comes down past them.
  const byBin: number[][] = Array.from({ length: nM }, () => []);
  for (let i = 0; i < n; i++) if (cn[i] !== MISSING) byBin[elBin[i] - mA].push(i);
  const set = new KthLargest(cn.subarray(0, n).filter((x) => x !== MISSING));
  const got = new Array<number>(nM);
  for (let j = nM - 1; j >= 0; j--) {
    for (const i of byBin[j]) set.add(cn[i], 1);
    const v = set.kth(need[j]);
    got[j] = v === MISSING ? MISSING : Math.round(v / tPer);
  }
  for (const v of got) out.push(v);
}

/** A multiset of integers from a known set of values: add, remove and the k-th largest in O(log n) (a Fenwick tree over their ranks). */
class KthLargest {
  private readonly vals: Int32Array;
  private readonly tree: Int32Array;
  private count = 0;
  constructor(values: ArrayLike<number>) {
    const v = Int32Array.from(values).sort().reverse();
    let n = 0;
    for (let i = 0; i < v.length; i++) if (i === 0 || v[i] !== v[i - 1]) v[n++] = v[i];
    this.vals = v.slice(0, n);
    this.tree = new Int32Array(n + 1);
  }
  private rank(x: number): number {
    let lo = 0, hi = this.vals.length - 1;
    while (lo < hi) { const mid = (lo + hi) >> 1; if (this.vals[mid] > x) lo = mid + 1; else hi = mid; }
    return lo;
  }
  add(x: number, d: 1 | -1): void {
    this.count += d;
    for (let i = this.rank(x) + 1; i < this.tree.length; i += i & -i) this.tree[i] += d;
  }
  /** The k-th largest (1-based), MISSING when fewer than k. */
  kth(k: number): number {
    if (k < 1 || k > this.count) return MISSING;
    let pos = 0, rest = k;
    for (let step = 1 << Math.floor(Math.log2(this.tree.length)); step > 0; step >>= 1) {
      if (pos + step < this.tree.length && this.tree[pos + step] < rest) { pos += step; rest -= this.tree[pos]; }
    }
    return this.vals[pos];
  }
}

type CellMap = Map<number, Map<number, number>>;

/** Group key: series, link, case, day (with their counts). */
const groupKey = (series: number, link: number, c: number, day: number, nL: number, nC: number, nD: number) => (((series + 1) * nL + link) * nC + c) * nD + day;

/** Steps [from, to) of a series into its day's group cells (runs of equal cells counted once). */
function addCells(cells: CellMap, key0: number, dayOf: (i: number) => number, elBin: Int32Array, cnBin: (i: number) => number, from: number, to: number): void {
  let i = from;
  while (i < to) {
    const d = dayOf(i), e = elBin[i], c = cnBin(i);
    let j = i + 1;
    while (j < to && elBin[j] === e && cnBin(j) === c && dayOf(j) === d) j++;
    if (c !== MISSING) {
      const g = key0 + d;
      let m = cells.get(g);
      if (!m) cells.set(g, (m = new Map()));
      const ck = (e + EL_OFF) * CN_SPAN + (c + CN_OFF);
      m.set(ck, (m.get(ck) ?? 0) + (j - i));
    }
    i = j;
  }
}

function cellsToPart(cells: CellMap, nL: number, nC: number, nD: number, items: number[], tStar: number[]): WhatIfSummaryPart {
  const keys = [...cells.keys()].sort((a, b) => a - b);
  const groups: number[] = [], el: number[] = [], cn: number[] = [], count: number[] = [];
  for (const g of keys) {
    const m = cells.get(g)!;
    const day = g % nD, c = Math.floor(g / nD) % nC, link = Math.floor(g / (nD * nC)) % nL, series = Math.floor(g / (nD * nC * nL)) - 1;
    const ck = [...m.keys()].sort((a, b) => a - b);
    groups.push(series, link, c, day, ck.length);
    for (const k of ck) {
      el.push(Math.floor(k / CN_SPAN) - EL_OFF);
      cn.push((k % CN_SPAN) - CN_OFF);
      count.push(m.get(k)!);
    }
  }
  return {
    groups: Int32Array.from(groups), cellEl: Int32Array.from(el), cellCn: Int32Array.from(cn), cellCount: Int32Array.from(count),
    items: Int32Array.from(items), tStar: Int32Array.from(tStar),
  };
}

/** Summarise per-step columns (a chunk's, or a whole satellite's): the histograms and the pass and contact thresholds. */
export function summariseWhatIf(s: SummaryInput): WhatIfSummaryPart {
  const rule = s.rule ?? DEFAULT_VERDICT_RULE;
  const { startS, stepS, nCases } = s;
  const { firstDay, count: nD } = utcDaysOfWindow(s.startS, s.endS);
  const nL = Math.max(1, s.linkNames.length), nC = Math.max(1, nCases);
  const dayAt = (k: number) => Math.min(nD - 1, Math.max(0, utcDayNumber(startS + k * stepS) - firstDay));
  const per = Math.round(SUMMARY_ELEVATION_BIN_DEG / s.elevationQuantumDeg);
  const cnPer = Math.round((s.cn0BinDB ?? SUMMARY_CN0_BIN_DB) / s.cn0QuantumDB);
  const tPer = Math.round(SUMMARY_THRESHOLD_QUANTUM_DB / s.cn0QuantumDB);
  const bin = (v: number) => (v === MISSING ? MISSING : Math.round(v / cnPer));
  const qEl = s.elevationQuantumDeg;
  const linkOf = s.stations.map((st) => s.linkNames.map((name) => st.links.findIndex((l) => l.name === name)));
  const cells: CellMap = new Map();
  const items: number[] = [], tStar: number[] = [];
  const steps = passSteps(s);
  const sums = [0];
  /** n steps' time as the accumulators add it. */
  const stepSum = (n: number) => { while (sums.length <= n) sums.push(sums[sums.length - 1] + stepS); return sums[n]; };

  // Station passes.
  for (const ps of steps) {
    const { station, k0, n, el } = ps;
    const pass = s.passes[ps.pass];
    const elBin = new Int32Array(n);
    let lo = Infinity, hi = -Infinity;
    for (let i = 0; i < n; i++) { elBin[i] = Math.floor(el[i] / per); if (elBin[i] < lo) lo = elBin[i]; if (elBin[i] > hi) hi = elBin[i]; }
    const mA = lo, nM = hi - lo + 1;
    const need = new Int32Array(nM);
    const elDeg = new Float64Array(n);
    for (let q = 0; q < n; q++) elDeg[q] = el[q] * qEl;
    for (let j = 0; j < nM; j++) {
      const above = j === 0 ? pass.durationS
        : maskRuns(elDeg, n, mA + j, startS, k0, stepS, pass.aosS, pass.losS).reduce((a, r) => a + (r.a === 0 && r.b === n ? pass.durationS : r.losS - r.aosS), 0);
      need[j] = neededSteps(above, stepS, rule, sums);
    }
    const dayOf = (i: number) => dayAt(k0 + i);
    const aosDay = Math.min(nD - 1, Math.max(0, utcDayNumber(pass.aosS) - firstDay));
    for (let li = 0; li < s.linkNames.length; li++) {
      const l = linkOf[station][li];
      if (l < 0) continue;
      for (let ci = 0; ci < nCases; ci++) {
        const cn = ps.cn0(l, ci);
        addCells(cells, groupKey(station, li, ci, 0, nL, nC, nD), dayOf, elBin, (i) => bin(cn[i]), 0, n);
        items.push(station, li, ci, aosDay, ps.pass, mA, nM);
        thresholds(elBin, n, cn, need, mA, nM, tPer, tStar);
      }
    }
  }

  // The network: per group of passes overlapping in grid time, per link, the grid times with a station in view.
  const sorted = [...steps].sort((a, b) => a.k0 - b.k0);
  let i = 0;
  while (i < sorted.length) {
    let last = sorted[i].k0 + sorted[i].n - 1;
    let j = i + 1;
    while (j < sorted.length && sorted[j].k0 <= last) { last = Math.max(last, sorted[j].k0 + sorted[j].n - 1); j++; }
    const kStart = sorted[i].k0, span = last - kStart + 1;
    for (let li = 0; li < s.linkNames.length; li++) {
      const inView = new Uint8Array(span);
      const maxEl = new Int32Array(span);
      const best = new Int32Array(span * nCases).fill(MISSING);
      const bestEl = new Int32Array(span * nCases);
      let any = false;
      for (let g = i; g < j; g++) {
        const ps = sorted[g];
        const l = linkOf[ps.station][li];
        if (l < 0) continue;
        any = true;
        for (let q = 0; q < ps.n; q++) {
          const k = ps.k0 - kStart + q;
          if (inView[k] === 0) { maxEl[k] = ps.el[q]; bestEl.fill(ps.el[q], k * nCases, k * nCases + nCases); } else if (ps.el[q] > maxEl[k]) maxEl[k] = ps.el[q];
          inView[k] = 1;
        }
        for (let ci = 0; ci < nCases; ci++) {
          const cn = ps.cn0(l, ci);
          for (let q = 0; q < ps.n; q++) {
            const x = (ps.k0 - kStart + q) * nCases + ci;
            const v = cn[q];
            if (v !== MISSING && (best[x] === MISSING || v > best[x])) { best[x] = v; bestEl[x] = ps.el[q]; }
          }
        }
      }
      if (!any) continue;
      const ks: number[] = [];
      for (let k = 0; k < span; k++) if (inView[k] === 1) ks.push(k);
      const n = ks.length;
      const dayOf = (q: number) => dayAt(kStart + ks[q]);
      // A contact is in view while some station is above the mask; a raised mask can split it into several.
      const viewBin = new Int32Array(n);
      for (let q = 0; q < n; q++) viewBin[q] = Math.floor(maxEl[ks[q]] / per);
      let lo = Infinity, hi = -Infinity;
      for (const e of viewBin) { if (e < lo) lo = e; if (e > hi) hi = e; }
      const mA = lo, nM = hi - lo + 1;
      // Per mask, its runs as ranges [qa, qb) of grid times (the whole contact with the run's mask): a run's grid times
      // are consecutive, so every one between its first and last is above the mask.
      const runsAt = (jm: number): number[] => {
        if (jm === 0) return [0, n];
        const out: number[] = [];
        let qa = -1;
        for (let q = 0; q <= n; q++) {
          const kept = q < n && viewBin[q] >= mA + jm;
          if (qa >= 0 && (!kept || ks[q] !== ks[q - 1] + 1)) { out.push(qa, q); qa = -1; }
          if (kept && qa < 0) qa = q;
        }
        return out;
      };
      const runs = Array.from({ length: nM }, (_, jm) => runsAt(jm));
      for (let ci = 0; ci < nCases; ci++) {
        const elBin = new Int32Array(n), cn = new Int32Array(n);
        for (let q = 0; q < n; q++) { const x = ks[q] * nCases + ci; elBin[q] = Math.floor(bestEl[x] / per); cn[q] = best[x]; }
        addCells(cells, groupKey(-1, li, ci, 0, nL, nC, nD), dayOf, elBin, (q) => bin(cn[q]), 0, n);
        // Per mask: the K-th best of the run's grid times (the best C/N0 of the stations above the mask;
        // each grid time one step of time in view, as the network adds them). Several runs: SPLIT, and an item each.
        // Per grid time at a mask: the best C/N0 of the stations above it.
        const withLink = sorted.slice(i, j).filter((ps) => linkOf[ps.station][li] >= 0);
        // Per grid time, each station's elevation bin (NONE when not in view) and C/N0: flat, nS per grid time.
        const nS = withLink.length, NONE = -2147483647;
        const candBin = new Int32Array(n * nS).fill(NONE), candCn = new Int32Array(n * nS);
        withLink.forEach((ps, x) => {
          const col = ps.cn0(linkOf[ps.station][li], ci);
          for (let q = 0; q < n; q++) {
            const at = ks[q] + kStart - ps.k0;
            if (at < 0 || at >= ps.n) continue;
            candBin[q * nS + x] = Math.floor(ps.el[at] / per);
            candCn[q * nS + x] = col[at];
          }
        });
        const valueAt = (q: number, m: number): number => {
          if (m === -Infinity) return cn[q];
          let v = MISSING;
          for (let x = q * nS; x < (q + 1) * nS; x++) {
            if (candBin[x] === NONE || candBin[x] < m) continue;
            const c = candCn[x];
            if (c !== MISSING && (v === MISSING || c > v)) v = c;
          }
          return v;
        };
        /** The K-th best of grid times [qa, qb) at mask m (a part of a split contact). */
        const kth = (qa: number, qb: number, m: number): number => {
          const vals: number[] = [];
          for (let q = qa; q < qb; q++) { const x = valueAt(q, m); if (x !== MISSING) vals.push(x); }
          const part = new KthLargest(vals);
          for (const x of vals) part.add(x, 1);
          const v = part.kth(neededSteps(stepSum(qb - qa), stepS, rule, sums));
          return v === MISSING ? MISSING : Math.round(v / tPer);
        };
        // Masks from the highest down, each grid time's value the best of the stations above (stations activated
        // as the mask comes down past them): the K-th best of a mask with one run in O(log n).
        // Candidates by bin, highest first (a counting sort; within a bin in grid-time order).
        let bLo = Infinity, bHi = -Infinity;
        for (let x = 0; x < n * nS; x++) if (candBin[x] !== NONE && candCn[x] !== MISSING) { if (candBin[x] < bLo) bLo = candBin[x]; if (candBin[x] > bHi) bHi = candBin[x]; }
        const buckets: number[][] = bHi >= bLo ? Array.from({ length: bHi - bLo + 1 }, () => []) : [];
        for (let x = 0; x < n * nS; x++) if (candBin[x] !== NONE && candCn[x] !== MISSING) buckets[bHi - candBin[x]].push(x);
        const order: number[] = [];
        for (const b of buckets) for (const x of b) order.push(x);
        const values = new Int32Array(order.length);
        order.forEach((x, o) => { values[o] = candCn[x]; });
        const set = new KthLargest(values);
        const value = new Int32Array(n).fill(MISSING);
        const single = new Array<number>(nM).fill(MISSING);
        let next = 0, kept = 0;
        const activate = (x: number) => {
          const q = Math.floor(x / nS), c = candCn[x];
          if (value[q] !== MISSING && c <= value[q]) return;
          if (value[q] !== MISSING) set.add(value[q], -1);
          value[q] = c;
          set.add(c, 1);
        };
        const perView = new Int32Array(nM);
        for (let q = 0; q < n; q++) perView[viewBin[q] - mA]++;
        for (let jm = nM - 1; jm >= 0; jm--) {
          const m = jm === 0 ? -Infinity : mA + jm;
          while (next < order.length && candBin[order[next]] >= m) activate(order[next++]);
          kept += perView[jm];
          if (runs[jm].length !== 2) continue;
          const v = set.kth(neededSteps(stepSum(kept), stepS, rule, sums));
          single[jm] = v === MISSING ? MISSING : Math.round(v / tPer);
        }
        items.push(-1, li, ci, dayOf(0), -1, mA, nM);
        const parts: number[][] = [];
        for (let jm = 0; jm < nM; jm++) {
          const m = jm === 0 ? -Infinity : mA + jm;
          const rs = runs[jm];
          if (rs.length === 2) { tStar.push(single[jm]); continue; }
          tStar.push(SPLIT);
          for (let r = 0; r < rs.length; r += 2) parts.push([dayOf(rs[r]), jm, kth(rs[r], rs[r + 1], m)]);
        }
        for (const [day, jm, t] of parts) { items.push(-1, li, ci, day, -2 - jm, mA, 1); tStar.push(t); }
      }
    }
    i = j;
  }
  return cellsToPart(cells, nL, nC, nD, items, tStar);
}

/** The summary of a whole run's every-step what-if data (as `passbudget report DIR` and the checks make it). */
export function summariseWhatIfData(d: WhatIfData): WhatIfSummaryData {
  return {
    kind: 'summary', startS: d.startS, endS: d.endS, stepS: d.stepS, weather: d.weather, policy: d.policy,
    thresholdQuantumDB: SUMMARY_THRESHOLD_QUANTUM_DB, elevationBinDeg: SUMMARY_ELEVATION_BIN_DEG, cn0BinDB: SUMMARY_CN0_BIN_DB,
    satellites: d.satellites.map((s) => ({
      satellite: s.satellite, linkNames: s.linkNames, stations: s.stations, passes: s.passes,
      summary: summariseWhatIf({
        startS: d.startS, endS: d.endS, stepS: d.stepS, nCases: d.weather.length, elevationQuantumDeg: d.elevationQuantumDeg, cn0QuantumDB: d.cn0QuantumDB,
        linkNames: s.linkNames, stations: s.stations, passes: s.passes, parts: s.parts, elevation: s.elevation, cn0: s.cn0,
      }),
    })),
  };
}

/** Chunk summaries merged in chunk order: cells of a group summed, items in order (pass numbers made satellite-wide). */
export interface SummaryMerger {
  add(part: WhatIfSummaryPart, passOffset: number): void;
  finish(): WhatIfSummaryPart;
}

export function createSummaryMerger(nLinks: number, nCases: number, startS: number, endS: number): SummaryMerger {
  const nD = utcDaysOfWindow(startS, endS).count, nL = Math.max(1, nLinks), nC = Math.max(1, nCases);
  const cells: CellMap = new Map();
  const items: number[] = [], tStar: number[] = [];
  return {
    add(p, passOffset) {
      let c = 0;
      for (let g = 0; g < p.groups.length; g += 5) {
        const key = groupKey(p.groups[g], p.groups[g + 1], p.groups[g + 2], p.groups[g + 3], nL, nC, nD);
        let m = cells.get(key);
        if (!m) cells.set(key, (m = new Map()));
        for (let e = 0; e < p.groups[g + 4]; e++, c++) {
          const ck = (p.cellEl[c] + EL_OFF) * CN_SPAN + (p.cellCn[c] + CN_OFF);
          m.set(ck, (m.get(ck) ?? 0) + p.cellCount[c]);
        }
      }
      for (let q = 0; q < p.items.length; q += 7) {
        for (let x = 0; x < 7; x++) items.push(x === 4 && p.items[q + 4] >= 0 ? p.items[q + 4] + passOffset : p.items[q + x]);
      }
      for (const v of p.tStar) tStar.push(v);
    },
    finish: () => cellsToPart(cells, nL, nC, nD, items, tStar),
  };
}

// ---- In the page: the daily figures and pass verdicts with a change, from a summary. ----

export interface WhatIfSummarySatellite {
  satellite: string;
  linkNames: string[];
  stations: { name: string; rank0: number; rank1: number; links: WhatIfLinkSpec[] }[];
  passes: WhatIfPassInfo[];
  summary: WhatIfSummaryPart;
}

export interface WhatIfSummaryData {
  kind: 'summary';
  startS: number;
  endS: number;
  stepS: number;
  weather: string[];
  policy: NetworkPolicy;
  /** Quantum of the pass thresholds (dB). */
  thresholdQuantumDB: number;
  elevationBinDeg: number;
  cn0BinDB: number;
  satellites: WhatIfSummarySatellite[];
}

export interface WhatIfSummaryDetail {
  result: WhatIfResult;
  /** Station and network daily rows (network rows have station NETWORK_STATION; no longest gap: NaN). */
  daily: DailyRow[];
  /** Per case: the worst step margin of the link at any station (dB; bins at their centre). */
  worstMarginDB: Record<string, number>;
  /** The drawn passes' verdicts under the change: usable or not (null: no step above the mask). */
  verdicts: Map<string, Record<string, boolean | null>>;
}

/** Recompute one link with a change from a summary. */
export function whatIfSummaryDetail(data: WhatIfSummaryData, change: WhatIfChange): WhatIfSummaryDetail {
  const problem = checkLinkChange(data.satellites.flatMap((s) => s.linkNames), change);
  if (problem) throw new Error(`passbudgetWhatIf: ${problem}`);
  const { startS, endS, stepS, weather } = data;
  const { firstDay, count: nD } = utcDaysOfWindow(startS, endS);
  const nCases = weather.length;
  const shift = (change.eirp_delta_db ?? 0) + (change.gt_delta_db ?? 0);
  // Whole-degree mask: a step is above it when its elevation bin is.
  const mask = change.mask_deg === undefined ? undefined : Math.ceil(change.mask_deg - 1e-9);
  const qC = data.thresholdQuantumDB, binDB = data.cn0BinDB;
  type Sums = { passes: number; usablePasses: number; usableS: number; bits: number };
  const blank = (): Sums[][] => weather.map(() => Array.from({ length: nD }, () => ({ passes: 0, usablePasses: 0, usableS: 0, bits: 0 })));
  const stationSums = new Map<string, { sums: Sums[][]; adaptive: boolean; satellite: string }>();
  const netSums: { sums: Sums[][]; adaptive: boolean; satellite: string }[] = [];
  const worst: Record<string, number> = Object.fromEntries(weather.map((w) => [w, Infinity]));
  const verdicts = new Map<string, Record<string, boolean | null>>();
  const one = caseColumns(1);
  /** The rule's columns for the bins of a group, grown as needed (the rule reads and writes the first m entries). */
  let cols = caseColumns(1024);

  for (const sat of data.satellites) {
    const li = sat.linkNames.indexOf(change.link);
    if (li < 0) continue;
    const specs = sat.stations.map((st) => { const l = st.links.find((x) => x.name === change.link); return l ? changedLink(l, change) : null; });
    const rules = specs.map((l) => (l ? createCaseRule(l) : null));
    const si = specs.findIndex((l) => l !== null);
    const protoRule = rules[si]!;
    const adaptive = specs[si]!.modcod.kind === 'adaptive';
    const ruleOf = (series: number) => (series < 0 ? protoRule : rules[series]);
    const sumsOf = (series: number): Sums[][] => {
      if (series < 0) {
        let e = netSums.find((x) => x.satellite === sat.satellite);
        if (!e) netSums.push((e = { sums: blank(), adaptive, satellite: sat.satellite }));
        return e.sums;
      }
      const name = sat.stations[series].name;
      let e = stationSums.get(name);
      if (!e) stationSums.set(name, (e = { sums: blank(), adaptive, satellite: sat.satellite }));
      return e.sums;
    };
    const { groups, cellEl, cellCn, cellCount, items, tStar } = sat.summary;
    // Histograms: each group's bins above the mask through the link's rule at their centre C/N0.
    let c = 0;
    for (let g = 0; g < groups.length; g += 5) {
      const series = groups[g], link = groups[g + 1], ci = groups[g + 2], day = groups[g + 3], nCells = groups[g + 4];
      if (link !== li || !ruleOf(series)) { c += nCells; continue; }
      // Each bin's steps taken as spread evenly across it: the rule at SUB points across the bin, each a SUB-th of its steps.
      const m = nCells * SUB;
      if (cols.usable.length < m) cols = caseColumns(m);
      for (let e = 0; e < nCells; e++) for (let u = 0; u < SUB; u++) cols.cOverN0DBHz[e * SUB + u] = (cellCn[c + e] + (u + 0.5) / SUB - 0.5) * binDB + shift;
      applyCaseRule(ruleOf(series)!, cols, m, false);
      const sum = sumsOf(series)[ci][day];
      for (let e = 0; e < nCells; e++) {
        if (mask !== undefined && cellEl[c + e] < mask) continue;
        const t = (cellCount[c + e] * stepS) / SUB;
        if (series >= 0 && cols.marginDB[e * SUB] < worst[weather[ci]]) worst[weather[ci]] = cols.marginDB[e * SUB];
        for (let u = e * SUB; u < (e + 1) * SUB; u++) {
          if (cols.usable[u] !== 1) continue;
          sum.usableS += t;
          sum.bits += t * cols.informationRateBps[u];
        }
      }
      c += nCells;
    }
    // Passes and contacts: usable when their K-th best step is.
    let o = 0;
    for (let q = 0; q < items.length; q += 7) {
      const series = items[q], link = items[q + 1], ci = items[q + 2], day = items[q + 3], pass = items[q + 4], mA = items[q + 5], nM = items[q + 6];
      const at = o;
      o += nM;
      if (link !== li || !ruleOf(series)) continue;
      const j = mask === undefined || mask <= mA ? 0 : mask - mA;
      // A network contact's part at one mask (pass −2 − j): counted only at that mask.
      const only = pass <= -2 ? -2 - pass : -1;
      if (only >= 0 && only !== j) continue;
      let usable: boolean | null = null;
      if (only >= 0 || (j < nM && tStar[at + j] !== SPLIT)) {
        const t = tStar[at + (only >= 0 ? 0 : j)];
        usable = false;
        if (t !== MISSING) {
          one.cOverN0DBHz[0] = t * qC + shift;
          applyCaseRule(ruleOf(series)!, one, 1, false);
          usable = one.usable[0] === 1;
        }
        const sum = sumsOf(series)[ci][day];
        sum.passes++;
        if (usable) sum.usablePasses++;
      }
      if (pass >= 0) {
        const id = sat.passes[pass].passId;
        let v = verdicts.get(id);
        if (!v) verdicts.set(id, (v = {}));
        v[weather[ci]] = usable;
      }
    }
  }

  const rowsOf = (sums: Sums[][], station: string, satellite: string, adaptive: boolean, ci: number): DailyRow[] => sums[ci].map((s, d) => ({
    dayUtc: utcDayLabel(firstDay + d), station, satellite, link: change.link, weather: weather[ci],
    passes: s.passes, usablePasses: s.usablePasses, usableMinutes: s.usableS / 60,
    fixedVolumeBits: adaptive ? 0 : s.bits, adaptiveVolumeBits: adaptive ? s.bits : null, longestGapH: NaN,
  }));
  const daily: DailyRow[] = [];
  const result: WhatIfResult = { cases: {} };
  for (let ci = 0; ci < nCases; ci++) {
    const stations: Record<string, WhatIfDaily> = {};
    for (const [name, e] of stationSums) {
      const rows = rowsOf(e.sums, name, e.satellite, e.adaptive, ci);
      stations[name] = packDaily(rows);
      daily.push(...rows);
    }
    // Several satellites with this link: the network's days summed.
    const net = sumDailyRows(netSums.map((e) => rowsOf(e.sums, NETWORK_STATION, e.satellite, e.adaptive, ci)));
    daily.push(...net);
    result.cases[weather[ci]] = { network: packDaily(net), stations };
  }
  for (const w of weather) if (!Number.isFinite(worst[w])) worst[w] = NaN;
  return { result, daily, worstMarginDB: worst, verdicts };
}

// ---- The page's compact form: each integer column as encodeIntColumn text with its length. ----

const SUMMARY_COLUMNS = ['groups', 'cellEl', 'cellCn', 'cellCount', 'items', 'tStar'] as const;

export interface WhatIfSummaryPayload extends Omit<WhatIfSummaryData, 'satellites'> {
  satellites: (Omit<WhatIfSummarySatellite, 'summary'> & { summary: Record<(typeof SUMMARY_COLUMNS)[number], { text: string; n: number }> })[];
}

export function encodeWhatIfSummary(p: WhatIfSummaryPart, toBase64: (bytes: Uint8Array) => string): WhatIfSummaryPayload['satellites'][number]['summary'] {
  return Object.fromEntries(SUMMARY_COLUMNS.map((k) => [k, { text: encodeIntColumn(p[k], toBase64), n: p[k].length }])) as WhatIfSummaryPayload['satellites'][number]['summary'];
}

export function decodeWhatIfSummaryPayload(p: WhatIfSummaryPayload, fromBase64: (s: string) => Uint8Array): WhatIfSummaryData {
  return {
    ...p,
    satellites: p.satellites.map((s) => ({
      ...s,
      summary: Object.fromEntries(SUMMARY_COLUMNS.map((k) => [k, decodeIntColumn(s.summary[k].text, s.summary[k].n, fromBase64)])) as unknown as WhatIfSummaryPart,
    })),
  };
}
