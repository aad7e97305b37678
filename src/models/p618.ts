/**
 * Earth–space propagation — ITU-R P.618-13:
 * rain attenuation (§2.2.1.1), tropospheric scintillation (§2.4.1) and the
 * combination of the impairments into a total attenuation (§2.5).
 */
import { rainSpecificCoefficients } from './p838.js';
import { checkAtLeast, checkRange, type Interval } from './range.js';
import { DEG } from './constants.js';

export const P618_RAIN_VALIDITY = {
  frequencyGHz: [1, 55] as Interval,
  exceedancePercent: [0.001, 5] as Interval,
  elevationDeg: [0, 90] as Interval,
};
/**
 * §2.4.1 is stated for θ ≥ 5° and 0.01 % ≤ p ≤ 50 % (and 4–55 GHz, from memory).
 * The SG3 validation examples evaluate a(p) down to p = 0.001 %; we accept that
 * extrapolation. Below 5° elevation we return the 5° value (see scintillationFade).
 */
export const P618_SCINTILLATION_VALIDITY = {
  frequencyGHz: [4, 55] as Interval,
  exceedancePercent: [0.001, 50] as Interval,
  elevationDeg: [0, 90] as Interval,
};
export const P618_TOTAL_VALIDITY = { exceedancePercent: [0.001, 50] as Interval };

const RE_KM = 8500;

export interface RainAttenuationInput {
  latitudeDeg: number;
  stationHeightKm: number;
  frequencyGHz: number;
  elevationDeg: number;
  /** Polarisation tilt from horizontal (deg); 45 for circular. */
  tiltDeg: number;
  exceedancePercent: number;
  rainRate001MmH: number;
  rainHeightKm: number;
}

export interface RainAttenuation { attenuationDB: number; slantPathKm: number }

/**
 * Rain attenuation exceeded for p % of an average year — ITU-R P.618-13 §2.2.1.1, steps 1–10.
 * Below 5° the slant path uses the curved-Earth form of step 2, which is finite at
 * θ = 0 (Ls = sqrt(2 (h_R − h_s) R_e)); every later step is finite there too
 * (sin θ → 0 turns the vertical adjustment and the β term off), so 0° needs no clamp.
 */
export function rainAttenuation(a: RainAttenuationInput): RainAttenuation {
  const r = rainAttenuation001(a);
  return { attenuationDB: rainAttenuationAt(r, a.exceedancePercent), slantPathKm: r.slantPathKm };
}

/** The p-independent part of §2.2.1.1 (steps 1–8): A0.01 and what steps 9–10 need. */
export interface RainAttenuation001 {
  a001DB: number;
  slantPathKm: number;
  absLatDeg: number;
  elevationDeg: number;
  sinElevation: number;
}

/**
 * ITU-R P.618-13 §2.2.1.1 steps 1–8 (A0.01), checked as rainAttenuation checks its
 * input (exceedancePercent included); steps 9–10 at any p by rainAttenuationAt.
 */
export function rainAttenuation001(a: RainAttenuationInput): RainAttenuation001 {
  const fn = 'rainAttenuation';
  checkRange(fn, 'frequencyGHz', a.frequencyGHz, P618_RAIN_VALIDITY.frequencyGHz, 'GHz');
  checkRange(fn, 'elevationDeg', a.elevationDeg, P618_RAIN_VALIDITY.elevationDeg, 'deg');
  checkRange(fn, 'exceedancePercent', a.exceedancePercent, P618_RAIN_VALIDITY.exceedancePercent, '%');
  checkRange(fn, 'latitudeDeg', a.latitudeDeg, [-90, 90], 'deg');
  checkAtLeast(fn, 'rainRate001MmH', a.rainRate001MmH, 0, 'mm/h');
  checkAtLeast(fn, 'rainHeightKm', a.rainHeightKm, -Infinity, 'km');
  checkAtLeast(fn, 'stationHeightKm', a.stationHeightKm, -Infinity, 'km');
  const f = a.frequencyGHz;
  const th = a.elevationDeg * DEG, sinT = Math.sin(th), cosT = Math.cos(th);
  const dh = a.rainHeightKm - a.stationHeightKm;
  const absLat = Math.abs(a.latitudeDeg);
  const none = (ls: number): RainAttenuation001 => ({ a001DB: 0, slantPathKm: ls, absLatDeg: absLat, elevationDeg: a.elevationDeg, sinElevation: sinT });
  // Step 1: station above the rain.
  if (dh <= 0) return none(0);
  // Step 2: slant path below the rain height.
  const ls = a.elevationDeg >= 5 ? dh / sinT : (2 * dh) / (Math.sqrt(sinT * sinT + (2 * dh) / RE_KM) + sinT);
  if (a.rainRate001MmH === 0) return none(ls);
  // Steps 3–4: horizontal projection and specific attenuation (P.838-3).
  const lg = ls * cosT;
  const { k, alpha } = rainSpecificCoefficients({ frequencyGHz: f, elevationDeg: a.elevationDeg, tiltDeg: a.tiltDeg });
  const gammaR = k * a.rainRate001MmH ** alpha;
  // Step 5: horizontal reduction factor.
  const r001 = 1 / (1 + 0.78 * Math.sqrt((lg * gammaR) / f) - 0.38 * (1 - Math.exp(-2 * lg)));
  // Step 6: vertical adjustment factor.
  const zetaDeg = Math.atan2(dh, lg * r001) / DEG;
  const lr = zetaDeg > a.elevationDeg ? (lg * r001) / cosT : dh / sinT;
  const chi = absLat < 36 ? 36 - absLat : 0;
  const v001 = 1 / (1 + Math.sqrt(sinT)
    * ((31 * (1 - Math.exp(-(a.elevationDeg / (1 + chi)))) * Math.sqrt(lr * gammaR)) / (f * f) - 0.45));
  // Steps 7–8: effective path length and A0.01.
  const a001 = gammaR * lr * v001;
  return { a001DB: a001, slantPathKm: ls, absLatDeg: absLat, elevationDeg: a.elevationDeg, sinElevation: sinT };
}

/** ITU-R P.618-13 §2.2.1.1 steps 9–10: A_p from A0.01 (0.001 % ≤ p ≤ 5 %; not checked here). */
export function rainAttenuationAt(r: RainAttenuation001, p: number): number {
  const a001 = r.a001DB, absLat = r.absLatDeg, sinT = r.sinElevation;
  if (a001 === 0) return 0;
  let beta: number;
  if (p >= 1 || absLat >= 36) beta = 0;
  else if (r.elevationDeg >= 25) beta = -0.005 * (absLat - 36);
  else beta = -0.005 * (absLat - 36) + 1.8 - 4.25 * sinT;
  const exponent = -(0.655 + 0.033 * Math.log(p) - 0.045 * Math.log(a001) - beta * (1 - p) * sinT);
  return a001 * (p / 0.01) ** exponent;
}

export interface ScintillationInput {
  frequencyGHz: number;
  elevationDeg: number;
  exceedancePercent: number;
  antennaDiameterM: number;
  antennaEfficiency: number;
  /** Wet term of the surface refractivity N_wet (N-units, P.453). */
  nWet: number;
}

const SCINT_MIN_ELEVATION_DEG = 5;

/**
 * Tropospheric scintillation fade depth exceeded for p % — ITU-R P.618-13 §2.4.1, steps 1–9.
 * The method is stated for θ ≥ 5°; below 5° we return the value at 5° (continuous,
 * but it underestimates the deep low-elevation fades that §2.4.2 would give —
 * §2.4.2 is not implemented).
 */
export function scintillationFade(a: ScintillationInput): number {
  return scintillationSigma(a) * scintillationTimeFactor(a.exceedancePercent);
}

/** ITU-R P.618-13 §2.4.1 steps 1–7: the standard deviation σ of the signal (dB), input checked as scintillationFade checks it. */
export function scintillationSigma(a: ScintillationInput): number {
  const fn = 'scintillationFade';
  checkRange(fn, 'frequencyGHz', a.frequencyGHz, P618_SCINTILLATION_VALIDITY.frequencyGHz, 'GHz');
  checkRange(fn, 'elevationDeg', a.elevationDeg, P618_SCINTILLATION_VALIDITY.elevationDeg, 'deg');
  checkRange(fn, 'exceedancePercent', a.exceedancePercent, P618_SCINTILLATION_VALIDITY.exceedancePercent, '%');
  checkAtLeast(fn, 'antennaDiameterM', a.antennaDiameterM, 0, 'm', true);
  checkRange(fn, 'antennaEfficiency', a.antennaEfficiency, [1e-6, 1]);
  checkAtLeast(fn, 'nWet', a.nWet, 0, 'N-units');
  const f = a.frequencyGHz;
  const th = Math.max(a.elevationDeg, SCINT_MIN_ELEVATION_DEG) * DEG, sinT = Math.sin(th);
  const sigmaRef = 3.6e-3 + 1e-4 * a.nWet; // step 3
  const hL = 1000; // m, height of the turbulent layer
  const l = (2 * hL) / (Math.sqrt(sinT * sinT + 2.35e-4) + sinT); // step 4
  const dEff = Math.sqrt(a.antennaEfficiency) * a.antennaDiameterM; // step 5
  const x = (1.22 * dEff * dEff * f) / l; // step 6
  const g2 = 3.86 * (x * x + 1) ** (11 / 12) * Math.sin((11 / 6) * Math.atan(1 / x)) - 7.08 * x ** (5 / 6);
  if (g2 <= 0) return 0; // P.618-13 step 6 (from memory): a negative argument (x ≥ 7.0) means the aperture averages the scintillation out, fade 0
  return (sigmaRef * f ** (7 / 12) * Math.sqrt(g2)) / sinT ** 1.2; // step 7
}

/** ITU-R P.618-13 §2.4.1 step 8: the time percentage factor a(p); the fade is a(p) σ (step 9). */
export function scintillationTimeFactor(p: number): number {
  const lp = Math.log10(p);
  return -0.061 * lp ** 3 + 0.072 * lp * lp - 1.71 * lp + 3.0;
}

/**
 * Total attenuation A_T(p) = A_G + sqrt((A_R + A_C)² + A_S²) — ITU-R P.618-13 §2.5;
 * for p < 1 % the gas and cloud terms are taken at 1 %.
 */
export function totalAttenuation(a: {
  exceedancePercent: number; gasDB: number; gasAt1PctDB: number; cloudDB: number; cloudAt1PctDB: number;
  rainDB: number; scintillationDB: number;
}): number {
  checkRange('totalAttenuation', 'exceedancePercent', a.exceedancePercent, P618_TOTAL_VALIDITY.exceedancePercent, '%');
  const below1 = a.exceedancePercent < 1;
  const gas = below1 ? a.gasAt1PctDB : a.gasDB;
  const cloud = below1 ? a.cloudAt1PctDB : a.cloudDB;
  return gas + Math.sqrt((a.rainDB + cloud) ** 2 + a.scintillationDB ** 2);
}
