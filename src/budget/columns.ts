/**
 * Column order of the per-step records, for the CSV writer and JSON output:
 * STEP_COLUMNS are the weather-independent fields of StepBudget, CASE_COLUMNS
 * the per-weather-case fields of CaseBudget. Units are in the names.
 */
import type { CaseBudget, StepBudget } from './types.js';

export const STEP_COLUMNS = [
  'time_s', 'range_km', 'elevation_deg', 'azimuth_deg', 'tx_off_boresight_deg', 'rx_off_boresight_deg',
  'eirp_dbw', 'free_space_loss_db', 'polarisation_loss_db', 'tx_pointing_loss_db', 'rx_pointing_loss_db',
  'other_losses_db', 'mount_lag_deg', 'mount_limited', 'doppler_hz', 'doppler_rate_hz_s',
  'closing_probability', 'expected_information_rate_mbps', 'closing_probability_clamped',
  'element_age_days', 'element_pointing_error_deg', 'sun_separation_deg', 'sun_noise_temperature_k',
] as const satisfies ReadonlyArray<keyof StepBudget>;

export const CASE_COLUMNS = [
  'weather', 'gas_loss_db', 'rain_loss_db', 'cloud_loss_db', 'scintillation_db', 'atmospheric_loss_db',
  'antenna_temperature_k', 'system_temperature_k', 'g_over_t_dbk', 'c_over_n0_dbhz', 'eb_over_n0_db',
  'es_over_n0_db', 'required_eb_over_n0_db', 'margin_db', 'usable', 'mode', 'information_rate_bps',
] as const satisfies ReadonlyArray<keyof CaseBudget>;

export type StepColumn = (typeof STEP_COLUMNS)[number];
export type CaseColumn = (typeof CASE_COLUMNS)[number];
export type StepCaseRecord = Pick<StepBudget, StepColumn> & CaseBudget;

/** One flat record (step fields then the case's fields) for weather case `caseIndex`; a copy. */
export function stepRecordForCase(step: StepBudget, caseIndex: number): StepCaseRecord {
  const c = step.cases[caseIndex];
  if (!c) throw new RangeError(`stepRecordForCase: caseIndex ${caseIndex} is outside 0–${step.cases.length - 1}`);
  const rec: Record<string, unknown> = {};
  for (const k of STEP_COLUMNS) rec[k] = step[k];
  for (const k of CASE_COLUMNS) rec[k] = c[k];
  return rec as unknown as StepCaseRecord;
}

/** A deep copy of a step (the engine reuses its records between steps). */
export function copyStepBudget(step: StepBudget): StepBudget {
  return { ...step, cases: step.cases.map((c) => ({ ...c })) };
}
