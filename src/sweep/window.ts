/**
 * A window of the sweep as the steps writers see it: the grid times
 * [k0, k1) and, for each pass and link in view during them, its columns.
 * Rows go in steps.csv order: grid time by grid time, and within a time the
 * parts in order (passes by AOS then station name, links in the station's order).
 */
import type { StationColumns } from '../geometry/columns.js';
import type { LinkColumns } from '../budget/linkColumns.js';
import type { LinkSpec } from '../budget/types.js';

/** Grid times per window: large enough to amortise the per-window work, small enough that the columns stay in cache. */
export const WINDOW_STEPS = 256;

export interface StepPart {
  passId: string;
  satellite: string;
  station: string;
  link: LinkSpec;
  /** Adaptive mode names by index (the `mode` column holds indices). */
  modeNames: readonly string[];
  /** Grid index of entry 0, and the number of entries. */
  k0: number;
  n: number;
  stn: StationColumns;
  cols: LinkColumns;
}

export interface StepWindow {
  /** The grid: time of grid index k is startS + k·stepS. */
  startS: number;
  stepS: number;
  k0: number;
  k1: number;
  parts: StepPart[];
}

/** Visit the rows of a window in steps.csv order: `fn(part, entry index, time)`; a returned promise is awaited. */
export async function forEachRow(w: StepWindow, fn: (p: StepPart, i: number, timeS: number) => void | Promise<void>): Promise<void> {
  const parts = w.parts;
  for (let k = w.k0; k < w.k1; k++) {
    const t = w.startS + k * w.stepS;
    for (let j = 0; j < parts.length; j++) {
      const p = parts[j];
      const i = k - p.k0;
      if (i < 0 || i >= p.n) continue;
      const wait = fn(p, i, t);
      if (wait) await wait;
    }
  }
}
