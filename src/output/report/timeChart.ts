/**
 * Margin (or Eb/N0) against time for one pass and link: one line per weather
 * case, the required-margin line, and each case's usable window drawn as a
 * labelled bar in a strip above the plot (the widest window also shaded).
 */
import { extent } from 'd3-array';
import { scaleLinear, type ScaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import type { PassLinkSummary } from '../../analysis/types.js';
import { axisBottom, axisLeft } from './axis.js';
import { REQUIRED_LINE, USABLE_FILL, seriesStyle } from './palette.js';
import { plotArea, px, spreadLabels, svgRoot, tag, text, type Frame, type PlotArea } from './svg.js';
import type { PassSeries } from './types.js';

export type TimeMetric = 'margin' | 'ebn0';

export const TIME_FRAME: Frame = { width: 420, height: 250, margin: { top: 22, right: 60, bottom: 44, left: 54 } };

export interface TimeScales { x: ScaleLinear<number, number>; y: ScaleLinear<number, number>; area: PlotArea }

/**
 * x: minutes from AOS over [0, (LOS − AOS)/60] → plot width; y: the metric's
 * range (with the reference line, if any, kept inside) → plot height, niced.
 */
export function timeScales(aosS: number, losS: number, values: number[], reference: number | null, frame: Frame = TIME_FRAME): TimeScales {
  const area = plotArea(frame);
  const finite = values.filter(Number.isFinite);
  if (reference !== null) finite.push(reference);
  const [lo, hi] = extent(finite) as [number | undefined, number | undefined];
  const y0 = lo ?? 0;
  const y1 = hi ?? 1;
  const pad = y1 > y0 ? 0 : 1;
  return {
    x: scaleLinear().domain([0, Math.max((losS - aosS) / 60, 1e-6)]).range([area.x0, area.x1]),
    y: scaleLinear().domain([y0 - pad, y1 + pad]).range([area.y1, area.y0]).nice(),
    area,
  };
}

/** `uid` makes the clip-path id unique within the document. */
export function timeChart(series: PassSeries, pass: PassLinkSummary, metric: TimeMetric, requiredMarginDB: number | null, uid: string, frame: Frame = TIME_FRAME): string {
  const pick = (c: PassSeries['cases'][number]) => (metric === 'margin' ? c.marginDB : c.ebN0DB);
  const reference = metric === 'margin' ? requiredMarginDB : null;
  const all = series.cases.flatMap(pick);
  const { x, y, area } = timeScales(pass.aosS, pass.losS, all, reference, frame);
  const tMin = (t: number) => (t - pass.aosS) / 60;
  let body = '';

  // Usable windows: a labelled bar per case above the plot, plus a light shade of their union.
  const windows = pass.cases.filter((c) => c.usableStartS !== null && c.usableEndS !== null);
  if (metric === 'margin' && windows.length > 0) {
    const a = Math.min(...windows.map((c) => c.usableStartS as number));
    const b = Math.max(...windows.map((c) => c.usableEndS as number));
    body += tag('rect', { class: 'usable-shade', x: x(tMin(a)), y: area.y0, width: Math.max(x(tMin(b)) - x(tMin(a)), 1), height: area.y1 - area.y0, fill: USABLE_FILL, 'fill-opacity': 0.08 });
  }
  body += axisLeft(y, area, { label: metric === 'margin' ? 'margin (dB)' : 'Eb/N0 (dB)', grid: true });
  body += axisBottom(x, area, { label: `time from AOS (min), AOS ${new Date(Math.round(pass.aosS) * 1000).toISOString().slice(11, 19)} UTC`, grid: false });

  if (reference !== null) {
    const yr = y(reference);
    body += tag('line', { class: 'required', x1: area.x0, x2: area.x1, y1: yr, y2: yr, stroke: REQUIRED_LINE, 'stroke-width': 1.5, 'stroke-dasharray': '4 2' });
    // Mid-pass is where the margin peaks, so the label there rarely sits on a curve.
    body += text({ x: (area.x0 + area.x1) / 2, y: yr - 4, 'text-anchor': 'middle', class: 'direct-label', fill: REQUIRED_LINE }, `required ${reference} dB`);
  }
  const t = series.timeS.map(tMin);
  const clip = `clip-${uid}-${metric}`;
  body += `<clipPath id="${clip}"><rect x="${px(area.x0)}" y="${px(area.y0)}" width="${px(area.x1 - area.x0)}" height="${px(area.y1 - area.y0)}"/></clipPath>`;
  const labels: { y: number; name: string; fill: string }[] = [];
  series.cases.forEach((c, i) => {
    const st = seriesStyle(i, c.weather);
    const v = pick(c);
    // d3's own rounding to 0.1 px (digits(1)) writes the same numbers roundPath would, without re-parsing the path.
    const d = line<number>().digits(1).defined((k) => Number.isFinite(v[k]) && Number.isFinite(t[k])).x((k) => x(t[k])).y((k) => y(v[k]))(t.map((_, k) => k));
    body += tag('path', { d: d ?? '', fill: 'none', stroke: st.colour, 'stroke-width': 2, 'stroke-dasharray': st.dash, 'clip-path': `url(#${clip})`, class: 'series' });
    // Direct label at the last finite point, clamped inside the frame.
    let last = v.length - 1;
    while (last >= 0 && !Number.isFinite(v[last])) last--;
    if (last >= 0) labels.push({ y: y(v[last]), name: c.weather, fill: st.textColour });
  });
  const ly = spreadLabels(labels.map((l) => l.y), 11, area.y0 + 4, area.y1);
  labels.forEach((l, i) => { body += text({ x: area.x1 + 4, y: ly[i] + 4, class: 'direct-label', fill: l.fill }, l.name); });
  if (metric === 'margin') {
    pass.cases.forEach((c, i) => {
      const k = series.cases.findIndex((sc) => sc.weather === c.weather);
      const st = seriesStyle(k >= 0 ? k : i, c.weather);
      const yy = 3 + i * 6;
      if (c.usableStartS === null || c.usableEndS === null) return;
      body += tag('rect', { class: 'usable-bar', x: x(tMin(c.usableStartS)), y: yy, width: Math.max(x(tMin(c.usableEndS)) - x(tMin(c.usableStartS)), 1), height: 4, fill: st.colour },
        `<title>usable ${c.weather}</title>`);
    });
    body += text({ x: area.x1 + 4, y: 3 + pass.cases.length * 3 + 3, class: 'direct-label' }, 'usable');
  }
  const title = `${metric === 'margin' ? 'Margin' : 'Eb/N0'} against time, ${pass.passId}, ${pass.link}`;
  return svgRoot(frame, title, body);
}

/** Round the numbers inside a d3 path string to 0.1 px. */
export function roundPath(d: string): string {
  return d.replace(/-?\d+\.?\d*(?:e-?\d+)?/g, (m) => px(Number(m)));
}
