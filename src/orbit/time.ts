/**
 * Time inside passbudget is a float64 count of seconds since 1970-01-01T00:00Z
 * (UTC, no leap seconds, as satellite.js and POSIX count). At 2e9 s a float64
 * resolves about 0.24 µs, far below the 10 ms the event search asks for.
 * Conversions to minutes since element epoch and Julian date are done in
 * floating point, never through millisecond `Date` objects.
 */
import { DateTime } from 'luxon';
import { InputError } from '../errors.js';

export type UnixSeconds = number;

export const SECONDS_PER_DAY = 86_400;
/** Julian date of the Unix epoch 1970-01-01T00:00:00Z. */
export const JD_UNIX_EPOCH = 2_440_587.5;

export function julianDateFromUnix(t: UnixSeconds): number {
  return JD_UNIX_EPOCH + t / SECONDS_PER_DAY;
}

export function unixFromJulianDate(jd: number): UnixSeconds {
  return (jd - JD_UNIX_EPOCH) * SECONDS_PER_DAY;
}

/** ISO-8601 UTC with milliseconds, e.g. `2026-03-14T05:06:07.123Z`. */
export function formatIsoUtc(t: UnixSeconds): string {
  // Round to the millisecond once, then split, so 59.9996 s never prints as "60.000".
  const ms = Math.round(t * 1000);
  return new Date(ms).toISOString();
}

/** ISO-8601 in the given IANA zone with offset, for human-facing tables. */
export function formatIsoZone(t: UnixSeconds, zone: string): string {
  return DateTime.fromMillis(Math.round(t * 1000), { zone }).toFormat("yyyy-MM-dd HH:mm:ss ZZ");
}

/**
 * Parse an ISO-8601 instant. A value without an offset is taken as UTC.
 * `where` names the source for the error message (a flag or a scenario path).
 */
export function parseIsoUtc(text: string, where: string): UnixSeconds {
  const dt = DateTime.fromISO(String(text).trim(), { zone: 'utc', setZone: true });
  if (!dt.isValid) {
    throw new InputError(`${where}: not an ISO-8601 date-time (got ${JSON.stringify(text)}; allowed e.g. 2026-03-14T05:00:00Z)`);
  }
  return dt.toMillis() / 1000;
}

const DURATION_UNITS: Record<string, number> = { s: 1, m: 60, min: 60, h: 3600, d: 86_400, w: 604_800 };

/** Parse `90s`, `45m`, `36h`, `7d`, `2w` (or a bare number of seconds). */
export function parseDuration(text: string, where: string): number {
  const m = /^\s*(\d+(?:\.\d+)?)\s*(s|m|min|h|d|w)?\s*$/.exec(String(text));
  if (!m) {
    throw new InputError(`${where}: not a duration (got ${JSON.stringify(text)}; allowed a number with unit s, m, h, d or w, e.g. 36h or 7d)`);
  }
  const value = Number(m[1]) * DURATION_UNITS[m[2] ?? 's'];
  if (!(value > 0)) {
    throw new InputError(`${where}: duration must be > 0 (got ${JSON.stringify(text)})`);
  }
  return value;
}
