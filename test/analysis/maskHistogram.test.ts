import { describe, expect, it } from 'vitest';
import { createMaskHistogram, findMask, maskTrade } from '../../src/analysis/maskHistogram.js';
import { InputError } from '../../src/errors.js';
import { lcg } from './synthetic.js';

interface Sample { e: number; dt: number; usable: boolean; rate: number }

/** Synthetic passes: elevation 0–90°, usable above ~12° with random fades below 25°. */
function samples(seed: number, n = 20_000): Sample[] {
  const rnd = lcg(seed);
  const out: Sample[] = [];
  for (let i = 0; i < n; i++) {
    const e = 90 * rnd() ** 1.5;
    const fade = e < 25 && rnd() < 0.05;
    const usable = e >= 12 + 2 * rnd() && !fade;
    out.push({ e, dt: 5 + 5 * rnd(), usable, rate: usable ? 1e6 * (1 + e / 30) : 0 });
  }
  return out;
}

function histOf(s: Sample[], binDeg = 0.1) {
  const h = createMaskHistogram({ binDeg, station: 'Gorsemoor', link: 'x-band', weather: 'clear' });
  for (const x of s) h.add(x.e, x.dt, x.usable, x.rate);
  return h;
}

const timeAbove = (s: Sample[], m: number, usableOnly: boolean) =>
  s.filter((x) => x.e >= m && (!usableOnly || x.usable)).reduce((a, x) => a + x.dt, 0);

describe('findMask', () => {
  const s = samples(42);
  const h = histOf(s);

  it('fraction 1: no unusable step at or above the mask, and the edge below fails', () => {
    const f = findMask(h);
    expect(f).toMatchObject({ station: 'Gorsemoor', link: 'x-band', weather: 'clear', fraction: 1 });
    const m = f.maskDeg!;
    expect(m).toBeGreaterThan(20);
    expect(s.filter((x) => x.e >= m && !x.usable)).toHaveLength(0);
    // Brute force: the highest unusable elevation lies in the bin just below the mask.
    const highestUnusable = Math.max(...s.filter((x) => !x.usable).map((x) => x.e));
    expect(highestUnusable).toBeLessThan(m);
    expect(highestUnusable).toBeGreaterThanOrEqual(m - 0.1 - 1e-9);
    expect(Math.round(m * 10) / 10).toBe(m); // a bin edge
  });

  it('fraction 0.9: at least 90 % of the time above it is usable; the next edge down is below 90 %', () => {
    const m = findMask(h, 0.9).maskDeg!;
    expect(timeAbove(s, m, true) / timeAbove(s, m, false)).toBeGreaterThanOrEqual(0.9);
    expect(m).toBeLessThan(findMask(h).maskDeg!);
    // Lowest: every lower edge fails the fraction.
    for (let k = Math.round(m * 10) - 1; k >= 0; k--) {
      const lower = k / 10;
      expect(timeAbove(s, lower, true) / timeAbove(s, lower, false)).toBeLessThan(0.9);
    }
  });

  it('a step exactly on a bin edge belongs above it (no rounding leak)', () => {
    for (const e of [0.3, 10, 12.7, 33.3, 45.1, 89.8]) {
      const hh = createMaskHistogram();
      hh.add(e, 10, false, 0);
      hh.add(89.95, 10, true, 1);
      // The unusable step at e must keep the mask above e.
      expect(findMask(hh).maskDeg!).toBeGreaterThan(e);
      expect(findMask(hh).maskDeg!).toBeCloseTo(e + 0.1, 9);
    }
  });

  it('all usable → the lowest edge holding data (never below the data or floorDeg); none → null', () => {
    const hh = createMaskHistogram();
    hh.add(3.04, 10, true, 1);
    hh.add(40, 10, true, 1);
    expect(findMask(hh).maskDeg).toBe(3);
    expect(findMask(hh, 1, { floorDeg: 5 }).maskDeg).toBe(5);
    const bad = createMaskHistogram();
    bad.add(89.95, 10, false, 0);
    bad.add(50, 10, true, 1);
    expect(findMask(bad).maskDeg).toBeNull();
    expect(findMask(createMaskHistogram()).maskDeg).toBeNull();
  });

  it('leaves out unusable mount-limited (keyhole) steps and reports their time above the mask', () => {
    const h = createMaskHistogram();
    h.add(4.05, 10, false, 0); // low elevation, does not close
    h.add(20.05, 100, true, 1e6);
    h.add(87.05, 7, false, 0, true); // near zenith, mount lagging: unusable, no mask fixes it
    h.add(88.05, 3, true, 1e6, true); // mount-limited but still usable: counts as usual
    const f = findMask(h, 1);
    expect(f.maskDeg).toBeCloseTo(4.1, 9);
    expect(f.mountLimitedExcludedS).toBe(7);
    // without the flag the same steps force the mask above 87° (only the 88° step left above it)
    const g = createMaskHistogram();
    g.add(4.05, 10, false, 0); g.add(20.05, 100, true, 1e6); g.add(87.05, 7, false, 0); g.add(88.05, 3, true, 1e6);
    expect(findMask(g, 1).maskDeg).toBeCloseTo(87.1, 9);
    // volumes are untouched by the exclusion
    expect(maskTrade(h, 1, [0])[0].dailyVolumeBits).toBe(103e6);
  });

  it('rejects a fraction or bin size out of range', () => {
    expect(() => findMask(h, 0)).toThrow(InputError);
    expect(() => findMask(h, 1.2)).toThrow(/fraction: 1.2 is out of range/);
    expect(() => createMaskHistogram({ binDeg: 0 })).toThrow(InputError);
  });
});

describe('maskTrade', () => {
  const s = samples(9);
  const h = histOf(s);
  const days = 3.5;

  it('equals Σ rate·Δt and Σ Δt over usable steps with elevation ≥ mask, per day', () => {
    const pts = maskTrade(h, days);
    expect(pts.map((p) => p.maskDeg)).toEqual(Array.from({ length: 31 }, (_, i) => i));
    for (const p of pts) {
      const inMask = s.filter((x) => x.usable && x.e >= p.maskDeg);
      const vol = inMask.reduce((a, x) => a + x.rate * x.dt, 0) / days;
      const min = inMask.reduce((a, x) => a + x.dt, 0) / 60 / days;
      expect(p.dailyVolumeBits / vol).toBeCloseTo(1, 10);
      expect(p.usableMinutesPerDay / min).toBeCloseTo(1, 10);
    }
  });

  it('volume and minutes are non-increasing in the mask, also at masks between edges', () => {
    const pts = maskTrade(h, days, [0, 0.05, 5, 12.34, 12.35, 20, 44.44, 60, 90]);
    for (let i = 1; i < pts.length; i++) {
      expect(pts[i].dailyVolumeBits).toBeLessThanOrEqual(pts[i - 1].dailyVolumeBits);
      expect(pts[i].usableMinutesPerDay).toBeLessThanOrEqual(pts[i - 1].usableMinutesPerDay);
    }
    // Between edges only whole bins above count: conservative against brute force.
    const brute = s.filter((x) => x.usable && x.e >= 12.34).reduce((a, x) => a + x.rate * x.dt, 0) / days;
    expect(pts[3].dailyVolumeBits).toBeLessThanOrEqual(brute);
    expect(pts[8].dailyVolumeBits).toBe(0);
  });
});
