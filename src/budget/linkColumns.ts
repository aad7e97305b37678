/**
 * The budget of one link over a run of steps, in columns: what the engine's
 * `evaluateColumns` writes, what the sweep's accumulators and the steps
 * writers read. Entry i of every array is step i of the run. The per-step
 * record (StepBudget) is entry i read back (`readStep`), for `explain`, the
 * checks and callers that want one record per step.
 */
import type { StationColumns } from '../geometry/columns.js';
import type { StepBudget } from './types.js';

/** One weather case over the run. */
export interface CaseColumns {
  gasDB: Float64Array;
  rainDB: Float64Array;
  cloudDB: Float64Array;
  scintillationDB: Float64Array;
  atmosphericDB: Float64Array;
  antennaTemperatureK: Float64Array;
  systemTemperatureK: Float64Array;
  gOverTDBK: Float64Array;
  cOverN0DBHz: Float64Array;
  ebN0DB: Float64Array;
  esN0DB: Float64Array;
  requiredEbN0DB: Float64Array;
  marginDB: Float64Array;
  /** 1 when usable (margin ≥ required, or an adaptive mode fits). */
  usable: Uint8Array;
  /** Adaptive: index of the mode chosen in the link's mode table, −1 when none fits; fixed: −1. */
  mode: Int16Array;
  informationRateBps: Float64Array;
  /** C/N0 lost to the Sun's noise (dB, ≥ 0). */
  sunLossDB: Float64Array;
}

export interface LinkColumns {
  capacity: number;
  /** Valid entries. */
  n: number;
  txOffBoresightDeg: Float64Array;
  rxOffBoresightDeg: Float64Array;
  txGainDBi: Float64Array;
  rxGainDBi: Float64Array;
  eirpDBW: Float64Array;
  freeSpaceLossDB: Float64Array;
  txPointingLossDB: Float64Array;
  rxPointingLossDB: Float64Array;
  mountLagDeg: Float64Array;
  mountLimited: Uint8Array;
  dopplerHz: Float64Array;
  dopplerRateHzS: Float64Array;
  /** Elevation the atmospheric terms were taken at (apparent, clamped to 0–90°). */
  atmosphericElevationDeg: Float64Array;
  /**
   * Weather as a probability (weather.ts): probability that the step closes over the
   * year's weather, the expected information rate (Mb/s), and 1 where the probability
   * was clamped at the model's 0.001–5 % range.
   */
  closingProbability: Float64Array;
  expectedInformationRateMbps: Float64Array;
  closingClamped: Uint8Array;
  elementAgeDays: Float64Array;
  elementPointingErrorDeg: Float64Array;
  sunSeparationDeg: Float64Array;
  sunNoiseK: Float64Array;
  /** Constant per link. */
  polarisationLossDB: number;
  otherLossesDB: number;
  cases: CaseColumns[];
}

function caseColumns(n: number): CaseColumns {
  const f = () => new Float64Array(n);
  return {
    gasDB: f(), rainDB: f(), cloudDB: f(), scintillationDB: f(), atmosphericDB: f(), antennaTemperatureK: f(),
    systemTemperatureK: f(), gOverTDBK: f(), cOverN0DBHz: f(), ebN0DB: f(), esN0DB: f(), requiredEbN0DB: f(),
    marginDB: f(), usable: new Uint8Array(n), mode: new Int16Array(n), informationRateBps: f(), sunLossDB: f(),
  };
}

export function createLinkColumns(capacity: number, caseCount: number): LinkColumns {
  const f = () => new Float64Array(capacity);
  return {
    capacity, n: 0,
    txOffBoresightDeg: f(), rxOffBoresightDeg: f(), txGainDBi: f(), rxGainDBi: f(), eirpDBW: f(), freeSpaceLossDB: f(),
    txPointingLossDB: f(), rxPointingLossDB: f(), mountLagDeg: f(), mountLimited: new Uint8Array(capacity),
    dopplerHz: f(), dopplerRateHzS: f(), atmosphericElevationDeg: f(),
    closingProbability: f(), expectedInformationRateMbps: f(), closingClamped: new Uint8Array(capacity),
    elementAgeDays: f(), elementPointingErrorDeg: f(), sunSeparationDeg: f(), sunNoiseK: f(),
    polarisationLossDB: NaN, otherLossesDB: NaN,
    cases: Array.from({ length: caseCount }, () => caseColumns(capacity)),
  };
}

/**
 * Entry i as a StepBudget (into `out`, whose cases must match in number):
 * geometry fields from the station columns, `timeS` the step time, adaptive
 * mode names from `modeNames`.
 */
export function readStep(stn: StationColumns, c: LinkColumns, i: number, timeS: number, modeNames: readonly string[], out: StepBudget): StepBudget {
  out.time_s = timeS;
  out.range_km = stn.rangeKm[i];
  out.elevation_deg = stn.elevationDeg[i];
  out.azimuth_deg = stn.azimuthDeg[i];
  out.tx_off_boresight_deg = c.txOffBoresightDeg[i];
  out.rx_off_boresight_deg = c.rxOffBoresightDeg[i];
  out.eirp_dbw = c.eirpDBW[i];
  out.free_space_loss_db = c.freeSpaceLossDB[i];
  out.polarisation_loss_db = c.polarisationLossDB;
  out.tx_pointing_loss_db = c.txPointingLossDB[i];
  out.rx_pointing_loss_db = c.rxPointingLossDB[i];
  out.other_losses_db = c.otherLossesDB;
  out.mount_lag_deg = c.mountLagDeg[i];
  out.mount_limited = c.mountLimited[i] === 1;
  out.doppler_hz = c.dopplerHz[i];
  out.doppler_rate_hz_s = c.dopplerRateHzS[i];
  out.closing_probability = c.closingProbability[i];
  out.expected_information_rate_mbps = c.expectedInformationRateMbps[i];
  out.closing_probability_clamped = c.closingClamped[i] === 1;
  out.element_age_days = c.elementAgeDays[i];
  out.element_pointing_error_deg = c.elementPointingErrorDeg[i];
  out.sun_separation_deg = c.sunSeparationDeg[i];
  out.sun_noise_temperature_k = c.sunNoiseK[i];
  for (let k = 0; k < out.cases.length; k++) {
    const s = c.cases[k];
    const o = out.cases[k];
    o.gas_loss_db = s.gasDB[i];
    o.rain_loss_db = s.rainDB[i];
    o.cloud_loss_db = s.cloudDB[i];
    o.scintillation_db = s.scintillationDB[i];
    o.atmospheric_loss_db = s.atmosphericDB[i];
    o.antenna_temperature_k = s.antennaTemperatureK[i];
    o.system_temperature_k = s.systemTemperatureK[i];
    o.g_over_t_dbk = s.gOverTDBK[i];
    o.c_over_n0_dbhz = s.cOverN0DBHz[i];
    o.eb_over_n0_db = s.ebN0DB[i];
    o.es_over_n0_db = s.esN0DB[i];
    o.required_eb_over_n0_db = s.requiredEbN0DB[i];
    o.margin_db = s.marginDB[i];
    o.usable = s.usable[i] === 1;
    const m = s.mode[i];
    o.mode = m >= 0 && o.usable ? modeNames[m] : '';
    o.information_rate_bps = s.informationRateBps[i];
    o.sun_loss_db = s.sunLossDB[i];
  }
  return out;
}
