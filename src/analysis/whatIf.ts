/**
 * The what-if recomputation: a run's per-step C/N0 and mask elevation (as the
 * sweep collected them, sweep/whatIfCollect.ts) with a link's EIRP, G/T, rate,
 * required margin or elevation mask changed, through the run's own rules:
 * the per-step rule (budget/caseRule.ts: usable test, adaptive mode choice
 * with the same mode table), the pass summary and verdict
 * (passAccumulator.ts, verdict.ts), the daily aggregate (dailyAccumulator.ts)
 * and the network arbitration (sweep/network.ts). Browser-clean: the report
 * page bundles this module (esbuild, at build time) and runs it on the data
 * the page carries.
 *
 * Exact apart from the quantisation of the carried columns (C/N0 to
 * 0.001 dB, elevation to 0.01°), with one approximation for a raised mask:
 * a pass's new AOS/LOS (the verdict's time above the mask) are interpolated
 * linearly in elevation between the grid steps either side of the new mask,
 * where the run root-finds them.
 */
import { applyCaseRule, createCaseRule } from '../budget/caseRule.js';
import type { LinkColumns } from '../budget/linkColumns.js';
import type { LinkSpec, ModCodSpec } from '../budget/types.js';
import type { NetworkPolicy } from '../scenario/types.js';
import { createNetworkFeed, type InView } from '../sweep/network.js';
import { WINDOW_STEPS } from '../sweep/window.js';
import { createDailyAccumulator, NETWORK_STATION, type DailyAccumulator } from './dailyAccumulator.js';
import { createPassAccumulator } from './passAccumulator.js';
import type { DailyRow, PassLinkSummary } from './types.js';

/** What the page carries of a link: what the rules read. */
export type WhatIfLinkSpec = Pick<LinkSpec, 'name' | 'direction' | 'station' | 'satellite' | 'modcod' | 'requiredMarginDB' | 'implementationLossDB'>;

export interface WhatIfPassInfo {
  passId: string;
  /** Index into the satellite's `stations`. */
  station: number;
  aosS: number;
  losS: number;
  tcaS: number;
  durationS: number;
  maxElevationDeg: number;
  clippedStart: boolean;
  clippedEnd: boolean;
}

export interface WhatIfSatelliteData {
  satellite: string;
  linkNames: string[];
  stations: { name: string; rank0: number; rank1: number; links: WhatIfLinkSpec[] }[];
  passes: WhatIfPassInfo[];
  /** Per part: station, pass, first grid index, steps (4 integers each). */
  parts: Int32Array;
  /** Mask elevation per part step (units of `elevationQuantumDeg`). */
  elevation: Int32Array;
  /** Per part, per station link, per case, per step: C/N0 (units of `cn0QuantumDB`). */
  cn0: Int32Array;
}

export interface WhatIfData {
  startS: number;
  endS: number;
  stepS: number;
  weather: string[];
  policy: NetworkPolicy;
  elevationQuantumDeg: number;
  cn0QuantumDB: number;
  satellites: WhatIfSatelliteData[];
}

/** The changes to one link (absent fields: as in the run). */
export interface WhatIfChange {
  link: string;
  eirp_delta_db?: number;
  gt_delta_db?: number;
  /** Fixed-rate links. */
  bit_rate_bps?: number;
  /** Adaptive links. */
  symbol_rate_baud?: number;
  required_margin_db?: number;
  /** Every station's mask raised to at least this (deg): max(mask(azimuth), mask_deg). */
  mask_deg?: number;
}

export interface WhatIfDaily { days_utc: string[]; daily_volume_bits: number[]; usable_passes: number }

export interface WhatIfResult {
  cases: Record<string, { network: WhatIfDaily; stations: Record<string, WhatIfDaily> }>;
}

/** The hook's result and what the panel draws: daily rows and the pass summaries of the link. */
export interface WhatIfDetail {
  result: WhatIfResult;
  /** Per case: station and network daily rows (network rows have station NETWORK_STATION). */
  daily: DailyRow[];
  passes: PassLinkSummary[];
}

/** The link spec with the change applied (rate, required margin). */
export function changedLink(l: WhatIfLinkSpec, c: WhatIfChange): LinkSpec {
  let modcod: ModCodSpec = l.modcod;
  if (modcod.kind === 'fixed' && c.bit_rate_bps !== undefined) modcod = { ...modcod, bitRateBps: c.bit_rate_bps };
  if (modcod.kind === 'adaptive' && c.symbol_rate_baud !== undefined) modcod = { ...modcod, symbolRateBaud: c.symbol_rate_baud };
  return { ...l, modcod, requiredMarginDB: c.required_margin_db ?? l.requiredMarginDB } as LinkSpec;
}

/** Check a change: one line per problem (WHERE: what is wrong (what is allowed)). */
export function checkWhatIfChange(data: WhatIfData, c: WhatIfChange): string | null {
  return checkLinkChange(data.satellites.flatMap((s) => s.linkNames), c);
}

/** Check a change against the run's link names. */
export function checkLinkChange(linkNames: readonly string[], c: WhatIfChange): string | null {
  const links = new Set(linkNames);
  if (!links.has(c.link)) return `link: "${c.link}" is not a link of this run (allowed ${[...links].join(', ')})`;
  const fin = (k: keyof WhatIfChange, lo: number, hi: number) => {
    const v = c[k];
    if (v === undefined) return null;
    return typeof v === 'number' && Number.isFinite(v) && v >= lo && v <= hi ? null : `${k}: ${String(v)} is out of range (allowed ${lo} to ${hi})`;
  };
  return fin('eirp_delta_db', -60, 60) ?? fin('gt_delta_db', -60, 60) ?? fin('bit_rate_bps', 1e-3, 1e12) ?? fin('symbol_rate_baud', 1e-3, 1e12)
    ?? fin('required_margin_db', -60, 60) ?? fin('mask_deg', -5, 89);
}

/** One pass's steps gathered from its parts: quantised mask elevation and C/N0 per station link and case. */
export interface PassSteps {
  /** Index into the satellite's passes. */
  pass: number;
  station: number;
  /** Grid index of the first step, and step count. */
  k0: number;
  n: number;
  el: Int32Array;
  /** The C/N0 column of the station's link l, case ci. */
  cn0(l: number, ci: number): Int32Array;
}

/** Each pass's parts (contiguous grid times, in order) gathered, passes in the order of their numbers; passes with no part left out. */
export function passSteps(s: { parts: Int32Array; elevation: Int32Array; cn0: Int32Array; stations: readonly { links: readonly unknown[] }[]; nCases: number }): PassSteps[] {
  const { parts, nCases } = s;
  const partsOf = new Map<number, number[]>();
  const elOff: number[] = [], cnOff: number[] = [];
  let eo = 0, co = 0;
  for (let p = 0; p * 4 < parts.length; p++) {
    const st = parts[4 * p], pass = parts[4 * p + 1], n = parts[4 * p + 3];
    let list = partsOf.get(pass);
    if (!list) partsOf.set(pass, (list = []));
    list.push(p);
    elOff.push(eo); cnOff.push(co);
    eo += n; co += n * s.stations[st].links.length * nCases;
  }
  return [...partsOf.keys()].sort((a, b) => a - b).map((pass) => {
    const ps = partsOf.get(pass)!;
    const station = parts[4 * ps[0]], k0 = parts[4 * ps[0] + 2];
    let n = 0;
    for (const p of ps) n += parts[4 * p + 3];
    const nl = s.stations[station].links.length;
    const el = new Int32Array(n);
    const cn = new Int32Array(n * nl * nCases);
    let o = 0;
    for (const p of ps) {
      const m = parts[4 * p + 3];
      el.set(s.elevation.subarray(elOff[p], elOff[p] + m), o);
      for (let lc = 0; lc < nl * nCases; lc++) cn.set(s.cn0.subarray(cnOff[p] + lc * m, cnOff[p] + (lc + 1) * m), lc * n + o);
      o += m;
    }
    return { pass, station, k0, n, el, cn0: (l: number, ci: number) => cn.subarray((l * nCases + ci) * n, (l * nCases + ci + 1) * n) };
  });
}

/**
 * A pass's runs [a, b) of steps at or above `floor` (deg; the whole pass when
 * undefined) with their AOS/LOS: the pass's own at its ends, else the mask
 * crossing interpolated linearly in elevation between the grid steps either
 * side (step i at startS + (k0 + i)·stepS).
 */
export function maskRuns(el: Float64Array, n: number, floor: number | undefined, startS: number, k0: number, stepS: number, passAosS: number, passLosS: number):
  { a: number; b: number; aosS: number; losS: number }[] {
  const out: { a: number; b: number; aosS: number; losS: number }[] = [];
  const cross = (i: number, j: number) => startS + (k0 + i) * stepS + ((floor! - el[i]) / (el[j] - el[i])) * stepS;
  let a = 0;
  while (a < n) {
    if (floor !== undefined && !(el[a] >= floor)) { a++; continue; }
    let b = a + 1;
    while (b < n && (floor === undefined || el[b] >= floor)) b++;
    out.push({ a, b, aosS: a === 0 ? passAosS : cross(a - 1, a), losS: b === n ? passLosS : cross(b - 1, b) });
    a = b;
  }
  return out;
}

interface Sub {
  pass: WhatIfPassInfo;
  station: number;
  /** Grid index of the first step and step count. */
  k0: number;
  n: number;
  aosS: number;
  losS: number;
  durationS: number;
  /** The link's case columns over the steps (null when the station has no such link). */
  cols: LinkColumns | null;
  linkSpec: LinkSpec | null;
}

/** Columns the per-step rule (budget/caseRule.ts applyCaseRule) reads and writes, n entries. */
export function caseColumns(n: number) {
  const f = () => new Float64Array(n);
  return { cOverN0DBHz: f(), esN0DB: f(), ebN0DB: f(), requiredEbN0DB: f(), marginDB: f(), usable: new Uint8Array(n), mode: new Int16Array(n), informationRateBps: f() };
}
type Cases = ReturnType<typeof caseColumns>;

function view(cols: LinkColumns, from: number): LinkColumns {
  return { ...cols, cases: cols.cases.map((c) => {
    const x = c as unknown as Cases;
    return { ...c, marginDB: x.marginDB.subarray(from), usable: x.usable.subarray(from), informationRateBps: x.informationRateBps.subarray(from), esN0DB: x.esN0DB.subarray(from) };
  }) } as LinkColumns;
}

/** Each satellite's passes gathered once (the page recomputes on every control move; the data does not change). */
const gathered = new WeakMap<WhatIfSatelliteData, PassSteps[]>();
function gatheredSteps(sat: WhatIfSatelliteData, nCases: number): PassSteps[] {
  let g = gathered.get(sat);
  if (!g) gathered.set(sat, (g = passSteps({ ...sat, nCases })));
  return g;
}

/** Recompute one link with a change. */
export function whatIfDetail(data: WhatIfData, change: WhatIfChange): WhatIfDetail {
  const problem = checkWhatIfChange(data, change);
  if (problem) throw new Error(`passbudgetWhatIf: ${problem}`);
  const { startS, endS, stepS, weather } = data;
  const nCases = weather.length;
  const dEirp = change.eirp_delta_db ?? 0, dGt = change.gt_delta_db ?? 0;
  const qEl = data.elevationQuantumDeg, qC = data.cn0QuantumDB;
  const floor = change.mask_deg;
  const daily: DailyRow[] = [];
  const passes: PassLinkSummary[] = [];
  /** Per station name, per satellite seeing it: the accumulators per case (each satellite's steps in time order). */
  const stationAcc = new Map<string, DailyAccumulator[][]>();
  const networkAcc: DailyAccumulator[][] = [];

  for (const sat of data.satellites) {
    if (!sat.linkNames.includes(change.link)) continue;
    const linkIndex = sat.stations.map((st) => st.links.findIndex((l) => l.name === change.link));
    const specs = sat.stations.map((st, s) => (linkIndex[s] >= 0 ? changedLink(st.links[linkIndex[s]], change) : null));
    const rules = specs.map((l) => (l ? createCaseRule(l) : null));
    const subs: Sub[] = [];
    for (const ps of gatheredSteps(sat, nCases)) {
      const pass = sat.passes[ps.pass];
      const { station: s, k0, n } = ps;
      const el = new Float64Array(n);
      for (let i = 0; i < n; i++) el[i] = ps.el[i] * qEl;
      const cols = linkIndex[s] >= 0 ? Array.from({ length: nCases }, () => caseColumns(n)) : null;
      if (cols) {
        for (let ci = 0; ci < nCases; ci++) {
          const src = ps.cn0(linkIndex[s], ci), dst = cols[ci].cOverN0DBHz;
          for (let i = 0; i < n; i++) dst[i] = src[i] * qC + dEirp + dGt;
        }
        for (const c of cols) applyCaseRule(rules[s]!, c, n, false);
      }
      // The pass's runs of steps at or above the raised mask (the whole pass when the mask is unchanged).
      for (const { a, b, aosS, losS } of maskRuns(el, n, floor, startS, k0, stepS, pass.aosS, pass.losS)) {
        const whole = a === 0 && b === n;
        let sc: LinkColumns | null = null;
        if (cols) {
          // What the pass accumulator reads. The Sun's cost is inside the carried C/N0 already; its flags (loss per
          // step, separation) are the run's, not recomputed here: zero loss and no separation.
          const none = new Float64Array(b - a);
          sc = { n: b - a, sunSeparationDeg: new Float64Array(b - a).fill(NaN), cases: cols.map((c) => ({
            marginDB: c.marginDB.subarray(a, b), usable: c.usable.subarray(a, b), informationRateBps: c.informationRateBps.subarray(a, b), esN0DB: c.esN0DB.subarray(a, b),
            sunLossDB: none,
          })) } as unknown as LinkColumns;
        }
        subs.push({ pass, station: s, k0: k0 + a, n: b - a, aosS, losS, durationS: whole ? pass.durationS : losS - aosS, cols: sc, linkSpec: specs[s] });
      }
    }
    // Station by station: pass summaries and the daily aggregate (the run's accumulators).
    const accOf = sat.stations.map((st, s) => {
      if (!specs[s]) return null;
      const acc = weather.map((w) => createDailyAccumulator({ startS, endS, link: specs[s]!, weather: w }));
      let list = stationAcc.get(st.name);
      if (!list) stationAcc.set(st.name, (list = []));
      list.push(acc);
      return acc;
    });
    const bySt = [...subs].sort((x, y) => x.station - y.station || x.k0 - y.k0);
    for (const sub of bySt) {
      if (!sub.cols || !sub.linkSpec) continue;
      const st = sat.stations[sub.station];
      const acc = createPassAccumulator({
        link: sub.linkSpec, weatherCases: weather,
        pass: {
          passId: sub.pass.passId, satellite: sat.satellite, station: st.name, aosS: sub.aosS, tcaS: sub.pass.tcaS, losS: sub.losS,
          maxElevationDeg: sub.pass.maxElevationDeg, durationS: sub.durationS,
          clippedStart: sub.pass.clippedStart && sub.aosS === sub.pass.aosS, clippedEnd: sub.pass.clippedEnd && sub.losS === sub.pass.losS,
        },
      });
      acc.addColumns(sub.cols, 0, sub.n, startS, sub.k0, stepS);
      const summary = acc.finish();
      passes.push(summary);
      const daysAcc = accOf[sub.station]!;
      summary.cases.forEach((c, ci) => {
        const cc = sub.cols!.cases[ci];
        daysAcc[ci].addColumns(startS, sub.k0, stepS, 0, sub.n, cc.usable, cc.informationRateBps, cc.esN0DB);
        daysAcc[ci].endPass(sub.aosS, c.verdict);
      });
    }
    // The network: groups of passes overlapping in grid time (every station's), windows of WINDOW_STEPS, the run's feed.
    const proto = specs.find((l) => l !== null)!;
    const feed = createNetworkFeed({ startS, endS, stepS, cases: weather.map((name) => ({ name })) as never, linkNames: [change.link], protoLinks: [proto], satellite: sat.satellite, policy: data.policy });
    feed.begin();
    // The run's order (the plan's: AOS, then station name) is the data's pass order; a raised mask moves AOS, so sort again.
    const order = floor === undefined ? subs
      : [...subs].sort((x, y) => x.aosS - y.aosS || sat.stations[x.station].name.localeCompare(sat.stations[y.station].name));
    const stationsIV = sat.stations.map((st, s) => ({ byName: [specs[s] ? 0 : -1], rank0: st.rank0, rank1: st.rank1, links: [{ link: specs[s] ?? proto }] }));
    let i = 0;
    while (i < order.length) {
      let maxLast = order[i].k0 + order[i].n - 1;
      let j = i + 1;
      while (j < order.length && order[j].k0 <= maxLast) { maxLast = Math.max(maxLast, order[j].k0 + order[j].n - 1); j++; }
      const group = order.slice(i, j);
      for (let w0 = order[i].k0; w0 <= maxLast; w0 += WINDOW_STEPS) {
        const w1 = Math.min(w0 + WINDOW_STEPS, maxLast + 1);
        const active: InView[] = [];
        for (const g of group) {
          const gLast = g.k0 + g.n - 1;
          if (g.k0 >= w1 || gLast < w0) continue;
          const a = Math.max(g.k0, w0), b = Math.min(gLast + 1, w1);
          active.push({ k0: a, n: b - a, station: stationsIV[g.station], cols: g.cols ? [view(g.cols, a - g.k0)] : [] });
        }
        feed.window(active, w0, w1);
      }
      feed.closeContact();
      i = j;
    }
    const states = feed.takeStates();
    networkAcc.push(states.map((stt, ci) => {
      const acc = createDailyAccumulator({ startS, endS, link: proto, weather: weather[ci], station: NETWORK_STATION, satellite: sat.satellite });
      acc.mergeState(stt);
      return acc;
    }));
  }

  const result: WhatIfResult = { cases: {} };
  weather.forEach((w, ci) => {
    const net = sumDailyRows(networkAcc.map((a) => a[ci].rows()));
    const stations: Record<string, WhatIfDaily> = {};
    for (const [name, list] of stationAcc) {
      // Several satellites at a station: their days summed.
      const rows = sumDailyRows(list.map((acc) => acc[ci].rows()));
      stations[name] = packDaily(rows);
      for (const r of rows) daily.push(r);
    }
    for (const r of net) daily.push(r);
    result.cases[w] = { network: packDaily(net), stations };
  });
  passes.sort((a, b) => a.aosS - b.aosS || a.station.localeCompare(b.station));
  return { result, daily, passes };
}

/** Daily rows as the hook returns them. */
export function packDaily(rows: readonly DailyRow[]): WhatIfDaily {
  return {
    days_utc: rows.map((r) => r.dayUtc),
    daily_volume_bits: rows.map((r) => r.adaptiveVolumeBits ?? r.fixedVolumeBits),
    usable_passes: rows.reduce((a, r) => a + r.usablePasses, 0),
  };
}

/** Day-by-day sums of several satellites' rows (the same days). */
export function sumDailyRows(lists: readonly DailyRow[][]): DailyRow[] {
  return lists[0].map((r, d) => lists.slice(1).reduce((x, l) => ({
    ...x, passes: x.passes + l[d].passes, usablePasses: x.usablePasses + l[d].usablePasses, usableMinutes: x.usableMinutes + l[d].usableMinutes,
    fixedVolumeBits: x.fixedVolumeBits + l[d].fixedVolumeBits,
    adaptiveVolumeBits: x.adaptiveVolumeBits === null ? null : x.adaptiveVolumeBits + (l[d].adaptiveVolumeBits ?? 0),
  }), r));
}

/** The hook: the daily volumes and usable passes with the change applied. */
export function whatIf(data: WhatIfData, change: WhatIfChange): WhatIfResult {
  return whatIfDetail(data, change).result;
}

// ---- The page's compact form: integer columns as zigzag LEB128 varints of successive differences, base64. ----

/** Integers → base64 of the varint-coded differences (each value minus the one before, the first minus 0). */
export function encodeIntColumn(a: Int32Array, toBase64: (bytes: Uint8Array) => string): string {
  const out = new Uint8Array(a.length * 5 + 8);
  let o = 0, prev = 0;
  for (let i = 0; i < a.length; i++) {
    const d = a[i] - prev;
    prev = a[i];
    let z = d >= 0 ? 2 * d : -2 * d - 1;
    while (z >= 128) { out[o++] = (z % 128) | 128; z = Math.floor(z / 128); }
    out[o++] = z;
  }
  return toBase64(out.subarray(0, o));
}

/** The inverse of encodeIntColumn (n values). */
export function decodeIntColumn(text: string, n: number, fromBase64: (s: string) => Uint8Array): Int32Array {
  const bytes = fromBase64(text);
  const out = new Int32Array(n);
  let o = 0, prev = 0, i = 0;
  while (o < n) {
    let z = 0, mul = 1, b: number;
    do { b = bytes[i++]; z += (b & 127) * mul; mul *= 128; } while (b & 128);
    const d = z % 2 === 0 ? z / 2 : -(z + 1) / 2;
    prev += d;
    out[o++] = prev;
  }
  return out;
}

/** The page's JSON form of WhatIfData: the integer columns as encodeIntColumn text with their lengths. */
export interface WhatIfPayload extends Omit<WhatIfData, 'satellites'> {
  satellites: (Omit<WhatIfSatelliteData, 'parts' | 'elevation' | 'cn0'> & {
    parts: string; nParts: number; elevation: string; nElevation: number; cn0: string; nCn0: number;
  })[];
}

export function decodeWhatIfPayload(p: WhatIfPayload, fromBase64: (s: string) => Uint8Array): WhatIfData {
  return {
    ...p,
    satellites: p.satellites.map((s) => ({
      ...s,
      parts: decodeIntColumn(s.parts, s.nParts, fromBase64),
      elevation: decodeIntColumn(s.elevation, s.nElevation, fromBase64),
      cn0: decodeIntColumn(s.cn0, s.nCn0, fromBase64),
    })),
  };
}
