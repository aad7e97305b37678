/**
 * Margin against elevation for every pass of one link: per weather case, the
 * lowest and highest margin seen in each elevation bin, drawn as a band with
 * the lower edge as a line. Where the lower edge stays above the required
 * margin is the mask the margin implies.
 */
import { bin, max, min } from 'd3-array';
import { scaleLinear } from 'd3-scale';
import { area as d3area, line } from 'd3-shape';
import { axisBottom, axisLeft } from './axis.js';
import { REQUIRED_LINE, seriesStyle } from './palette.js';
import { plotArea, spreadLabels, svgRoot, tag, text, type Frame } from './svg.js';
import { roundPath } from './timeChart.js';
import type { PassSeries } from './types.js';

export const ENVELOPE_FRAME: Frame = { width: 560, height: 280, margin: { top: 16, right: 88, bottom: 44, left: 54 } };

export interface EnvelopeBin { elevationDeg: number; minDB: number; maxDB: number }

/** Lowest/highest margin per elevation bin (d3-array `bin`, thresholds every `binDeg` degrees over 0–90°). */
export function marginEnvelope(elevationDeg: number[], marginDB: number[], binDeg = 2): EnvelopeBin[] {
  const idx = elevationDeg.map((_, k) => k).filter((k) => Number.isFinite(elevationDeg[k]) && Number.isFinite(marginDB[k]));
  const thresholds = Array.from({ length: Math.floor(90 / binDeg) - 1 }, (_, i) => (i + 1) * binDeg);
  const bins = bin<number, number>().value((k) => elevationDeg[k]).domain([0, 90]).thresholds(thresholds)(idx);
  return bins.filter((b) => b.length > 0).map((b) => ({
    elevationDeg: ((b.x0 as number) + (b.x1 as number)) / 2,
    minDB: min(b, (k) => marginDB[k]) as number,
    maxDB: max(b, (k) => marginDB[k]) as number,
  }));
}

/**
 * Lowest bin-start elevation above which every bin's lowest margin meets `requiredDB`;
 * null when the top bin fails. A reading of the envelope, not the analysis stage's mask finder.
 */
export function impliedMaskDeg(env: EnvelopeBin[], requiredDB: number, binDeg = 2): number | null {
  let mask: number | null = null;
  for (let i = env.length - 1; i >= 0; i--) {
    if (env[i].minDB < requiredDB) break;
    mask = env[i].elevationDeg - binDeg / 2;
  }
  return mask;
}

export interface EnvelopeSeries { weather: string; bins: EnvelopeBin[] }

/** Pool every series of one link, per weather case. */
export function envelopesForLink(series: PassSeries[], weatherCases: string[], binDeg = 2): EnvelopeSeries[] {
  return weatherCases.map((w) => {
    const el: number[] = [];
    const m: number[] = [];
    for (const s of series) {
      const c = s.cases.find((k) => k.weather === w);
      if (!c) continue;
      const n = Math.min(s.elevationDeg.length, c.marginDB.length);
      for (let k = 0; k < n; k++) { el.push(s.elevationDeg[k]); m.push(c.marginDB[k]); }
    }
    return { weather: w, bins: marginEnvelope(el, m, binDeg) };
  });
}

export function envelopeChart(title: string, envs: EnvelopeSeries[], requiredDB: number | null, frame: Frame = ENVELOPE_FRAME): string {
  const area = plotArea(frame);
  const values = envs.flatMap((e) => e.bins.flatMap((b) => [b.minDB, b.maxDB]));
  if (requiredDB !== null) values.push(requiredDB);
  const x = scaleLinear().domain([0, 90]).range([area.x0, area.x1]);
  const y = scaleLinear().domain([min(values) ?? 0, max(values) ?? 1]).range([area.y1, area.y0]).nice();
  let body = axisLeft(y, area, { label: 'margin (dB)', grid: true });
  body += axisBottom(x, area, { label: 'elevation (deg)', ticks: 9, grid: true });
  const labels: { y: number; name: string; fill: string }[] = [];
  envs.forEach((e, i) => {
    const st = seriesStyle(i, e.weather);
    if (e.bins.length === 0) return;
    const band = d3area<EnvelopeBin>().x((b) => x(b.elevationDeg)).y0((b) => y(b.minDB)).y1((b) => y(b.maxDB))(e.bins);
    const low = line<EnvelopeBin>().x((b) => x(b.elevationDeg)).y((b) => y(b.minDB))(e.bins);
    body += tag('path', { d: roundPath(band ?? ''), fill: st.colour, 'fill-opacity': 0.14, stroke: 'none' });
    body += tag('path', { d: roundPath(low ?? ''), fill: 'none', stroke: st.colour, 'stroke-width': 2, 'stroke-dasharray': st.dash, class: 'series' });
    const last = e.bins[e.bins.length - 1];
    labels.push({ y: y(last.minDB), name: `${e.weather} lowest`, fill: st.textColour });
  });
  const ly = spreadLabels(labels.map((l) => l.y), 11, area.y0 + 4, area.y1);
  labels.forEach((l, i) => { body += text({ x: area.x1 + 4, y: ly[i] + 4, class: 'direct-label', fill: l.fill }, l.name); });
  if (requiredDB !== null) {
    body += tag('line', { class: 'required', x1: area.x0, x2: area.x1, y1: y(requiredDB), y2: y(requiredDB), stroke: REQUIRED_LINE, 'stroke-width': 1.5, 'stroke-dasharray': '4 2' });
    body += text({ x: area.x0 + 4, y: y(requiredDB) - 4, class: 'direct-label', fill: REQUIRED_LINE }, `required ${requiredDB} dB`);
  }
  return svgRoot(frame, title, body);
}
