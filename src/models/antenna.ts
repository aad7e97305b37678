/**
 * Antenna gain models. Per-step functions (pointing loss, patterns) allocate
 * nothing and check only what is cheap.
 */
import { checkAtLeast, checkRange } from './range.js';
import { C_M_S, DEG } from './constants.js';

/** Gain floor of the parabolic main-lobe model below the peak (dB): a stated sidelobe level, assumption of this project. */
export const PARABOLIC_SIDELOBE_BELOW_PEAK_DB = 30;

function wavelengthM(frequencyGHz: number): number {
  return C_M_S / (frequencyGHz * 1e9);
}

/** G = η (π D / λ)² (dBi) — aperture antenna gain (common practice; e.g. Balanis, Antenna Theory). */
export function parabolicGainDBi(a: { diameterM: number; frequencyGHz: number; efficiency: number }): number {
  const fn = 'parabolicGainDBi';
  checkAtLeast(fn, 'diameterM', a.diameterM, 0, 'm', true);
  checkAtLeast(fn, 'frequencyGHz', a.frequencyGHz, 0, 'GHz', true);
  checkRange(fn, 'efficiency', a.efficiency, [1e-6, 1]);
  return 10 * Math.log10(a.efficiency * ((Math.PI * a.diameterM) / wavelengthM(a.frequencyGHz)) ** 2);
}

/** θ3dB ≈ 70 λ / D (deg) — half-power beamwidth of a dish (common practice). */
export function parabolicBeamwidthDeg(a: { diameterM: number; frequencyGHz: number }): number {
  checkAtLeast('parabolicBeamwidthDeg', 'diameterM', a.diameterM, 0, 'm', true);
  checkAtLeast('parabolicBeamwidthDeg', 'frequencyGHz', a.frequencyGHz, 0, 'GHz', true);
  return (70 * wavelengthM(a.frequencyGHz)) / a.diameterM;
}

/** L = 12 (θe / θ3dB)² dB — main-lobe Gaussian-beam pointing loss (common practice). */
export function pointingLossDB(a: { errorDeg: number; beamwidthDeg: number }): number {
  const r = a.errorDeg / a.beamwidthDeg;
  return 12 * r * r;
}

/**
 * Parabolic gain off boresight (dBi): peak − 12 (θ/θ3dB)², floored at
 * peak − PARABOLIC_SIDELOBE_BELOW_PEAK_DB (or `floorGainDBi` when given).
 * The Gaussian main lobe is fair to about the first null (≈ 1.2 θ3dB, −17 dB);
 * beyond, the flat floor stands for the sidelobes (assumption, not a pattern standard).
 */
export function parabolicGainAtDBi(a: {
  diameterM: number; frequencyGHz: number; efficiency: number; offBoresightDeg: number; floorGainDBi?: number;
}): number {
  const peak = parabolicGainDBi(a);
  return parabolicMainLobeDBi(peak, parabolicBeamwidthDeg(a), a.floorGainDBi ?? peak - PARABOLIC_SIDELOBE_BELOW_PEAK_DB, a.offBoresightDeg);
}

/** The main lobe with its floor, from the peak (dBi), beamwidth (deg) and floor (dBi): the one formula of parabolicGainAtDBi. */
function parabolicMainLobeDBi(peak: number, beamwidthDeg: number, floor: number, offDeg: number): number {
  const r = offDeg / beamwidthDeg;
  const g = peak - 12 * r * r; // pointingLossDB, inlined so the call does not allocate
  return g > floor ? g : floor;
}

/** parabolicGainAtDBi at off[i] + addDeg for i < n, into out: the peak, beamwidth and floor computed once (same numbers). */
export function parabolicGainColumnDBi(
  a: { diameterM: number; frequencyGHz: number; efficiency: number; floorGainDBi?: number }, off: Float64Array, addDeg: number, n: number, out: Float64Array,
): void {
  const peak = parabolicGainDBi(a);
  const bw = parabolicBeamwidthDeg(a);
  const floor = (a.floorGainDBi ?? peak - PARABOLIC_SIDELOBE_BELOW_PEAK_DB) * 1;
  for (let i = 0; i < n; i++) out[i] = parabolicMainLobeDBi(peak, bw, floor, off[i] + addDeg);
}

/** n such that cosⁿ(θ3dB / 2) = 1/2, for 0 < θ3dB < 180° (broad-beam cosine-power model; common practice). */
export function cosinePowerExponent(a: { beamwidthDeg: number }): number {
  checkRange('cosinePowerExponent', 'beamwidthDeg', a.beamwidthDeg, [1e-6, 179.999], 'deg');
  return Math.log(0.5) / Math.log(Math.cos((a.beamwidthDeg / 2) * DEG));
}

/** Default floor of the cosine-power pattern below the peak (dB), assumption of this project. */
export const COSINE_POWER_FLOOR_BELOW_PEAK_DB = 30;

/**
 * G(θ) = G0 + 10 log10(cosⁿ θ) (dBi), not below the floor (default G0 − 30 dB);
 * the floor also applies for θ ≥ 90° (broad-beam model; common practice).
 */
export function cosinePowerGainDBi(a: { peakGainDBi: number; exponent: number; offBoresightDeg: number; floorGainDBi?: number }): number {
  one[0] = a.offBoresightDeg;
  cosinePowerGainColumnDBi(a, one, 0, 1, one);
  return one[0];
}
const one = new Float64Array(1);

/** cosinePowerGainDBi at off[i] + addDeg for i < n, into out (out may be off). */
export function cosinePowerGainColumnDBi(
  a: { peakGainDBi: number; exponent: number; floorGainDBi?: number }, off: Float64Array, addDeg: number, n: number, out: Float64Array,
): void {
  // × 1: a plain float64 for the loop (an optional field read as is would make every result a boxed number).
  const floor = (a.floorGainDBi ?? a.peakGainDBi - COSINE_POWER_FLOOR_BELOW_PEAK_DB) * 1;
  // 10 n log10(cos θ) = c ln(cos θ), c = 10 n / ln 10: Math.log is several times cheaper than Math.log10 in V8 (equal to ~1 ulp).
  const c = (10 * a.exponent) / Math.LN10;
  const peak = a.peakGainDBi * 1;
  for (let i = 0; i < n; i++) {
    const x = off[i] + addDeg;
    const th = x < 0 ? -x : x;
    const g = th >= 90 ? floor : peak + c * Math.log(Math.cos(th * DEG));
    out[i] = g > floor ? g : floor;
  }
}

/**
 * cosinePowerGainDBi at off[i] and at off[i] + addDeg (addDeg ≥ 0, off[i] in
 * 0–180°), into gainOut and gainPlusOut: the second cosine from the angle-sum
 * identity cos(θ+ε) = cos θ cos ε − sin θ sin ε with sin θ = √(1 − cos² θ)
 * (one cosine per step instead of two). sin θ taken from cos θ loses about
 * √(2⁻⁵³) ≈ 1e-8 rad near boresight, so the second gain is within 1e-8 dB of
 * a direct evaluation (tested), far below the 0.001 dB the outputs print.
 */
export function cosinePowerGainPairColumnDBi(
  a: { peakGainDBi: number; exponent: number; floorGainDBi?: number }, off: Float64Array, addDeg: number, n: number,
  gainOut: Float64Array, gainPlusOut: Float64Array,
): void {
  const floor = (a.floorGainDBi ?? a.peakGainDBi - COSINE_POWER_FLOOR_BELOW_PEAK_DB) * 1;
  const c = (10 * a.exponent) / Math.LN10;
  const peak = a.peakGainDBi * 1;
  const ce = Math.cos(addDeg * DEG), se = Math.sin(addDeg * DEG);
  for (let i = 0; i < n; i++) {
    const x = off[i];
    const th = x < 0 ? -x : x;
    if (th >= 90) { gainOut[i] = floor; gainPlusOut[i] = floor; continue; }
    const ct = Math.cos(th * DEG);
    const g = peak + c * Math.log(ct);
    gainOut[i] = g > floor ? g : floor;
    if (th + addDeg >= 90) { gainPlusOut[i] = floor; continue; }
    const cp = ct * ce - Math.sqrt(1 - ct * ct) * se;
    const gp = peak + c * Math.log(cp);
    gainPlusOut[i] = gp > floor ? gp : floor;
  }
}

export interface GainTable { offBoresightDeg: number[]; gainDBi: number[] }

/**
 * Checks a tabulated pattern once (at scenario load): same lengths, at least
 * one point, finite values, angles strictly increasing. Throws RangeError naming the fault.
 */
export function validateGainTable(t: GainTable): void {
  const fn = 'validateGainTable';
  if (t.offBoresightDeg.length !== t.gainDBi.length) {
    throw new RangeError(`${fn}: offBoresightDeg has ${t.offBoresightDeg.length} points and gainDBi ${t.gainDBi.length} (must be equal)`);
  }
  if (t.offBoresightDeg.length === 0) throw new RangeError(`${fn}: the table is empty (at least 1 point)`);
  for (let i = 0; i < t.offBoresightDeg.length; i++) {
    if (!Number.isFinite(t.offBoresightDeg[i]) || !Number.isFinite(t.gainDBi[i])) {
      throw new RangeError(`${fn}: point ${i} is not finite (finite numbers)`);
    }
    if (i > 0 && !(t.offBoresightDeg[i] > t.offBoresightDeg[i - 1])) {
      throw new RangeError(`${fn}: offBoresightDeg[${i}] = ${t.offBoresightDeg[i]} is not above offBoresightDeg[${i - 1}] = ${t.offBoresightDeg[i - 1]} (strictly increasing)`);
    }
  }
}

/**
 * Gain (dBi) at `angleDeg` from a tabulated pattern, linear in dB between points,
 * held constant beyond the ends. Binary search; no allocation. Call
 * validateGainTable once beforehand (this per-step function only checks lengths).
 */
export function tabulatedGainDBi(t: GainTable, angleDeg: number): number {
  const x = t.offBoresightDeg, y = t.gainDBi, n = x.length;
  if (n === 0 || n !== y.length) validateGainTable(t);
  if (angleDeg <= x[0]) return y[0];
  if (angleDeg >= x[n - 1]) return y[n - 1];
  let lo = 0, hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (x[mid] <= angleDeg) lo = mid; else hi = mid;
  }
  const w = (angleDeg - x[lo]) / (x[hi] - x[lo]);
  return y[lo] + w * (y[hi] - y[lo]);
}
