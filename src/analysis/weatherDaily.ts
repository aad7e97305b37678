/**
 * Weather as a probability, per UTC day and over the run, from the pass
 * summaries (budget/weather.ts gives each step its closing probability and
 * expected rate; passAccumulator.ts sums them per pass).
 *
 * Conventions (documented choices):
 *   - A pass counts whole on the UTC day of its AOS (daily.csv's fixed-case
 *     volumes split a pass across midnight by step time), so on a day with a
 *     pass across midnight the two differ by that pass's share.
 *   - Availability: Σ closing probability × Δt over Σ Δt of the in-view steps,
 *     i.e. the expected share of in-view time the link closes.
 *   - Station rows only: the network's arbitration (one station per step)
 *     is made per fixed case and has no expected-value counterpart here.
 */
import type { PassLinkSummary } from './types.js';
import { utcDayLabel, utcDayNumber } from './utcDay.js';

export interface WeatherDayRow {
  dayUtc: string;
  satellite: string;
  station: string;
  link: string;
  passes: number;
  expectedVolumeBits: number;
  expectedUsableS: number;
  sweptS: number;
  /** Σ over the day's passes of the probability that the pass closes throughout (the expected count of such passes). */
  expectedPassesClosingThroughout: number;
}

export interface WeatherTotal {
  satellite: string;
  station: string;
  link: string;
  passes: number;
  expectedVolumeBitsPerDay: number;
  /** Share of in-view time the link is expected to close (NaN without in-view time). */
  availabilityFraction: number;
  expectedPassesClosingThroughoutPerDay: number;
}

const key = (d: string, sat: string, st: string, l: string) => `${d}\u0000${sat}\u0000${st}\u0000${l}`;

/** Per (day of AOS, satellite, station, link) sums, in the order passes come (AOS order gives day order). */
export function weatherDays(passes: Iterable<PassLinkSummary>): Map<string, WeatherDayRow> {
  const out = new Map<string, WeatherDayRow>();
  for (const p of passes) {
    if (Number.isNaN(p.expectedVolumeBits)) continue;
    const day = utcDayLabel(utcDayNumber(p.aosS));
    const k = key(day, p.satellite, p.station, p.link);
    let r = out.get(k);
    if (!r) {
      r = { dayUtc: day, satellite: p.satellite, station: p.station, link: p.link, passes: 0, expectedVolumeBits: 0, expectedUsableS: 0, sweptS: 0, expectedPassesClosingThroughout: 0 };
      out.set(k, r);
    }
    r.passes++;
    r.expectedVolumeBits += p.expectedVolumeBits;
    r.expectedUsableS += p.expectedUsableS;
    r.sweptS += p.sweptS;
    r.expectedPassesClosingThroughout += p.closesThroughoutProbability;
  }
  return out;
}

/** The day row of a daily.csv row's day, satellite, station and link (undefined: no pass that day). */
export function weatherDayOf(days: Map<string, WeatherDayRow>, dayUtc: string, satellite: string, station: string, link: string): WeatherDayRow | undefined {
  return days.get(key(dayUtc, satellite, station, link));
}

/**
 * Per (station, link) over the run, every satellite together (as the run's totals per station, which they
 * stand beside): expected volume and passes per day (over `days` days) and availability; `satellite` names
 * the satellites counted (joined with " + " when several).
 */
export function weatherTotals(passes: Iterable<PassLinkSummary>, days: number): WeatherTotal[] {
  const by = new Map<string, WeatherTotal & { usableS: number; sweptS: number; bits: number; through: number; sats: Set<string> }>();
  for (const p of passes) {
    if (Number.isNaN(p.expectedVolumeBits)) continue;
    const k = key('', '', p.station, p.link);
    let t = by.get(k);
    if (!t) {
      t = { satellite: '', station: p.station, link: p.link, passes: 0, expectedVolumeBitsPerDay: 0, availabilityFraction: NaN, expectedPassesClosingThroughoutPerDay: 0, usableS: 0, sweptS: 0, bits: 0, through: 0, sats: new Set() };
      by.set(k, t);
    }
    t.sats.add(p.satellite);
    t.passes++; t.usableS += p.expectedUsableS; t.sweptS += p.sweptS; t.bits += p.expectedVolumeBits; t.through += p.closesThroughoutProbability;
  }
  for (const t of by.values()) t.satellite = [...t.sats].sort().join(' + ');
  return [...by.values()]
    .sort((a, b) => a.link.localeCompare(b.link) || a.satellite.localeCompare(b.satellite) || a.station.localeCompare(b.station))
    .map((t) => ({
      satellite: t.satellite, station: t.station, link: t.link, passes: t.passes,
      expectedVolumeBitsPerDay: t.bits / days,
      availabilityFraction: t.sweptS > 0 ? t.usableS / t.sweptS : NaN,
      expectedPassesClosingThroughoutPerDay: t.through / days,
    }));
}
