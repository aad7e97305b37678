/**
 * Grouped bar chart: data volume per UTC day (outer band), one bar per
 * station and the network (inner band), for one link and weather case.
 */
import { max } from 'd3-array';
import { scaleBand, scaleLinear } from 'd3-scale';
import type { DailyRow } from '../../analysis/types.js';
import { axisBottomBand, axisLeft } from './axis.js';
import { caseVolumeBits } from './format.js';
import { stationStyles } from './palette.js';
import { plotArea, svgRoot, tag, type Frame } from './svg.js';

export const BAR_FRAME: Frame = { width: 370, height: 230, margin: { top: 14, right: 12, bottom: 44, left: 62 } };

export interface BarGroup { day: string; values: { key: string; bits: number }[] }

/** Rows of one link and case grouped by day, keys in the given order (stations, then '(network)'). */
export function barGroups(rows: DailyRow[], keys: string[]): BarGroup[] {
  const days = [...new Set(rows.map((r) => r.dayUtc))].sort();
  return days.map((day) => ({
    day,
    values: keys.map((key) => {
      const r = rows.find((x) => x.dayUtc === day && x.station === key);
      return { key, bits: r ? caseVolumeBits(r) : 0 };
    }),
  }));
}

export function barScales(groups: BarGroup[], keys: string[], frame: Frame = BAR_FRAME) {
  const area = plotArea(frame);
  const x = scaleBand<string>().domain(groups.map((g) => g.day)).range([area.x0, area.x1]).paddingInner(0.2).paddingOuter(0.1);
  const inner = scaleBand<string>().domain(keys).range([0, x.bandwidth()]).padding(0.08);
  const top = max(groups.flatMap((g) => g.values.map((v) => v.bits))) ?? 0;
  const y = scaleLinear().domain([0, top > 0 ? top : 1]).range([area.y1, area.y0]).nice();
  return { x, inner, y, area };
}

export function barChart(title: string, groups: BarGroup[], keys: string[], frame: Frame = BAR_FRAME): string {
  const { x, inner, y, area } = barScales(groups, keys, frame);
  let body = axisLeft(y, area, { label: 'volume per day (bit)', specifier: '~s', grid: true });
  const styles = stationStyles(keys);
  for (const g of groups) {
    g.values.forEach((v) => {
      const st = styles.get(v.key) ?? stationStyles([v.key]).get(v.key)!;
      const x0 = (x(g.day) ?? 0) + (inner(v.key) ?? 0);
      body += tag('rect', { x: x0, y: y(v.bits), width: inner.bandwidth(), height: Math.max(y(0) - y(v.bits), 0), fill: st.colour, class: 'bar' },
        `<title>${escapeTitle(`${g.day} ${v.key}: ${v.bits} bit`)}</title>`);
    });
  }
  // Days of one year are labelled MM-DD with the year in the axis label, so more of them fit.
  const years = [...new Set(groups.map((g) => g.day.slice(0, 4)))];
  body += years.length === 1
    ? axisBottomBand(x, area, `UTC day, ${years[0]}`, (d) => d.slice(5))
    : axisBottomBand(x, area, 'UTC day');
  return svgRoot(frame, title, body);
}

function escapeTitle(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}
