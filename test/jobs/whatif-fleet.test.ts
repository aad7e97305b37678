/**
 * What-if with several satellites sharing link names (the invented VELKA
 * constellation, fixtures/constellation: six satellites, links s-band and
 * x-band each): the hook's network and station figures are the sums over
 * the satellites of the run's daily rows (daily.csv has one network row per
 * satellite), with no change and against a rerun with +3 dB of spacecraft
 * power on s-band for the whole fleet (daily volumes within 0.5 %, usable
 * passes equal). The long-window summary of the same columns agrees
 * (within 1 %, as test/jobs/whatif-summary.test.ts states).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { parse, stringify } from 'yaml';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DailyRow } from '../../src/analysis/types.js';
import { decodeWhatIfPayload, whatIf, type WhatIfData, type WhatIfPayload, type WhatIfResult } from '../../src/analysis/whatIf.js';
import { summariseWhatIfData, whatIfSummaryDetail } from '../../src/analysis/whatIfSummary.js';
import { runScenario } from '../../src/jobs/run.js';
import { loadScenario } from '../../src/scenario/index.js';
import { removeTempDirs, tempDir } from './helpers.js';

afterAll(removeTempDirs);

const ROOT = path.resolve(import.meta.dirname, '../..');
const FLEET = path.join(ROOT, 'fixtures/constellation/scenario.yaml');

/** The constellation cut to one day, elements by absolute path; `edit` changes the text first. */
function fleetCopy(dir: string, name: string, edit: (s: string) => string = (s) => s): string {
  const text = edit(readFileSync(FLEET, 'utf8'));
  const doc = parse(text) as { window: { duration: string }; satellites: { elements: string }[] };
  doc.window.duration = '1d';
  for (const s of doc.satellites) s.elements = path.resolve(path.dirname(FLEET), s.elements);
  const file = path.join(dir, `${name}.yaml`);
  writeFileSync(file, stringify(doc, { aliasDuplicateObjects: false }));
  return file;
}

/** The run's rows summed over satellites, per day: as the hook reports them. */
function expectSums(got: WhatIfResult, daily: DailyRow[], link: string, tol: number): void {
  for (const [weather, c] of Object.entries(got.cases)) {
    for (const [station, d] of [['(network)', c.network] as const, ...Object.entries(c.stations)]) {
      const rows = daily.filter((r) => r.link === link && r.weather === weather && r.station === station);
      const days = [...new Set(rows.map((r) => r.dayUtc))];
      expect(d.days_utc).toEqual(days);
      expect(new Set(rows.map((r) => r.satellite)).size, `${station}: several satellites`).toBeGreaterThan(1);
      expect(d.usable_passes, `${link} ${weather} ${station}`).toBe(rows.reduce((a, r) => a + r.usablePasses, 0));
      days.forEach((day, k) => {
        const want = rows.filter((r) => r.dayUtc === day).reduce((a, r) => a + (r.adaptiveVolumeBits ?? r.fixedVolumeBits), 0);
        expect(Math.abs(d.daily_volume_bits[k] - want), `${link} ${weather} ${station} ${day}`).toBeLessThanOrEqual(tol * want + 1e-6);
      });
    }
  }
}

describe('what-if of a six-satellite fleet sharing link names (one day)', () => {
  const tmp = tempDir('whatif-fleet');
  let data: WhatIfData;
  let daily: DailyRow[];
  let rerun: DailyRow[];

  beforeAll(async () => {
    const r = await runScenario(loadScenario(fleetCopy(tmp, 'run')), { outDir: path.join(tmp, 'out'), quiet: true, steps: false });
    daily = r.pipeline.daily;
    const m = readFileSync(path.join(tmp, 'out', 'report.html'), 'utf8').match(/<script type="application\/json" id="passbudget-whatif-data">(.*?)<\/script>/s)!;
    data = decodeWhatIfPayload(JSON.parse(m[1]) as WhatIfPayload, (s) => new Uint8Array(Buffer.from(s, 'base64')));
    // 2 W + 3 dB on the s-band transmitter (the fleet shares one link list).
    const more = (s: string) => s.replace('transmitter: { power_w: 2, line_loss_db: 1.0 }', `transmitter: { power_w: ${2 * 10 ** 0.3}, line_loss_db: 1.0 }`);
    expect(more('transmitter: { power_w: 2, line_loss_db: 1.0 }')).not.toContain('power_w: 2,');
    rerun = (await runScenario(loadScenario(fleetCopy(tmp, 'more', more)), { outDir: path.join(tmp, 'out-more'), quiet: true, steps: false })).pipeline.daily;
  }, 300_000);

  it('carries every satellite', () => {
    expect(data.satellites.map((s) => s.satellite)).toEqual(['VELKA-A1', 'VELKA-A2', 'VELKA-A3', 'VELKA-B1', 'VELKA-B2', 'VELKA-B3']);
  });

  it('with no change, the run summed over the satellites', () => {
    for (const link of ['s-band', 'x-band']) expectSums(whatIf(data, { link }), daily, link, 0.005);
  });

  it('+3 dB EIRP on s-band: the rerun summed over the satellites', () => {
    expectSums(whatIf(data, { link: 's-band', eirp_delta_db: 3 }), rerun, 's-band', 0.005);
  });

  it('the long-window summary of the same columns: the same sums', () => {
    const sum = summariseWhatIfData(data);
    expectSums(whatIfSummaryDetail(sum, { link: 's-band', eirp_delta_db: 3 }).result, rerun, 's-band', 0.01);
    expectSums(whatIfSummaryDetail(sum, { link: 'x-band' }).result, daily, 'x-band', 0.01);
  });
});
