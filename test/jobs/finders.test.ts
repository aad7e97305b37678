/**
 * The elevation-mask and data-rate finders end to end (`maskScenario`,
 * `rateScenario`) on the e2e pair scenario, checked against the run itself:
 *   - mask.csv / rate.csv have exactly the columns of src/jobs/finders.ts;
 *   - mask.csv: daily volume and usable minutes are non-increasing in the mask
 *     (raising a mask can only remove steps);
 *   - the found mask (fraction 1) is recomputed from the steps: it is the
 *     lowest 0.1° bin edge above every unusable step;
 *   - self-consistency: re-running with every station's mask raised to a found
 *     mask leaves no step of that station, link and case below the required
 *     margin;
 *   - rate.csv: usable minutes are non-increasing in bit rate, volume =
 *     rate × usable time, and at the link's own bit rate the usable minutes
 *     agree with the run's daily.csv figure;
 *   - `passbudget mask` and `passbudget rate` (built CLI) write the same
 *     mask.csv, mask.json and rate.csv as the library calls.
 */
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runPipeline } from '../../src/sweep/pipeline.js';
import type { DailyRow, MaskFinding } from '../../src/analysis/types.js';
import { MASK_COLUMNS, RATE_COLUMNS, maskScenario, rateScenario } from '../../src/jobs/finders.js';
import { loadScenario, type ResolvedScenario } from '../../src/scenario/index.js';
import { badKeys } from '../output/jsonKeys.js';
import { CLI, PAIR, num, readCsv, runCli, removeTempDirs, tempDir, type CsvRecord } from './helpers.js';

afterAll(removeTempDirs);

const BIN_DEG = 0.1; // mask histogram bin (src/analysis/maskHistogram.ts default)

let scenario: ResolvedScenario;
let outDir: string;
let findings: MaskFinding[];
let maskHeader: string[];
let maskRows: CsvRecord[];
let rateHeader: string[];
let rateRows: CsvRecord[];
/** Per station|link|case: highest elevation of an unusable step, lowest elevation of any step. */
let unusableTopDeg: Map<string, number>;
let lowestDeg: Map<string, number>;
let daily: DailyRow[];

beforeAll(async () => {
  scenario = loadScenario(PAIR);
  outDir = path.join(tempDir('finders'), 'out');
  const m = await maskScenario(scenario, { outDir, quiet: true, fraction: 1 });
  findings = m.findings;
  ({ header: maskHeader, rows: maskRows } = readCsv(path.join(outDir, 'mask.csv')));
  await rateScenario(scenario, { outDir, quiet: true });
  ({ header: rateHeader, rows: rateRows } = readCsv(path.join(outDir, 'rate.csv')));

  unusableTopDeg = new Map();
  lowestDeg = new Map();
  const names = scenario.weatherCases.map((c) => c.name);
  const p = await runPipeline({
    scenario,
    onStep: (e) => {
      e.step.cases.forEach((c, ci) => {
        const k = `${e.station}|${e.link.name}|${names[ci]}`;
        const el = e.step.elevation_deg;
        // Unusable steps while the mount is rate-limited (keyhole) are left out by the finder's definition.
        if (!c.usable && e.step.mount_limited) return;
        lowestDeg.set(k, Math.min(lowestDeg.get(k) ?? Infinity, el));
        if (!c.usable) unusableTopDeg.set(k, Math.max(unusableTopDeg.get(k) ?? -Infinity, el));
      });
    },
  });
  daily = p.daily;
});

describe('mask finder', () => {
  it('mask.csv has the columns of MASK_COLUMNS and one row per mask 0–30° per station, link and case', () => {
    expect(maskHeader).toEqual(MASK_COLUMNS);
    const groups = new Set(maskRows.map((r) => `${r.station}|${r.link}|${r.weather}`));
    expect(groups.size).toBe(2 * 2 * scenario.weatherCases.length);
    expect(maskRows.length).toBe(groups.size * 31);
  });

  it('daily volume and usable minutes are non-increasing in the mask', () => {
    const byGroup = new Map<string, CsvRecord[]>();
    for (const r of maskRows) {
      const k = `${r.station}|${r.link}|${r.weather}`;
      if (!byGroup.has(k)) byGroup.set(k, []);
      byGroup.get(k)!.push(r);
    }
    let falling = 0;
    for (const [k, rows] of byGroup) {
      rows.sort((a, b) => num(a.mask_deg) - num(b.mask_deg));
      for (let i = 1; i < rows.length; i++) {
        expect(num(rows[i].daily_volume_mb), `${k} at ${rows[i].mask_deg}°`).toBeLessThanOrEqual(num(rows[i - 1].daily_volume_mb));
        expect(num(rows[i].usable_min_per_day), `${k} at ${rows[i].mask_deg}°`).toBeLessThanOrEqual(num(rows[i - 1].usable_min_per_day));
      }
      if (num(rows[rows.length - 1].daily_volume_mb) < num(rows[0].daily_volume_mb)) falling++;
    }
    // Not all flat: the S-band link closes at low elevation, so masks up to 30° cost it volume
    // (the 1 W X-band link closes only above ~30°, where its curve is flat by construction).
    expect(falling).toBeGreaterThanOrEqual(4);
  });

  it('the found mask is the lowest 0.1° edge above every unusable step (recomputed from the steps)', () => {
    expect(findings.length).toBe(2 * 2 * scenario.weatherCases.length);
    let aboveHorizon = 0;
    for (const f of findings) {
      const k = `${f.station}|${f.link}|${f.weather}`;
      expect(f.fraction).toBe(1);
      expect(f.maskDeg, k).not.toBeNull();
      const m = f.maskDeg!;
      const top = unusableTopDeg.get(k);
      if (top === undefined) {
        // Every step usable: the lowest edge holding data.
        expect(m, k).toBeLessThanOrEqual(lowestDeg.get(k)!);
        expect(m, k).toBeGreaterThan(lowestDeg.get(k)! - BIN_DEG);
      } else {
        expect(m, `${k}: mask ${m} above the highest unusable step ${top}`).toBeGreaterThan(top);
        expect(m - BIN_DEG, `${k}: mask ${m} is the next edge above ${top}`).toBeLessThanOrEqual(top + 1e-9);
        aboveHorizon++;
      }
    }
    // The X-band link at 1 W does not close at low elevation: the finder has work to do.
    expect(aboveHorizon).toBeGreaterThanOrEqual(4);
  });

  it('re-running with the station mask raised to the found mask leaves no step below the required margin', async () => {
    const masks = [...new Set(findings.map((f) => f.maskDeg!))].sort((a, b) => a - b);
    const reqMargin = new Map(scenario.links.map((l) => [`${l.station}|${l.name}`, l.requiredMarginDB]));
    const names = scenario.weatherCases.map((c) => c.name);
    for (const m of masks) {
      const wanted = new Set(findings.filter((f) => f.maskDeg === m).map((f) => `${f.station}|${f.link}|${f.weather}`));
      let counted = 0;
      const bad: string[] = [];
      await runPipeline({
        scenario,
        maskFloorDeg: m,
        onStep: (e) => {
          e.step.cases.forEach((c, ci) => {
            const k = `${e.station}|${e.link.name}|${names[ci]}`;
            if (!wanted.has(k)) return;
            if (!c.usable && e.step.mount_limited) return; // keyhole: excluded by the finder's definition
            counted++;
            const req = reqMargin.get(`${e.station}|${e.link.name}`)!;
            if (!(c.usable && c.margin_db >= req)) bad.push(`${k} at el ${e.step.elevation_deg.toFixed(3)}°: margin ${c.margin_db.toFixed(3)} dB < ${req} dB`);
          });
        },
      });
      expect(bad.slice(0, 5), `mask ${m}°: ${bad.length} steps below the required margin`).toEqual([]);
      expect(counted, `mask ${m}°: steps remain above it`).toBeGreaterThan(0);
    }
  });
});

describe('rate finder', () => {
  it('rate.csv has the columns of RATE_COLUMNS, fixed-rate links only, every candidate rate', () => {
    expect(rateHeader).toEqual(RATE_COLUMNS);
    const fixedLinks = new Set(scenario.links.filter((l) => l.modcod.kind === 'fixed').map((l) => l.name));
    expect(new Set(rateRows.map((r) => r.link))).toEqual(fixedLinks);
    const groups = new Set(rateRows.map((r) => `${r.station}|${r.link}|${r.weather}`));
    expect(rateRows.length).toBe(groups.size * scenario.rateCandidatesBps.length);
  });

  it('usable minutes are non-increasing with bit rate, and volume = rate × usable time', () => {
    const byGroup = new Map<string, CsvRecord[]>();
    for (const r of rateRows) {
      const k = `${r.station}|${r.link}|${r.weather}`;
      if (!byGroup.has(k)) byGroup.set(k, []);
      byGroup.get(k)!.push(r);
    }
    for (const [k, rows] of byGroup) {
      rows.sort((a, b) => num(a.bit_rate_bps) - num(b.bit_rate_bps));
      for (let i = 1; i < rows.length; i++) {
        expect(num(rows[i].usable_min_per_day), `${k} at ${rows[i].bit_rate_bps} b/s`).toBeLessThanOrEqual(num(rows[i - 1].usable_min_per_day));
      }
      for (const r of rows) {
        const mb = (num(r.bit_rate_bps) * num(r.usable_min_per_day) * 60) / 8e6;
        // usable_min_per_day is printed to 1e-3 min: that much time at this rate.
        const tol = (num(r.bit_rate_bps) * 0.06) / 8e6 + 1e-6;
        expect(Math.abs(num(r.daily_volume_mb) - mb), `${k} at ${r.bit_rate_bps} b/s`).toBeLessThanOrEqual(tol);
      }
      // The lowest rate closes for longer than the highest.
      expect(num(rows[rows.length - 1].usable_min_per_day)).toBeLessThan(num(rows[0].usable_min_per_day));
    }
  });

  it("at the link's own bit rate, usable minutes per day match the run (daily.csv)", () => {
    const days = (scenario.window.endS - scenario.window.startS) / 86_400;
    for (const l of scenario.links) {
      if (l.modcod.kind !== 'fixed') continue;
      for (const w of scenario.weatherCases) {
        const row = rateRows.find((r) => r.station === l.station && r.link === l.name && r.weather === w.name && num(r.bit_rate_bps) === (l.modcod as { bitRateBps: number }).bitRateBps);
        expect(row, `${l.station} ${l.name} ${w.name}: rate row at the link rate`).toBeDefined();
        const runMin = daily.filter((d) => d.station === l.station && d.link === l.name && d.weather === w.name)
          .reduce((s, d) => s + d.usableMinutes, 0) / days;
        // The rate histogram bins C/N0 at 0.01 dB: steps within a bin of the threshold may fall
        // either side. Allow 3 steps per day.
        expect(Math.abs(num(row!.usable_min_per_day) - runMin), `${l.station} ${l.name} ${w.name}: ${row!.usable_min_per_day} vs run ${runMin}`)
          .toBeLessThanOrEqual((3 * scenario.window.stepS) / 60);
      }
    }
  });
});

describe('mask.json', () => {
  it('is snake_case with units in the names, one finding per station, link and case', () => {
    const j = JSON.parse(readFileSync(path.join(outDir, 'mask.json'), 'utf8')) as { findings: Record<string, unknown>[] };
    expect(badKeys(j)).toEqual([]);
    expect(Object.keys(j.findings[0]).sort()).toEqual(['fraction', 'link', 'mask_deg', 'mount_limited_excluded_s', 'station', 'weather']);
    expect(j.findings.map((f) => f.mask_deg)).toEqual(findings.map((f) => f.maskDeg));
  });
});

describe('passbudget mask / rate at the command line', () => {
  it('write the same mask.csv, mask.json and rate.csv as the library', async () => {
    if (!existsSync(CLI)) throw new Error(`${CLI} is missing: build with npx tsc -p . (npm test does)`);
    const cliOut = path.join(tempDir('finders-cli'), 'out');
    const [m, r] = await Promise.all([
      runCli(['mask', PAIR, '--fraction', '1', '--out', cliOut, '--quiet']),
      runCli(['rate', PAIR, '--out', `${cliOut}-rate`, '--quiet']),
    ]);
    expect(m.stderr).toBe('');
    expect(m.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    for (const f of ['mask.csv', 'mask.json']) {
      expect(readFileSync(path.join(cliOut, f), 'utf8'), f).toBe(readFileSync(path.join(outDir, f), 'utf8'));
    }
    expect(readFileSync(path.join(`${cliOut}-rate`, 'rate.csv'), 'utf8')).toBe(readFileSync(path.join(outDir, 'rate.csv'), 'utf8'));
  });
});
