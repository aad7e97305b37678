/**
 * The contact plan: candidates (candidates.ts) selected horizon by horizon
 * (plan.horizon_days UTC days at a time, each horizon after the ones before
 * it: contacts already chosen stay, candidates clashing with them go, their
 * volume after midnight counts toward the next day's target), each horizon a
 * selection problem (model.ts) solved by HiGHS (highs.ts) with the greedy as
 * fallback when the time limit stops the solver.
 *
 * Objective, per horizon (normalised so the solver sees numbers near 1):
 *   max-volume: Σ weight × volume / V0 over the contacts taken (V0 the largest candidate volume);
 *   min-cost:   −Σ cost / C0, plus a tie-break of 10⁻⁴/n × volume / V0 toward more volume at equal cost;
 * minus P × (the unmet fraction of each target), P = 1 + Σ |gain|: a shortfall
 * outweighs the volume or cost it would buy, except for fractions below 1/P.
 * Targets are per satellite and UTC day: daily_volume_target_bits (all links,
 * or per link) and min_contacts_per_day (a contact counts on the day it starts).
 * Constraints: per antenna no two contacts held closer than setup_s (held =
 * the booked time); per satellite and link one contact at a time (a satellite
 * sends one stream per link); at most one variant of a window; at most
 * max_contacts_per_day per station and day.
 */
import { NETWORK_STATION } from '../analysis/dailyAccumulator.js';
import { utcDayLabel, utcDaysOfWindow } from '../analysis/utcDay.js';
import type { PipelineResult } from '../sweep/types.js';
import type { ResolvedPlan, ResolvedScenario } from '../scenario/types.js';
import { buildCandidates, type Candidate } from './candidates.js';
import { evaluate, greedy, intervalCliques, type Cap, type SelectionProblem, type Target } from './model.js';
import { solveMip } from './highs.js';

export interface HorizonResult {
  firstDayUtc: string;
  days: number;
  candidates: number;
  /** Which answer was kept. */
  method: 'highs' | 'greedy' | 'none';
  solverStatus: string;
  objective: number;
  greedyObjective: number;
  /** Upper bound on the objective (the optimum when proven). */
  bound: number | null;
  /** (bound − objective) / |bound|: 0 when proven optimal; null when no bound is known. */
  gap: number | null;
  solverTimeS: number;
}

export interface SatelliteDay {
  satellite: string;
  dayUtc: string;
  contacts: number;
  plannedBits: number;
  /** The run's volume of the satellite that day (best station at each step, every station's antennas free). */
  unconstrainedBits: number;
  lostToContentionBits: number;
  targetBits: number | null;
  /** Shortfall of the volume target (bits; per-link targets summed), 0 when met. */
  unmetBits: number;
  minContacts: number;
  unmetContacts: number;
  cost: number;
  /** Per link: planned and unconstrained (bits). */
  links: { link: string; plannedBits: number; unconstrainedBits: number; targetBits: number | null; unmetBits: number }[];
}

export interface ContactPlan {
  objective: ResolvedPlan['objective'];
  weather: string;
  candidates: Candidate[];
  /** 1 for each candidate taken. */
  chosen: Uint8Array;
  horizons: HorizonResult[];
  days: SatelliteDay[];
  totalCost: number;
  solverTimeS: number;
  /** Candidates, solves and the per-day tables together (s, wall clock). */
  planTimeS: number;
  /** Worst gap over the horizons (0: every horizon optimal). */
  gap: number | null;
}

/** Do two candidates exclude each other (one antenna within setup, or one satellite link at once, or one window)? */
export function clash(a: Candidate, b: Candidate): boolean {
  if (a.windowKey === b.windowKey) return true;
  if (a.station === b.station && a.antenna === b.antenna) {
    if (a.startS < b.heldEndS + b.setupS && b.startS < a.heldEndS + a.setupS) return true;
  }
  if (a.satellite === b.satellite && a.links.some((l) => b.links.includes(l))) {
    if (a.startS < b.endS && b.startS < a.endS) return true;
  }
  return false;
}

/** The selection problem over candidates `cs` given the contacts taken in earlier horizons. */
export function horizonProblem(scenario: ResolvedScenario, cs: readonly Candidate[], days: readonly number[], earlier: readonly Candidate[]): SelectionProblem {
  const plan = scenario.plan as ResolvedPlan;
  const n = cs.length;
  const vol = (c: Candidate) => Object.values(c.linkBits).reduce((s, v) => s + v, 0);
  const V0 = cs.reduce((m, c) => Math.max(m, vol(c)), 1);
  const C0 = cs.reduce((m, c) => Math.max(m, c.cost), 1e-9);
  const weight = new Map(plan.demand.map((d) => [d.satellite, d.weight]));
  const gain = cs.map((c) => (plan.objective === 'max-volume'
    ? (weight.get(c.satellite)! * vol(c)) / V0
    : -c.cost / C0 + (1e-4 / Math.max(1, n)) * (vol(c) / V0)));
  const groups: number[][] = [];
  const keyed = (key: (c: Candidate) => string) => {
    const m = new Map<string, number[]>();
    cs.forEach((c, i) => { const k = key(c); let l = m.get(k); if (!l) { l = []; m.set(k, l); } l.push(i); });
    return m;
  };
  for (const vs of keyed((c) => `${c.station}\u0000${c.antenna}`).values()) {
    groups.push(...intervalCliques(vs.map((v) => ({ v, start: cs[v].startS, end: cs[v].heldEndS + cs[v].setupS }))));
  }
  const satLink = new Map<string, number[]>();
  cs.forEach((c, i) => { for (const l of c.links) { const k = `${c.satellite}\u0000${l}`; let a = satLink.get(k); if (!a) { a = []; satLink.set(k, a); } a.push(i); } });
  for (const vs of satLink.values()) groups.push(...intervalCliques(vs.map((v) => ({ v, start: cs[v].startS, end: cs[v].endS }))));
  for (const vs of keyed((c) => c.windowKey).values()) if (vs.length > 1) groups.push(vs);
  // Deduplicate groups (the same clique can come from two resources).
  const seen = new Set<string>();
  const uniq = groups.filter((g) => { const k = g.join(','); if (seen.has(k)) return false; seen.add(k); return true; });

  const caps: Cap[] = [];
  for (const st of scenario.stations) {
    const max = plan.booking[st.station.name].maxContactsPerDay;
    if (max === null) continue;
    for (const d of days) {
      const vars = cs.flatMap((c, i) => (c.station === st.station.name && c.day === d ? [i] : []));
      if (vars.length > max) caps.push({ key: `${st.station.name}/${utcDayLabel(d)}`, vars, max });
    }
  }
  const targets: Target[] = [];
  const P = 1 + gain.reduce((s, g) => s + Math.abs(g), 0);
  for (const dem of plan.demand) {
    for (const d of days) {
      const mine = cs.flatMap((c, i) => (c.satellite === dem.satellite ? [i] : []));
      const bitsOn = (c: Candidate, links: string[] | null) => {
        const r = c.dayLinkBits.get(d);
        if (!r) return 0;
        return Object.entries(r).reduce((s, [l, b]) => s + (links === null || links.includes(l) ? b : 0), 0);
      };
      const volTarget = (key: string, T: number, links: string[] | null) => {
        if (!(T > 0)) return;
        const carried = earlier.filter((c) => c.satellite === dem.satellite).reduce((s, c) => s + bitsOn(c, links), 0);
        const need = 1 - carried / T;
        if (need <= 0) return;
        const vars = mine.filter((i) => bitsOn(cs[i], links) > 0);
        targets.push({ key, vars, coef: vars.map((i) => bitsOn(cs[i], links) / T), need, penalty: P });
      };
      const t = dem.dailyTargetBits;
      if (t && 'total' in t) volTarget(`${dem.satellite}/${utcDayLabel(d)}/volume`, t.total, null);
      else if (t) for (const [l, T] of Object.entries(t.byLink)) volTarget(`${dem.satellite}/${utcDayLabel(d)}/volume/${l}`, T, [l]);
      if (dem.minContactsPerDay > 0) {
        const vars = mine.filter((i) => cs[i].day === d);
        targets.push({ key: `${dem.satellite}/${utcDayLabel(d)}/contacts`, vars, coef: vars.map(() => 1 / dem.minContactsPerDay), need: 1, penalty: P });
      }
    }
  }
  return { n, gain, groups: uniq, caps, targets };
}

export async function planContacts(scenario: ResolvedScenario, pipeline: PipelineResult): Promise<ContactPlan> {
  const plan = scenario.plan;
  if (!plan) throw new Error('plan: the scenario has no resolved plan terms');
  if (!pipeline.profiles) throw new Error('plan: the sweep kept no volume profiles (set scenario.volumeProfileGridS)');
  const t0 = performance.now();
  const { candidates } = buildCandidates(scenario, pipeline.passLinks, pipeline.profiles);
  const chosen = new Uint8Array(candidates.length);
  const taken: Candidate[] = [];
  const horizons: HorizonResult[] = [];
  const { firstDay, count } = utcDaysOfWindow(scenario.window.startS, scenario.window.endS);
  for (let h = 0; h < count; h += plan.horizonDays) {
    const days = Array.from({ length: Math.min(plan.horizonDays, count - h) }, (_, i) => firstDay + h + i);
    // Contacts of earlier horizons that reach into this one (held, plus setup): the only ones that can clash or carry volume in.
    const h0 = days[0] * 86_400;
    const recent = taken.filter((t) => t.heldEndS + t.setupS > h0 || t.endS > h0);
    const cs = candidates.filter((c) => c.day >= days[0] && c.day <= days[days.length - 1] && !recent.some((t) => clash(t, c)));
    const p = horizonProblem(scenario, cs, days, recent);
    const g = greedy(p);
    let x = g.x, objective = g.objective, method: HorizonResult['method'] = cs.length ? 'greedy' : 'none';
    let status = 'Empty', bound: number | null = cs.length ? null : 0, timeS = 0;
    if (cs.length) {
      const r = await solveMip(p, plan.timeLimitS);
      status = r.status; bound = r.bound; timeS = r.timeS;
      const z = r.x ? evaluate(p, r.x) : -Infinity;
      if (r.x && z >= objective - 1e-9 * Math.max(1, Math.abs(objective))) { x = r.x; objective = z; method = 'highs'; }
      if (r.optimal && bound !== null && objective < bound - 1e-5 * Math.max(1, Math.abs(bound))) {
        // The solver's optimum must be what its selection scores; else keep the better answer and say so.
        status = `${r.status} (its selection scores ${objective}, below its objective ${bound})`;
      }
    }
    const gap = bound === null ? null : Math.abs(bound) > 1e-12 ? Math.max(0, (bound - objective) / Math.abs(bound)) : 0;
    horizons.push({
      firstDayUtc: utcDayLabel(days[0]), days: days.length, candidates: cs.length, method, solverStatus: status,
      objective, greedyObjective: g.objective, bound, gap: method === 'highs' && status === 'Optimal' ? 0 : gap, solverTimeS: timeS,
    });
    cs.forEach((c, i) => { if (x[i]) { chosen[c.id] = 1; taken.push(c); } });
  }
  const days = satelliteDays(scenario, pipeline, candidates, chosen);
  const gaps = horizons.map((h) => h.gap);
  return {
    objective: plan.objective, weather: plan.weather, candidates, chosen, horizons, days,
    totalCost: candidates.reduce((s, c) => s + (chosen[c.id] ? c.cost : 0), 0),
    solverTimeS: horizons.reduce((s, h) => s + h.solverTimeS, 0),
    planTimeS: (performance.now() - t0) / 1000,
    gap: gaps.some((x) => x === null) ? null : Math.max(0, ...(gaps as number[])),
  };
}

function satelliteDays(scenario: ResolvedScenario, pipeline: PipelineResult, cs: readonly Candidate[], chosen: Uint8Array): SatelliteDay[] {
  const plan = scenario.plan as ResolvedPlan;
  const { firstDay, count } = utcDaysOfWindow(scenario.window.startS, scenario.window.endS);
  const net = new Map<string, number>();
  for (const r of pipeline.daily) {
    if (r.station !== NETWORK_STATION || r.weather !== plan.weather) continue;
    net.set(`${r.satellite}\u0000${r.dayUtc}\u0000${r.link}`, r.adaptiveVolumeBits ?? r.fixedVolumeBits);
  }
  const out: SatelliteDay[] = [];
  for (const dem of plan.demand) {
    for (let d = firstDay; d < firstDay + count; d++) {
      const label = utcDayLabel(d);
      const mine = cs.filter((c) => chosen[c.id] && c.satellite === dem.satellite);
      const links = Object.keys(dem.linkTerminals).map((link) => {
        const planned = mine.reduce((s, c) => s + (c.dayLinkBits.get(d)?.[link] ?? 0), 0);
        const t = dem.dailyTargetBits;
        const target = t && 'byLink' in t ? (t.byLink[link] ?? null) : null;
        return { link, plannedBits: planned, unconstrainedBits: net.get(`${dem.satellite}\u0000${label}\u0000${link}`) ?? 0, targetBits: target, unmetBits: target === null ? 0 : Math.max(0, target - planned) };
      });
      const plannedBits = links.reduce((s, l) => s + l.plannedBits, 0);
      const unconstrainedBits = links.reduce((s, l) => s + l.unconstrainedBits, 0);
      const t = dem.dailyTargetBits;
      const targetBits = t === null ? null : 'total' in t ? t.total : Object.values(t.byLink).reduce((s, v) => s + v, 0);
      const unmetBits = t === null ? 0 : 'total' in t ? Math.max(0, t.total - plannedBits) : links.reduce((s, l) => s + l.unmetBits, 0);
      const today = mine.filter((c) => c.day === d);
      out.push({
        satellite: dem.satellite, dayUtc: label, contacts: today.length, plannedBits, unconstrainedBits,
        lostToContentionBits: Math.max(0, unconstrainedBits - plannedBits), targetBits, unmetBits,
        minContacts: dem.minContactsPerDay, unmetContacts: Math.max(0, dem.minContactsPerDay - today.length),
        cost: today.reduce((s, c) => s + c.cost, 0), links,
      });
    }
  }
  return out;
}
