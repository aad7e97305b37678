/**
 * Specific attenuation of rain — ITU-R P.838-3: γR = k R^α (dB/km), with k and α
 * from the horizontal/vertical coefficients combined for path elevation and
 * polarisation tilt (eqs. (2)–(5)).
 */
import { checkRange, type Interval } from './range.js';
import { DEG } from './constants.js';

export const P838_VALIDITY = { frequencyGHz: [1, 1000] as Interval, elevationDeg: [0, 90] as Interval };

// P.838-3 Tables 1–4: rows of (a_j, b_j, c_j), then m, c.
type Coeffs = { terms: readonly (readonly [number, number, number])[]; m: number; c: number };
const KH: Coeffs = {
  terms: [[-5.3398, -0.10008, 1.13098], [-0.35351, 1.2697, 0.454], [-0.23789, 0.86036, 0.15354], [-0.94158, 0.64552, 0.16817]],
  m: -0.18961, c: 0.71147,
};
const KV: Coeffs = {
  terms: [[-3.80595, 0.56934, 0.81061], [-3.44965, -0.22911, 0.51059], [-0.39902, 0.73042, 0.11899], [0.50167, 1.07319, 0.27195]],
  m: -0.16398, c: 0.63297,
};
const AH: Coeffs = {
  terms: [[-0.14318, 1.82442, -0.55187], [0.29591, 0.77564, 0.19822], [0.32177, 0.63773, 0.13164],
    [-5.3761, -0.9623, 1.47828], [16.1721, -3.2998, 3.4399]],
  m: 0.67849, c: -1.95537,
};
const AV: Coeffs = {
  terms: [[-0.07771, 2.3384, -0.76284], [0.56727, 0.95545, 0.54039], [-0.20238, 1.1452, 0.26809],
    [-48.2991, 0.791669, 0.116226], [48.5833, 0.791459, 0.116479]],
  m: -0.053739, c: 0.83433,
};

function fit(c: Coeffs, lf: number): number {
  let s = 0;
  for (let j = 0; j < c.terms.length; j++) {
    const t = c.terms[j];
    s += t[0] * Math.exp(-(((lf - t[1]) / t[2]) ** 2));
  }
  return s + c.m * lf + c.c;
}

/** kH, kV, αH, αV at the last frequency asked for: a table of one link evaluates them at one frequency, many times. */
const last = { f: NaN, kH: NaN, kV: NaN, aH: NaN, aV: NaN };
function coefficientsAt(frequencyGHz: number): typeof last {
  if (frequencyGHz !== last.f) {
    const lf = Math.log10(frequencyGHz);
    last.kH = 10 ** fit(KH, lf); last.kV = 10 ** fit(KV, lf);
    last.aH = fit(AH, lf); last.aV = fit(AV, lf);
    last.f = frequencyGHz;
  }
  return last;
}

export interface RainCoefficients { k: number; alpha: number }

/** k and α for elevation θ and tilt τ (τ = 45° for circular) — ITU-R P.838-3 eqs. (2)–(5). */
export function rainSpecificCoefficients(a: { frequencyGHz: number; elevationDeg: number; tiltDeg: number }): RainCoefficients {
  const fn = 'rainSpecificCoefficients';
  checkRange(fn, 'frequencyGHz', a.frequencyGHz, P838_VALIDITY.frequencyGHz, 'GHz');
  checkRange(fn, 'elevationDeg', a.elevationDeg, P838_VALIDITY.elevationDeg, 'deg');
  checkRange(fn, 'tiltDeg', a.tiltDeg, [-180, 180], 'deg');
  const { kH, kV, aH, aV } = coefficientsAt(a.frequencyGHz);
  const cos2 = Math.cos(a.elevationDeg * DEG) ** 2 * Math.cos(2 * a.tiltDeg * DEG);
  const k = (kH + kV + (kH - kV) * cos2) / 2;
  const alpha = (kH * aH + kV * aV + (kH * aH - kV * aV) * cos2) / (2 * k);
  return { k, alpha };
}

/** γR = k R^α (dB/km) — ITU-R P.838-3 eq. (1). */
export function rainSpecificAttenuation(a: { frequencyGHz: number; elevationDeg: number; tiltDeg: number; rainRateMmH: number }): number {
  if (!(a.rainRateMmH >= 0) || !Number.isFinite(a.rainRateMmH)) {
    throw new RangeError(`rainSpecificAttenuation: rainRateMmH = ${a.rainRateMmH} is outside ≥ 0 mm/h`);
  }
  const { k, alpha } = rainSpecificCoefficients(a);
  return k * a.rainRateMmH ** alpha;
}
