/** The HTML document as a whole: self-contained, escaped, and carrying the figures of its input. */
import { max, min } from 'd3-array';
import { describe, expect, it } from 'vitest';
import { renderReport } from '../../src/output/report/index.js';
import { formatBits } from '../../src/output/report/format.js';
import { STANDING_CAUTIONS } from '../../src/output/report/header.js';
import { expectedChartCount, syntheticScenario } from '../browser/synthetic.js';

const HOSTILE = '<script>alert(1)</script> & "quotes"';

describe('renderReport', () => {
  const input = syntheticScenario(['Kaldfjell', 'Pico Verde', HOSTILE]);
  const html = renderReport(input);

  it('makes one collapsible section per pass and link and the expected number of charts', () => {
    expect((html.match(/<details class="pass"/g) ?? []).length).toBe(input.passes.length);
    expect((html.match(/<svg [^>]*role="img"/g) ?? []).length).toBe(expectedChartCount(input));
    expect(input.passes.length).toBe(54);
  });

  it('references nothing outside the document', () => {
    expect(html).not.toMatch(/\ssrc=/i);
    expect(html).not.toMatch(/<link\b/i);
    expect(html).not.toMatch(/@import|@font-face/i);
    for (const m of html.matchAll(/\shref="([^"]*)"/g)) expect(m[1].startsWith('#')).toBe(true);
    for (const m of html.matchAll(/url\(([^)]*)\)/g)) expect(m[1].startsWith('#')).toBe(true);
    // The only absolute URL is the SVG namespace name, which is never fetched.
    expect([...new Set(html.match(/https?:\/\/[^\s"'<>]+/g))]).toEqual(['http://www.w3.org/2000/svg']);
    expect(html).toContain("default-src 'none'");
  });

  it('escapes a hostile station name everywhere; the only script is our own', () => {
    expect(html).not.toContain('<script>alert(1)');
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;quotes&quot;');
    expect((html.match(/<script\b/g) ?? []).length).toBe(1);
  });

  it('states window, cautions, defaults and models in the header', () => {
    expect(html).toContain('2031-06-01T00:00:00.000Z');
    for (const c of STANDING_CAUTIONS) expect(html).toContain(c);
    expect(html.split(STANDING_CAUTIONS[0]).length - 1).toBe(1); // the run's copy of a standing caution is not repeated
    expect(html).toContain('stations.Maraka.climate.rainRate001MmH');
    expect(html).toContain('ITU-R P.618-13 §2.2.1.1 with P.838-3');
  });

  it('puts per-link network volume and worst/best margin in the at-a-glance block', () => {
    const glance = html.slice(html.indexOf('id="glance"'), html.indexOf('class="link"'));
    for (const link of input.summary.links) {
      const t = input.summary.totals.find((x) => x.link === link && x.weather === 'clear' && x.station === '(network)');
      expect(t).toBeDefined();
      expect(glance).toContain(`<strong>${formatBits(t!.dailyVolumeBits.mean)}</strong>`);
      const cases = input.passes.filter((p) => p.link === link).map((p) => p.cases[0]);
      expect(glance).toContain(`>${(min(cases, (c) => c.minMarginDB) as number).toFixed(1).replace('-', '−')}<`);
      expect(glance).toContain(`>${(max(cases, (c) => c.maxMarginDB) as number).toFixed(1)}<`);
    }
  });

  it('has one pass-table row per pass, link and case, with raw numbers for numeric sorting', () => {
    const table = html.slice(html.indexOf('<table class="sortable"'));
    const rows = table.slice(0, table.indexOf('</tbody>')).match(/<tr><td><a href="#pass-/g) ?? [];
    expect(rows.length).toBe(input.passes.reduce((a, p) => a + p.cases.length, 0));
    const p = input.passes[0];
    expect(table).toContain(`data-v="${p.maxElevationDeg}"`);
  });

  it('renders the same input to the same document', () => {
    expect(renderReport(input)).toBe(html);
  });

  it('stays under 30 kB of document per pass section (measured ≈ 24 kB here, 1.3 MB in all)', () => {
    expect(html.length / input.passes.length).toBeLessThan(30_000);
  });

  it('renders an input with no passes, trades or series without failing', () => {
    const empty = { ...input, passes: [], series: [], daily: [], maskTrade: undefined, rateTrade: undefined, maskFindings: undefined };
    const out = renderReport(empty);
    expect(out).toContain('<h2>At a glance</h2>');
    expect((out.match(/<details class="pass"/g) ?? []).length).toBe(0);
  });
});
