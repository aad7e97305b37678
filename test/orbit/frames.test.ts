/**
 * GMST (IAU-82, Vallado 2004 eq. 3-45) from seconds since J2000 against
 * satellite.js `gstime` (the same equation, fed a Julian date): they agree to
 * the Julian date's float64 resolution (~40 µs at 2026, i.e. 3e-9 rad of
 * rotation), and ours has no such steps (smooth to the millisecond).
 */
import { gstime } from 'satellite.js';
import { describe, expect, it } from 'vitest';
import { gmstRad, EARTH_ROTATION_RAD_S } from '../../src/orbit/frames.js';
import { julianDateFromUnix } from '../../src/orbit/time.js';

describe('gmstRad', () => {
  it('equals satellite.js gstime within 5e-9 rad from 1990 to 2060', () => {
    let worst = 0;
    for (let i = 0; i < 20_000; i++) {
      const t = 631_152_000 + (i / 20_000) * 70 * 365.25 * 86_400 + (i % 7) * 0.123;
      let d = Math.abs(gmstRad(t) - gstime(julianDateFromUnix(t)));
      if (d > Math.PI) d = 2 * Math.PI - d;
      worst = Math.max(worst, d);
    }
    expect(worst).toBeLessThan(5e-9);
  });
  it('advances smoothly at the sidereal rate: 1 ms steps within 5e-11 rad of ω⊕ × 1 ms (the Julian-date form steps by ~3e-9 rad)', () => {
    // 5e-11 rad (0.3 mm at the equator): a few float64 ulps of eq. 3-45's sidereal seconds (~1.2e-7 s ≈ 9e-12 rad) and of the angle (7e-12 rad).
    const t0 = 1_795_305_600.25;
    let ours = 0, viaJd = 0;
    for (let i = 0; i < 1000; i++) {
      const d = gmstRad(t0 + (i + 1) * 1e-3) - gmstRad(t0 + i * 1e-3);
      ours = Math.max(ours, Math.abs(d - EARTH_ROTATION_RAD_S * 1e-3));
      const dj = gstime(julianDateFromUnix(t0 + (i + 1) * 1e-3)) - gstime(julianDateFromUnix(t0 + i * 1e-3));
      viaJd = Math.max(viaJd, Math.abs(dj - EARTH_ROTATION_RAD_S * 1e-3));
    }
    expect(ours).toBeLessThan(5e-11);
    expect(viaJd).toBeGreaterThan(1e-9);
  });
});
