/**
 * The HTML report: one self-contained file (inline CSS, inline SVG charts
 * built here with d3-scale/d3-shape, one small inline script), no network
 * requests. Every text from the input is escaped.
 */
import { escapeHtml as h } from './escape.js';
import { decimateSeries } from './decimate.js';
import { glance, glanceRows, weatherGlance } from './glance.js';
import { header } from './header.js';
import { linkSection } from './linkSection.js';
import { pageShell } from './page.js';
import { passTable } from './passTable.js';
import { whatIfSection } from './whatIfPanel.js';
import { skyBackgroundSymbol } from './skyPlot.js';
import type { EnvelopeSeries } from './envelope.js';
import type { PassSeries, ReportInput } from './types.js';
import type { PassLinkSummary } from '../../analysis/types.js';

export type { PassSeries, ReportInput } from './types.js';
export { escapeHtml } from './escape.js';
export { skyProjection } from './skyPlot.js';
export { timeScales } from './timeChart.js';
export { marginEnvelope, impliedMaskDeg } from './envelope.js';
export { SERIES_COLOURS } from './palette.js';
export type { LinkEnvelope } from './types.js';

/**
 * Pass-link sections drawn in detail by default: the first 300 of the run in
 * time order. A section is ~20 KB (two time charts and a sky plot), so the
 * report stays near 6 MB and renders in well under a second however long the
 * window; every pass stays in the pass table.
 */
export const REPORT_MAX_PASS_SECTIONS = 300;

/** The whole HTML document for one run. */
export function renderReport(input: ReportInput): string {
  const s = input.summary;
  const title = input.title ?? `passbudget report: ${s.scenario}`;
  const seriesKey = (passId: string, link: string) => `${passId}\u0000${link}`;
  const passes = [...input.passes].sort((a, b) => a.aosS - b.aosS || a.station.localeCompare(b.station) || a.link.localeCompare(b.link));
  const index = new Map<PassLinkSummary, number>(passes.map((p, i) => [p, i]));
  const maxSections = Math.max(0, input.maxPassSections ?? REPORT_MAX_PASS_SECTIONS);
  const drawnKeys = new Set(passes.slice(0, maxSections).map((p) => seriesKey(p.passId, p.link)));
  const series = new Map<string, PassSeries>();
  for (const x of input.series) {
    const key = seriesKey(x.passId, x.link);
    if (drawnKeys.has(key)) series.set(key, decimateSeries(x, input.maxChartPoints ?? 150));
  }
  // One sky-plot background per station, drawn once as a <symbol> (a hidden <svg> before the sections).
  const skyBackgroundIds = new Map<string, string>();
  const symbols: string[] = [];
  for (const p of passes.slice(0, maxSections)) {
    if (skyBackgroundIds.has(p.station) || !series.has(seriesKey(p.passId, p.link))) continue;
    const id = `sky-bg-${skyBackgroundIds.size}`;
    skyBackgroundIds.set(p.station, id);
    symbols.push(skyBackgroundSymbol(id, input.horizonMasks[p.station]));
  }
  const defs = symbols.length > 0
    ? `<svg xmlns="http://www.w3.org/2000/svg" width="0" height="0" style="position:absolute" aria-hidden="true" focusable="false"><defs>${symbols.join('')}</defs></svg>`
    : '';
  const envelopesFor = (link: string): EnvelopeSeries[] | null => {
    if (!input.envelopes) return null;
    return weatherCases.map((w) => ({ weather: w, bins: input.envelopes!.find((e) => e.link === link && e.weather === w)?.bins ?? [] }));
  };
  const links = [...s.links, ...new Set(passes.map((p) => p.link).filter((l) => !s.links.includes(l)))];
  const weatherCases = s.weatherCases.length > 0 ? s.weatherCases : [...new Set(passes.flatMap((p) => p.cases.map((c) => c.weather)))];

  const nav = `<nav class="small">Jump to: <a href="#glance">at a glance</a> · <a href="#whatif">what if</a> · ${links.map((l, i) => `<a href="#link-${i}">${h(l)}</a>`).join(' · ')} · <a href="#pass-table">all passes</a></nav>`;
  const body = [
    defs,
    header(s, title, input.generatedNote),
    nav,
    glance(glanceRows(s, passes, input.daily), links, input.requiredMarginDB),
    weatherGlance(s),
    ...(input.extraSections ?? []),
    whatIfSection(input.whatIf, maxSections),
    ...links.map((link, i) => linkSection({
      link,
      stations: s.stations,
      weatherCases,
      daily: input.daily.filter((r) => r.link === link),
      passes: passes.filter((p) => p.link === link && (index.get(p) as number) < maxSections)
        .map((p) => ({ pass: p, index: index.get(p) as number, series: series.get(seriesKey(p.passId, p.link)) })),
      passCount: passes.filter((p) => p.link === link).length,
      maxSections,
      envelopes: envelopesFor(link),
      skyBackgroundIds,
      requiredDB: input.requiredMarginDB[link] ?? null,
      horizonMasks: input.horizonMasks,
      maskTrade: (input.maskTrade ?? []).filter((t) => t.link === link),
      maskFindings: (input.maskFindings ?? []).filter((t) => t.link === link),
      rateTrade: (input.rateTrade ?? []).filter((t) => t.link === link),
      anchor: `link-${i}`,
    })),
    passTable(passes, (p) => index.get(p) as number, (i) => i < maxSections),
    `<footer class="small"><p>Made by passbudget from run inputs ${h(s.inputsSha256.slice(0, 12))}…; files of this run: ${s.files.map(h).join(', ') || '–'}.</p></footer>`,
  ].join('\n');
  return pageShell(title, body);
}
