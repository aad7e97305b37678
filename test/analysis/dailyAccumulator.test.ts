import { describe, expect, it } from 'vitest';
import { createDailyAccumulator, NETWORK_STATION } from '../../src/analysis/dailyAccumulator.js';
import { createPassAccumulator } from '../../src/analysis/passAccumulator.js';
import { chooseNetworkStation } from '../../src/analysis/network.js';
import type { CaseBudget, LinkSpec } from '../../src/budget/types.js';
import { InputError } from '../../src/errors.js';
import { adaptiveCase, adaptiveLink, fixedCase, fixedLink, lcg, makeStep, passInfo } from './synthetic.js';

const DAY = 86_400;
const D0 = Date.UTC(2026, 2, 14) / 1000; // 2026-03-14T00:00Z
const H = 3600;

/** Feed one pass of cases to a pass accumulator and a daily accumulator together, as the pipeline does. */
function feedPass(link: LinkSpec, daily: ReturnType<typeof createDailyAccumulator>, aosS: number, dtS: number, cases: CaseBudget[]) {
  const pass = createPassAccumulator({ link, pass: passInfo(aosS, aosS + dtS * cases.length), weatherCases: ['clear'] });
  cases.forEach((c, i) => {
    const t = aosS + i * dtS;
    pass.add(t, dtS, 30, makeStep(t, 30, [c]));
    daily.add(t, dtS, c);
  });
  const s = pass.finish();
  daily.endPass(s.aosS, s.cases[0].verdict);
  return s;
}

describe('createDailyAccumulator', () => {
  it('splits a pass across midnight exactly by step time and counts it on its AOS day', () => {
    const link = fixedLink(9600);
    const daily = createDailyAccumulator({ startS: D0, endS: D0 + 2 * DAY, link, weather: 'clear' });
    // 23:55:00 to 00:04:50, 60 steps of 10 s, all usable: 30 before midnight, 30 after.
    const s = feedPass(link, daily, D0 + DAY - 300, 10, Array.from({ length: 60 }, () => fixedCase(link, 'clear', 5)));
    const rows = daily.rows();
    expect(rows.map((r) => r.dayUtc)).toEqual(['2026-03-14', '2026-03-15']);
    expect(rows.map((r) => r.usableMinutes)).toEqual([5, 5]);
    expect(rows.map((r) => r.fixedVolumeBits)).toEqual([9600 * 300, 9600 * 300]);
    expect(rows.map((r) => r.passes)).toEqual([1, 0]);
    expect(rows.map((r) => r.usablePasses)).toEqual([1, 0]);
    expect(rows[0].fixedVolumeBits + rows[1].fixedVolumeBits).toBe(s.cases[0].fixedVolumeBits);
    expect(rows[0].adaptiveVolumeBits).toBeNull();
    expect(rows[0].station).toBe('Gorsemoor');
    expect(rows[0].satellite).toBe('TERN-3');
  });

  it('adaptive link: daily fixed and adaptive volumes sum to the pass totals across midnight', () => {
    const link = adaptiveLink(2e6);
    const daily = createDailyAccumulator({ startS: D0, endS: D0 + 2 * DAY, link, weather: 'clear' });
    const rnd = lcg(11);
    const totals = { fixed: 0, adaptive: 0 };
    // Three passes; the second crosses midnight.
    for (const aos of [D0 + 10 * H, D0 + DAY - 200, D0 + DAY + 5 * H]) {
      const s = feedPass(link, daily, aos, 10, Array.from({ length: 50 }, () => adaptiveCase(link, 'clear', -1 + 16 * rnd())));
      totals.fixed += s.cases[0].fixedVolumeBits;
      totals.adaptive += s.cases[0].adaptiveVolumeBits!;
    }
    const rows = daily.rows();
    expect(rows.map((r) => r.passes)).toEqual([2, 1]);
    const sum = (k: 'fixedVolumeBits' | 'adaptiveVolumeBits') => rows.reduce((a, r) => a + (r[k] ?? 0), 0);
    expect(sum('fixedVolumeBits') / totals.fixed).toBeCloseTo(1, 12);
    expect(sum('adaptiveVolumeBits') / totals.adaptive).toBeCloseTo(1, 12);
    expect(rows[1].fixedVolumeBits).toBeGreaterThan(0);
  });

  it('longest gap from known usable intervals, counting from 00:00 and to 24:00 UTC', () => {
    const link = fixedLink(1200);
    const daily = createDailyAccumulator({ startS: D0, endS: D0 + 3 * DAY, link, weather: 'clear' });
    const usableRun = (fromS: number, minutes: number) =>
      feedPass(link, daily, fromS, 60, Array.from({ length: minutes }, () => fixedCase(link, 'clear', 3)));
    // Day 1: [01:00, 01:10), [05:00, 05:20), [23:00, 23:30) → gaps 1 h, 3 h 50 min, 17 h 40 min, 30 min.
    usableRun(D0 + 1 * H, 10);
    usableRun(D0 + 5 * H, 20);
    usableRun(D0 + 23 * H, 30);
    // Day 2: [23:50, 00:10) crosses into day 3; day 2 has a gap 00:00–23:50.
    usableRun(D0 + DAY + 23 * H + 50 * 60, 20);
    // Day 3: nothing else → gap from 00:10 to 24:00.
    const rows = daily.rows();
    expect(rows[0].longestGapH).toBeCloseTo(17 + 40 / 60, 12);
    expect(rows[1].longestGapH).toBeCloseTo(23 + 50 / 60, 12);
    expect(rows[2].longestGapH).toBeCloseTo(23 + 50 / 60, 12);
    expect(rows[1].usableMinutes).toBe(10);
    expect(rows[2].usableMinutes).toBe(10);
    expect(rows[2].passes).toBe(0);
  });

  it('a one-step unusable hole is a gap; window edges bound the first and last day', () => {
    const link = fixedLink(1200);
    // Window 06:00 day 1 to 18:00 day 2.
    const daily = createDailyAccumulator({ startS: D0 + 6 * H, endS: D0 + DAY + 18 * H, link, weather: 'clear' });
    const margins = [3, 3, 3, -1, 3, 3]; // 10 min each from 07:00; hole 07:30–07:40
    feedPass(link, daily, D0 + 7 * H, 600, margins.map((m) => fixedCase(link, 'clear', m)));
    const rows = daily.rows();
    // Day 1 gaps: 06:00–07:00 (1 h), 07:30–07:40, 08:00–24:00 (16 h).
    expect(rows[0].longestGapH).toBeCloseTo(16, 12);
    // Day 2: nothing, so the gap is the window part, 00:00–18:00.
    expect(rows[1].longestGapH).toBeCloseTo(18, 12);
    expect(rows[0].usableMinutes).toBe(50);
    // 50 of 60 min ≥ 50 % and ≥ 60 s → a usable pass.
    expect(rows[0].usablePasses).toBe(1);
  });

  it('rows for empty days, a window ending at midnight has no extra day', () => {
    const link = fixedLink(1200);
    const rows = createDailyAccumulator({ startS: D0, endS: D0 + 2 * DAY, link, weather: 'clear', station: NETWORK_STATION }).rows();
    expect(rows).toHaveLength(2);
    expect(rows.every((r) => r.passes === 0 && r.fixedVolumeBits === 0 && r.longestGapH === 24)).toBe(true);
    expect(rows[0].station).toBe('(network)');
  });

  it('refuses an empty window, and rows() with steps not closed by endPass()', () => {
    const link = fixedLink(1200);
    expect(() => createDailyAccumulator({ startS: D0, endS: D0, link, weather: 'clear' })).toThrow(InputError);
    const d = createDailyAccumulator({ startS: D0, endS: D0 + DAY, link, weather: 'clear' });
    d.add(D0 + 10, 10, fixedCase(link, 'clear', 5));
    expect(() => d.rows()).toThrow(/endPass/);
  });
});

describe('network aggregate', () => {
  it('network volume ≤ the sum of stations and equals the rate × union of usable time', () => {
    const a = fixedLink(9600, { station: 'Gorsemoor' });
    const b = fixedLink(9600, { station: 'Lintel Point' });
    const opts = { startS: D0, endS: D0 + DAY, weather: 'clear' };
    const da = createDailyAccumulator({ ...opts, link: a });
    const db = createDailyAccumulator({ ...opts, link: b });
    const dn = createDailyAccumulator({ ...opts, link: a, station: NETWORK_STATION });
    const rnd = lcg(3);
    let unionS = 0;
    for (let i = 0; i < 200; i++) {
      const t = D0 + 8 * H + i * 10;
      const ca = fixedCase(a, 'clear', -3 + 8 * rnd());
      const cb = fixedCase(b, 'clear', -3 + 8 * rnd());
      da.add(t, 10, ca);
      db.add(t, 10, cb);
      const k = chooseNetworkStation([
        { station: 'Gorsemoor', marginDB: ca.margin_db, usable: ca.usable, rateBps: 9600, priority: 1 },
        { station: 'Lintel Point', marginDB: cb.margin_db, usable: cb.usable, rateBps: 9600, priority: 2 },
      ], { kind: 'highest-rate' });
      if (ca.usable || cb.usable) unionS += 10;
      if (k >= 0) dn.add(t, 10, k === 0 ? ca : cb, k === 0 ? a : b);
    }
    for (const d of [da, db, dn]) d.endPass(D0 + 8 * H, 'usable');
    const [ra, rb, rn] = [da, db, dn].map((d) => d.rows()[0]);
    expect(rn.fixedVolumeBits).toBeLessThanOrEqual(ra.fixedVolumeBits + rb.fixedVolumeBits);
    expect(rn.fixedVolumeBits).toBeCloseTo(9600 * unionS, 6);
    expect(rn.fixedVolumeBits).toBeGreaterThanOrEqual(Math.max(ra.fixedVolumeBits, rb.fixedVolumeBits));
    expect(rn.usableMinutes * 60).toBeCloseTo(unionS, 9);
  });
});
