/**
 * The report of a real run (the demo scenario, one day, one station renamed to
 * a hostile string) in headless Chromium: no console errors, no request but
 * the page itself, one collapsible section per pass and link, charts present,
 * the hostile name shown as text. Leaves out/report-demo-screenshot.png.
 */
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadScenario } from '../../src/scenario/index.js';
import { runScenario, type RunResult } from '../../src/jobs/run.js';

const CHROMIUM = '/usr/bin/chromium';
const HOSTILE = '<script>alert(1)</script> & "quotes"';
const ROOT = path.resolve(import.meta.dirname, '../..');
const present = existsSync(CHROMIUM);
if (!present && process.env.CI) throw new Error(`${CHROMIUM} is missing: CI must install Debian's chromium package (see .ci/run)`);
if (!present) console.warn(`SKIPPED test/browser/demo-report.test.ts: ${CHROMIUM} not found (apt-get install -y chromium)`);

describe.skipIf(!present)('report of a real run in headless Chromium', () => {
  let dir = '';
  let run: RunResult;
  let context: BrowserContext;
  let page: Page;
  let url = '';
  const requests: string[] = [];
  const errors: string[] = [];
  const dialogs: string[] = [];

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'passbudget-demo-report-'));
    const yaml = readFileSync(path.join(ROOT, 'fixtures/demo/scenario.yaml'), 'utf8')
      .replace('duration: 7d', 'duration: 1d')
      .replace('- name: Maraka', `- name: '${HOSTILE}'`);
    expect(yaml).toContain(HOSTILE);
    writeFileSync(path.join(dir, 'scenario.yaml'), yaml);
    copyFileSync(path.join(ROOT, 'fixtures/demo/orbilux-3.tle'), path.join(dir, 'orbilux-3.tle'));
    run = await runScenario(loadScenario(path.join(dir, 'scenario.yaml')), { outDir: path.join(dir, 'out'), quiet: true, steps: false });
    url = pathToFileURL(path.join(dir, 'out', 'report.html')).href;
    context = await chromium.launchPersistentContext(path.join(dir, 'profile'), {
      executablePath: CHROMIUM, headless: true, viewport: { width: 1240, height: 1600 },
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    page = context.pages()[0] ?? (await context.newPage());
    page.on('request', (r) => requests.push(r.url()));
    page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
    page.on('pageerror', (e) => errors.push(String(e)));
    page.on('dialog', (d) => { dialogs.push(d.message()); void d.dismiss(); });
    await page.goto(url, { waitUntil: 'load' });
  }, 120_000);

  afterAll(async () => {
    await context?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('loads with no console errors and no request but the page itself', () => {
    expect(errors).toEqual([]);
    expect(requests).toEqual([url]);
  });

  it('has one pass section per pass and link, each with its charts', async () => {
    expect(run.pipeline.passLinks.length).toBeGreaterThan(10);
    expect(await page.locator('details.pass').count()).toBe(run.pipeline.passLinks.length);
    // margin, Eb/N0 and sky plot in every section that has steps
    const withSteps = [...run.pipeline.passLinks].filter((p) => p.steps > 0).length;
    expect(await page.locator('details.pass svg.sky').count()).toBe(withSteps);
    expect(await page.locator('svg').count()).toBeGreaterThan(3 * withSteps);
  });

  it('shows the hostile station name as text', async () => {
    expect(dialogs).toEqual([]);
    const text = await page.evaluate(() => document.body.textContent ?? '');
    expect(text).toContain(HOSTILE);
    // The report's scripts: table sorting, the what-if data block (JSON, not run) and the what-if page script.
    expect(await page.locator('script').count()).toBe(3);
  });

  it('leaves a screenshot for a person to look at', async () => {
    mkdirSync(path.join(ROOT, 'out'), { recursive: true });
    const file = path.join(ROOT, 'out', 'report-demo-screenshot.png');
    await page.screenshot({ path: file, fullPage: false });
    expect(existsSync(file)).toBe(true);
  });
});
