/**
 * UTC day arithmetic on Unix seconds (no leap seconds, as POSIX counts), so a
 * day is exactly 86 400 s and day n starts at n·86 400 s.
 */
import { SECONDS_PER_DAY } from '../orbit/time.js';

/** Day number since 1970-01-01 (UTC) of the instant t (s). */
export function utcDayNumber(timeS: number): number {
  return Math.floor(timeS / SECONDS_PER_DAY);
}

/** `YYYY-MM-DD` of a UTC day number. */
export function utcDayLabel(dayNumber: number): string {
  return new Date(dayNumber * SECONDS_PER_DAY * 1000).toISOString().slice(0, 10);
}

/**
 * The UTC days a window [startS, endS) touches: first day number and count.
 * A window ending exactly at midnight does not touch the day that starts then.
 */
export function utcDaysOfWindow(startS: number, endS: number): { firstDay: number; count: number } {
  const firstDay = utcDayNumber(startS);
  const lastDay = Math.ceil(endS / SECONDS_PER_DAY) - 1;
  return { firstDay, count: Math.max(1, lastDay - firstDay + 1) };
}
