/** Number and time formats for the report text (d3-format for SI prefixes). */
import { format } from 'd3-format';
import { formatIsoUtc } from '../../orbit/time.js';
import type { PassCaseSummary } from '../../analysis/types.js';

const si = format('.3~s');

/** `1.23 Gbit`, `456 Mbit`; 0 → `0 bit`. */
export function formatBits(bits: number | null): string {
  if (bits === null || !Number.isFinite(bits)) return '–';
  return `${si(bits)}bit`.replace(/^(-?[\d.]+)([a-zA-Zµ]*)bit$/, (_m, n: string, p: string) => `${n} ${p}bit`);
}

/** Fixed decimals with a real minus sign; `–` for missing values. */
export function formatFixed(x: number | null | undefined, decimals: number): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '–';
  return x.toFixed(decimals).replace(/^-/, '−');
}

/** `2026-03-14 05:06:07` UTC (seconds resolution). */
export function formatUtc(tS: number): string {
  return formatIsoUtc(Math.round(tS)).replace('T', ' ').replace(/\.\d{3}Z$/, '');
}

/** `05:06:07` UTC. */
export function formatUtcClock(tS: number): string {
  return formatUtc(tS).slice(11);
}

/** The volume a case delivers: adaptive when the link is adaptive, else fixed-rate. */
export function caseVolumeBits(c: Pick<PassCaseSummary, 'adaptiveVolumeBits' | 'fixedVolumeBits'>): number {
  return c.adaptiveVolumeBits ?? c.fixedVolumeBits;
}
