/**
 * Polar sky plot of a pass: azimuth clockwise from north at the top,
 * elevation 90° at the centre and 0° at the rim (the usual azimuthal
 * equidistant sky view: radius linear in zenith angle). The horizon mask is
 * drawn as shaded ground between the rim and the mask line.
 */
import { scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import { GROUND_FILL, INK, GRID, MUTED, seriesStyle } from './palette.js';
import { px, svgRoot, tag, text, type Frame } from './svg.js';
import { roundPath } from './timeChart.js';

export const SKY_FRAME: Frame = { width: 250, height: 250, margin: { top: 24, right: 24, bottom: 24, left: 24 } };

export interface SkyProjection {
  cx: number;
  cy: number;
  radius: number;
  /** Elevation (deg) → distance from the centre (px): 90° → 0, 0° → radius. Clamped to [0°, 90°]. */
  r: (elevationDeg: number) => number;
  /** (azimuth, elevation) in degrees → [x, y] in px, y down. */
  xy: (azimuthDeg: number, elevationDeg: number) => [number, number];
  ticks: number[];
}

export function skyProjection(frame: Frame = SKY_FRAME): SkyProjection {
  const radius = Math.min(frame.width - frame.margin.left - frame.margin.right, frame.height - frame.margin.top - frame.margin.bottom) / 2;
  const cx = frame.margin.left + (frame.width - frame.margin.left - frame.margin.right) / 2;
  const cy = frame.margin.top + (frame.height - frame.margin.top - frame.margin.bottom) / 2;
  const r = scaleLinear().domain([90, 0]).range([0, radius]).clamp(true);
  return {
    cx, cy, radius, r: (e) => r(e),
    xy: (az, el) => {
      const a = (az * Math.PI) / 180;
      const d = r(el);
      // Clockwise from north at the top: east (90°) to the right, y grows downward.
      return [cx + d * Math.sin(a), cy - d * Math.cos(a)];
    },
    ticks: r.ticks(3),
  };
}

export interface SkyTrack { azimuthDeg: number[]; elevationDeg: number[]; label?: string }

/**
 * A sky plot. The background (horizon-mask ground, rings, spokes, compass
 * letters) is the same for every pass of a station: with `backgroundId` the
 * plot refers to a `<symbol>` made once by `skyBackgroundSymbol` (inline in
 * the same document) instead of drawing it again.
 */
export function skyPlot(title: string, track: SkyTrack, mask: [number, number][] | undefined, frame: Frame = SKY_FRAME, backgroundId?: string): string {
  const p = skyProjection(frame);
  let body = backgroundId === undefined
    ? skyBackground(mask, frame)
    : tag('use', { href: `#${backgroundId}`, x: 0, y: 0, width: frame.width, height: frame.height });
  body += skyTrack(p, track);
  return svgRoot(frame, title, body, 'chart sky');
}

/** The background once, as a `<symbol>` for `skyPlot(…, backgroundId)`; place it inside an `<svg>` (e.g. a hidden one). */
export function skyBackgroundSymbol(id: string, mask: [number, number][] | undefined, frame: Frame = SKY_FRAME): string {
  return tag('symbol', { id, viewBox: `0 0 ${frame.width} ${frame.height}`, width: frame.width, height: frame.height }, skyBackground(mask, frame));
}

function skyBackground(mask: [number, number][] | undefined, frame: Frame): string {
  const p = skyProjection(frame);
  let body = '';
  // Horizon mask as ground: the area between the rim (0°) and the mask line, evenodd-filled.
  if (mask && mask.length >= 2) {
    const pts = [...mask].sort((a, b) => a[0] - b[0]);
    const path = line<[number, number]>().x((d) => p.xy(d[0], d[1])[0]).y((d) => p.xy(d[0], d[1])[1]);
    const dense = densify(pts);
    const maskPath = roundPath(path(dense) ?? '');
    body += tag('path', {
      d: `${maskPath}Z M${px(p.cx)} ${px(p.cy - p.radius)} a${px(p.radius)} ${px(p.radius)} 0 1 0 0.01 0Z`,
      fill: GROUND_FILL, 'fill-rule': 'evenodd', stroke: 'none', class: 'mask-ground',
    });
    body += tag('path', { d: maskPath, fill: 'none', stroke: '#8a6d3b', 'stroke-width': 1.2, class: 'mask-line' });
  }
  for (const e of p.ticks) {
    if (e >= 90) continue;
    body += tag('circle', { cx: p.cx, cy: p.cy, r: p.r(e), fill: 'none', stroke: e === 0 ? INK : GRID });
    if (e > 0) {
      // Ring labels along the SSE bearing, away from the N/E/S/W letters.
      const [tx, ty] = p.xy(157.5, e);
      body += text({ x: tx + 2, y: ty - 2, class: 'tick' }, `${e}°`);
    }
  }
  for (let az = 0; az < 360; az += 30) {
    const [x, y] = p.xy(az, 0);
    body += tag('line', { x1: p.cx, y1: p.cy, x2: x, y2: y, stroke: GRID });
  }
  for (const [az, name] of [[0, 'N'], [90, 'E'], [180, 'S'], [270, 'W']] as const) {
    const [x, y] = p.xy(az, 0);
    const dx = Math.sin((az * Math.PI) / 180) * 11;
    const dy = -Math.cos((az * Math.PI) / 180) * 11;
    body += text({ x: x + dx, y: y + dy + 4, 'text-anchor': 'middle', class: 'compass' }, name);
  }
  body += text({ x: frame.width - 4, y: frame.height - 4, 'text-anchor': 'end', class: 'tick', fill: MUTED }, 'elevation (deg), azimuth (deg)');
  return body;
}

function skyTrack(p: SkyProjection, track: SkyTrack): string {
  let body = '';
  const n = Math.min(track.azimuthDeg.length, track.elevationDeg.length);
  if (n > 0) {
    const idx = Array.from({ length: n }, (_, k) => k).filter((k) => Number.isFinite(track.azimuthDeg[k]) && Number.isFinite(track.elevationDeg[k]));
    const st = seriesStyle(0, track.label ?? 'track');
    const d = line<number>().digits(1).x((k) => p.xy(track.azimuthDeg[k], track.elevationDeg[k])[0]).y((k) => p.xy(track.azimuthDeg[k], track.elevationDeg[k])[1])(idx);
    body += tag('path', { d: d ?? '', fill: 'none', stroke: st.colour, 'stroke-width': 2.2, class: 'track' });
    if (idx.length > 0) {
      const [ax, ay] = p.xy(track.azimuthDeg[idx[0]], track.elevationDeg[idx[0]]);
      const [lx, ly] = p.xy(track.azimuthDeg[idx[idx.length - 1]], track.elevationDeg[idx[idx.length - 1]]);
      body += tag('circle', { cx: ax, cy: ay, r: 3.5, fill: '#ffffff', stroke: st.colour, 'stroke-width': 2 });
      body += text({ x: ax + 5, y: ay - 5, class: 'direct-label' }, 'AOS');
      body += tag('circle', { cx: lx, cy: ly, r: 3.5, fill: st.colour });
      body += text({ x: lx + 5, y: ly - 5, class: 'direct-label' }, 'LOS');
    }
  }
  return body;
}

/** Insert points every ≤ 6° of azimuth (chord sag at the rim under 0.2 % of the radius) so straight chords become arcs on the polar plot; close the loop at 360°. */
function densify(pts: [number, number][]): [number, number][] {
  const out: [number, number][] = [];
  const closed = pts[pts.length - 1][0] >= 360 ? pts : [...pts, [pts[0][0] + 360, pts[0][1]] as [number, number]];
  for (let i = 0; i < closed.length - 1; i++) {
    const [a0, e0] = closed[i];
    const [a1, e1] = closed[i + 1];
    const steps = Math.max(1, Math.ceil((a1 - a0) / 6));
    for (let k = 0; k < steps; k++) out.push([a0 + ((a1 - a0) * k) / steps, e0 + ((e1 - e0) * k) / steps]);
  }
  out.push(closed[closed.length - 1]);
  return out;
}
