/**
 * The report in a real headless Chromium (Debian's package, driven by
 * playwright-core): loads from file:// with no console errors and no request
 * but the page itself, has the expected sections and charts, renders a hostile
 * station name as text, sorts the pass table on a header click, and leaves a
 * screenshot in out/report-screenshot.png.
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderReport } from '../../src/output/report/index.js';
import { expectedChartCount, syntheticScenario } from './synthetic.js';

const CHROMIUM = '/usr/bin/chromium';
const HOSTILE = '<script>alert(1)</script> & "quotes"';
const present = existsSync(CHROMIUM);

if (!present && process.env.CI) {
  throw new Error(`${CHROMIUM} is missing: CI must install Debian's chromium package (see .ci/run) for the report browser test`);
}
if (!present) console.warn(`SKIPPED test/browser/report.test.ts: ${CHROMIUM} not found (apt-get install -y chromium)`);

describe.skipIf(!present)('HTML report in headless Chromium', () => {
  const input = syntheticScenario(['Kaldfjell', 'Pico Verde', HOSTILE]);
  let dir = '';
  let url = '';
  let context: BrowserContext;
  let page: Page;
  const requests: string[] = [];
  const consoleErrors: string[] = [];
  const dialogs: string[] = [];

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'passbudget-report-'));
    const file = path.join(dir, 'report.html');
    writeFileSync(file, renderReport(input));
    url = pathToFileURL(file).href;
    context = await chromium.launchPersistentContext(path.join(dir, 'profile'), {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
      viewport: { width: 1240, height: 1800 },
    });
    page = context.pages()[0] ?? (await context.newPage());
    page.on('request', (r) => requests.push(r.url()));
    page.on('console', (m) => { if (m.type() === 'error') consoleErrors.push(m.text()); });
    page.on('pageerror', (e) => consoleErrors.push(String(e)));
    page.on('dialog', (d) => { dialogs.push(d.message()); void d.dismiss(); });
    await page.goto(url, { waitUntil: 'load' });
  });

  afterAll(async () => {
    await context?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('loads with no console errors and no request but the page itself', () => {
    expect(consoleErrors).toEqual([]);
    expect(requests).toEqual([url]);
  });

  it('has one <details> per pass and link and the expected number of charts', async () => {
    expect(await page.locator('details.pass').count()).toBe(input.passes.length);
    expect(await page.locator('svg[role="img"]').count()).toBe(expectedChartCount(input));
    // Every chart has a non-empty box once its section is open.
    await page.locator('details.pass').first().evaluate((d) => { (d as HTMLDetailsElement).open = true; });
    const box = await page.locator('details.pass').first().locator('svg.sky').boundingBox();
    expect(box?.width).toBeGreaterThan(100);
  });

  it('renders a hostile station name as text, not markup', async () => {
    expect(dialogs).toEqual([]);
    const text = await page.evaluate(() => document.body.textContent ?? '');
    expect(text).toContain(HOSTILE);
    expect(await page.locator('script').count()).toBe(1);
  });

  it('sorts the pass table numerically on a header click, and reverses on a second click', async () => {
    const head = page.locator('#passes thead th', { hasText: 'peak elevation (deg)' });
    const col = await page.locator('#passes thead th').evaluateAll((ths) => ths.findIndex((t) => t.textContent === 'peak elevation (deg)'));
    const values = () => page.locator('#passes tbody tr').evaluateAll((rows, c) => rows.map((r) => Number((r as HTMLTableRowElement).cells[c].getAttribute('data-v'))), col);
    const before = await values();
    await head.click();
    const asc = await values();
    expect(asc).toEqual([...before].sort((a, b) => a - b));
    expect(asc[0]).toBeLessThan(asc[asc.length - 1]);
    expect(await head.getAttribute('aria-sort')).toBe('ascending');
    await head.click();
    expect(await values()).toEqual([...before].sort((a, b) => b - a));
    // A text column sorts by text.
    const station = page.locator('#passes thead th', { hasText: /^station$/ });
    await station.click();
    const names = await page.locator('#passes tbody tr td:nth-child(2)').allTextContents();
    expect(names).toEqual([...names].sort((a, b) => a.localeCompare(b)));
  });

  it('opens every pass section of a link with its "open all" button', async () => {
    await page.locator('#link-1 button[data-toggle="open"]').click();
    const states = await page.locator('#link-1 details.pass').evaluateAll((ds) => ds.map((d) => (d as HTMLDetailsElement).open));
    expect(states.length).toBeGreaterThan(0);
    expect(states.every(Boolean)).toBe(true);
    await page.locator('#link-1 button[data-toggle="close"]').click();
    expect(await page.locator('#link-1 details.pass[open]').count()).toBe(0);
  });

  it('writes a screenshot to out/report-screenshot.png', async () => {
    const out = path.resolve(process.cwd(), 'out');
    mkdirSync(out, { recursive: true });
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: path.join(out, 'report-screenshot.png') });
    // A second view of one open pass, for review of the per-pass charts.
    const first = page.locator('details.pass').nth(1);
    await first.evaluate((d) => { (d as HTMLDetailsElement).open = true; });
    await first.screenshot({ path: path.join(out, 'report-screenshot-pass.png') });
    await page.locator('#link-2').screenshot({ path: path.join(out, 'report-screenshot-link.png') });
    expect(existsSync(path.join(out, 'report-screenshot.png'))).toBe(true);
  });
});
