/**
 * Our series palette, ordered by CIE L* (≈ 20, 40, 60, 79) so series stay
 * apart in lightness alone (grey print, any colour-vision deficiency); hues
 * alternate between the blue and the red/orange side, the axis deuteranopes
 * keep. Checked in test/output/report-palette.test.ts by simulating
 * deuteranopia. Every series is also named in text, so colour never carries
 * meaning alone; a dash pattern is the second cue.
 */
export const SERIES_COLOURS = ['#1d2b6e', '#a3307a', '#e0711a', '#8fcdeb'] as const;
export const SERIES_COLOUR_NAMES = ['navy', 'magenta', 'orange', 'sky blue'] as const;
/** Text colours for direct labels: the same hues, darkened where the line colour is too light for small text on white. */
export const SERIES_TEXT_COLOURS = ['#1d2b6e', '#a3307a', '#a84b0c', '#2a6f95'] as const;
export const SERIES_DASHES = ['', '6 3', '2 3', '10 3 2 3'] as const;

/** Required-margin line, usable-window shading, grid and ink. */
export const INK = '#1a1a1a';
export const MUTED = '#666666';
export const GRID = '#e3e3e3';
export const REQUIRED_LINE = '#b00020';
export const USABLE_FILL = '#2e7d5b';
export const GROUND_FILL = '#d9cbb3';

export interface SeriesStyle { colour: string; textColour: string; dash: string; name: string }

/**
 * Styles for stations and the network: the network, the headline figure, takes
 * the darkest colour; stations follow in palette order.
 */
export function stationStyles(keys: string[], network = '(network)'): Map<string, SeriesStyle> {
  const m = new Map<string, SeriesStyle>();
  let i = keys.includes(network) ? 1 : 0;
  for (const k of keys) m.set(k, k === network ? seriesStyle(0, k) : seriesStyle(i++, k));
  return m;
}

export function seriesStyle(index: number, name: string): SeriesStyle {
  const i = ((index % SERIES_COLOURS.length) + SERIES_COLOURS.length) % SERIES_COLOURS.length;
  // Past the palette length the dash pattern changes, so the pair (colour, dash) stays unique up to 16 series.
  const d = Math.floor(index / SERIES_COLOURS.length) % SERIES_DASHES.length;
  return { colour: SERIES_COLOURS[i], textColour: SERIES_TEXT_COLOURS[i], dash: SERIES_DASHES[(i + d) % SERIES_DASHES.length], name };
}
