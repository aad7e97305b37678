/**
 * Run-level statistics. Quantiles follow d3-array's `quantile` (linear
 * interpolation between order statistics, the R-7 / Excel PERCENTILE.INC rule).
 */
import { mean, median, quantile } from 'd3-array';
import type { DailyRow, RunTotals } from './types.js';

export interface VolumeStats { mean: number; median: number; p10: number; p90: number }

/** Mean, median, 10th and 90th percentile of daily volumes; NaN for each when there are no values. */
export function dailyVolumeStats(values: Iterable<number>): VolumeStats {
  const v = Array.from(values);
  return {
    mean: mean(v) ?? NaN,
    median: median(v) ?? NaN,
    p10: quantile(v, 0.1) ?? NaN,
    p90: quantile(v, 0.9) ?? NaN,
  };
}

/**
 * Totals per (link, weather, station or '(network)') from the daily rows,
 * summed over satellites and days. The daily-volume statistics are over the
 * days of the window (every day has a row, empty days included) of the
 * per-day volume summed over satellites: the adaptive volume for an adaptive
 * link, the fixed volume otherwise.
 */
export function runTotals(daily: readonly DailyRow[]): RunTotals[] {
  interface Group { totals: RunTotals; perDay: Map<string, number> }
  const groups = new Map<string, Group>();
  for (const r of daily) {
    const key = JSON.stringify([r.link, r.weather, r.station]);
    let g = groups.get(key);
    if (!g) {
      g = {
        totals: {
          link: r.link, weather: r.weather, station: r.station,
          passes: 0, usablePasses: 0, usableMinutes: 0, fixedVolumeBits: 0,
          adaptiveVolumeBits: r.adaptiveVolumeBits === null ? null : 0,
          dailyVolumeBits: { mean: NaN, median: NaN, p10: NaN, p90: NaN },
        },
        perDay: new Map(),
      };
      groups.set(key, g);
    }
    const t = g.totals;
    t.passes += r.passes;
    t.usablePasses += r.usablePasses;
    t.usableMinutes += r.usableMinutes;
    t.fixedVolumeBits += r.fixedVolumeBits;
    if (r.adaptiveVolumeBits !== null) t.adaptiveVolumeBits = (t.adaptiveVolumeBits ?? 0) + r.adaptiveVolumeBits;
    const vol = r.adaptiveVolumeBits ?? r.fixedVolumeBits;
    g.perDay.set(r.dayUtc, (g.perDay.get(r.dayUtc) ?? 0) + vol);
  }
  return [...groups.values()].map(({ totals, perDay }) => ({ ...totals, dailyVolumeBits: dailyVolumeStats(perDay.values()) }));
}
