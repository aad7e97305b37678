/**
 * Weather as a probability (PHYSICS.md §13, issue 15 part 3).
 *
 * The budget's weather cases are a few fixed exceedance percentages. Here the
 * whole P.618 distribution is used instead: at a step's elevation the total
 * attenuation A_T(p) (ITU-R P.618-13 §2.5: gas, rain, cloud and scintillation
 * combined as the engine combines them, atmosphere.ts) and the receive noise
 * it brings (P.618 §3 sky noise) lower the margin by a degradation D(p)
 * relative to the engine's first weather case. A step whose first-case excess
 * margin is y (margin − required margin, or for an adaptive mode the effective
 * Es/N0 − the mode's threshold) closes in the weather states with D(p) ≤ y,
 * i.e. for all but the p* % of an average year with D(p*) = y: it closes with
 * probability 1 − p* / 100.
 *
 * Tabulated, never solved per step: for every node of the link's elevation
 * table (the same nodes and the same linear interpolation the budget uses),
 * D on a fixed p grid (16 points per decade over 0.001–5 %, plus the fixed
 * cases' own p and a node just below 1 %, where P.618's β term switches).
 * Per step the row is the elevation interpolation of two node rows, and p* is
 * found by a monotone search in it, hunting from the previous step's index
 * (consecutive steps are close), with linear interpolation of D in ln p.
 *
 * Conventions (documented choices):
 * - A step that does not close in clear sky (the engine's best weather: gas
 *   and clear-sky cloud only) closes with probability 0.
 * - Outside the model's 0.001–5 % the attenuation distribution is unknown:
 *   a step that closes even at 0.001 % is given p* = 0.001 % (probability
 *   0.99999, a lower bound); one that fails at 5 % but closes in clear sky is
 *   given p* = 5 % (probability 0.95, an upper bound). Both are flagged
 *   (`closing_probability_clamped`).
 * - P.618's A(p) is not strictly decreasing at |φ| < 36° and low elevation
 *   between 0.001 and 0.002 % (as published); each node row is made
 *   non-increasing in p by a running maximum from 5 % downwards, so the
 *   inversion is monotone (the interpolated rows are then monotone too).
 */
import { atmosphereCurve, TERM, TERM_COUNT, type AtmosphereContext, type ElevationTable } from './atmosphere.js';
import type { WeatherCase } from './types.js';

/** The model's range of exceedance percentages (ITU-R P.618-13 §2.2.1.1). */
export const WEATHER_P_MIN_PERCENT = 0.001;
export const WEATHER_P_MAX_PERCENT = 5;
/** Grid points per decade of p. */
export const WEATHER_POINTS_PER_DECADE = 16;

/** D (dB) relative to the first weather case, per elevation node, on the p grid. */
export interface WeatherTable {
  /** The p grid (%), ascending, 0.001 … 5. */
  pPercent: Float64Array;
  /** ln of pPercent. */
  lnP: Float64Array;
  /** Numbers per node: 1 (clear sky) + grid points. */
  width: number;
  /** Node-major: [D_clear, D(p_0), …, D(p_{G−1})] per elevation node of the link's table (dB). */
  values: Float64Array;
  /** Terms per node of the elevation table (maps its row offsets to node indices). */
  tableTermsPerNode: number;
}

/** The p grid: 16 per decade over 0.001–5 %, the fixed cases' p, and 1 % less 1e-9 (β switches at 1 %). */
export function weatherGrid(cases: readonly WeatherCase[]): Float64Array {
  const ps: number[] = [];
  const top = Math.log10(WEATHER_P_MAX_PERCENT);
  for (let k = 0; ; k++) {
    const e = -3 + k / WEATHER_POINTS_PER_DECADE;
    if (e >= top - 1e-12) break;
    ps.push(10 ** e);
  }
  ps.push(WEATHER_P_MAX_PERCENT, 1 - 1e-9);
  for (const c of cases) if (c.exceedancePercent !== null) ps.push(c.exceedancePercent);
  ps.sort((a, b) => a - b);
  // Equal points (to 1e-12 relative) collapse to one, a fixed case's own value kept.
  const fixed = new Set(cases.map((c) => c.exceedancePercent));
  const out: number[] = [];
  for (const p of ps) {
    const last = out[out.length - 1];
    if (last !== undefined && Math.abs(p - last) <= 1e-12 * p) {
      if (fixed.has(p)) out[out.length - 1] = p;
      continue;
    }
    out.push(p);
  }
  return Float64Array.from(out);
}

/**
 * The weather table of a link, on the nodes of its elevation table: every
 * grid case evaluated by the same models and arithmetic as the budget's cases (atmosphereCurve),
 * so at a fixed case's p the row equals the budget's own degradation there.
 */
export function buildWeatherTable(ctx: AtmosphereContext, table: ElevationTable): WeatherTable {
  const grid = weatherGrid(ctx.weatherCases);
  const G = grid.length;
  const width = G + 1;
  const nodes = table.elevationsDeg.length;
  const nt = table.caseCount * TERM_COUNT;
  const values = new Float64Array(nodes * width);
  const buf = new Float64Array(width * TERM_COUNT);
  const deg = (v: ArrayLike<number>, o: number) => v[o + TERM.total] - v[o + TERM.gOverTBoresightDBK];
  for (let j = 0; j < nodes; j++) {
    atmosphereCurve(ctx, table.elevationsDeg[j], grid, buf);
    const ref = deg(table.values, j * nt);
    const row = j * width;
    for (let c = 0; c < width; c++) values[row + c] = deg(buf, c * TERM_COUNT) - ref;
    // Non-increasing in p: running maximum from 5 % down.
    for (let g = G - 1; g >= 1; g--) if (values[row + g] < values[row + g + 1]) values[row + g] = values[row + g + 1];
  }
  return { pPercent: grid, lnP: grid.map(Math.log), width, values, tableTermsPerNode: nt };
}

/**
 * Closing levels of a link: a fixed link has one (threshold = the required
 * margin, on the margin column, worth the bit rate); an adaptive link one per
 * distinct mode threshold (required Es/N0 + required margin, on the effective
 * Es/N0 column), worth the rate gained over the level below. Thresholds ascend.
 */
export interface WeatherLevels {
  thresholdDB: Float64Array;
  /** Rate added by the level (any unit; the expected rate comes out in it). */
  rateStep: Float64Array;
  /** Hunt index per level, carried from step to step. */
  hunt: Int32Array;
}

export function weatherLevels(thresholdDB: ArrayLike<number>, rate: ArrayLike<number>): WeatherLevels {
  const th: number[] = [], dr: number[] = [];
  let best = 0;
  for (let j = 0; j < thresholdDB.length; j++) {
    const gain = rate[j] - best;
    if (!(gain > 0) && th.length > 0) continue;
    th.push(thresholdDB[j]); dr.push(Math.max(0, gain));
    best = Math.max(best, rate[j]);
  }
  return { thresholdDB: Float64Array.from(th), rateStep: Float64Array.from(dr), hunt: new Int32Array(th.length) };
}

/** Closing probability given to a step that closes even at 0.001 % (a lower bound). */
export const CLOSING_PROBABILITY_MAX = 1 - WEATHER_P_MIN_PERCENT / 100;
/** Closing probability given to a step that fails at 5 % but closes in clear sky (an upper bound). */
export const CLOSING_PROBABILITY_AT_P_MAX = 1 - WEATHER_P_MAX_PERCENT / 100;

/**
 * Per step i < n (elevation-table intervals lo, hiOff, frac as tableIntervals
 * gives them; x the first case's margin or effective Es/N0, dB): the closing
 * probability of the lowest level, the expected information rate Σ over
 * levels of (rate step × its closing probability), and the clamp flag of the
 * lowest level. A column loop: no allocation, no model call.
 */
export function weatherColumns(
  wt: WeatherTable, lv: WeatherLevels, n: number, lo: Int32Array, hiOff: Int32Array, frac: Float64Array, x: Float64Array,
  prob: Float64Array, rate: Float64Array, clamped: Uint8Array,
): void {
  const v = wt.values, L = wt.lnP, W = wt.width | 0, G = (W - 1) | 0, nt = wt.tableTermsPerNode | 0;
  const th = lv.thresholdDB, dr = lv.rateStep, hunt = lv.hunt, nl = th.length;
  const qTop = CLOSING_PROBABILITY_MAX * 1, qBottom = CLOSING_PROBABILITY_AT_P_MAX * 1;
  for (let i = 0; i < n; i++) {
    const a = ((lo[i] / nt) | 0) * W, b = ((hiOff[i] / nt) | 0) * W, f = frac[i];
    const rc = v[a] + f * (v[b] - v[a]);
    const top = v[a + 1] + f * (v[b + 1] - v[a + 1]);
    const bot = v[a + G] + f * (v[b + G] - v[a + G]);
    const xi = x[i];
    let expected = 0, p0 = 0, c0 = 0;
    for (let j = 0; j < nl; j++) {
      const y = xi - th[j];
      // Fails in clear sky (or NaN): this level and every higher one close with probability 0.
      if (!(y >= rc)) break;
      let q: number, c = 0;
      if (y >= top) { q = qTop; c = 1; } else if (y < bot) { q = qBottom; c = 1; } else {
        // D(p_g) > y ≥ D(p_{g+1}); D at grid point g is at offset 1 + g of a row.
        let g = hunt[j];
        if (g > G - 2) g = G - 2;
        while (g > 0 && !(v[a + 1 + g] + f * (v[b + 1 + g] - v[a + 1 + g]) > y)) g--;
        while (g < G - 2 && v[a + 2 + g] + f * (v[b + 2 + g] - v[a + 2 + g]) > y) g++;
        hunt[j] = g;
        const r0 = v[a + 1 + g] + f * (v[b + 1 + g] - v[a + 1 + g]);
        const r1 = v[a + 2 + g] + f * (v[b + 2 + g] - v[a + 2 + g]);
        const t = (r0 - y) / (r0 - r1);
        q = 1 - Math.exp(L[g] + t * (L[g + 1] - L[g])) / 100;
      }
      if (j === 0) { p0 = q; c0 = c; }
      expected += dr[j] * q;
    }
    prob[i] = p0; rate[i] = expected; clamped[i] = c0;
  }
}
