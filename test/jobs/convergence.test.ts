/**
 * Step convergence: the volume is a Riemann sum Σ rate(t_k) Δt over grid
 * points in the usable windows, so its error is about one step at each end of
 * each usable interval (and at each adaptive mode change). Halving the step
 * from 2 s to 1 s must then change the clear-sky volume per day by well under
 * 0.5 % (our acceptance figure for the time step; common practice is to keep
 * the step much shorter than any usable window, here 1–10 min).
 * Checked per link, per station and for the network, on the e2e pair scenario
 * and on a one-day cut of the demo scenario.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runPipeline } from '../../src/sweep/pipeline.js';
import type { DailyRow } from '../../src/analysis/types.js';
import { loadScenario, type ResolvedScenario } from '../../src/scenario/index.js';
import { PAIR, removeTempDirs, tempDir, writeDemoCopy } from './helpers.js';

afterAll(removeTempDirs);

const LIMIT = 0.005;

async function dailyAt(s: ResolvedScenario, stepS: number): Promise<DailyRow[]> {
  const p = await runPipeline({ scenario: { ...s, window: { ...s.window, stepS } } });
  return p.daily.filter((d) => d.weather === 'clear');
}

const volume = (d: DailyRow) => d.adaptiveVolumeBits ?? d.fixedVolumeBits;

function compare(coarse: DailyRow[], fine: DailyRow[]): { key: string; coarse: number; fine: number; rel: number }[] {
  const key = (d: DailyRow) => `${d.dayUtc}|${d.station}|${d.link}`;
  const fineBy = new Map(fine.map((d) => [key(d), d]));
  expect(fineBy.size).toBe(coarse.length);
  return coarse.map((c) => {
    const f = fineBy.get(key(c))!;
    const a = volume(c);
    const b = volume(f);
    return { key: key(c), coarse: a, fine: b, rel: b === 0 ? (a === 0 ? 0 : Infinity) : Math.abs(a - b) / b };
  });
}

describe.each([
  ['e2e pair scenario', () => loadScenario(PAIR)],
  ['demo scenario, first day', () => loadScenario(writeDemoCopy(tempDir('convergence')))],
])('halving the step 2 s → 1 s (%s)', (_label, load) => {
  let rows: ReturnType<typeof compare>;
  beforeAll(async () => {
    const s = load();
    rows = compare(await dailyAt(s, 2), await dailyAt(s, 1));
  });

  it('changes each clear-sky daily volume (per station and network, per link) by < 0.5 %', () => {
    const worst = [...rows].sort((a, b) => b.rel - a.rel)[0];
    const bad = rows.filter((r) => r.rel >= LIMIT && r.fine > 0).map((r) => `${r.key}: ${r.coarse} vs ${r.fine} bits (${(100 * r.rel).toFixed(3)} %)`);
    expect(bad, `worst ${worst.key} ${(100 * worst.rel).toFixed(3)} %`).toEqual([]);
    // Rows with data on both grids: the comparison is not vacuous.
    expect(rows.filter((r) => r.fine > 0 && r.coarse > 0).length).toBeGreaterThanOrEqual(6);
    // A day with no volume at 1 s has none at 2 s either.
    for (const r of rows) if (r.fine === 0) expect(r.coarse, r.key).toBe(0);
  });

  it('includes network rows', () => {
    expect(rows.some((r) => r.key.includes('(network)') && r.fine > 0)).toBe(true);
  });
});
