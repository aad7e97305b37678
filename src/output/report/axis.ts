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

/** Bottom axis of a continuous scale, at the bottom of `area`. */
export function axisBottom(scale: Continuous, area: PlotArea, o: AxisOptions): string {
  const n = o.ticks ?? 6;
  const fmt = scale.tickFormat(n, o.specifier);
  let s = tag('line', { x1: area.x0, x2: area.x1, y1: area.y1, y2: area.y1, stroke: INK });
  for (const t of scale.ticks(n)) {
    const x = scale(t);
    if (o.grid) s += tag('line', { x1: x, x2: x, y1: area.y0, y2: area.y1, stroke: GRID });
    s += tag('line', { x1: x, x2: x, y1: area.y1, y2: area.y1 + 5, stroke: INK });
    s += text({ x, y: area.y1 + 17, 'text-anchor': 'middle', class: 'tick' }, fmt(t));
  }
  s += text({ x: (area.x0 + area.x1) / 2, y: area.y1 + 34, 'text-anchor': 'middle', class: 'axis-label' }, o.label);
  return tag('g', { class: 'axis axis-x' }, s);
}

/** Left axis of a continuous scale, at the left of `area`. */
export function axisLeft(scale: Continuous, area: PlotArea, o: AxisOptions): string {
  const n = o.ticks ?? 5;
  const fmt = scale.tickFormat(n, o.specifier);
  let s = tag('line', { x1: area.x0, x2: area.x0, y1: area.y0, y2: area.y1, stroke: INK });
  for (const t of scale.ticks(n)) {
    const y = scale(t);
    if (o.grid) s += tag('line', { x1: area.x0, x2: area.x1, y1: y, y2: y, stroke: GRID });
    s += tag('line', { x1: area.x0 - 5, x2: area.x0, y1: y, y2: y, stroke: INK });
    s += text({ x: area.x0 - 8, y: y + 4, 'text-anchor': 'end', class: 'tick' }, fmt(t));
  }
  const cy = (area.y0 + area.y1) / 2;
  s += text({ x: 14, y: cy, 'text-anchor': 'middle', class: 'axis-label', transform: `rotate(-90 14 ${px(cy)})` }, o.label);
  return tag('g', { class: 'axis axis-y' }, s);
}

/** Bottom axis of a band scale: one label per category. */
export function axisBottomBand(scale: ScaleBand<string>, area: PlotArea, label: string): string {
  let s = tag('line', { x1: area.x0, x2: area.x1, y1: area.y1, y2: area.y1, stroke: INK });
  for (const d of scale.domain()) {
    const x = (scale(d) ?? 0) + scale.bandwidth() / 2;
    s += text({ x, y: area.y1 + 17, 'text-anchor': 'middle', class: 'tick' }, d);
  }
  s += text({ x: (area.x0 + area.x1) / 2, y: area.y1 + 34, 'text-anchor': 'middle', class: 'axis-label', fill: MUTED }, label);
  return tag('g', { class: 'axis axis-x' }, s);
}
