/**
 * The contact-planning part of a scenario (`passbudget plan`): antennas and
 * booking terms per station, demand per satellite, plan options. Resolved
 * with every scenario (a bad antenna list is a bad scenario for `run` too),
 * its defaults kept apart from the run's (so `run` outputs do not change).
 */
import type { Path, ScenarioSource } from './source.js';
import { formatPath } from './source.js';
import type { ScenarioInput } from './schema.js';
import type { AppliedDefault, ResolvedPlan, PlanAntenna, StationBooking, SatelliteDemand } from './types.js';

/** Reconfiguration allowance between two contacts on one antenna (s): a planning figure chosen here, not a published value. */
export const SETUP_ALLOWANCE_S = 30;
/** Worst slew between two contacts: half a turn in azimuth, a quarter turn in elevation (deg). */
export const WORST_SLEW_AZ_DEG = 180;
export const WORST_SLEW_EL_DEG = 90;
export const DEFAULT_TIME_LIMIT_S = 20;

/** Default setup time of an antenna: the allowance plus the worst slew at the slowest rate limit of its terminals' mounts. */
export function defaultSetupS(rates: readonly { azDegS?: number; elDegS?: number }[]): number {
  let slew = 0;
  for (const r of rates) {
    if (r.azDegS) slew = Math.max(slew, WORST_SLEW_AZ_DEG / r.azDegS);
    if (r.elDegS) slew = Math.max(slew, WORST_SLEW_EL_DEG / r.elDegS);
  }
  return SETUP_ALLOWANCE_S + slew;
}

const fmt = (x: number) => String(Number(x.toPrecision(6)));

export function resolvePlan(input: ScenarioInput, weatherNames: readonly string[], src: ScenarioSource): ResolvedPlan {
  const defaults: AppliedDefault[] = [];
  const rec = (path: Path, value: string, reason: string) => defaults.push({ path: formatPath(path), value, reason });
  const p = input.plan ?? {};
  const objective = p.objective ?? 'max-volume';
  if (p.objective === undefined) rec(['plan', 'objective'], 'max-volume', 'most weighted volume, targets first');
  let weather = weatherNames[0];
  if (p.weather !== undefined) {
    const wanted = p.weather === 'clear' ? 'clear' : `${fmt(p.weather)}%`;
    if (!weatherNames.includes(wanted)) src.fail(['plan', 'weather'], `weather case ${wanted} is not in weather: (allowed: ${weatherNames.join(', ')})`);
    weather = wanted;
  } else rec(['plan', 'weather'], weather, 'the first weather case');
  const horizonDays = p.horizon_days ?? 1;
  if (p.horizon_days === undefined) rec(['plan', 'horizon_days'], '1', 'each UTC day optimised in turn');
  const timeLimitS = p.time_limit_s ?? DEFAULT_TIME_LIMIT_S;
  if (p.time_limit_s === undefined) rec(['plan', 'time_limit_s'], String(DEFAULT_TIME_LIMIT_S), 'solver time limit per horizon');

  const antennas: PlanAntenna[] = [];
  const booking: Record<string, StationBooking> = {};
  input.stations.forEach((s, si) => {
    const at: Path = ['stations', si];
    const terminals = Object.keys(s.terminals);
    const rates = (names: string[]) => names.map((t) => {
      const pt = s.terminals[t].pointing;
      return pt && pt.mode === 'track' ? { azDegS: pt.max_azimuth_rate_deg_s, elDegS: pt.max_elevation_rate_deg_s } : {};
    });
    const owner = new Map<string, string>();
    const names = new Set<string>();
    (s.antennas ?? []).forEach((a, ai) => {
      if (names.has(a.name)) src.fail([...at, 'antennas', ai, 'name'], `duplicate antenna name ${JSON.stringify(a.name)} (names must be unique per station)`);
      names.add(a.name);
      a.terminals.forEach((t, ti) => {
        if (!terminals.includes(t)) src.fail([...at, 'antennas', ai, 'terminals', ti], `unknown terminal ${JSON.stringify(t)} (allowed: ${terminals.join(', ')})`);
        const prev = owner.get(t);
        if (prev !== undefined) src.fail([...at, 'antennas', ai, 'terminals', ti], `terminal ${JSON.stringify(t)} is already on antenna ${JSON.stringify(prev)} (a terminal is on one antenna)`);
        owner.set(t, a.name);
      });
      const setupS = a.setup_s ?? defaultSetupS(rates(a.terminals));
      if (a.setup_s === undefined) rec([...at, 'antennas', ai, 'setup_s'], fmt(setupS), `${SETUP_ALLOWANCE_S} s allowance plus the worst slew (${WORST_SLEW_AZ_DEG}° azimuth, ${WORST_SLEW_EL_DEG}° elevation) at the mount rate limits (a planning rule chosen here)`);
      antennas.push({ station: s.name, name: a.name, terminals: [...a.terminals], setupS });
    });
    for (const t of terminals) {
      if (owner.has(t)) continue;
      if (names.has(t)) src.fail([...at, 'antennas'], `terminal ${JSON.stringify(t)} is on no antenna and an antenna already has its name (name the antenna otherwise)`);
      const setupS = defaultSetupS(rates([t]));
      rec([...at, 'terminals', t], `antenna ${t}, setup ${fmt(setupS)} s`, 'a terminal on no listed antenna is its own antenna');
      antennas.push({ station: s.name, name: t, terminals: [t], setupS });
    }
    const b = s.booking ?? {};
    booking[s.name] = {
      pricePerMinute: b.price_per_minute ?? 0,
      minimumBookingS: b.minimum_booking_s ?? 0,
      granularityS: b.booking_granularity_s ?? null,
      maxContactsPerDay: b.max_contacts_per_day ?? null,
    };
  });

  const demand: SatelliteDemand[] = input.satellites.map((sat, i) => {
    const at: Path = ['satellites', i, 'plan'];
    const d = sat.plan ?? {};
    const linkNames = sat.links.map((l) => l.name);
    const t = d.daily_volume_target_bits;
    let target: SatelliteDemand['dailyTargetBits'] = null;
    if (typeof t === 'number') target = { total: t };
    else if (t !== undefined) {
      for (const k of Object.keys(t)) {
        if (!linkNames.includes(k)) src.fail([...at, 'daily_volume_target_bits', k], `unknown link ${JSON.stringify(k)} (allowed: ${linkNames.join(', ')})`);
      }
      target = { byLink: { ...t } };
    }
    if (d.weight === undefined && input.plan !== undefined) rec([...at, 'weight'], '1', 'every satellite weighs the same');
    return {
      satellite: sat.name,
      weight: d.weight ?? 1,
      dailyTargetBits: target,
      minContactsPerDay: d.min_contacts_per_day ?? 0,
      linkTerminals: Object.fromEntries(sat.links.map((l) => [l.name, l.terminal])),
    };
  });
  return { objective, weather, horizonDays, timeLimitS, antennas, booking, demand, defaultsApplied: defaults };
}
