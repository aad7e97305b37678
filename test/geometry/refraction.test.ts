/**
 * Refraction per ITU-R P.834 (formula from memory, PHYSICS.md §11): about
 * 0.76 deg at the horizon, 0.19 deg at 5 deg and 0.09 deg at 10 deg (h = 0),
 * values also from memory; the inversion must satisfy θ0 − τ(h, θ0) = θ.
 */
import { describe, expect, it } from 'vitest';
import { apparentElevationDeg, refractionDeg } from '../../src/geometry/refraction.js';

describe('ITU-R P.834 refraction (from memory)', () => {
  it.each([[0, 0.761], [5, 0.1905], [10, 0.0942]])('tau(0 km, %d deg) = %d deg', (el, tau) => {
    expect(refractionDeg(0, el)).toBeCloseTo(tau, 3);
  });
  it('decreases with station height', () => {
    expect(refractionDeg(2, 0)).toBeLessThan(refractionDeg(0, 0));
    expect(refractionDeg(2, 0)).toBeCloseTo(1 / (1.314 + 2 * 0.2305 + 0.008583 * 4), 12);
  });
  it.each([-0.5, 0, 2, 5, 10, 30, 89])('apparent elevation inverts the bending at geometric %d deg', (g) => {
    const app = apparentElevationDeg(0.5, g);
    expect(app - refractionDeg(0.5, app)).toBeCloseTo(g, 9);
    expect(app).toBeGreaterThan(g);
  });
  it('holds the bending below -1 deg geometric, continuously', () => {
    const at = apparentElevationDeg(0, -1) + 1;
    expect(apparentElevationDeg(0, -5) + 5).toBeCloseTo(at, 12);
    expect(apparentElevationDeg(0, -1 + 1e-9) - apparentElevationDeg(0, -1)).toBeLessThan(1e-8);
  });
});
