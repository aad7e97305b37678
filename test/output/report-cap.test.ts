/**
 * The report's bound on detailed pass sections (REPORT_MAX_PASS_SECTIONS):
 * the first N pass-link sections in time order (AOS, station, link) are drawn
 * with charts; the page says how many of how many; every pass stays in the
 * pass table; the sky-plot background is drawn once per station as a
 * <symbol> and each sky plot refers to it with <use>.
 */
import { describe, expect, it } from 'vitest';
import { renderReport, REPORT_MAX_PASS_SECTIONS } from '../../src/output/report/index.js';
import { syntheticScenario } from '../browser/synthetic.js';

describe('report section cap', () => {
  const input = syntheticScenario(['Kaldfjell', 'Pico Verde', 'Maraka']);
  const sorted = [...input.passes].sort((a, b) => a.aosS - b.aosS || a.station.localeCompare(b.station) || a.link.localeCompare(b.link));

  it('draws the first N sections in time order and says how many of how many per link', () => {
    const n = 10;
    const html = renderReport({ ...input, maxPassSections: n });
    expect((html.match(/<details class="pass"/g) ?? []).length).toBe(n);
    const ids = [...html.matchAll(/<details class="pass" id="pass-(\d+)"[^>]*><summary><strong>([^<]*)<\/strong> · ([^ ]*) ·/g)].map((m) => [Number(m[1]), m[2], m[3]]);
    expect(ids.map((x) => x[0]).sort((a, b) => Number(a) - Number(b))).toEqual(Array.from({ length: n }, (_, i) => i));
    for (const [i, passId, link] of ids) expect([passId, link]).toEqual([sorted[i as number].passId, sorted[i as number].link]);
    for (const link of input.summary.links) {
      const all = input.passes.filter((p) => p.link === link).length;
      const drawn = sorted.slice(0, n).filter((p) => p.link === link).length;
      expect(html).toContain(`Drawn in detail: ${drawn} of the ${all} passes of this link`);
    }
    // Every pass and case is still in the table; only drawn sections are linked.
    const table = html.slice(html.indexOf('<table class="sortable" id="passes">'));
    const body = table.slice(0, table.indexOf('</tbody>'));
    expect((body.match(/<tr>/g) ?? []).length).toBe(1 + input.passes.reduce((s, p) => s + p.cases.length, 0));
    expect(new Set([...body.matchAll(/href="#pass-(\d+)"/g)].map((m) => Number(m[1])))).toEqual(new Set(Array.from({ length: n }, (_, i) => i)));
  });

  it('draws everything, without a cap note, under the default cap', () => {
    expect(input.passes.length).toBeLessThan(REPORT_MAX_PASS_SECTIONS);
    const html = renderReport(input);
    expect((html.match(/<details class="pass"/g) ?? []).length).toBe(input.passes.length);
    expect(html).not.toContain('Drawn in detail');
  });

  it('draws each station\'s sky background once and refers to it from every sky plot', () => {
    const html = renderReport(input);
    const symbols = [...html.matchAll(/<symbol id="(sky-bg-\d+)"/g)].map((m) => m[1]);
    expect(symbols.length).toBe(new Set(input.passes.map((p) => p.station)).size);
    expect((html.match(/class="mask-ground"/g) ?? []).length).toBe(symbols.length);
    const skyPlots = (html.match(/<svg [^>]*class="chart sky"/g) ?? []).length;
    expect(skyPlots).toBe(input.series.length);
    const uses = [...html.matchAll(/<use href="#(sky-bg-\d+)"/g)].map((m) => m[1]);
    expect(uses.length).toBe(skyPlots);
    for (const u of uses) expect(symbols).toContain(u);
  });
});
