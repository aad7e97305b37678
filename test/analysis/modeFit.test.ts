/**
 * Mode fit times by rank (ModeFit) equal the direct rule they replace: for
 * each mode, Σ Δt over steps with Es/N0 ≥ its threshold (modes.ts), on
 * thresholds with ties and out of order, random Es/N0 including NaN.
 */
import { describe, expect, it } from 'vitest';
import { createModeFit } from '../../src/analysis/modes.js';

describe('createModeFit', () => {
  it('equals per-mode counting of Es/N0 ≥ threshold', () => {
    const th = Float64Array.from([4.2, 1, 7, 4.2, -2, 10.5, 3]);
    const fit = createModeFit(th);
    const direct = new Float64Array(th.length);
    let s = 7;
    for (let i = 0; i < 5000; i++) {
      s = (Math.imul(s, 1103515245) + 12345) >>> 0;
      const es = i % 97 === 0 ? NaN : -5 + (20 * s) / 2 ** 32 + (i % 13 === 0 ? 0 : 0);
      const dt = 0.5 + (i % 3);
      fit.add(es, dt);
      for (let m = 0; m < th.length; m++) if (es >= th[m]) direct[m] += dt;
    }
    // A value exactly on a threshold fits (≥).
    fit.add(4.2, 1); for (let m = 0; m < th.length; m++) if (4.2 >= th[m]) direct[m] += 1;
    const got = fit.fitTimeS();
    for (let m = 0; m < th.length; m++) expect(got[m]).toBeCloseTo(direct[m], 9);
    const other = createModeFit(th);
    other.addFrom(fit);
    expect(Array.from(other.fitTimeS())).toEqual(Array.from(got));
  });
});
