import { describe, expect, it } from 'vitest';
import { BITS_PER_MEGABYTE, bitsToMegabytes, megabytesToBits, secondsToMinutes } from '../../src/analysis/units.js';
import { utcDayLabel, utcDayNumber, utcDaysOfWindow } from '../../src/analysis/utcDay.js';

describe('units: volume_mb is megabytes of 10^6 bytes (SI)', () => {
  it('8·10^6 bits = 1 MB, not 2^20 bytes', () => {
    expect(BITS_PER_MEGABYTE).toBe(8_000_000);
    expect(bitsToMegabytes(8e6)).toBe(1);
    expect(bitsToMegabytes(9600 * 600)).toBeCloseTo(0.72, 12);
    expect(megabytesToBits(2.5)).toBe(2e7);
    expect(secondsToMinutes(90)).toBe(1.5);
  });
});

describe('UTC days on Unix seconds', () => {
  const d = Date.UTC(2028, 1, 29) / 1000; // a leap day
  it('labels and day numbers', () => {
    expect(utcDayLabel(0)).toBe('1970-01-01');
    expect(utcDayLabel(utcDayNumber(d + 86_399.999))).toBe('2028-02-29');
    expect(utcDayLabel(utcDayNumber(d + 86_400))).toBe('2028-03-01');
    expect(utcDayLabel(utcDayNumber(d - 0.001))).toBe('2028-02-28');
  });
  it('a window ending at midnight does not touch the next day', () => {
    expect(utcDaysOfWindow(d, d + 86_400).count).toBe(1);
    expect(utcDaysOfWindow(d + 3600, d + 86_401).count).toBe(2);
    expect(utcDaysOfWindow(d - 1, d + 1)).toEqual({ firstDay: utcDayNumber(d) - 1, count: 2 });
  });
});
