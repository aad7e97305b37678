/** The sortable table of every pass, link and weather case. Numeric cells carry their raw value in data-v. */
import type { PassLinkSummary } from '../../analysis/types.js';
import { escapeHtml as h } from './escape.js';
import { caseVolumeBits, formatFixed, formatUtc } from './format.js';
import { passAnchor } from './passDetail.js';

interface Column { head: string; num: boolean }

export const PASS_TABLE_COLUMNS: Column[] = [
  { head: 'pass', num: false }, { head: 'station', num: false }, { head: 'link', num: false }, { head: 'weather', num: false },
  { head: 'AOS (UTC)', num: true }, { head: 'LOS (UTC)', num: true }, { head: 'peak elevation (deg)', num: true },
  { head: 'above mask (min)', num: true }, { head: 'usable (min)', num: true }, { head: 'lowest margin (dB)', num: true },
  { head: 'highest margin (dB)', num: true }, { head: 'volume (Mbit)', num: true }, { head: 'verdict', num: false },
];

const num = (v: number, shown: string) => `<td class="num" data-v="${Number.isFinite(v) ? v : ''}">${shown}</td>`;

/** `drawn(i)`: pass i has a detailed section to link to. */
export function passTable(passes: PassLinkSummary[], indexOf: (p: PassLinkSummary) => number, drawn: (index: number) => boolean = () => true): string {
  const head = PASS_TABLE_COLUMNS.map((c) => `<th${c.num ? ' class="num" data-type="num"' : ''} scope="col">${h(c.head)}</th>`).join('');
  const rows = passes.flatMap((p) => p.cases.map((c) => {
    const vol = caseVolumeBits(c) / 1e6;
    const i = indexOf(p);
    const id = drawn(i) ? `<a href="#${passAnchor(i)}">${h(p.passId)}</a>` : h(p.passId);
    return `<tr><td>${id}</td><td>${h(p.station)}</td><td>${h(p.link)}</td><td>${h(c.weather)}</td>`
      + num(p.aosS, h(formatUtc(p.aosS))) + num(p.losS, h(formatUtc(p.losS)))
      + num(p.maxElevationDeg, formatFixed(p.maxElevationDeg, 1)) + num(p.durationS / 60, formatFixed(p.durationS / 60, 1))
      + num(c.usableDurationS / 60, formatFixed(c.usableDurationS / 60, 1)) + num(c.minMarginDB, formatFixed(c.minMarginDB, 1))
      + num(c.maxMarginDB, formatFixed(c.maxMarginDB, 1)) + num(vol, formatFixed(vol, 1))
      + `<td class="verdict-${h(c.verdict)}">${h(c.verdict)}</td></tr>`;
  })).join('\n');
  return `<section id="pass-table"><h2>All passes</h2><p class="small">Click a column heading to sort; click again to reverse. One row per pass, link and weather case.</p>
<div class="tablewrap"><table class="sortable" id="passes"><thead><tr>${head}</tr></thead><tbody>
${rows}
</tbody></table></div></section>`;
}
