/**
 * The what-if panel of the demo week's report in headless Chromium. The hook
 * `window.passbudgetWhatIf` is checked against reruns of the scenario with
 * the change made in the scenario file (the four changes: +3 dB EIRP
 * on x-band, half the bit rate on uhf-tm, 6 dB required margin on s-band, a
 * 10° mask at every station for each link): daily network volumes within
 * 0.5 % (the carried C/N0 is quantised to 0.001 dB, elevation to 0.01°, and a
 * raised mask's AOS/LOS are interpolated between grid steps) and usable-pass
 * counts equal, network and per station. Then a control is moved (the
 * figures change, the "changed" marker shows) and reset (the run's figures
 * come back), with no console error. Leaves out/whatif-panel.png.
 */
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DailyRow } from '../../src/analysis/types.js';
import type { WhatIfChange, WhatIfResult } from '../../src/analysis/whatIf.js';
import { loadScenario } from '../../src/scenario/index.js';
import { runScenario } from '../../src/jobs/run.js';

const CHROMIUM = '/usr/bin/chromium';
const ROOT = path.resolve(import.meta.dirname, '../..');
const present = existsSync(CHROMIUM);
if (!present && process.env.CI) throw new Error(`${CHROMIUM} is missing: CI must install Debian's chromium package (see .ci/run)`);
if (!present) console.warn(`SKIPPED test/browser/whatif.test.ts: ${CHROMIUM} not found (apt-get install -y chromium)`);

const DEMO = readFileSync(path.join(ROOT, 'fixtures/demo/scenario.yaml'), 'utf8');

/** Replace the k-th (0-based) occurrence of `a` in `s` by `b`; fails when there is none. */
function replaceNth(s: string, a: string, b: string, k: number): string {
  let at = -1;
  for (let i = 0; i <= k; i++) { at = s.indexOf(a, at + 1); if (at < 0) throw new Error(`no occurrence ${k} of ${a}`); }
  return s.slice(0, at) + b + s.slice(at + a.length);
}

// Pico Verde's table mask [[0,4],[60,9],[120,12],[180,6],[240,3],[300,7]] (joined by straight lines) raised to at least
// 10°: the same lines with the points where they cross 10° added (80° on the 60–120 side, 140° on the 120–180 side).
const PICO_AT_LEAST_10 = 'mask_table: [[0, 10], [60, 10], [80, 10], [120, 12], [140, 10], [180, 10], [240, 10], [300, 10]]';

interface Change { label: string; hook: WhatIfChange[]; yaml: (s: string) => string }
const CHANGES: Change[] = [
  {
    label: '+3 dB EIRP on x-band', hook: [{ link: 'x-band', eirp_delta_db: 3 }],
    // 2 W + 3 dB = 2·10^0.3 W.
    yaml: (s) => replaceNth(s, 'transmitter: { power_w: 2, line_loss_db: 1.2 }', `transmitter: { power_w: ${2 * 10 ** 0.3}, line_loss_db: 1.2 }`, 0),
  },
  { label: 'half the bit rate on uhf-tm', hook: [{ link: 'uhf-tm', bit_rate_bps: 4800 }], yaml: (s) => replaceNth(s, 'bit_rate_bps: 9600', 'bit_rate_bps: 4800', 0) },
  { label: 'required margin 6 dB on s-band', hook: [{ link: 's-band', required_margin_db: 6 }], yaml: (s) => replaceNth(s, 'required_margin_db: 3', 'required_margin_db: 6', 1) },
  {
    label: 'mask 10° at every station',
    hook: ['uhf-tm', 's-band', 'x-band'].map((link) => ({ link, mask_deg: 10 })),
    yaml: (s) => s.replaceAll('mask_deg: 5', 'mask_deg: 10').replace('mask_table: [[0, 4], [60, 9], [120, 12], [180, 6], [240, 3], [300, 7]]', PICO_AT_LEAST_10),
  },
];

describe.skipIf(!present)('what-if panel of the demo week in headless Chromium', () => {
  let dir = '';
  let context: BrowserContext;
  let page: Page;
  const errors: string[] = [];
  const requests: string[] = [];
  let url = '';
  const reruns: DailyRow[][] = [];

  const runOf = async (name: string, yaml: string): Promise<DailyRow[]> => {
    const sub = path.join(dir, name);
    mkdirSync(sub, { recursive: true });
    writeFileSync(path.join(sub, 'scenario.yaml'), yaml);
    copyFileSync(path.join(ROOT, 'fixtures/demo/orbilux-3.tle'), path.join(sub, 'orbilux-3.tle'));
    const r = await runScenario(loadScenario(path.join(sub, 'scenario.yaml')), { outDir: path.join(sub, 'out'), quiet: true, steps: false });
    return r.pipeline.daily;
  };

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'passbudget-whatif-'));
    await runOf('run', DEMO);
    for (const [i, c] of CHANGES.entries()) {
      const yaml = c.yaml(DEMO);
      expect(yaml).not.toBe(DEMO);
      reruns.push(await runOf(`rerun-${i}`, yaml));
    }
    url = pathToFileURL(path.join(dir, 'run', 'out', 'report.html')).href;
    context = await chromium.launchPersistentContext(path.join(dir, 'profile'), {
      executablePath: CHROMIUM, headless: true, viewport: { width: 1240, height: 1400 },
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    page = context.pages()[0] ?? (await context.newPage());
    page.on('request', (r) => requests.push(r.url()));
    page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
    page.on('pageerror', (e) => errors.push(String(e)));
    await page.goto(url, { waitUntil: 'load' });
  }, 300_000);

  afterAll(async () => {
    await context?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('loads with the panel, no console errors and no request but the page', async () => {
    expect(errors).toEqual([]);
    expect(requests).toEqual([url]);
    expect(await page.locator('.whatif-link').count()).toBe(3);
  });

  for (const [i, c] of CHANGES.entries()) {
    it(`matches a rerun: ${c.label}`, async () => {
      for (const change of c.hook) {
        const got = await page.evaluate((x) => (window as unknown as { passbudgetWhatIf: (c: unknown) => WhatIfResult }).passbudgetWhatIf(x), change);
        const rows = reruns[i].filter((r) => r.link === change.link);
        for (const [weather, res] of Object.entries(got.cases)) {
          const groups = [['(network)', res.network] as const, ...Object.entries(res.stations)];
          for (const [station, d] of groups) {
            const mine = rows.filter((r) => r.weather === weather && r.station === station);
            expect(d.days_utc, `${change.link} ${weather} ${station}`).toEqual(mine.map((r) => r.dayUtc));
            const usable = mine.reduce((a, r) => a + r.usablePasses, 0);
            expect(d.usable_passes, `${change.link} ${weather} ${station} usable passes`).toBe(usable);
            d.daily_volume_bits.forEach((v, k) => {
              const want = mine[k].adaptiveVolumeBits ?? mine[k].fixedVolumeBits;
              if (want === 0) expect(v).toBe(0);
              else expect(Math.abs(v - want) / want, `${change.link} ${weather} ${station} ${d.days_utc[k]}: ${v} vs ${want}`).toBeLessThanOrEqual(0.005);
            });
          }
        }
      }
    });
  }

  it('a moved control changes the figures and shows the marker; reset restores the run', async () => {
    const box = page.locator('.whatif-link[data-link="x-band"]');
    const cells = box.locator('table.whatif-figures tbody td:nth-child(3)');
    const runCells = box.locator('table.whatif-figures tbody td:nth-child(2)');
    const before = await cells.allTextContents();
    expect(before).toEqual(await runCells.allTextContents());
    // The "at a glance" rows of the link: redrawn in place with the what-if figures, restored on reset.
    const glanceVolume = page.locator('tr[data-glance-link="x-band"] td[data-g="volume"]');
    const glanceBefore = await glanceVolume.allTextContents();
    expect(glanceBefore.length).toBe(3);
    expect(await box.locator('.whatif-changed').isHidden()).toBe(true);
    await box.locator('input[data-key="eirp_delta_db"]').fill('3');
    const after = await cells.allTextContents();
    expect(after[0]).not.toBe(before[0]); // network volume per day
    expect(await box.locator('.whatif-changed').isVisible()).toBe(true);
    const glanceAfter = await glanceVolume.allTextContents();
    expect(glanceAfter[0]).not.toBe(glanceBefore[0]);
    expect(glanceAfter[0]).toBe(after[0]); // the panel's and the glance table's what-if network volume per day agree (clear)
    expect(await page.locator('tr.whatif-now[data-glance-link="x-band"]').count()).toBe(3);
    expect(await page.locator('tr.whatif-now[data-glance-link="s-band"]').count()).toBe(0);
    // The link's drawn pass sections show their what-if verdict and volume.
    const marks = page.locator('details.pass[data-link="x-band"] .whatif-pass');
    expect(await marks.count()).toBeGreaterThan(0);
    expect(await marks.first().textContent()).toMatch(/what-if clear: (usable|marginal|unusable), [\d.]+ [kMGT]?bit/);
    await box.locator('input[data-key="mask_deg"]').fill('10');
    mkdirSync(path.join(ROOT, 'out'), { recursive: true });
    await page.locator('#whatif').screenshot({ path: path.join(ROOT, 'out', 'whatif-panel.png') });
    await box.locator('[data-reset]').click();
    expect(await cells.allTextContents()).toEqual(before);
    expect(await box.locator('.whatif-changed').isHidden()).toBe(true);
    expect(await marks.first().textContent()).toBe('');
    expect(await glanceVolume.allTextContents()).toEqual(glanceBefore);
    expect(await page.locator('tr.whatif-now').count()).toBe(0);
    expect(errors).toEqual([]);
  });
});

/**
 * A 35-day window (10 s steps): the report carries the summary
 * (analysis/whatIfSummary.ts). The page's hook gives what the same module
 * gives in Node on the page's data (the bundle runs the same code), the
 * panel says it works from histograms, and a moved control changes the
 * figures and the drawn passes' verdicts; reset restores them.
 */
describe.skipIf(!present)('what-if panel of a 35-day report (histograms) in headless Chromium', () => {
  let dir = '';
  let context: BrowserContext;
  let page: Page;
  const errors: string[] = [];
  let html = '';

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'passbudget-whatif-long-'));
    const yaml = DEMO.replace('duration: 7d', 'duration: 35d').replace(/step_s: 1\b/, 'step_s: 10');
    expect(yaml).not.toBe(DEMO);
    writeFileSync(path.join(dir, 'scenario.yaml'), yaml);
    copyFileSync(path.join(ROOT, 'fixtures/demo/orbilux-3.tle'), path.join(dir, 'orbilux-3.tle'));
    await runScenario(loadScenario(path.join(dir, 'scenario.yaml')), { outDir: path.join(dir, 'out'), quiet: true, steps: false });
    html = readFileSync(path.join(dir, 'out', 'report.html'), 'utf8');
    context = await chromium.launchPersistentContext(path.join(dir, 'profile'), {
      executablePath: CHROMIUM, headless: true, viewport: { width: 1240, height: 1400 },
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    page = context.pages()[0] ?? (await context.newPage());
    page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
    page.on('pageerror', (e) => errors.push(String(e)));
    await page.goto(pathToFileURL(path.join(dir, 'out', 'report.html')).href, { waitUntil: 'load' });
  }, 300_000);

  afterAll(async () => {
    await context?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('says it works from histograms, with their resolution', async () => {
    expect(await page.locator('#whatif').textContent()).toMatch(/from histograms: this window is longer than 31 days.*elevation \(1°\) and C\/N0 \(0\.25 dB/s);
    expect(await page.locator('.whatif-link').count()).toBe(3);
    expect(errors).toEqual([]);
  });

  it('the hook gives what the module gives in Node on the page\'s data', async () => {
    const { decodeWhatIfSummaryPayload, whatIfSummaryDetail } = await import('../../src/analysis/whatIfSummary.js');
    const m = html.match(/<script type="application\/json" id="passbudget-whatif-data">(.*?)<\/script>/s)!;
    const data = decodeWhatIfSummaryPayload(JSON.parse(m[1]), (s) => new Uint8Array(Buffer.from(s, 'base64')));
    for (const change of [{ link: 'x-band', eirp_delta_db: 3 }, { link: 'uhf-tm', bit_rate_bps: 4800 }, { link: 's-band', required_margin_db: 6, mask_deg: 10 }]) {
      const got = await page.evaluate((x) => (window as unknown as { passbudgetWhatIf: (c: unknown) => WhatIfResult }).passbudgetWhatIf(x), change);
      const want = whatIfSummaryDetail(data, change).result;
      expect(got).toEqual(JSON.parse(JSON.stringify(want)));
      expect(got.cases.clear.network.days_utc.length).toBe(35);
    }
  });

  it('a moved control changes the figures and the drawn verdicts; reset restores the run', async () => {
    const box = page.locator('.whatif-link[data-link="s-band"]');
    const cells = box.locator('table.whatif-figures tbody td:nth-child(3)');
    const before = await cells.allTextContents();
    await box.locator('input[data-key="required_margin_db"]').fill('9');
    const after = await cells.allTextContents();
    expect(after[0]).not.toBe(before[0]);
    expect(await box.locator('.whatif-changed').isVisible()).toBe(true);
    const marks = page.locator('details.pass[data-link="s-band"] .whatif-pass');
    expect(await marks.count()).toBeGreaterThan(0);
    expect(await marks.first().textContent()).toMatch(/what-if clear: (usable|not usable|below the mask)$/);
    mkdirSync(path.join(ROOT, 'out'), { recursive: true });
    await page.locator('#whatif').screenshot({ path: path.join(ROOT, 'out', 'whatif-panel-35d.png') });
    await box.locator('[data-reset]').click();
    expect(await cells.allTextContents()).toEqual(before);
    expect(await marks.first().textContent()).toBe('');
    expect(errors).toEqual([]);
  });
});
