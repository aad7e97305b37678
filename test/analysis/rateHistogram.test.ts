import { describe, expect, it } from 'vitest';
import { bestRate, closingCOverN0DBHz, createRateHistogram, rateTrade } from '../../src/analysis/rateHistogram.js';
import { InputError } from '../../src/errors.js';
import { lcg } from './synthetic.js';

// Requirement: BPSK at BER 1e-5 needs Eb/N0 = 9.6 dB (Sklar, Digital Communications, as in PHYSICS.md §12).
const req = { requiredEbN0DB: 9.6, implementationLossDB: 1, requiredMarginDB: 3 };

describe('closingCOverN0DBHz', () => {
  it('is 10 log10 R + Eb/N0 required + implementation loss + margin (PHYSICS.md §10)', () => {
    // 10 log10 9600 = 39.822712 dB.
    expect(closingCOverN0DBHz(9600, req)).toBeCloseTo(39.822712 + 13.6, 6);
  });
});

describe('rateTrade against brute force on C/N0 samples', () => {
  const rnd = lcg(2024);
  const cn0: { v: number; dt: number }[] = Array.from({ length: 20_000 }, () => ({ v: 45 + 35 * rnd(), dt: 1 + 9 * rnd() }));
  const h = createRateHistogram({ station: 'Skerrow', link: 'tlm', weather: 'clear' });
  for (const x of cn0) h.add(x.v, x.dt);
  const days = 2;
  const rates = [1200, 4800, 9600, 38_400, 115_200, 1e6, 1e7];
  const closing = (need: number) => cn0.filter((x) => x.v >= need).reduce((a, x) => a + x.dt, 0);

  it('never counts more than brute force and loses at most one bin', () => {
    const pts = rateTrade(h, req, rates, days);
    for (const p of pts) {
      const need = closingCOverN0DBHz(p.bitRateBps, req);
      const minutes = p.usableMinutesPerDay * 60 * days;
      expect(minutes).toBeLessThanOrEqual(closing(need) * (1 + 1e-12));
      expect(minutes).toBeGreaterThanOrEqual(closing(need + h.binDB) * (1 - 1e-12));
      expect(p.dailyVolumeBits).toBeCloseTo((p.bitRateBps * minutes) / days, 3);
      expect(p).toMatchObject({ station: 'Skerrow', link: 'tlm', weather: 'clear' });
    }
    // At 1e7 b/s the step needs 83.6 dBHz: no sample reaches it.
    expect(pts[6].dailyVolumeBits).toBe(0);
  });

  it('closing minutes are non-increasing in rate', () => {
    const pts = rateTrade(h, req, Array.from({ length: 60 }, (_, i) => 100 * 1.2 ** i), days);
    for (let i = 1; i < pts.length; i++) expect(pts[i].usableMinutesPerDay).toBeLessThanOrEqual(pts[i - 1].usableMinutesPerDay);
  });

  it('a sample just below the threshold never counts; one at a bin edge at or above does', () => {
    const need = closingCOverN0DBHz(9600, req); // 53.422712…
    const hh = createRateHistogram();
    hh.add(need - 1e-9, 60);
    expect(rateTrade(hh, req, [9600], 1)[0].usableMinutesPerDay).toBe(0);
    hh.add(53.43, 60); // a bin edge above the threshold
    expect(rateTrade(hh, req, [9600], 1)[0].usableMinutesPerDay).toBe(1);
  });

  it('bestRate picks the largest daily volume; null when nothing closes', () => {
    const pts = rateTrade(h, req, rates, days);
    const best = bestRate(pts)!;
    expect(best.dailyVolumeBits).toBe(Math.max(...pts.map((p) => p.dailyVolumeBits)));
    expect(bestRate(rateTrade(h, req, [1e7], days))).toBeNull();
    expect(bestRate([])).toBeNull();
  });

  it('C/N0 below the histogram range never closes; above it counts as the top edge', () => {
    const hh = createRateHistogram({ minDBHz: 30, maxDBHz: 60 });
    hh.add(10, 100);
    hh.add(NaN, 100);
    hh.add(75, 60);
    expect(hh.underflowS).toBe(200);
    const [low, high] = rateTrade(hh, { requiredEbN0DB: 0, implementationLossDB: 0, requiredMarginDB: 0 }, [1, 1e6], 1);
    expect(low.usableMinutesPerDay).toBe(1); // 0 dBHz needed: only the 75 dBHz step counts
    expect(rateTrade(hh, { requiredEbN0DB: 0, implementationLossDB: 0, requiredMarginDB: 0.001 }, [1e6], 1)[0].usableMinutesPerDay).toBe(0);
    expect(high.usableMinutesPerDay).toBe(1); // 60 dBHz needed: the open top bin starts at 60 dBHz
  });

  it('rejects bad rates, days and bin sizes with one line', () => {
    expect(() => rateTrade(h, req, [0], 1)).toThrow(new InputError('rate finder candidate rates: 0 b/s is not a rate (allowed finite numbers > 0)'));
    expect(() => rateTrade(h, req, [9600], 0)).toThrow(InputError);
    expect(() => createRateHistogram({ binDB: -1 })).toThrow(InputError);
  });
});
