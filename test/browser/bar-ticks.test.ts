/**
 * The daily bar charts' day labels in a real Chromium (Debian's package):
 * for 7, 30 and 120 days, the drawn labels' boxes as the browser lays them
 * out (getBBox, in the chart's own units) never overlap, and the first day is
 * always labelled. A control draws every day in full (YYYY-MM-DD, as before
 * this change) at 7 days and finds them overlapping, so the measure can fail.
 */
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { scaleBand } from 'd3-scale';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DailyRow } from '../../src/analysis/types.js';
import { axisBottomBand } from '../../src/output/report/axis.js';
import { BAR_FRAME, barChart, barGroups } from '../../src/output/report/barChart.js';
import { pageShell } from '../../src/output/report/page.js';
import { plotArea } from '../../src/output/report/svg.js';

const CHROMIUM = '/usr/bin/chromium';
const present = existsSync(CHROMIUM);
if (!present && process.env.CI) throw new Error(`${CHROMIUM} is missing: CI must install Debian's chromium package (see .ci/run)`);
if (!present) console.warn(`SKIPPED test/browser/bar-ticks.test.ts: ${CHROMIUM} not found (apt-get install -y chromium)`);

const KEYS = ['Kaldfjell', 'Pico Verde', '(network)'];
function rows(days: number): DailyRow[] {
  const out: DailyRow[] = [];
  for (let d = 0; d < days; d++) {
    const dayUtc = new Date(Date.UTC(2026, 2, 1 + d)).toISOString().slice(0, 10);
    for (const station of KEYS) {
      out.push({ dayUtc, station, satellite: 'S', link: 'x', weather: 'clear', passes: 3, usablePasses: 2, usableMinutes: 20, fixedVolumeBits: 1e9 * (1 + (d % 3)), adaptiveVolumeBits: null, longestGapH: 6 });
    }
  }
  return out;
}

/** Every day labelled in full, as the axis did before (the control). */
function allFullLabels(days: number): string {
  const groups = barGroups(rows(days), KEYS);
  const area = plotArea(BAR_FRAME);
  const x = scaleBand<string>().domain(groups.map((g) => g.day)).range([area.x0, area.x1]).paddingInner(0.2).paddingOuter(0.1);
  let svg = '';
  for (const d of x.domain()) svg += `<text class="tick" x="${(x(d) ?? 0) + x.bandwidth() / 2}" y="${area.y1 + 17}" text-anchor="middle">${d}</text>`;
  return `<svg xmlns="http://www.w3.org/2000/svg" class="chart control" viewBox="0 0 ${BAR_FRAME.width} ${BAR_FRAME.height}" width="${BAR_FRAME.width}"><g class="axis axis-x">${svg}</g></svg>`;
}

describe.skipIf(!present)('day labels of the daily bar charts', () => {
  let dir = '';
  let context: BrowserContext;
  let page: Page;

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'passbudget-ticks-'));
    const charts = [7, 30, 120].map((n) => `<figure data-days="${n}">${barChart(`${n} days`, barGroups(rows(n), KEYS), KEYS)}</figure>`).join('');
    const file = path.join(dir, 'ticks.html');
    writeFileSync(file, pageShell('ticks', `<main><div class="charts">${charts}<figure data-days="control">${allFullLabels(7)}</figure></div></main>`));
    context = await chromium.launchPersistentContext(path.join(dir, 'profile'), {
      executablePath: CHROMIUM, headless: true, viewport: { width: 1240, height: 900 },
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    page = context.pages()[0] ?? (await context.newPage());
    await page.goto(pathToFileURL(file).href, { waitUntil: 'load' });
  });

  afterAll(async () => {
    await context?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  /** The x-axis label boxes of one figure, left to right, in SVG units. */
  const boxes = (days: string) => page.evaluate((sel) => {
    const texts = [...document.querySelectorAll(`figure[data-days="${sel}"] g.axis-x text.tick`)] as SVGTextElement[];
    return texts.map((t) => { const b = t.getBBox(); return { x0: b.x, x1: b.x + b.width, text: t.textContent ?? '' }; });
  }, days);

  it.each(['7', '30', '120'])('%s days: labels do not overlap, the first day is labelled', async (n) => {
    const b = await boxes(n);
    expect(b.length).toBeGreaterThan(2);
    expect(b[0].text).toBe('03-01');
    for (let i = 1; i < b.length; i++) expect(b[i].x0, `${b[i - 1].text} | ${b[i].text}`).toBeGreaterThan(b[i - 1].x1);
    // and the year is in the axis label once
    const axis = await page.evaluate((sel) => document.querySelector(`figure[data-days="${sel}"] g.axis-x text.axis-label`)?.textContent, n);
    expect(axis).toBe('UTC day, 2026');
  });

  it('7 days: every day keeps its label', async () => {
    expect((await boxes('7')).map((x) => x.text)).toEqual(['03-01', '03-02', '03-03', '03-04', '03-05', '03-06', '03-07']);
  });

  it('control: full dates on every one of 7 days overlap, so the check above can fail', async () => {
    const b = await boxes('control');
    expect(b).toHaveLength(7);
    expect(b.some((x, i) => i > 0 && x.x0 <= b[i - 1].x1)).toBe(true);
  });

  it('a window across a new year keeps full dates, still without overlap', async () => {
    const area = plotArea(BAR_FRAME);
    const days = Array.from({ length: 12 }, (_, d) => new Date(Date.UTC(2026, 11, 25 + d)).toISOString().slice(0, 10));
    const x = scaleBand<string>().domain(days).range([area.x0, area.x1]).paddingInner(0.2).paddingOuter(0.1);
    const svg = `<svg xmlns="http://www.w3.org/2000/svg" class="chart" viewBox="0 0 ${BAR_FRAME.width} ${BAR_FRAME.height}" width="${BAR_FRAME.width}">${axisBottomBand(x, area, 'UTC day')}</svg>`;
    await page.evaluate((html) => { document.body.insertAdjacentHTML('beforeend', `<figure data-days="ny">${html}</figure>`); }, svg);
    const b = await boxes('ny');
    expect(b[0].text).toBe('2026-12-25');
    for (let i = 1; i < b.length; i++) expect(b[i].x0).toBeGreaterThan(b[i - 1].x1);
  });
});
