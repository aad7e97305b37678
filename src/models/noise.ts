/** Noise temperatures, system temperature and G/T. */
import { checkAtLeast, checkRange } from './range.js';

/** Boltzmann constant (J/K), exact in the 2019 SI. */
export const BOLTZMANN_J_PER_K = 1.380649e-23;
/** 10 log10(k) = −228.599… dBW/(K·Hz) (rounds to the trade value −228.60). */
export const BOLTZMANN_DBW_PER_K_HZ = 10 * Math.log10(BOLTZMANN_J_PER_K);
/** Cosmic background temperature (K) used in the sky-noise formula (P.618 §3; from memory). */
export const COSMIC_BACKGROUND_K = 2.725;
export const T0_K = 290;
/** Default mean radiating temperature T_mr (K) of the atmosphere (P.618 §3; from memory). */
export const DEFAULT_MEAN_RADIATING_TEMPERATURE_K = 275;

/** T_mr ≈ 37.34 + 0.81 T_s (K), T_s the surface temperature (P.618 §3; from memory). */
export function meanRadiatingTemperatureK(a: { surfaceTemperatureK: number }): number {
  checkRange('meanRadiatingTemperatureK', 'surfaceTemperatureK', a.surfaceTemperatureK, [180, 340], 'K');
  return 37.34 + 0.81 * a.surfaceTemperatureK;
}

/**
 * Sky brightness temperature seen through an atmosphere of total attenuation A (dB):
 * T_sky = T_mr (1 − 10^(−A/10)) + T_c 10^(−A/10) — ITU-R P.618-13 §3 (T_mr, T_c from memory).
 */
export function skyNoiseTemperatureK(a: { attenuationDB: number; meanRadiatingTemperatureK?: number }): number {
  checkAtLeast('skyNoiseTemperatureK', 'attenuationDB', a.attenuationDB, 0, 'dB');
  const tmr = a.meanRadiatingTemperatureK ?? DEFAULT_MEAN_RADIATING_TEMPERATURE_K;
  const tr = 10 ** (-a.attenuationDB / 10);
  return tmr * (1 - tr) + COSMIC_BACKGROUND_K * tr;
}

/** T = T0 (10^(NF/10) − 1) (K), T0 = 290 K (IEEE definition of noise figure; common practice). */
export function noiseTemperatureFromFigureK(noiseFigureDB: number): number {
  checkAtLeast('noiseTemperatureFromFigureK', 'noiseFigureDB', noiseFigureDB, 0, 'dB');
  return T0_K * (10 ** (noiseFigureDB / 10) - 1);
}

export type SystemNoiseInput =
  | { antennaTemperatureK: number; feedLossDB: number; receiverNoiseFigureDB: number }
  | { antennaTemperatureK: number; feedLossDB: number; receiverTemperatureK: number };

/**
 * System temperature at the LNA input (K): T_A 10^(−L/10) + T0 (1 − 10^(−L/10)) + T_rx,
 * the feed loss L at physical temperature T0 = 290 K (Friis cascade; common practice).
 */
export function systemNoiseTemperatureK(a: SystemNoiseInput): number {
  const fn = 'systemNoiseTemperatureK';
  checkAtLeast(fn, 'antennaTemperatureK', a.antennaTemperatureK, 0, 'K');
  checkAtLeast(fn, 'feedLossDB', a.feedLossDB, 0, 'dB');
  let trx: number;
  if ('receiverTemperatureK' in a) {
    checkAtLeast(fn, 'receiverTemperatureK', a.receiverTemperatureK, 0, 'K');
    trx = a.receiverTemperatureK;
  } else {
    trx = noiseTemperatureFromFigureK(a.receiverNoiseFigureDB);
  }
  const g = 10 ** (-a.feedLossDB / 10);
  return a.antennaTemperatureK * g + T0_K * (1 - g) + trx;
}

/** G/T = G − L_feed − 10 log10 T_sys (dB/K), referred to the LNA input (common practice). */
export function gOverTDBK(a: { gainDBi: number; feedLossDB: number; systemTemperatureK: number }): number {
  checkAtLeast('gOverTDBK', 'systemTemperatureK', a.systemTemperatureK, 0, 'K', true);
  return a.gainDBi - a.feedLossDB - 10 * Math.log10(a.systemTemperatureK);
}
