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

/**
 * Where each steps field comes from in a sweep window part (sweep/window.ts):
 * `s.` the station's columns, `c.` the link's, `k.` the weather case's; `[i]`
 * a column per step, else a constant per link. The CSV writer compiles these
 * into its row function, the Parquet writer reads the arrays they name.
 */
export const STEP_SOURCE: Record<string, string> = {
  range_km: 's.rangeKm[i]', elevation_deg: 's.elevationDeg[i]', azimuth_deg: 's.azimuthDeg[i]',
  tx_off_boresight_deg: 'c.txOffBoresightDeg[i]', rx_off_boresight_deg: 'c.rxOffBoresightDeg[i]', eirp_dbw: 'c.eirpDBW[i]',
  free_space_loss_db: 'c.freeSpaceLossDB[i]', polarisation_loss_db: 'c.polarisationLossDB', tx_pointing_loss_db: 'c.txPointingLossDB[i]',
  rx_pointing_loss_db: 'c.rxPointingLossDB[i]', other_losses_db: 'c.otherLossesDB', mount_lag_deg: 'c.mountLagDeg[i]',
  mount_limited: 'c.mountLimited[i]', doppler_hz: 'c.dopplerHz[i]', doppler_rate_hz_s: 'c.dopplerRateHzS[i]',
  closing_probability: 'c.closingProbability[i]', expected_information_rate_mbps: 'c.expectedInformationRateMbps[i]',
  closing_probability_clamped: 'c.closingClamped[i]',
  element_age_days: 'c.elementAgeDays[i]', element_pointing_error_deg: 'c.elementPointingErrorDeg[i]',
  sun_separation_deg: 'c.sunSeparationDeg[i]', sun_noise_temperature_k: 'c.sunNoiseK[i]',
};
export const CASE_SOURCE: Record<string, string> = {
  gas_loss_db: 'k.gasDB[i]', rain_loss_db: 'k.rainDB[i]', cloud_loss_db: 'k.cloudDB[i]', scintillation_db: 'k.scintillationDB[i]',
  atmospheric_loss_db: 'k.atmosphericDB[i]', antenna_temperature_k: 'k.antennaTemperatureK[i]', system_temperature_k: 'k.systemTemperatureK[i]',
  g_over_t_dbk: 'k.gOverTDBK[i]', c_over_n0_dbhz: 'k.cOverN0DBHz[i]', eb_over_n0_db: 'k.ebN0DB[i]', es_over_n0_db: 'k.esN0DB[i]',
  required_eb_over_n0_db: 'k.requiredEbN0DB[i]', margin_db: 'k.marginDB[i]', usable: 'k.usable[i]', mode: 'k.mode[i]',
  information_rate_bps: 'k.informationRateBps[i]',
};
export const BOOLEAN_FIELDS = new Set(['mount_limited', 'usable', 'closing_probability_clamped']);

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

