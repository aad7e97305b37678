/**
 * The plan's files: contacts.csv / contacts.json (one row per contact taken),
 * contacts.ics (one event per contact) and plan.json (objective, gap, solver
 * and time per horizon; per satellite and day the planned volume, contacts,
 * unmet targets and the volume lost to contention against the unconstrained
 * run). Solver times are not written (they differ from run to run; two
 * runs give identical files): the CLI prints them. Units in every name; cost is in the unit of the stations'
 * price_per_minute (`cost_price_units`).
 */
import { bitsToMegabytes } from '../analysis/units.js';
import { fmt, type CsvCell } from '../output/csv.js';
import { escapeIcsText, foldIcsLine, icsUtc } from '../output/ics.js';
import { formatIsoUtc } from '../orbit/time.js';
import type { ResolvedScenario } from '../scenario/types.js';
import type { Candidate } from './candidates.js';
import type { ContactPlan } from './plan.js';

export function contactColumns(scenario: ResolvedScenario): string[] {
  return [
    'contact_id', 'satellite', 'station', 'antenna', 'pass_id', 'start_utc', 'end_utc', 'duration_s', 'booked_s', 'links',
    ...scenario.weatherCases.map((c) => `volume_bits_${c.name}`), ...scenario.weatherCases.map((c) => `volume_mb_${c.name}`), 'cost_price_units',
  ];
}

export function takenContacts(plan: ContactPlan): Candidate[] {
  return plan.candidates.filter((c) => plan.chosen[c.id]);
}

/** Contacts are numbered 1, 2, … in time order over the whole plan. */
const contactId = (_c: Candidate, i: number) => String(i + 1);

export function contactRows(plan: ContactPlan): CsvCell[][] {
  return takenContacts(plan).map((c, i) => [
    contactId(c, i), c.satellite, c.station, c.antenna, c.passId, formatIsoUtc(c.startS), formatIsoUtc(c.endS),
    fmt(c.endS - c.startS, 3), fmt(c.bookedS, 3), c.links.join('+'),
    ...c.volumeBits.map((v) => fmt(v, 0)), ...c.volumeBits.map((v) => fmt(bitsToMegabytes(v), 6)), fmt(c.cost, 2),
  ]);
}

const r = (x: number, d: number) => Number(x.toFixed(d));

export function contactsJson(scenario: ResolvedScenario, plan: ContactPlan): unknown[] {
  return takenContacts(plan).map((c, i) => ({
    contact_id: contactId(c, i), satellite: c.satellite, station: c.station, antenna: c.antenna, pass_id: c.passId,
    start_utc: formatIsoUtc(c.startS), end_utc: formatIsoUtc(c.endS), duration_s: r(c.endS - c.startS, 3), booked_s: r(c.bookedS, 3),
    links: c.links,
    volume_bits: Object.fromEntries(scenario.weatherCases.map((w, k) => [w.name, r(c.volumeBits[k], 0)])),
    cost_price_units: r(c.cost, 2),
  }));
}

export function planJson(scenario: ResolvedScenario, plan: ContactPlan): Record<string, unknown> {
  const taken = takenContacts(plan);
  return {
    scenario: scenario.name,
    objective: plan.objective,
    weather: plan.weather,
    solver: 'HiGHS (highs npm package, WebAssembly), relative gap 0; greedy fallback at the time limit',
    objective_value: r(plan.horizons.reduce((s, h) => s + h.objective, 0), 9),
    gap: plan.gap === null ? null : r(plan.gap, 9),
    // Solver wall-clock time is printed by the CLI and returned by the library, not written: two runs give identical files.
    candidates: plan.candidates.length,
    contacts: taken.length,
    cost_price_units: r(plan.totalCost, 2),
    horizons: plan.horizons.map((h) => ({
      first_day_utc: h.firstDayUtc, days: h.days, candidates: h.candidates, method: h.method, solver_status: h.solverStatus,
      objective: r(h.objective, 9), greedy_objective: r(h.greedyObjective, 9), bound: h.bound === null ? null : r(h.bound, 9),
      gap: h.gap === null ? null : r(h.gap, 9),
    })),
    satellite_days: plan.days.map((d) => ({
      satellite: d.satellite, day_utc: d.dayUtc, contacts: d.contacts,
      planned_volume_bits: r(d.plannedBits, 0), unconstrained_volume_bits: r(d.unconstrainedBits, 0),
      lost_to_contention_bits: r(d.lostToContentionBits, 0),
      target_volume_bits: d.targetBits, unmet_volume_bits: r(d.unmetBits, 0),
      min_contacts: d.minContacts, unmet_contacts: d.unmetContacts, cost_price_units: r(d.cost, 2),
      links: d.links.map((l) => ({ link: l.link, planned_volume_bits: r(l.plannedBits, 0), unconstrained_volume_bits: r(l.unconstrainedBits, 0), target_volume_bits: l.targetBits, unmet_volume_bits: r(l.unmetBits, 0) })),
    })),
    unmet: plan.days.filter((d) => d.unmetBits > 0 || d.unmetContacts > 0).map((d) => ({
      satellite: d.satellite, day_utc: d.dayUtc, unmet_volume_bits: r(d.unmetBits, 0), unmet_contacts: d.unmetContacts,
    })),
    defaults_applied: (scenario.plan?.defaultsApplied ?? []).map((d) => ({ path: d.path, value: d.value, reason: d.reason })),
    note: 'The run\'s other files (passes.csv, daily.csv, …) are unconstrained: every pass at every station, as if each antenna were free for each satellite. This plan is the contended answer.',
  };
}

/** contacts.ics: one event per contact taken (DTSTAMP the window start, so two runs give the same file). */
export function contactsCalendar(scenario: ResolvedScenario, plan: ContactPlan): string {
  const stamp = icsUtc(scenario.window.startS);
  const ci = scenario.weatherCases.findIndex((w) => w.name === plan.weather);
  const lines = ['BEGIN:VCALENDAR', 'VERSION:2.0', 'PRODID:-//passbudget//planned contacts//EN', 'CALSCALE:GREGORIAN', 'METHOD:PUBLISH', `NAME:${escapeIcsText(`${scenario.name} contact plan`)}`];
  takenContacts(plan).forEach((c, i) => {
    const uid = Array.from(Buffer.from(contactId(c, i), 'utf8'), (b) => (/[A-Za-z0-9_-]/.test(String.fromCharCode(b)) ? String.fromCharCode(b) : `%${b.toString(16).toUpperCase().padStart(2, '0')}`)).join('');
    lines.push(
      'BEGIN:VEVENT', `UID:${uid}@passbudget.invalid`, `DTSTAMP:${stamp}`,
      `DTSTART:${icsUtc(Math.floor(c.startS))}`, `DTEND:${icsUtc(Math.max(Math.ceil(c.endS), Math.floor(c.startS) + 1))}`,
      `SUMMARY:${escapeIcsText(`${c.satellite} on ${c.station} ${c.antenna}: ${(c.volumeBits[ci] / 1e9).toFixed(2)} Gbit`)}`,
      `LOCATION:${escapeIcsText(c.station)}`,
      `DESCRIPTION:${escapeIcsText(`Planned contact (pass ${c.passId}), links ${c.links.join(', ')}, weather case ${plan.weather}. Booked ${(c.bookedS / 60).toFixed(1)} min, cost ${c.cost.toFixed(2)}. Planning estimate only.`)}`,
      'STATUS:CONFIRMED', 'END:VEVENT',
    );
  });
  lines.push('END:VCALENDAR');
  return `${lines.map(foldIcsLine).join('\r\n')}\r\n`;
}

/** The terminal summary of a plan: per satellite and day, before and after contention. */
export function formatPlanSummary(plan: ContactPlan): string {
  const head = ['satellite', 'day', 'contacts', 'unconstrained MB', 'planned MB', 'lost MB', 'unmet MB', 'cost'];
  const rows = plan.days.map((d) => [d.satellite, d.dayUtc, String(d.contacts), bitsToMegabytes(d.unconstrainedBits).toFixed(0), bitsToMegabytes(d.plannedBits).toFixed(0),
    bitsToMegabytes(d.lostToContentionBits).toFixed(0), d.targetBits === null ? '' : bitsToMegabytes(d.unmetBits).toFixed(0), d.cost.toFixed(2)]);
  const w = head.map((h, i) => Math.max(h.length, ...rows.map((x) => x[i].length)));
  const line = (x: string[]) => x.map((c, i) => (i >= 2 ? c.padStart(w[i]) : c.padEnd(w[i]))).join('  ');
  const out = [`contact plan: ${plan.objective}, weather ${plan.weather}, ${takenContacts(plan).length} of ${plan.candidates.length} candidates, cost ${plan.totalCost.toFixed(2)}, gap ${plan.gap === null ? 'unknown' : plan.gap.toExponential(2)}, solver ${plan.solverTimeS.toFixed(2)} s, planning ${plan.planTimeS.toFixed(2)} s in all (wall clock)`, '', line(head), w.map((n) => '-'.repeat(n)).join('  '), ...rows.map(line)];
  const unmet = plan.days.filter((d) => d.unmetBits > 0 || d.unmetContacts > 0);
  if (unmet.length) {
    out.push('', 'unmet targets:');
    for (const d of unmet) out.push(`  ${d.satellite} ${d.dayUtc}: ${d.unmetBits > 0 ? `${bitsToMegabytes(d.unmetBits).toFixed(0)} MB short of ${bitsToMegabytes(d.targetBits ?? 0).toFixed(0)} MB` : ''}${d.unmetContacts > 0 ? `${d.unmetBits > 0 ? ', ' : ''}${d.unmetContacts} contacts short of ${d.minContacts}` : ''}`);
  }
  out.push('', 'MB = 10^6 bytes. Unconstrained: the run (every antenna free for every satellite). Planning estimates only.');
  return out.join('\n');
}
