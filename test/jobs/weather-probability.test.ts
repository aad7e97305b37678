/**
 * Weather as a probability through the run's outputs, on the e2e pair scenario
 * (invented; a fixed-rate S-band link and an adaptive X-band link; weather
 * clear and 0.1 %; a window across midnight UTC):
 *   - bounds that follow from the definition (probabilities ≤ 1, a step that
 *     closes at p closes with probability ≥ 1 − p/100, none closes without the
 *     clear sky): per pass (1 − 0.1/100) × the 0.1 % volume ≤ expected volume
 *     ≤ the clear-sky volume;
 *   - bookkeeping: each pass's expected_volume_bits is Σ expected rate × step
 *     over its steps in steps.csv, closes_throughout_probability the least
 *     closing_probability of its clear-sky-closing steps; daily.csv's expected
 *     volumes add up to the passes' (by AOS day); summary.json's per-day
 *     figure is the run's total over the window's days.
 */
import path from 'node:path';
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SummaryJson } from '../../src/output/json.js';
import { runScenario } from '../../src/jobs/run.js';
import { loadScenario, type ResolvedScenario } from '../../src/scenario/index.js';
import { PAIR, readCsv, removeTempDirs, tempDir, type CsvRecord } from './helpers.js';

afterAll(removeTempDirs);

let scenario: ResolvedScenario;
let steps: CsvRecord[];
let passes: CsvRecord[];
let daily: CsvRecord[];
let summary: SummaryJson;

beforeAll(async () => {
  scenario = loadScenario(PAIR);
  const outDir = path.join(tempDir('weather-probability'), 'out');
  await runScenario(scenario, { outDir, quiet: true, steps: true });
  steps = readCsv(path.join(outDir, 'steps.csv')).rows;
  passes = readCsv(path.join(outDir, 'passes.csv')).rows;
  daily = readCsv(path.join(outDir, 'daily.csv')).rows;
  summary = JSON.parse(readFileSync(path.join(outDir, 'summary.json'), 'utf8')) as SummaryJson;
});

const n = (s: string) => Number(s);
const isAdaptive = (link: string) => scenario.links.find((l) => l.name === link)!.modcod.kind === 'adaptive';
const volume = (r: CsvRecord) => n(isAdaptive(r.link) ? r.adaptive_volume_bits : r.fixed_volume_bits);

describe('pass expected volume between the worst case and clear sky', () => {
  it('every pass-link, both links', () => {
    const byPass = new Map<string, Record<string, CsvRecord>>();
    for (const r of passes) {
      const k = `${r.pass_id}|${r.link}`;
      byPass.set(k, { ...byPass.get(k), [r.weather]: r });
    }
    let between = 0;
    for (const [k, c] of byPass) {
      const e = n(c.clear.expected_volume_bits);
      expect(c.clear.expected_volume_bits).toBe(c['0.1%'].expected_volume_bits); // a pass field, on each case row
      expect(e, k).toBeLessThanOrEqual(volume(c.clear) + 1);
      expect(e, k).toBeGreaterThanOrEqual((1 - 0.1 / 100) * volume(c['0.1%']) - 1);
      if (e > volume(c['0.1%']) && e < volume(c.clear)) between++;
      const p = n(c.clear.closes_throughout_probability);
      expect(p).toBeGreaterThanOrEqual(0);
      expect(p).toBeLessThanOrEqual(1);
    }
    expect(between).toBeGreaterThan(0); // not only the trivial ends
    expect(new Set(passes.map((r) => r.link)).size).toBe(2);
  });
});

describe('bookkeeping from steps.csv', () => {
  it('expected_volume_bits = Σ expected rate × step; closes_throughout_probability = least clear-sky-closing step probability', () => {
    const stepS = scenario.window.stepS;
    const sums = new Map<string, { bits: number; n: number; minP: number }>();
    for (const s of steps) {
      const k = `${s.pass_id}|${s.link}`;
      const t = sums.get(k) ?? { bits: 0, n: 0, minP: Infinity };
      t.bits += n(s.expected_information_rate_mbps) * 1e6 * stepS;
      t.n++;
      const q = n(s.closing_probability);
      expect(q).toBeGreaterThanOrEqual(0);
      expect(q).toBeLessThanOrEqual(1);
      if (q > 0) t.minP = Math.min(t.minP, q);
      sums.set(k, t);
    }
    for (const r of passes.filter((x) => x.weather === 'clear')) {
      const t = sums.get(`${r.pass_id}|${r.link}`);
      if (!t) { expect(n(r.expected_volume_bits)).toBe(0); continue; }
      // steps.csv rounds the rate to 1 b/s (6 decimals in Mb/s): ½ b/s × step per step, plus the bits' own rounding.
      expect(Math.abs(n(r.expected_volume_bits) - t.bits), r.pass_id).toBeLessThanOrEqual(0.5 * stepS * t.n + 1);
      expect(n(r.closes_throughout_probability)).toBeCloseTo(t.minP === Infinity ? 0 : t.minP, 6);
    }
  });
  it('daily expected volumes add up to the passes by AOS day; availability in [0, 1]; summary per day = total / days', () => {
    const passBits = new Map<string, number>();
    for (const r of passes.filter((x) => x.weather === 'clear')) {
      const k = `${r.aos_utc.slice(0, 10)}|${r.station}|${r.link}`;
      passBits.set(k, (passBits.get(k) ?? 0) + n(r.expected_volume_bits));
    }
    for (const d of daily.filter((x) => x.station !== '(network)' && x.weather === 'clear')) {
      const k = `${d.day_utc}|${d.station}|${d.link}`;
      expect(n(d.expected_volume_mb) * 8e6).toBeCloseTo(passBits.get(k) ?? 0, -1);
      if (d.availability_fraction !== '') {
        expect(n(d.availability_fraction)).toBeGreaterThanOrEqual(0);
        expect(n(d.availability_fraction)).toBeLessThanOrEqual(1);
      }
    }
    for (const d of daily.filter((x) => x.station === '(network)')) expect(d.expected_volume_mb).toBe('');
    const days = (scenario.window.endS - scenario.window.startS) / 86_400;
    const w = summary.weather_probability!;
    expect(w.length).toBe(new Set(passes.map((r) => `${r.station}|${r.link}`)).size);
    for (const t of w) {
      let total = 0;
      for (const [k, v] of passBits) if (k.endsWith(`|${t.station}|${t.link}`)) total += v;
      expect(t.expected_volume_bits_per_day * days).toBeCloseTo(total, -1);
    }
  });
});
