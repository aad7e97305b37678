/** The "at a glance" block: per link and weather case, what the network delivers per day and how close to the edge it runs. */
import { max, min } from 'd3-array';
import type { DailyRow, PassLinkSummary, RunSummary } from '../../analysis/types.js';
import { escapeHtml as h } from './escape.js';
import { formatBits, formatFixed } from './format.js';

export const NETWORK = '(network)';

export interface GlanceRow {
  link: string;
  weather: string;
  networkVolumePerDayBits: number;
  usablePassesPerDay: number;
  usableMinutesPerDay: number;
  worstMarginDB: number | null;
  bestMarginDB: number | null;
  verdicts: { usable: number; marginal: number; unusable: number };
}

/** One row per (link, weather): network totals from the run summary (daily rows as fallback), margins from the passes. */
export function glanceRows(s: RunSummary, passes: PassLinkSummary[], daily: DailyRow[]): GlanceRow[] {
  const days = s.window.days > 0 ? s.window.days : 1;
  const rows: GlanceRow[] = [];
  for (const link of s.links) {
    for (const weather of s.weatherCases) {
      const t = s.totals.find((x) => x.link === link && x.weather === weather && x.station === NETWORK);
      const d = daily.filter((x) => x.link === link && x.weather === weather && x.station === NETWORK);
      const cases = passes.filter((p) => p.link === link).flatMap((p) => p.cases.filter((c) => c.weather === weather));
      const sum = (f: (r: DailyRow) => number) => d.reduce((a, r) => a + f(r), 0);
      rows.push({
        link, weather,
        networkVolumePerDayBits: t ? t.dailyVolumeBits.mean : sum((r) => r.adaptiveVolumeBits ?? r.fixedVolumeBits) / days,
        usablePassesPerDay: (t ? t.usablePasses : sum((r) => r.usablePasses)) / days,
        usableMinutesPerDay: (t ? t.usableMinutes : sum((r) => r.usableMinutes)) / days,
        worstMarginDB: min(cases, (c) => c.minMarginDB) ?? null,
        bestMarginDB: max(cases, (c) => c.maxMarginDB) ?? null,
        verdicts: {
          usable: cases.filter((c) => c.verdict === 'usable').length,
          marginal: cases.filter((c) => c.verdict === 'marginal').length,
          unusable: cases.filter((c) => c.verdict === 'unusable').length,
        },
      });
    }
  }
  return rows;
}

export function glance(rows: GlanceRow[], links: string[], required: Record<string, number>): string {
  const body = links.map((link) => {
    const req = required[link];
    const mine = rows.filter((r) => r.link === link);
    return mine.map((r, k) => {
      const worstCls = r.worstMarginDB !== null && req !== undefined && r.worstMarginDB < req ? ' bad' : '';
      const linkCell = k === 0
        ? `<th rowspan="${mine.length}" scope="rowgroup" class="glance-link">${h(link)}<br><span class="small">required margin ${req === undefined ? 'not given' : `${formatFixed(req, 1)} dB`}</span></th>`
        : '';
      // data-glance-* and data-g: the what-if panel redraws these cells in place while a control is moved.
      return `<tr${k === 0 ? ' class="group-start"' : ''} data-glance-link="${h(link)}" data-glance-weather="${h(r.weather)}">${linkCell}<td>${h(r.weather)}</td><td class="num" data-g="volume"><strong>${h(formatBits(r.networkVolumePerDayBits))}</strong></td>`
        + `<td class="num" data-g="passes">${formatFixed(r.usablePassesPerDay, 1)}</td><td class="num" data-g="minutes">${formatFixed(r.usableMinutesPerDay, 1)}</td>`
        + `<td class="num${worstCls}" data-g="worst">${formatFixed(r.worstMarginDB, 1)}</td><td class="num">${formatFixed(r.bestMarginDB, 1)}</td>`
        + `<td class="num">${r.verdicts.usable} / ${r.verdicts.marginal} / ${r.verdicts.unusable}</td></tr>`;
    }).join('');
  }).join('');
  return `<section id="glance"><h2>At a glance</h2>
<table class="glance"><thead><tr><th>link</th><th>weather</th><th class="num">network volume per day</th><th class="num">usable passes per day</th><th class="num">usable minutes per day</th><th class="num">worst margin (dB)</th><th class="num">best margin (dB)</th><th class="num">passes usable / marginal / unusable</th></tr></thead>
<tbody>${body}</tbody></table>
<p class="small">Network figures count every station (see network counting above); margins are over every step of every pass of the link. A worst margin below the link's required margin is shown in red. While a what-if control is moved (below), a link's volume, usable passes, usable minutes and worst margin here show the what-if figures, shaded; best margin and verdict counts stay the run's.</p></section>`;
}

/**
 * Weather as a probability, per station link: the fixed cases' mean volume per day at that station beside the
 * expected volume over an average year's weather, the availability and the passes per day expected to close throughout.
 */
export function weatherGlance(s: RunSummary): string {
  const w = s.weatherProbability ?? [];
  if (w.length === 0) return '';
  const body = w.map((t) => {
    const fixed = s.weatherCases.map((c) => {
      const f = s.totals.find((x) => x.link === t.link && x.station === t.station && x.weather === c);
      return `<td class="num">${h(formatBits(f ? f.dailyVolumeBits.mean : null))}</td>`;
    }).join('');
    return `<tr><td>${h(t.link)}</td><td>${h(t.station)}</td>${fixed}<td class="num"><strong>${h(formatBits(t.expectedVolumeBitsPerDay))}</strong></td>`
      + `<td class="num">${formatFixed(100 * t.availabilityFraction, 2)}</td><td class="num">${formatFixed(t.expectedPassesClosingThroughoutPerDay, 2)}</td></tr>`;
  }).join('');
  const heads = s.weatherCases.map((c) => `<th class="num">per day, ${h(c)}</th>`).join('');
  return `<section id="weather-probability"><h2>Weather as a probability</h2>
<table class="glance"><thead><tr><th>link</th><th>station</th>${heads}<th class="num">per day, expected over the year's weather</th><th class="num">availability (% of in-view time)</th><th class="num">passes per day closing throughout</th></tr></thead>
<tbody>${body}</tbody></table>
<p class="small">Each step closes with probability 1 − p*/100, p* the percentage of an average year that the ITU-R P.618-13 total attenuation exceeds what its margin absorbs (0.001–5 %; clamped outside, see steps.csv closing_probability_clamped). A pass is taken to see one weather state throughout. Averages over the year's statistics, not a forecast.</p></section>`;
}
