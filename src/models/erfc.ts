/**
 * Complementary error function (Node has none), to near double precision:
 * - |x| < 2.5: erf(x) = (2/√π) e^(−x²) Σ 2ⁿ x^(2n+1) / (1·3·…·(2n+1)) — Abramowitz & Stegun,
 *   Handbook of Mathematical Functions, 7.1.6 (all terms positive, no cancellation); erfc = 1 − erf.
 * - x ≥ 2.5: the continued fraction erfc(x) = (e^(−x²)/√π) / (x + (1/2)/(x + 1/(x + (3/2)/(x + …))))
 *   — A&S 7.1.14, evaluated by the modified Lentz method (Press et al., Numerical Recipes, §5.2).
 * - x < 0: erfc(x) = 2 − erfc(−x).
 */
const INV_SQRT_PI = 1 / Math.sqrt(Math.PI);
const SWITCH = 2.5;

function erfSeries(x: number): number {
  const x2 = x * x;
  let term = x, sum = x;
  for (let n = 1; n < 200; n++) {
    term *= (2 * x2) / (2 * n + 1);
    sum += term;
    if (term < sum * 1e-17) break;
  }
  return 2 * INV_SQRT_PI * Math.exp(-x2) * sum;
}

function erfcContinuedFraction(x: number): number {
  const tiny = 1e-300;
  let f = x, c = x, d = 0;
  for (let n = 1; n < 500; n++) {
    const an = n / 2;
    d = x + an * d;
    d = d === 0 ? tiny : 1 / d;
    c = x + an / c;
    if (c === 0) c = tiny;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return (Math.exp(-x * x) * INV_SQRT_PI) / f;
}

export function erfc(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x < 0) return 2 - erfc(-x);
  if (x < SWITCH) return 1 - erfSeries(x);
  return erfcContinuedFraction(x);
}

/** Exposed for the cross-check of the two expansions in the tests. */
export const erfcParts = { erfSeries, erfcContinuedFraction };
