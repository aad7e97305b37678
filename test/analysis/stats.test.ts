import { describe, expect, it } from 'vitest';
import { dailyVolumeStats, runTotals } from '../../src/analysis/stats.js';
import type { DailyRow } from '../../src/analysis/types.js';

describe('dailyVolumeStats (d3-array quantile: R-7 linear interpolation)', () => {
  it('1..10: mean 5.5, median 5.5, p10 1.9, p90 9.1', () => {
    // h = (n − 1) p; p10 → h = 0.9 → 1 + 0.9·(2 − 1) = 1.9; p90 → h = 8.1 → 9 + 0.1 = 9.1.
    const s = dailyVolumeStats([7, 3, 10, 1, 5, 2, 9, 4, 8, 6]);
    expect(s.mean).toBe(5.5);
    expect(s.median).toBe(5.5);
    expect(s.p10).toBeCloseTo(1.9, 12);
    expect(s.p90).toBeCloseTo(9.1, 12);
  });
  it('one value gives it back; no values give NaN', () => {
    expect(dailyVolumeStats([4e9])).toEqual({ mean: 4e9, median: 4e9, p10: 4e9, p90: 4e9 });
    const e = dailyVolumeStats([]);
    expect([e.mean, e.median, e.p10, e.p90].every(Number.isNaN)).toBe(true);
  });
});

describe('runTotals', () => {
  const row = (dayUtc: string, station: string, satellite: string, fixed: number, adaptive: number | null, passes = 1): DailyRow => ({
    dayUtc, station, satellite, link: 'x-band', weather: 'clear', passes, usablePasses: passes > 0 ? 1 : 0,
    usableMinutes: 10, fixedVolumeBits: fixed, adaptiveVolumeBits: adaptive, longestGapH: 12,
  });
  const rows = [
    row('2026-03-14', 'Gorsemoor', 'TERN-3', 100, 300),
    row('2026-03-15', 'Gorsemoor', 'TERN-3', 200, 500, 2),
    row('2026-03-14', 'Gorsemoor', 'TERN-4', 50, 100),
    row('2026-03-15', 'Gorsemoor', 'TERN-4', 0, 0, 0),
    row('2026-03-14', '(network)', 'TERN-3', 100, 300),
    row('2026-03-15', '(network)', 'TERN-3', 150, 450),
  ];

  it('sums passes, minutes and volumes per station and network, over satellites', () => {
    const t = runTotals(rows);
    expect(t).toHaveLength(2);
    const g = t.find((x) => x.station === 'Gorsemoor')!;
    expect(g).toMatchObject({ passes: 4, usablePasses: 3, usableMinutes: 40, fixedVolumeBits: 350, adaptiveVolumeBits: 900 });
    // Per-day adaptive volumes over satellites: 400 and 500.
    expect(g.dailyVolumeBits.mean).toBe(450);
    expect(g.dailyVolumeBits.p10).toBeCloseTo(410, 9);
    const n = t.find((x) => x.station === '(network)')!;
    expect(n.fixedVolumeBits).toBe(250);
    expect(n.dailyVolumeBits.median).toBe(375);
  });

  it('fixed-rate rows keep adaptive null and use the fixed volume per day', () => {
    const t = runTotals([row('2026-03-14', 'Skerrow', 'TERN-3', 80, null), row('2026-03-15', 'Skerrow', 'TERN-3', 0, null, 0)]);
    expect(t[0].adaptiveVolumeBits).toBeNull();
    expect(t[0].dailyVolumeBits.mean).toBe(40);
    expect(runTotals([])).toEqual([]);
  });
});
