/**
 * Pass lists as rows, CSV, JSON and an aligned text table. The CSV/JSON
 * fields are fixed: one row per pass, units in the field names.
 */
import { stringify } from 'csv-stringify/sync';
import { formatIsoUtc, formatIsoZone } from '../orbit/time.js';
import type { Pass } from './types.js';

export interface PassRow {
  satellite: string;
  station: string;
  aos_utc: string;
  tca_utc: string;
  los_utc: string;
  duration_s: number;
  max_elevation_deg: number;
  aos_azimuth_deg: number;
  tca_azimuth_deg: number;
  los_azimuth_deg: number;
  min_range_km: number;
  clipped_start: boolean;
  clipped_end: boolean;
}

export const PASS_FIELDS: ReadonlyArray<keyof PassRow> = [
  'satellite', 'station', 'aos_utc', 'tca_utc', 'los_utc', 'duration_s', 'max_elevation_deg',
  'aos_azimuth_deg', 'tca_azimuth_deg', 'los_azimuth_deg', 'min_range_km', 'clipped_start', 'clipped_end',
];

const round = (x: number, digits: number) => Number(x.toFixed(digits));

/** One row per pass; times to the millisecond, angles to 0.001°, range to 1 m. */
export function passRows(passes: readonly Pass[]): PassRow[] {
  return passes.map((p) => ({
    satellite: p.satellite,
    station: p.station,
    aos_utc: formatIsoUtc(p.aosS),
    tca_utc: formatIsoUtc(p.tcaS),
    los_utc: formatIsoUtc(p.losS),
    duration_s: round(p.durationS, 3),
    max_elevation_deg: round(p.maxElevationDeg, 3),
    aos_azimuth_deg: round(p.aosAzimuthDeg, 3),
    tca_azimuth_deg: round(p.tcaAzimuthDeg, 3),
    los_azimuth_deg: round(p.losAzimuthDeg, 3),
    min_range_km: round(p.minRangeKm, 3),
    clipped_start: p.clippedStart,
    clipped_end: p.clippedEnd,
  }));
}

export function passesCsv(passes: readonly Pass[]): string {
  return stringify(passRows(passes), { header: true, columns: PASS_FIELDS as string[], cast: { boolean: (b) => (b ? 'true' : 'false') } });
}

export function passesJson(passes: readonly Pass[]): string {
  return `${JSON.stringify(passRows(passes), null, 2)}\n`;
}

function hms(seconds: number): string {
  const s = Math.round(seconds);
  const m = Math.floor(s / 60);
  return `${m}:${String(s % 60).padStart(2, '0')}`;
}

/**
 * Aligned table for reading: times in UTC, or in `zone` (IANA) when given;
 * '<' marks a pass clipped by the window start, '>' one clipped by its end.
 */
export function passesTable(passes: readonly Pass[], zone?: string): string {
  const when = (t: number) => (zone ? formatIsoZone(t, zone) : `${formatIsoUtc(t).slice(0, 19).replace('T', ' ')} UTC`);
  const head = ['#', 'satellite', 'station', `AOS (${zone ?? 'UTC'})`, 'TCA', 'LOS', 'dur (m:s)', 'max el (deg)', 'az AOS/TCA/LOS (deg)', 'min range (km)', 'clip'];
  const rows = passes.map((p, i) => [
    String(i + 1), p.satellite, p.station, when(p.aosS), when(p.tcaS).slice(11, 19), when(p.losS).slice(11, 19),
    hms(p.durationS), p.maxElevationDeg.toFixed(1),
    `${p.aosAzimuthDeg.toFixed(0)}/${p.tcaAzimuthDeg.toFixed(0)}/${p.losAzimuthDeg.toFixed(0)}`,
    p.minRangeKm.toFixed(0), `${p.clippedStart ? '<' : ''}${p.clippedEnd ? '>' : ''}`,
  ]);
  const numeric = new Set([0, 6, 7, 9]);
  const widths = head.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
  const fmt = (r: string[]) => r.map((x, c) => (numeric.has(c) ? x.padStart(widths[c]) : x.padEnd(widths[c]))).join('  ').trimEnd();
  const lines = [fmt(head), widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(fmt)];
  if (passes.length === 0) lines.push('(no passes above the mask in this window)');
  return `${lines.join('\n')}\n`;
}
