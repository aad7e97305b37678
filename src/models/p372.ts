/**
 * External (galactic and man-made) radio noise — ITU-R P.372 (from memory):
 * median external noise figures F_a (dB above k T0 b) as straight lines in log f:
 * galactic F_a = 52 − 23 log10 f(MHz); man-made F_a = c − d log10 f(MHz) with
 * (c, d) = city (76.8, 27.7), residential (72.5, 27.7), rural (67.2, 27.7),
 * quiet rural (53.6, 28.6). T = T0 10^(F_a/10), T0 = 290 K.
 * The man-made lines are given from 0.3 MHz to 250 MHz and the galactic line
 * roughly from 10 MHz to a few hundred MHz; above 250 MHz the values returned
 * are extrapolations (small by then: < 1 K in a city at 1 GHz). Below 0.3 MHz: RangeError.
 */
import type { NoiseEnvironment } from '../budget/types.js';
import { checkAtLeast } from './range.js';


export const P372_VALIDITY = { frequencyMHz: [0.3, 250] as const, minimumFrequencyMHz: 0.3 };
export const REFERENCE_TEMPERATURE_K = 290;

const MAN_MADE: Readonly<Record<Exclude<NoiseEnvironment, 'none'>, readonly [number, number]>> = {
  city: [76.8, 27.7],
  residential: [72.5, 27.7],
  rural: [67.2, 27.7],
  'quiet-rural': [53.6, 28.6],
};

/** True when P.372's straight-line fits are being used above their stated 250 MHz. */
export function externalNoiseIsExtrapolated(frequencyMHz: number): boolean {
  return frequencyMHz > P372_VALIDITY.frequencyMHz[1];
}

/** Galactic noise temperature (K) — ITU-R P.372 (from memory). */
export function galacticNoiseTemperatureK(frequencyMHz: number): number {
  checkAtLeast('galacticNoiseTemperatureK', 'frequencyMHz', frequencyMHz, P372_VALIDITY.minimumFrequencyMHz, 'MHz');
  return REFERENCE_TEMPERATURE_K * 10 ** ((52 - 23 * Math.log10(frequencyMHz)) / 10);
}

/**
 * External noise temperature (K) entering the antenna: galactic + man-made for
 * the environment (powers add) — ITU-R P.372 (from memory). 'none' means no
 * external noise term at all (0 K), for links where the sky model alone applies.
 */
export function externalNoiseTemperatureK(a: { frequencyMHz: number; environment: NoiseEnvironment }): number {
  const fn = 'externalNoiseTemperatureK';
  checkAtLeast(fn, 'frequencyMHz', a.frequencyMHz, P372_VALIDITY.minimumFrequencyMHz, 'MHz');
  if (a.environment === 'none') return 0;
  const cd = Object.prototype.hasOwnProperty.call(MAN_MADE, a.environment) ? MAN_MADE[a.environment] : undefined;
  if (!cd) {
    throw new RangeError(`${fn}: environment = ${JSON.stringify(a.environment)} is outside none, ${Object.keys(MAN_MADE).join(', ')}`);
  }
  const lf = Math.log10(a.frequencyMHz);
  const manMade = REFERENCE_TEMPERATURE_K * 10 ** ((cd[0] - cd[1] * lf) / 10);
  return manMade + galacticNoiseTemperatureK(a.frequencyMHz);
}
