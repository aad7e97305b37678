/** One collapsible section per pass and link: key figures, margin and Eb/N0 against time, sky plot. */
import type { PassLinkSummary } from '../../analysis/types.js';
import { escapeHtml as h } from './escape.js';
import { caseVolumeBits, formatBits, formatFixed, formatUtc, formatUtcClock } from './format.js';
import { legend } from './legend.js';
import { seriesStyle, REQUIRED_LINE, USABLE_FILL } from './palette.js';
import { skyPlot } from './skyPlot.js';
import { timeChart } from './timeChart.js';
import type { PassSeries } from './types.js';

/** Stable, markup-safe element id for a pass and link. */
export function passAnchor(index: number): string {
  return `pass-${index}`;
}

/** `skyBackgroundId`: the station's sky-plot background symbol in this document (see skyBackgroundSymbol), if any. */
export function passDetail(
  p: PassLinkSummary, index: number, series: PassSeries | undefined, requiredDB: number | null, mask: [number, number][] | undefined,
  skyBackgroundId?: string,
): string {
  const first = p.cases[0];
  const clip = [p.clippedStart ? 'starts before the window' : '', p.clippedEnd ? 'ends after the window' : ''].filter(Boolean).join(', ');
  const caseRows = p.cases.map((c) => `<tr><th>${h(c.weather)}</th>`
    + `<td>${c.usableStartS === null || c.usableEndS === null ? '–' : `${formatUtcClock(c.usableStartS)}–${formatUtcClock(c.usableEndS)}`}</td>`
    + `<td class="num">${formatFixed(c.usableDurationS / 60, 1)}</td>`
    + `<td class="num">${formatFixed(c.minMarginDB, 1)}</td><td class="num">${formatFixed(c.meanMarginDB, 1)}</td><td class="num">${formatFixed(c.maxMarginDB, 1)}</td>`
    + `<td class="num">${h(formatBits(caseVolumeBits(c)))}</td>`
    + `<td class="verdict-${h(c.verdict)}">${h(c.verdict)}</td><td class="small">${h(c.verdictRule)}</td></tr>`).join('');
  const figures = `<table class="kv"><tbody>
<tr><th>AOS</th><td>${h(formatUtc(p.aosS))} UTC</td><th>peak elevation</th><td>${formatFixed(p.maxElevationDeg, 1)}°</td></tr>
<tr><th>TCA</th><td>${h(formatUtc(p.tcaS))} UTC</td><th>above mask</th><td>${formatFixed(p.durationS / 60, 1)} min${clip ? ` (${h(clip)})` : ''}</td></tr>
<tr><th>LOS</th><td>${h(formatUtc(p.losS))} UTC</td><th>direction, steps</th><td>${h(p.direction)}, ${p.steps}</td></tr>
</tbody></table>
<table><thead><tr><th>weather</th><th>usable window (UTC)</th><th class="num">usable (min)</th><th class="num">lowest margin (dB)</th><th class="num">mean margin (dB)</th><th class="num">highest margin (dB)</th><th class="num">volume</th><th>verdict</th><th>rule</th></tr></thead><tbody>${caseRows}</tbody></table>`;
  let charts = '<p class="small">No time series for this pass in this output.</p>';
  if (series) {
    const styles = series.cases.map((c, i) => seriesStyle(i, c.weather));
    const extra = [
      `<li><svg class="swatch" width="22" height="14" aria-hidden="true"><line x1="0" x2="22" y1="7" y2="7" stroke="${REQUIRED_LINE}" stroke-width="2" stroke-dasharray="4 2"/></svg>required margin</li>`,
      `<li><svg class="swatch" width="22" height="14" aria-hidden="true"><rect x="1" y="2" width="20" height="10" fill="${USABLE_FILL}" fill-opacity="0.25"/></svg>usable (any case; bars above the plot per case)</li>`,
    ];
    const uid = `p${index}`;
    charts = `<div class="charts">
<figure>${timeChart(series, p, 'margin', requiredDB, uid)}<figcaption>Margin against time, one line per weather case.</figcaption></figure>
<figure>${timeChart(series, p, 'ebn0', null, uid)}<figcaption>Eb/N0 against time.</figcaption></figure>
<figure>${skyPlot(`Sky track of ${p.passId} seen from ${p.station}`, { azimuthDeg: series.azimuthDeg, elevationDeg: series.elevationDeg }, mask, undefined, skyBackgroundId)}<figcaption>Sky track: north up, east right, zenith at the centre; shaded: below the horizon mask.</figcaption></figure>
</div>${legend(styles, 'line', extra)}`;
  }
  const summaryLine = `<strong>${h(p.passId)}</strong> · ${h(p.link)} · ${h(formatUtc(p.aosS))} UTC · peak ${formatFixed(p.maxElevationDeg, 1)}°`
    + (first ? ` · ${h(first.weather)}: <span class="verdict-${h(first.verdict)}">${h(first.verdict)}</span>, ${formatFixed(first.usableDurationS / 60, 1)} min, ${h(formatBits(caseVolumeBits(first)))}` : '');
  // data-pass/data-link and the empty span: where the what-if panel writes this pass's changed verdict and volume.
  return `<details class="pass" id="${passAnchor(index)}" data-pass="${h(p.passId)}" data-link="${h(p.link)}"><summary>${summaryLine}<span class="whatif-pass"></span></summary>${figures}${charts}</details>`;
}
