/**
 * Trade curves: daily volume against elevation mask (linear x) or against
 * bit rate (logarithmic x), one line per station or network, direct-labelled.
 */
import { extent, group, max } from 'd3-array';
import { scaleLinear, scaleLog } from 'd3-scale';
import { line } from 'd3-shape';
import { axisBottom, axisLeft } from './axis.js';
import { stationStyles } from './palette.js';
import { plotArea, spreadLabels, svgRoot, tag, text, type Frame } from './svg.js';
import { roundPath } from './timeChart.js';

export const TRADE_FRAME: Frame = { width: 370, height: 250, margin: { top: 14, right: 86, bottom: 44, left: 62 } };

export interface TradePoint { station: string; x: number; dailyVolumeBits: number }

export function tradeChart(title: string, points: TradePoint[], stationOrder: string[], xKind: 'mask' | 'rate', frame: Frame = TRADE_FRAME): string {
  const area = plotArea(frame);
  const [x0, x1] = extent(points, (p) => p.x) as [number, number];
  const x = xKind === 'rate'
    ? scaleLog().domain([x0 ?? 1, x1 > x0 ? x1 : (x0 ?? 1) * 10]).range([area.x0, area.x1])
    : scaleLinear().domain([x0 ?? 0, x1 > x0 ? x1 : (x0 ?? 0) + 1]).range([area.x0, area.x1]);
  const y = scaleLinear().domain([0, (max(points, (p) => p.dailyVolumeBits) ?? 0) || 1]).range([area.y1, area.y0]).nice();
  let body = axisLeft(y, area, { label: 'volume per day (bit)', specifier: '~s', grid: true });
  body += axisBottom(x, area, xKind === 'rate'
    ? { label: 'bit rate (bit/s)', specifier: '~s', ticks: 5, grid: true }
    : { label: 'elevation mask (deg)', grid: true });
  const byStation = group(points, (p) => p.station);
  const keys = stationOrder.filter((s) => byStation.has(s)).concat([...byStation.keys()].filter((s) => !stationOrder.includes(s)));
  const labels: { y: number; name: string; fill: string }[] = [];
  const styles = stationStyles(keys);
  keys.forEach((k) => {
    const st = styles.get(k)!;
    const pts = [...(byStation.get(k) ?? [])].sort((a, b) => a.x - b.x);
    const d = line<TradePoint>().x((p) => x(p.x)).y((p) => y(p.dailyVolumeBits))(pts);
    body += tag('path', { d: roundPath(d ?? ''), fill: 'none', stroke: st.colour, 'stroke-width': 2, 'stroke-dasharray': st.dash, class: 'series' });
    for (const p of pts) body += tag('circle', { cx: x(p.x), cy: y(p.dailyVolumeBits), r: 2.2, fill: st.colour });
    const last = pts[pts.length - 1];
    if (last) labels.push({ y: y(last.dailyVolumeBits), name: k, fill: st.textColour });
  });
  const ly = spreadLabels(labels.map((l) => l.y), 11, area.y0 + 4, area.y1);
  // Long names are shortened in the direct label only; the legend below the chart carries them in full.
  const short = (s: string) => ([...s].length > 13 ? `${[...s].slice(0, 12).join('')}…` : s);
  labels.forEach((l, i) => { body += text({ x: area.x1 + 4, y: ly[i] + 4, class: 'direct-label', fill: l.fill }, short(l.name)); });
  return svgRoot(frame, title, body);
}
