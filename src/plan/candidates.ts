/**
 * Candidate contacts from a run: per pass of a satellite over a station and
 * per antenna of that station carrying at least one of the satellite's links
 * there, the union of those links' usable windows in the plan's weather
 * case, trimmed to the station's booking grid (start rounded up, end rounded
 * down), with its volume recomputed inside the trimmed window from the sweep's
 * volume profiles (sweep/profiles.ts), for every weather case. Where a window
 * is long enough, its first and second halves are candidates too (the trims
 * that let two satellites share one antenna within a pass); at most one of a
 * window's variants can be chosen.
 *
 * Booking: the time paid is max(contact, minimum_booking_s), rounded up to the
 * booking grid; the antenna is held for that time from the contact's start
 * (then setup_s before its next contact). Cost = paid minutes × price.
 */
import { PassLinkTable } from '../analysis/passTable.js';
import { SECONDS_PER_DAY } from '../orbit/time.js';
import { utcDayNumber } from '../analysis/utcDay.js';
import type { VolumeProfiles } from '../sweep/profiles.js';
import type { ResolvedPlan, ResolvedScenario } from '../scenario/types.js';

/** A window shorter than this (s) is not split into halves. */
export const MIN_SPLIT_S = 240;

export interface Candidate {
  /** Index in the candidate list (time order, then satellite, station, antenna, variant). */
  id: number;
  satellite: string;
  station: string;
  antenna: string;
  passId: string;
  /** 0: the whole window; 1, 2: its first and second half. */
  variant: number;
  /** Key shared by the variants of one window (at most one is chosen). */
  windowKey: string;
  /** The satellite's links this antenna carries and that are usable in the window (scenario order). */
  links: string[];
  /** The untrimmed window: union of the links' usable windows in the plan case (s). */
  windowStartS: number;
  windowEndS: number;
  /** The contact (s). */
  startS: number;
  endS: number;
  /** Paid (booked) time (s), and the antenna is held until startS + bookedS. */
  bookedS: number;
  heldEndS: number;
  setupS: number;
  cost: number;
  /** Volume per weather case (bits), all links. */
  volumeBits: number[];
  /** Volume in the plan case per link (bits), and split by UTC day (day number → bits per link). */
  linkBits: Record<string, number>;
  dayLinkBits: Map<number, Record<string, number>>;
  /** UTC day number of the start. */
  day: number;
}

export interface CandidateSet {
  candidates: Candidate[];
  /** Plan weather-case index. */
  caseIndex: number;
}

/**
 * The volume-profile grid for a scenario (s): the longest whole number of steps
 * up to about 10 s that divides every station's booking grid, so that trimmed
 * boundaries fall on grid times and their volumes are exact.
 */
export function profileGridS(scenario: ResolvedScenario): number {
  const step = scenario.window.stepS;
  const grids = Object.values(scenario.plan?.booking ?? {}).flatMap((b) => (b.granularityS ? [b.granularityS] : []));
  for (let k = Math.max(1, Math.round(10 / step)); k > 1; k--) {
    if (grids.every((g) => Math.abs(g / (k * step) - Math.round(g / (k * step))) < 1e-9)) return k * step;
  }
  return step;
}

export function buildCandidates(scenario: ResolvedScenario, passLinks: PassLinkTable, profiles: VolumeProfiles): CandidateSet {
  const plan = scenario.plan as ResolvedPlan;
  const { startS: W0, endS: W1, stepS } = scenario.window;
  const caseIndex = scenario.weatherCases.findIndex((w) => w.name === plan.weather);
  const nCases = scenario.weatherCases.length;
  const demand = new Map(plan.demand.map((d) => [d.satellite, d]));
  const satOrder = new Map(scenario.satellites.map((s, i) => [s.name, i]));
  // Pass-links grouped by pass id (rows of one pass are its links, in station order).
  const byPass = new Map<string, { satellite: string; station: string; link: string; u0: number; u1: number }[]>();
  /** Per pass-link, per case: the usable window [first usable step, last usable step + Δt), or null. */
  const usable = new Map<string, ([number, number] | null)[]>();
  for (let r = 0; r < passLinks.length; r++) {
    const p = passLinks.get(r);
    usable.set(`${p.passId}\u0000${p.link}`, p.cases.map((x) => (x.usableStartS === null || x.usableEndS === null ? null : [x.usableStartS, Math.min(x.usableEndS + stepS, W1)])));
    const c = p.cases[caseIndex];
    if (c.usableStartS === null || c.usableEndS === null) continue;
    let list = byPass.get(p.passId);
    if (!list) { list = []; byPass.set(p.passId, list); }
    list.push({ satellite: p.satellite, station: p.station, link: p.link, u0: c.usableStartS, u1: Math.min(c.usableEndS + stepS, W1) });
  }
  const gridS = profiles.gridS;
  /**
   * Volume of a pass-link in case c inside [a, b]: clipped to its usable window
   * in that case (nothing usable outside it, so a boundary there is exact), the
   * rest from the profile (exact on its grid times, where trims fall).
   */
  const linkVolume = (passId: string, link: string, c: number, a: number, b: number): number => {
    const u = usable.get(`${passId}\u0000${link}`)?.[c];
    if (!u) return 0;
    const lo = Math.max(a, u[0]), hi = Math.min(b, u[1]);
    if (!(hi > lo)) return 0;
    const total = profiles.total(passId, link, c);
    const upper = hi >= u[1] ? total : profiles.cumulative(passId, link, c, hi, W0);
    const lower = lo <= u[0] ? 0 : profiles.cumulative(passId, link, c, lo, W0);
    return upper - lower;
  };
  const raw: Omit<Candidate, 'id'>[] = [];
  for (const [passId, rows] of byPass) {
    const { satellite, station } = rows[0];
    const d = demand.get(satellite)!;
    const book = plan.booking[station];
    for (const ant of plan.antennas) {
      if (ant.station !== station) continue;
      const on = rows.filter((x) => ant.terminals.includes(d.linkTerminals[x.link]));
      if (on.length === 0) continue;
      const links = Object.keys(d.linkTerminals).filter((l) => on.some((x) => x.link === l));
      const w0 = Math.min(...on.map((x) => x.u0)), w1 = Math.max(...on.map((x) => x.u1));
      const g = book.granularityS;
      const a = g ? W0 + Math.ceil((w0 - W0) / g - 1e-9) * g : w0;
      const b = g ? W0 + Math.floor((w1 - W0) / g + 1e-9) * g : w1;
      if (!(b > a)) continue;
      const spans: [number, number][] = [[a, b]];
      if (b - a >= MIN_SPLIT_S) {
        const mid = W0 + Math.round(((a + b) / 2 - W0) / (g ?? gridS)) * (g ?? gridS);
        if (mid > a && mid < b) spans.push([a, mid], [mid, b]);
      }
      const windowKey = `${passId}\u0000${ant.name}`;
      spans.forEach(([s, e], variant) => {
        let booked = Math.max(e - s, book.minimumBookingS);
        if (g) booked = Math.ceil(booked / g - 1e-9) * g;
        const volumeBits = Array.from({ length: nCases }, (_, c) => links.reduce((sum, l) => sum + linkVolume(passId, l, c, s, e), 0));
        const linkBits: Record<string, number> = {};
        for (const l of links) linkBits[l] = linkVolume(passId, l, caseIndex, s, e);
        const dayLinkBits = new Map<number, Record<string, number>>();
        for (let day = utcDayNumber(s); day * SECONDS_PER_DAY < e; day++) {
          const lo = Math.max(s, day * SECONDS_PER_DAY), hi = Math.min(e, (day + 1) * SECONDS_PER_DAY);
          const rec: Record<string, number> = {};
          for (const l of links) rec[l] = linkVolume(passId, l, caseIndex, lo, hi);
          dayLinkBits.set(day, rec);
        }
        raw.push({
          satellite, station, antenna: ant.name, passId, variant, windowKey, links,
          windowStartS: w0, windowEndS: w1, startS: s, endS: e, bookedS: booked, heldEndS: s + booked, setupS: ant.setupS,
          cost: (booked / 60) * book.pricePerMinute, volumeBits, linkBits, dayLinkBits, day: utcDayNumber(s),
        });
      });
    }
  }
  const stationOrder = new Map(scenario.stations.map((s, i) => [s.station.name, i]));
  const antOrder = new Map(plan.antennas.map((a, i) => [`${a.station}\u0000${a.name}`, i]));
  raw.sort((x, y) => x.startS - y.startS || satOrder.get(x.satellite)! - satOrder.get(y.satellite)!
    || stationOrder.get(x.station)! - stationOrder.get(y.station)!
    || antOrder.get(`${x.station}\u0000${x.antenna}`)! - antOrder.get(`${y.station}\u0000${y.antenna}`)! || x.variant - y.variant);
  return { candidates: raw.map((c, id) => ({ ...c, id })), caseIndex };
}
