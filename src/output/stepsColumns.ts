/**
 * steps.csv's columns: which fields, in which order, with how many decimals.
 * One home for these rules: the fast writer (stepsCsv.ts), the general path
 * (stepRow + csv-stringify) and the readers of a steps file follow them.
 */
import { STEP_COLUMNS, CASE_COLUMNS } from '../budget/columns.js';
import type { StepBudget, WeatherCase } from '../budget/types.js';
import type { StepEvent } from '../sweep/types.js';
import { formatIsoUtc } from '../orbit/time.js';
import { fmt, type CsvCell } from './csv.js';

/** Decimals per numeric column (by unit suffix), so files stay readable and deterministic. */
export function decimalsFor(column: string): number {
  if (column.endsWith('_bps')) return 0;
  if (column === 'closing_probability' || column.endsWith('_mbps')) return 6;
  if (column === 'doppler_hz') return 1;
  if (column.endsWith('_hz_s')) return 2;
  if (column.endsWith('_k')) return 2;
  return 3;
}

/** steps.csv carries time_utc instead of time_s, and the case name in the column suffix instead of a weather column. */
export const STEP_FIELDS = STEP_COLUMNS.filter((c) => c !== 'time_s');
export const CASE_FIELDS = CASE_COLUMNS.filter((c) => c !== 'weather');

/** steps.csv: one row per (time, station, link); per-case fields suffixed with the case name. */
export function stepColumns(cases: readonly WeatherCase[]): string[] {
  const cols = ['pass_id', 'time_utc', 'satellite', 'station', 'link', ...STEP_FIELDS];
  for (const c of cases) for (const f of CASE_FIELDS) cols.push(`${f}_${c.name}`);
  return cols;
}

export function stepRow(e: StepEvent, row: CsvCell[] = []): CsvCell[] {
  const s: StepBudget = e.step;
  let i = 0;
  row[i++] = e.passId;
  row[i++] = formatIsoUtc(e.timeS);
  row[i++] = e.satellite;
  row[i++] = e.station;
  row[i++] = e.link.name;
  for (const f of STEP_FIELDS) {
    const v = s[f];
    row[i++] = typeof v === 'number' ? fmt(v, decimalsFor(f)) : v;
  }
  for (const c of s.cases) {
    for (const f of CASE_FIELDS) {
      const v = c[f];
      row[i++] = typeof v === 'number' ? fmt(v, decimalsFor(f)) : v;
    }
  }
  row.length = i;
  return row;
}

