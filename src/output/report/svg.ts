/**
 * Minimal SVG string building: every attribute value and text node passes
 * through `escapeHtml`, and coordinates are rounded to 0.1 px to keep the
 * file small.
 */
import { escapeHtml } from './escape.js';

export type Attrs = Record<string, string | number | undefined | null | false>;

/** Round a pixel coordinate to 0.1 px (enough on any screen, a third of the bytes). */
export function px(v: number): string {
  const r = Math.round(v * 10) / 10;
  return Object.is(r, -0) ? '0' : String(r);
}

function attrs(a: Attrs): string {
  let s = '';
  for (const [k, v] of Object.entries(a)) {
    if (v === undefined || v === null || v === false || v === '') continue;
    s += ` ${k}="${escapeHtml(typeof v === 'number' ? px(v) : v)}"`;
  }
  return s;
}

/** An element with children given as already-built markup. */
export function tag(name: string, a: Attrs, ...children: string[]): string {
  return children.length === 0 ? `<${name}${attrs(a)}/>` : `<${name}${attrs(a)}>${children.join('')}</${name}>`;
}

/** A `<text>` node; `content` is escaped. */
export function text(a: Attrs, content: string): string {
  return `<text${attrs(a)}>${escapeHtml(content)}</text>`;
}

/** Plot frame: outer size and the margins around the plot area. */
export interface Frame {
  width: number;
  height: number;
  margin: { top: number; right: number; bottom: number; left: number };
}

export interface PlotArea { x0: number; x1: number; y0: number; y1: number }

/** Pixel box of the plot area: x0..x1 left to right, y0 (top)..y1 (bottom). */
export function plotArea(f: Frame): PlotArea {
  return { x0: f.margin.left, x1: f.width - f.margin.right, y0: f.margin.top, y1: f.height - f.margin.bottom };
}

/** Root `<svg>` with a title for screen readers; `role="img"` so the title is its accessible name. */
export function svgRoot(f: Frame, title: string, body: string, cls = 'chart'): string {
  return tag('svg', {
    xmlns: 'http://www.w3.org/2000/svg', class: cls, viewBox: `0 0 ${f.width} ${f.height}`,
    width: f.width, height: f.height, role: 'img', 'aria-label': title,
  }, `<title>${escapeHtml(title)}</title>`, body);
}

/**
 * Move label y positions apart so neighbours are at least `gap` px apart,
 * keeping them inside [lo, hi] and as close to their wish as possible
 * (one forward and one backward sweep over the sorted wishes).
 */
export function spreadLabels(wish: number[], gap: number, lo: number, hi: number): number[] {
  const order = wish.map((_, i) => i).sort((a, b) => wish[a] - wish[b]);
  const y = order.map((i) => Math.min(Math.max(wish[i], lo), hi));
  for (let k = 1; k < y.length; k++) y[k] = Math.max(y[k], y[k - 1] + gap);
  if (y.length > 0 && y[y.length - 1] > hi) y[y.length - 1] = hi;
  for (let k = y.length - 2; k >= 0; k--) y[k] = Math.min(y[k], y[k + 1] - gap);
  const out = new Array<number>(wish.length);
  order.forEach((i, k) => { out[i] = y[k]; });
  return out;
}
