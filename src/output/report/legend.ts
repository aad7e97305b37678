/** Legends in HTML (text the reader can select and search), with the series swatch drawn as a tiny inline SVG. */
import { escapeHtml } from './escape.js';
import type { SeriesStyle } from './palette.js';

export function swatch(st: SeriesStyle, kind: 'line' | 'box' = 'line'): string {
  const body = kind === 'box'
    ? `<rect x="1" y="2" width="20" height="10" fill="${st.colour}"/>`
    : `<line x1="0" x2="22" y1="7" y2="7" stroke="${st.colour}" stroke-width="3"${st.dash ? ` stroke-dasharray="${st.dash}"` : ''}/>`;
  return `<svg class="swatch" width="22" height="14" viewBox="0 0 22 14" aria-hidden="true">${body}</svg>`;
}

export function legend(items: SeriesStyle[], kind: 'line' | 'box' = 'line', extra: string[] = []): string {
  const li = items.map((st) => `<li>${swatch(st, kind)}${escapeHtml(st.name)}</li>`);
  return `<ul class="legend">${li.join('')}${extra.join('')}</ul>`;
}
