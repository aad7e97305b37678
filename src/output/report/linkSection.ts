/** Everything about one link: daily volume, passes and usable minutes per day, margin against elevation, trade curves, its passes. */
import type { DailyRow, MaskFinding, MaskTradePoint, PassLinkSummary, RateTradePoint } from '../../analysis/types.js';
import { barChart, barGroups } from './barChart.js';
import { envelopeChart, envelopesForLink, impliedMaskDeg, type EnvelopeSeries } from './envelope.js';
import { escapeHtml as h } from './escape.js';
import { caseVolumeBits, formatBits, formatFixed } from './format.js';
import { NETWORK } from './glance.js';
import { legend } from './legend.js';
import { REQUIRED_LINE, seriesStyle, stationStyles } from './palette.js';
import { passDetail } from './passDetail.js';
import { tradeChart } from './tradeChart.js';
import type { PassSeries } from './types.js';

export interface LinkContext {
  link: string;
  stations: string[];
  weatherCases: string[];
  daily: DailyRow[];
  /** The passes of this link drawn in detail (the report's cap), in time order. */
  passes: { pass: PassLinkSummary; index: number; series: PassSeries | undefined }[];
  /** All passes of this link (drawn or not). */
  passCount: number;
  /** The report's cap on detailed sections (all links together). */
  maxSections: number;
  /** Envelopes over every pass (per weather case), or null: pool the drawn passes' series. */
  envelopes: EnvelopeSeries[] | null;
  /** Per station: id of its sky-plot background symbol. */
  skyBackgroundIds: Map<string, string>;
  requiredDB: number | null;
  horizonMasks: Record<string, [number, number][]>;
  maskTrade: MaskTradePoint[];
  maskFindings: MaskFinding[];
  rateTrade: RateTradePoint[];
  anchor: string;
}

function dailyTable(c: LinkContext, keys: string[]): string {
  const days = [...new Set(c.daily.map((r) => r.dayUtc))].sort();
  const head = `<tr><th>UTC day</th><th>station</th><th class="num">passes</th>${c.weatherCases.map((w) => `<th class="num">${h(w)}: usable passes</th><th class="num">${h(w)}: usable min</th><th class="num">${h(w)}: volume</th>`).join('')}</tr>`;
  const rows = days.flatMap((day) => keys.map((st) => {
    const byCase = c.weatherCases.map((w) => c.daily.find((r) => r.dayUtc === day && r.station === st && r.weather === w));
    const any = byCase.find(Boolean);
    if (!any) return '';
    const cells = byCase.map((r) => (r
      ? `<td class="num">${r.usablePasses}</td><td class="num">${formatFixed(r.usableMinutes, 1)}</td><td class="num">${h(formatBits(caseVolumeBits(r)))}</td>`
      : '<td class="num">–</td><td class="num">–</td><td class="num">–</td>')).join('');
    const cls = st === NETWORK ? ' style="font-weight:600"' : '';
    return `<tr${cls}><td>${h(day)}</td><td>${h(st)}</td><td class="num">${any.passes}</td>${cells}</tr>`;
  })).join('');
  return `<table class="daily"><thead>${head}</thead><tbody>${rows}</tbody></table>`;
}

export function linkSection(c: LinkContext): string {
  const keys = [...c.stations.filter((s) => c.daily.some((r) => r.station === s)), ...(c.daily.some((r) => r.station === NETWORK) ? [NETWORK] : [])];
  const styles = stationStyles(keys);
  const keyStyles = keys.map((k) => styles.get(k)!);
  const bars = c.weatherCases.map((w) => {
    const groups = barGroups(c.daily.filter((r) => r.weather === w), keys);
    return `<figure>${barChart(`Data volume per day, ${c.link}, ${w}`, groups, keys)}<figcaption>Volume per UTC day, weather case <strong>${h(w)}</strong>.</figcaption></figure>`;
  }).join('');
  let out = `<section class="link" id="${c.anchor}"><h2>Link ${h(c.link)}</h2>
<h3>Data volume per day</h3><div class="charts">${bars}</div>${legend(keyStyles, 'box')}
<h3>Passes and usable minutes per day</h3>${dailyTable(c, keys)}`;

  const pooled = c.passes.map((p) => p.series).filter((s): s is PassSeries => s !== undefined);
  const envs = c.envelopes ?? envelopesForLink(pooled, c.weatherCases);
  const over = c.envelopes ? `every step of every pass (${c.passCount})` : `the passes with a time series in this output (${pooled.length} of ${c.passCount})`;
  if (envs.some((e) => e.bins.length > 0)) {
    const readings = envs.map((e) => {
      const m = c.requiredDB === null ? null : impliedMaskDeg(e.bins, c.requiredDB);
      return `<li><strong>${h(e.weather)}</strong>: ${c.requiredDB === null ? 'no required margin given' : m === null ? 'the lowest margin misses the requirement even at the highest elevations seen' : `every step above about ${formatFixed(m, 0)}° met the required margin`}</li>`;
    }).join('');
    const findings = c.maskFindings.map((f) => `<li>${h(f.station)}, ${h(f.weather)}, fraction ${formatFixed(f.fraction, 2)}: ${f.maskDeg === null ? 'no mask up to 90° meets it' : `mask ${formatFixed(f.maskDeg, 1)}°`}${(f.mountLimitedExcludedS ?? 0) > 0 ? ` (leaves out ${formatFixed(f.mountLimitedExcludedS!, 0)} s near zenith where the mount lagged: no mask removes those)` : ''}</li>`).join('');
    out += `<h3>Margin against elevation, all passes</h3><div class="charts"><figure>${envelopeChart(`Margin against elevation, ${c.link}`, envs, c.requiredDB)}<figcaption>Band: lowest to highest margin seen in each 2° elevation bin over ${h(over)}; line: the lowest. Where the line stays above the red required-margin line is the mask the margin implies.</figcaption></figure>
<div><p class="small">Reading of the envelope (2° bins):</p><ul>${readings}</ul>${findings ? `<p class="small">Mask finder of the analysis:</p><ul>${findings}</ul>` : ''}</div></div>
${legend(envs.map((e, i) => seriesStyle(i, `${e.weather} (lowest margin; band to highest)`)), 'line', [`<li><svg class="swatch" width="22" height="14" aria-hidden="true"><line x1="0" x2="22" y1="7" y2="7" stroke="${REQUIRED_LINE}" stroke-width="2" stroke-dasharray="4 2"/></svg>required margin</li>`])}`;
  }

  const trade = (kind: 'mask' | 'rate') => {
    const pts = kind === 'mask' ? c.maskTrade : c.rateTrade;
    if (pts.length === 0) return '';
    const charts = c.weatherCases.filter((w) => pts.some((p) => p.weather === w)).map((w) => {
      const sel = pts.filter((p) => p.weather === w).map((p) => ({ station: p.station, x: 'maskDeg' in p ? p.maskDeg : p.bitRateBps, dailyVolumeBits: p.dailyVolumeBits }));
      const t = kind === 'mask' ? `Daily volume against elevation mask, ${c.link}, ${w}` : `Daily volume against bit rate, ${c.link}, ${w}`;
      return `<figure>${tradeChart(t, sel, [...c.stations, NETWORK], kind)}<figcaption>${kind === 'mask' ? 'Volume per day against the elevation mask' : 'Volume per day against the fixed bit rate'}, weather case <strong>${h(w)}</strong>.</figcaption></figure>`;
    }).join('');
    const tk = [...c.stations, NETWORK].filter((s) => pts.some((p) => p.station === s));
    const ts = stationStyles(tk);
    return `<h3>${kind === 'mask' ? 'Mask trade' : 'Rate trade'}</h3><div class="charts">${charts}</div>${legend(tk.map((k) => ts.get(k)!), 'line')}`;
  };
  out += trade('mask') + trade('rate');

  const scope = `${c.anchor}-passes`;
  const capped = c.passes.length < c.passCount
    ? `<p class="small"><strong>Drawn in detail: ${c.passes.length} of the ${c.passCount} passes of this link</strong> (the report draws the first ${c.maxSections} pass sections of the run in time order, all links together, so its size stays bounded). Every pass is in the table of all passes below and in passes.csv / passes.json.</p>`
    : '';
  out += `<h3>Passes (${c.passCount})</h3>${capped}<div id="${scope}"><button type="button" data-toggle="open" data-scope="${scope}">open all</button><button type="button" data-toggle="close" data-scope="${scope}">close all</button>
${c.passes.map((p) => passDetail(p.pass, p.index, p.series, c.requiredDB, c.horizonMasks[p.pass.station], c.skyBackgroundIds.get(p.pass.station))).join('\n')}</div></section>`;
  return out;
}
