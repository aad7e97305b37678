/**
 * Axes drawn from the scales themselves: tick values from `scale.ticks()`,
 * labels from `scale.tickFormat()` (d3-scale, which formats with d3-format),
 * or from the band domain for categorical axes.
 */
import type { ScaleBand, ScaleContinuousNumeric } from 'd3-scale';
import { GRID, INK, MUTED } from './palette.js';
import { px, tag, text, type PlotArea } from './svg.js';

type Continuous = ScaleContinuousNumeric<number, number>;

export interface AxisOptions {
  ticks?: number;
  /** d3-format specifier passed to `scale.tickFormat(count, specifier)`. */
  specifier?: string;
  label: string;
  grid?: boolean;
}

/** Bottom axis of a continuous scale, at the bottom of `area`. Tick marks and grid lines are one path each. */
export function axisBottom(scale: Continuous, area: PlotArea, o: AxisOptions): string {
  const n = o.ticks ?? 6;
  const fmt = scale.tickFormat(n, o.specifier);
  const ticks = scale.ticks(n);
  let marks = `M${px(area.x0)} ${px(area.y1)}H${px(area.x1)}`;
  let grid = '';
  let labels = '';
  for (const t of ticks) {
    const x = px(scale(t));
    grid += `M${x} ${px(area.y0)}V${px(area.y1)}`;
    marks += `M${x} ${px(area.y1)}v5`;
    labels += text({ x: scale(t), y: area.y1 + 17, 'text-anchor': 'middle', class: 'tick' }, fmt(t));
  }
  const label = text({ x: (area.x0 + area.x1) / 2, y: area.y1 + 34, 'text-anchor': 'middle', class: 'axis-label' }, o.label);
  return tag('g', { class: 'axis axis-x' },
    o.grid ? tag('path', { d: grid, stroke: GRID, fill: 'none' }) : '', tag('path', { d: marks, stroke: INK, fill: 'none' }), labels, label);
}

/** Left axis of a continuous scale, at the left of `area`. */
export function axisLeft(scale: Continuous, area: PlotArea, o: AxisOptions): string {
  const n = o.ticks ?? 5;
  const fmt = scale.tickFormat(n, o.specifier);
  let marks = `M${px(area.x0)} ${px(area.y0)}V${px(area.y1)}`;
  let grid = '';
  let labels = '';
  for (const t of scale.ticks(n)) {
    const y = px(scale(t));
    grid += `M${px(area.x0)} ${y}H${px(area.x1)}`;
    marks += `M${px(area.x0 - 5)} ${y}h5`;
    labels += text({ x: area.x0 - 8, y: scale(t) + 4, 'text-anchor': 'end', class: 'tick' }, fmt(t));
  }
  const cy = (area.y0 + area.y1) / 2;
  const label = text({ x: 14, y: cy, 'text-anchor': 'middle', class: 'axis-label', transform: `rotate(-90 14 ${px(cy)})` }, o.label);
  return tag('g', { class: 'axis axis-y' },
    o.grid ? tag('path', { d: grid, stroke: GRID, fill: 'none' }) : '', tag('path', { d: marks, stroke: INK, fill: 'none' }), labels, label);
}

/** Font size of tick labels (px), as `svg .tick` in page.ts. */
export const TICK_FONT_PX = 10.5;
/** Space kept between neighbouring tick labels (px). */
export const TICK_GAP_PX = 6;

/**
 * Estimated width (px) of a tick label: digits, '-' and ':' in the page's
 * sans-serif faces average under 0.6 em, so this errs on the wide side.
 */
export function tickLabelWidthPx(text: string, fontPx = TICK_FONT_PX): number {
  return text.length * 0.6 * fontPx;
}

/** Every how many categories a label fits without touching the next (1 = all). */
export function bandLabelEvery(scale: ScaleBand<string>, format: (d: string) => string = (d) => d): number {
  const widest = Math.max(0, ...scale.domain().map((d) => tickLabelWidthPx(format(d))));
  return Math.max(1, Math.ceil((widest + TICK_GAP_PX) / Math.max(scale.step(), 1e-9)));
}

/**
 * Bottom axis of a band scale: a tick mark per category, and a label on
 * every category when they fit, else on every k-th from the first, so labels
 * never overlap however many categories there are.
 */
export function axisBottomBand(scale: ScaleBand<string>, area: PlotArea, label: string, format: (d: string) => string = (d) => d): string {
  const every = bandLabelEvery(scale, format);
  let s = tag('line', { x1: area.x0, x2: area.x1, y1: area.y1, y2: area.y1, stroke: INK });
  let marks = '';
  scale.domain().forEach((d, i) => {
    const x = (scale(d) ?? 0) + scale.bandwidth() / 2;
    marks += `M${px(x)} ${px(area.y1)}v${i % every === 0 ? 4 : 2}`;
    if (i % every === 0) s += text({ x, y: area.y1 + 17, 'text-anchor': 'middle', class: 'tick' }, format(d));
  });
  s += tag('path', { d: marks, stroke: INK, fill: 'none' });
  s += text({ x: (area.x0 + area.x1) / 2, y: area.y1 + 34, 'text-anchor': 'middle', class: 'axis-label', fill: MUTED }, label);
  return tag('g', { class: 'axis axis-x' }, s);
}
