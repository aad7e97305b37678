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
  /** ln(p_{g+1} / p_g) per grid interval (at most ln 10 / 16 = 0.144: exp of it by a 5th-order series, error < 2e-8 relative). */
  lnStep: Float64Array;
  /** (p_{g+1} − p_g) / E(lnStep_g), E(u) = the series of exp(u) − 1 the search uses. */
  expScale: Float64Array;
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
  return weatherTableOf(grid, values, nt);
}

/** A weather table from its p grid and node rows (as buildWeatherTable lays them out). */
export function weatherTableOf(grid: Float64Array, values: Float64Array, tableTermsPerNode: number): WeatherTable {
  const lnP = grid.map(Math.log);
  const lnStep = new Float64Array(grid.length);
  const expScale = new Float64Array(grid.length);
  for (let g = 0; g + 1 < grid.length; g++) {
    const u = (lnStep[g] = lnP[g + 1] - lnP[g]);
    const e = u * (1 + u * (0.5 + u * (1 / 6 + u * (1 / 24 + u / 120))));
    expScale[g] = e > 0 ? (grid[g + 1] - grid[g]) / e : 0;
  }
  return { pPercent: grid, lnP, lnStep, expScale, width: grid.length + 1, values, tableTermsPerNode };
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
  /** cumRate[k] = Σ rateStep[0 … k−1]. */
  cumRate: Float64Array;
  /**
   * Hunt state carried from step to step: [0] the number of levels that close even at 0.001 %,
   * [1] the grid interval of the first level inside the model's range.
   */
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
  const cumRate = new Float64Array(th.length + 1);
  for (let j = 0; j < th.length; j++) cumRate[j + 1] = cumRate[j] + dr[j];
  return { thresholdDB: Float64Array.from(th), rateStep: Float64Array.from(dr), cumRate, hunt: new Int32Array(2) };
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
 *
 * Level j's excess is y_j = x − threshold_j, falling with j. The levels with
 * y_j ≥ D(0.001 %) (the first kTop) count at once through cumRate, kTop
 * hunted from the previous step; the next levels, down to the first that
 * fails in clear sky, walk the row forwards from the previous step's grid
 * interval (their p* rise with j), so a step costs O(levels inside the
 * model's range + intervals moved), not a search per level.
 */
export function weatherColumns(
  wt: WeatherTable, lv: WeatherLevels, n: number, lo: Int32Array, hiOff: Int32Array, frac: Float64Array, x: Float64Array,
  prob: Float64Array, rate: Float64Array, clamped: Uint8Array,
): void {
  const v = wt.values, pg = wt.pPercent, dl = wt.lnStep, es = wt.expScale, W = wt.width | 0, G = (W - 1) | 0, nt = wt.tableTermsPerNode | 0;
  const th = lv.thresholdDB, dr = lv.rateStep, cum = lv.cumRate, hunt = lv.hunt, nl = th.length | 0;
  const qTop = CLOSING_PROBABILITY_MAX * 1, qBottom = CLOSING_PROBABILITY_AT_P_MAX * 1;
  let kTop = hunt[0] | 0, g0 = hunt[1] | 0;
  if (kTop > nl) kTop = nl;
  if (g0 > G - 2) g0 = G - 2;
  if (g0 < 0) g0 = 0;
  for (let i = 0; i < n; i++) {
    const a = ((lo[i] / nt) | 0) * W, b = ((hiOff[i] / nt) | 0) * W, f = frac[i];
    const rc = v[a] + f * (v[b] - v[a]);
    const top = v[a + 1] + f * (v[b + 1] - v[a + 1]);
    const bot = v[a + G] + f * (v[b + G] - v[a + G]);
    const xi = x[i];
    // kTop: levels with y ≥ top (and ≥ rc: they close in clear sky too).
    const lim = xi - (top > rc ? top : rc);
    while (kTop > 0 && !(th[kTop - 1] <= lim)) kTop--;
    while (kTop < nl && th[kTop] <= lim) kTop++;
    let expected = qTop * cum[kTop];
    let p0 = kTop > 0 ? qTop : 0, c0 = kTop > 0 ? 1 : 0;
    let j = kTop;
    if (j < nl) {
      // The first level left: its own hunt (from the previous step's interval) and the row values around it.
      const y0 = xi - th[j];
      if (y0 >= rc) {
        let g = g0;
        if (y0 < bot) {
          // Fails at 5 %: every level from here that closes in clear sky gets the 5 % clamp.
          if (j === 0) { p0 = qBottom; c0 = 1; }
          for (; j < nl && xi - th[j] >= rc; j++) expected += dr[j] * qBottom;
        } else {
          while (g > 0 && !(v[a + 1 + g] + f * (v[b + 1 + g] - v[a + 1 + g]) > y0)) g--;
          let r0 = v[a + 1 + g] + f * (v[b + 1 + g] - v[a + 1 + g]);
          let r1 = v[a + 2 + g] + f * (v[b + 2 + g] - v[a + 2 + g]);
          while (g < G - 2 && r1 > y0) { g++; r0 = r1; r1 = v[a + 2 + g] + f * (v[b + 2 + g] - v[a + 2 + g]); }
          g0 = g;
          if (j === 0) c0 = 0;
          // Levels inside the range: D(p_g) = r0 > y ≥ r1 = D(p_{g+1}), g walking forwards as y falls.
          for (; j < nl; j++) {
            const y = xi - th[j];
            if (!(y >= bot) || !(y >= rc)) break;
            while (g < G - 2 && r1 > y) { g++; r0 = r1; r1 = v[a + 2 + g] + f * (v[b + 2 + g] - v[a + 2 + g]); }
            // p* = p_g exp(t ln(p_{g+1}/p_g)), t the place of y between r0 and r1 (interpolation in ln p);
            // exp(u) − 1 by its series, scaled so t = 0 and t = 1 give p_g and p_{g+1} exactly.
            const u = ((r0 - y) / (r0 - r1)) * dl[g];
            const q = 1 - (pg[g] + es[g] * (u * (1 + u * (0.5 + u * (1 / 6 + u * (1 / 24 + u / 120)))))) / 100;
            if (j === 0) p0 = q;
            expected += dr[j] * q;
          }
          // Then the levels that fail at 5 % but close in clear sky.
          for (; j < nl && xi - th[j] >= rc; j++) { if (j === 0) { p0 = qBottom; c0 = 1; } expected += dr[j] * qBottom; }
        }
      }
    }
    prob[i] = p0; rate[i] = expected; clamped[i] = c0;
  }
  hunt[0] = kTop; hunt[1] = g0;
}
