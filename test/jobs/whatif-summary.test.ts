/**
 * The what-if summary for windows longer than WHATIF_MAX_DAYS
 * (analysis/whatIfSummary.ts), checked against the exact recomputation from
 * every step (analysis/whatIf.ts, itself checked against reruns of changed
 * scenarios in test/browser/whatif.test.ts) on the same run's columns, and a
 * long run's own report against the run's daily rows.
 * Stated resolution: C/N0 bins of 0.25 dB (each bin's steps taken as spread
 * evenly across it, so only the bins straddling the usable threshold or a
 * mode boundary are approximate: daily volumes within 1 %), masks in whole
 * degrees, pass thresholds to 0.001 dB (usable-pass counts equal). The network series is the best
 * in-view station per grid time: exact for these fixed-rate links, and for
 * the adaptive x-band link under highest-rate when stations share its rule.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DailyRow } from '../../src/analysis/types.js';
import { decodeWhatIfPayload, encodeIntColumn, whatIf, type WhatIfChange, type WhatIfData, type WhatIfPayload, type WhatIfResult } from '../../src/analysis/whatIf.js';
import {
  decodeWhatIfSummaryPayload, encodeWhatIfSummary, summariseWhatIfData, whatIfSummaryDetail, type WhatIfSummaryData, type WhatIfSummaryPayload,
} from '../../src/analysis/whatIfSummary.js';
import { rebuildReportWithNotes } from '../../src/jobs/report.js';
import { runScenario } from '../../src/jobs/run.js';
import { loadScenario } from '../../src/scenario/index.js';
import { removeTempDirs, tempDir, writeDemoCopy } from './helpers.js';

afterAll(removeTempDirs);

const fromB64 = (s: string) => new Uint8Array(Buffer.from(s, 'base64'));

function pageBlock(file: string): WhatIfPayload | WhatIfSummaryPayload {
  const m = readFileSync(file, 'utf8').match(/<script type="application\/json" id="passbudget-whatif-data">(.*?)<\/script>/s);
  if (!m) throw new Error(`${file}: no what-if data block`);
  return JSON.parse(m[1]) as WhatIfPayload | WhatIfSummaryPayload;
}

/** Daily volumes within `tol` of the day's plus 0.5 % of the link's best day, usable passes equal, network and per station. */
function expectClose(got: WhatIfResult, want: WhatIfResult, tol: number, label: string): void {
  expect(Object.keys(got.cases)).toEqual(Object.keys(want.cases));
  // The link's best day (any station or the network, any case): the floor of the tolerance for nearly empty days.
  const best = Math.max(...Object.values(want.cases).flatMap((c) => [c.network, ...Object.values(c.stations)].flatMap((d) => d.daily_volume_bits)));
  for (const [weather, w] of Object.entries(want.cases)) {
    const g = got.cases[weather];
    for (const [station, a, b] of [['(network)', g.network, w.network] as const, ...Object.entries(w.stations).map(([k, v]) => [k, g.stations[k], v] as const)]) {
      const where = `${label} ${weather} ${station}`;
      expect(a.days_utc, where).toEqual(b.days_utc);
      a.daily_volume_bits.forEach((v, k) => expect(Math.abs(v - b.daily_volume_bits[k]), `${where} ${b.days_utc[k]}`).toBeLessThanOrEqual(tol * b.daily_volume_bits[k] + 0.005 * best + 1e-6));
      expect(a.usable_passes, where).toBe(b.usable_passes);
    }
  }
}

const CHANGES: WhatIfChange[] = [
  { link: 'x-band', eirp_delta_db: 3 },
  { link: 'uhf-tm', bit_rate_bps: 4800 },
  { link: 's-band', required_margin_db: 6 },
  { link: 's-band', gt_delta_db: -4.5 },
  { link: 'x-band', symbol_rate_baud: 2.5e7 },
  ...['uhf-tm', 's-band', 'x-band'].map((link) => ({ link, mask_deg: 10 })),
  { link: 'uhf-tm', mask_deg: 25, eirp_delta_db: -2 },
];

describe('what-if summary against the exact recomputation (two demo days, every step)', () => {
  const tmp = tempDir('whatif-summary');
  let exact: WhatIfData;
  let summary: WhatIfSummaryData;

  beforeAll(async () => {
    const file = writeDemoCopy(tmp, '2d');
    await runScenario(loadScenario(file), { outDir: path.join(tmp, 'out'), quiet: true, steps: false });
    exact = decodeWhatIfPayload(pageBlock(path.join(tmp, 'out', 'report.html')) as WhatIfPayload, fromB64);
    summary = summariseWhatIfData(exact);
  }, 120_000);

  it('with no change, gives the exact figures', () => {
    for (const link of ['uhf-tm', 's-band', 'x-band']) expectClose(whatIfSummaryDetail(summary, { link }).result, whatIf(exact, { link }), 0.01, link);
  });

  it('with each change (power, G/T, rates, margin, whole-degree masks), gives the exact figures', () => {
    for (const c of CHANGES) expectClose(whatIfSummaryDetail(summary, c).result, whatIf(exact, c), 0.01, JSON.stringify(c));
  });

  it('refuses a bad change with the same line as the exact recomputation', () => {
    expect(() => whatIfSummaryDetail(summary, { link: 'ka-band' })).toThrow(/link: "ka-band" is not a link of this run \(allowed uhf-tm, s-band, x-band\)/);
    expect(() => whatIfSummaryDetail(summary, { link: 'x-band', mask_deg: 95 })).toThrow(/mask_deg: 95 is out of range \(allowed -5 to 89\)/);
  });

  it('is under half the size of the steps it summarises, coded as the page carries both (1 s steps)', () => {
    const toB64 = (b: Uint8Array) => Buffer.from(b).toString('base64');
    const steps = exact.satellites.reduce((a, s) => a + [s.elevation, s.cn0].reduce((x, c) => x + encodeIntColumn(c, toB64).length, 0), 0);
    const coded = summary.satellites.reduce((a, s) => a + Object.values(encodeWhatIfSummary(s.summary, toB64)).reduce((x, c) => x + c.text.length, 0), 0);
    expect(coded).toBeLessThan(steps / 2);
  });
});

describe('a 35-day run: the report carries the summary', () => {
  const tmp = tempDir('whatif-long');
  let daily: DailyRow[];
  let out = '';

  beforeAll(async () => {
    const file = writeDemoCopy(tmp, '35d');
    const text = readFileSync(file, 'utf8').replace(/step_s: 1\b/, 'step_s: 10');
    const f2 = path.join(tmp, 'long.yaml');
    (await import('node:fs')).writeFileSync(f2, text);
    out = path.join(tmp, 'out');
    const r = await runScenario(loadScenario(f2), { outDir: out, quiet: true, steps: true });
    daily = r.pipeline.daily;
  }, 300_000);

  const check = (data: WhatIfSummaryData) => {
    for (const link of ['uhf-tm', 's-band', 'x-band']) {
      const r = whatIfSummaryDetail(data, { link }).result;
      for (const [weather, c] of Object.entries(r.cases)) {
        for (const [station, d] of [['(network)', c.network] as const, ...Object.entries(c.stations)]) {
          const rows = daily.filter((x) => x.link === link && x.weather === weather && x.station === station);
          expect(d.days_utc).toEqual(rows.map((x) => x.dayUtc));
          expect(d.usable_passes, `${link} ${weather} ${station}`).toBe(rows.reduce((a, x) => a + x.usablePasses, 0));
          const total = rows.reduce((a, x) => a + (x.adaptiveVolumeBits ?? x.fixedVolumeBits), 0);
          const got = d.daily_volume_bits.reduce((a, v) => a + v, 0);
          if (total === 0) expect(got).toBe(0);
          else expect(Math.abs(got - total) / total, `${link} ${weather} ${station}`).toBeLessThanOrEqual(0.01);
        }
      }
    }
  };

  it('with no change, the run\'s daily volumes (35 days summed, within 1 %) and usable passes', () => {
    const p = pageBlock(path.join(out, 'report.html'));
    expect('kind' in p && p.kind).toBe('summary');
    check(decodeWhatIfSummaryPayload(p as WhatIfSummaryPayload, fromB64));
    expect(readFileSync(path.join(out, 'report.html'), 'utf8')).toMatch(/from histograms: this window is longer than 31 days/);
  });

  it('rebuilt from steps.csv by passbudget report, the same', async () => {
    const { file, whatIfMissing } = await rebuildReportWithNotes(out);
    expect(whatIfMissing).toBeNull();
    check(decodeWhatIfSummaryPayload(pageBlock(file) as WhatIfSummaryPayload, fromB64));
  });
});
