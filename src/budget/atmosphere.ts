/**
 * Elevation-dependent part of the budget for one (station, link): atmospheric
 * attenuation per weather case and the receive noise that follows from it,
 * evaluated directly by the models (`atmosphereAt`) and tabulated once per link
 * against elevation (`buildElevationTable`) for linear interpolation per step.
 *
 * Per weather case:
 * - clear sky (exceedancePercent null): gases (P.676-12 Annex 2), plus clouds
 *   (P.840) at `climate.clearSkyCloudLiquidWaterKgM2` when > 0; no rain, no
 *   scintillation; total = gas + cloud (P.618-13 §2.5 with A_R = A_S = 0).
 * - exceedance p %: gases, rain (P.618-13 §2.2.1.1 with P.838-3), clouds at
 *   `climate.cloudLiquidWaterKgM2`, scintillation (P.618-13 §2.4.1), combined
 *   per P.618-13 §2.5. The climate gives one gas and one cloud value, so the
 *   "at 1 %" gas and cloud inputs of §2.5 are those same values.
 * Noise (receiving end):
 * - downlink (ground receives): T_A = T_sky + spill-over + external, with
 *   T_sky from P.618-13 §3 driven by the absorptive attenuation, i.e. the
 *   §2.5 total without scintillation (§3 excludes scintillation fading; from memory),
 *   external = P.372 environment (galactic + man-made, from memory) unless 'none'.
 * - uplink (spacecraft receives): T_A = 290 K Earth-filled beam (from memory,
 *   common practice) + spill-over + external; independent of elevation.
 * - `receiver.antennaTemperatureK`, when given, replaces T_A entirely.
 * - T_sys: Friis at the LNA input (systemNoiseTemperatureK); G/T at boresight.
 *
 * Model validity outside the link's frequency is handled here, and listed in `notes`:
 * gases, clouds and rain below 1 GHz are evaluated at 1 GHz, scintillation below 4 GHz at
 * 4 GHz (each an over-estimate: these terms grow with frequency there).
 */
import {
  cloudAttenuation, externalNoiseIsExtrapolated, externalNoiseTemperatureK, gasSlantAttenuation, gasSlantFromZenith,
  gasZenithAttenuation, gOverTDBK, type GasZenith,
  rainAttenuation, rainAttenuation001, rainAttenuationAt, scintillationFade, scintillationSigma, scintillationTimeFactor, skyNoiseTemperatureK, systemNoiseTemperatureK, totalAttenuation,
} from '../models/index.js';
import { InputError } from '../errors.js';
import type { AntennaPattern } from './antenna.js';
import type { Climate, LinkSpec, WeatherCase } from './types.js';
import type { WeatherTable } from './weather.js';

/** Index of each term in a case's block of TERM_COUNT numbers. */
export const TERM = {
  gas: 0, rain: 1, cloud: 2, scintillation: 3, total: 4,
  antennaTemperatureK: 5, systemTemperatureK: 6, gOverTBoresightDBK: 7,
} as const;
export const TERM_COUNT = 8;
export const TERM_NAMES = ['gas', 'rain', 'cloud', 'scintillation', 'total', 'antennaTemperatureK', 'systemTemperatureK', 'gOverTBoresightDBK'] as const;

/** Earth-filled beam temperature for a spacecraft receiver (from memory, common practice). */
export const EARTH_ANTENNA_TEMPERATURE_K = 290;

const GAS_MIN_GHZ = 1;
const CLOUD_MIN_GHZ = 1;
const RAIN_MIN_GHZ = 1;
const RAIN_MAX_GHZ = 55;
const SCINT_MIN_GHZ = 4;

/** Everything constant per link that the elevation-dependent terms need. */
export interface AtmosphereContext {
  link: LinkSpec;
  climate: Climate;
  weatherCases: WeatherCase[];
  /** Receiving-end antenna peak gain (dBi) and the line loss before the LNA (dB). */
  rxPeakGainDBi: number;
  rxFeedLossDB: number;
  /** Reused argument objects for the model calls (no allocation per evaluation). */
  gasArgs: Parameters<typeof gasSlantAttenuation>[0];
  /** Zenith gas attenuation of gasArgs (elevation-independent), filled on first use. */
  gasZenith?: GasZenith;
  rainArgs: Parameters<typeof rainAttenuation>[0];
  cloudArgs: Parameters<typeof cloudAttenuation>[0];
  cloudClearArgs: Parameters<typeof cloudAttenuation>[0];
  scintArgs: Parameters<typeof scintillationFade>[0];
  /** (f / f_eval)^(7/12): P.618-13 §2.4.1's σ ∝ f^(7/12), carrying the fade from the model's lower limit down to f. */
  scintillationScale: number;
  totalArgs: Parameters<typeof totalAttenuation>[0];
  skyArgs: Parameters<typeof skyNoiseTemperatureK>[0];
  sysArgs: Parameters<typeof systemNoiseTemperatureK>[0];
  /** G/T at boresight (G − L_feed − 10 log10 T_sys). */
  gtArgs: Parameters<typeof gOverTDBK>[0];
  /** Fixed part of the antenna temperature: spill-over + external (downlink), or the whole T_A (uplink / override). */
  fixedAntennaTemperatureK: number;
  /** True when T_A includes the sky term (downlink without override). */
  skyNoise: boolean;
  externalNoiseK: number;
  /** Rain polarisation tilt used for P.838 (deg): 45° for circular/elliptical, the tilt for linear. */
  rainTiltDeg: number;
  notes: string[];
}

function caseWhere(i: number): string {
  return `weatherCases[${i}].exceedancePercent`;
}

export function createAtmosphereContext(
  link: LinkSpec, climate: Climate, weatherCases: WeatherCase[], groundPattern: AntennaPattern, rxPattern: AntennaPattern,
): AtmosphereContext {
  const f = link.frequencyGHz;
  const notes: string[] = [];
  if (f > RAIN_MAX_GHZ) {
    throw new InputError(`link ${link.name}: frequencyGHz = ${f} is above the rain model's range (ITU-R P.618-13: 1–55 GHz)`);
  }
  weatherCases.forEach((w, i) => {
    const p = w.exceedancePercent;
    if (p !== null && !(p >= 0.001 && p <= 5)) {
      throw new InputError(`${caseWhere(i)}: ${p} % is outside the rain model's range (0.001–5 % of an average year, ITU-R P.618-13; or null for clear sky)`);
    }
  });
  const cloudF = Math.max(f, CLOUD_MIN_GHZ);
  const gasF = Math.max(f, GAS_MIN_GHZ), rainF = Math.max(f, RAIN_MIN_GHZ), scintF = Math.max(f, SCINT_MIN_GHZ);
  if (gasF !== f) notes.push(`gas attenuation evaluated at ${GAS_MIN_GHZ} GHz (P.676 lower limit; an over-estimate at ${f} GHz)`);
  if (cloudF !== f && (climate.cloudLiquidWaterKgM2 > 0 || climate.clearSkyCloudLiquidWaterKgM2 > 0)) {
    notes.push(`cloud attenuation evaluated at ${CLOUD_MIN_GHZ} GHz (P.840 lower limit; an over-estimate at ${f} GHz)`);
  }
  if (rainF !== f) notes.push(`rain attenuation evaluated at ${RAIN_MIN_GHZ} GHz (P.618/P.838 lower limit; an over-estimate at ${f} GHz)`);
  if (scintF !== f && weatherCases.some((w) => w.exceedancePercent !== null)) {
    notes.push(`scintillation evaluated at ${SCINT_MIN_GHZ} GHz (P.618 §2.4.1 lower limit, from memory) and scaled by the model's own f^(7/12) law to ${f} GHz (aperture averaging kept at ${SCINT_MIN_GHZ} GHz: slightly pessimistic)`);
  }

  const pol = link.ground.polarisation;
  const rainTiltDeg = Number.isFinite(pol.axialRatio) ? 45 : pol.tiltDeg;

  const receiving = link.direction === 'downlink' ? link.ground : link.spacecraft;
  const rx = receiving.receiver;
  if (!rx) throw new InputError(`link ${link.name}: ${link.direction === 'downlink' ? 'ground' : 'spacecraft'}.receiver is missing (the receiving end needs a receiver)`);
  if (rx.noiseFigureDB === undefined && rx.noiseTemperatureK === undefined) {
    throw new InputError(`link ${link.name}: receiver needs noiseFigureDB or noiseTemperatureK (one of them)`);
  }
  const externalNoiseK = externalNoiseTemperatureK({ frequencyMHz: f * 1000, environment: rx.environment });
  if (rx.environment !== 'none' && rx.antennaTemperatureK === undefined && externalNoiseIsExtrapolated(f * 1000)) {
    notes.push(`external noise (${rx.environment}) extrapolated above 250 MHz (ITU-R P.372 curves, from memory): ${externalNoiseK.toFixed(1)} K`);
  }
  const skyNoise = link.direction === 'downlink' && rx.antennaTemperatureK === undefined;
  const fixedAntennaTemperatureK = rx.antennaTemperatureK !== undefined
    ? rx.antennaTemperatureK
    : (link.direction === 'downlink' ? 0 : EARTH_ANTENNA_TEMPERATURE_K) + rx.spilloverK + externalNoiseK;

  const sysArgs = (rx.noiseFigureDB !== undefined
    ? { antennaTemperatureK: 0, feedLossDB: rx.feedLossDB, receiverNoiseFigureDB: rx.noiseFigureDB }
    : { antennaTemperatureK: 0, feedLossDB: rx.feedLossDB, receiverTemperatureK: rx.noiseTemperatureK as number }
  ) as Parameters<typeof systemNoiseTemperatureK>[0];

  return {
    link, climate, weatherCases,
    rxPeakGainDBi: rxPattern.peakGainDBi,
    rxFeedLossDB: rx.feedLossDB,
    gasArgs: {
      frequencyGHz: gasF, elevationDeg: 0, pressureDryHPa: climate.pressureDryHPa, temperatureK: climate.temperatureK,
      waterVapourDensityGM3: climate.waterVapourDensityGM3, stationHeightKm: climate.stationHeightKm,
      ...(climate.waterVapourContentKgM2 !== undefined ? { waterVapourContentKgM2: climate.waterVapourContentKgM2 } : {}),
    },
    rainArgs: {
      latitudeDeg: climate.latitudeDeg, stationHeightKm: climate.stationHeightKm, frequencyGHz: rainF, elevationDeg: 0,
      tiltDeg: rainTiltDeg, exceedancePercent: 1, rainRate001MmH: climate.rainRate001MmH, rainHeightKm: climate.rainHeightKm,
    },
    cloudArgs: { frequencyGHz: cloudF, elevationDeg: 0, liquidWaterKgM2: climate.cloudLiquidWaterKgM2 },
    cloudClearArgs: { frequencyGHz: cloudF, elevationDeg: 0, liquidWaterKgM2: climate.clearSkyCloudLiquidWaterKgM2 },
    scintArgs: {
      frequencyGHz: scintF, elevationDeg: 0, exceedancePercent: 1,
      antennaDiameterM: groundPattern.apertureDiameterM, antennaEfficiency: groundPattern.apertureEfficiency, nWet: climate.nWet,
    },
    scintillationScale: (f / scintF) ** (7 / 12),
    totalArgs: {
      exceedancePercent: 1, gasDB: 0, gasAt1PctDB: 0, cloudDB: 0, cloudAt1PctDB: 0, rainDB: 0, scintillationDB: 0,
    },
    skyArgs: { attenuationDB: 0, meanRadiatingTemperatureK: climate.meanRadiatingTemperatureK },
    sysArgs,
    gtArgs: { gainDBi: rxPattern.peakGainDBi, feedLossDB: rx.feedLossDB, systemTemperatureK: 1 },
    fixedAntennaTemperatureK, skyNoise, externalNoiseK, rainTiltDeg, notes,
  };
}

/** Gas and the clear-sky cloud at one elevation (deg, already clamped): the terms every case shares. */
function sharedTerms(ctx: AtmosphereContext, el: number): { gas: number; cloudClear: number } {
  ctx.gasArgs.elevationDeg = el;
  // The zenith parts (line-by-line specific attenuation, equivalent heights) do not depend on
  // elevation: computed once per context, then only the path factor per elevation.
  ctx.gasZenith ??= gasZenithAttenuation(ctx.gasArgs);
  const gas = gasSlantFromZenith(ctx.gasZenith, el);
  let cloudClear = 0;
  if (ctx.climate.clearSkyCloudLiquidWaterKgM2 > 0) {
    ctx.cloudClearArgs.elevationDeg = el;
    cloudClear = cloudAttenuation(ctx.cloudClearArgs);
  }
  return { gas, cloudClear };
}

/** The weather cases' cloud attenuation at one elevation (climate.cloudLiquidWaterKgM2). */
function caseCloud(ctx: AtmosphereContext, el: number): number {
  ctx.cloudArgs.elevationDeg = el;
  return ctx.climate.cloudLiquidWaterKgM2 > 0 ? cloudAttenuation(ctx.cloudArgs) : 0;
}

/**
 * One case's block of TERM_COUNT at out[o…] from its parts: total per P.618-13 §2.5
 * (clear sky, p null: gas + cloud), then the receive noise it brings.
 */
function caseBlock(ctx: AtmosphereContext, p: number | null, gas: number, cl: number, rain: number, scint: number, out: Float64Array, o: number): void {
  let total: number, absorptive: number;
  if (p === null) {
    total = gas + cl;
    absorptive = total;
  } else {
    const t = ctx.totalArgs;
    t.exceedancePercent = p; t.gasDB = gas; t.gasAt1PctDB = gas; t.cloudDB = cl; t.cloudAt1PctDB = cl;
    t.rainDB = rain; t.scintillationDB = scint;
    total = totalAttenuation(t);
    t.scintillationDB = 0;
    absorptive = totalAttenuation(t);
  }
  let ta = ctx.fixedAntennaTemperatureK;
  if (ctx.skyNoise) {
    ctx.skyArgs.attenuationDB = absorptive;
    ta += skyNoiseTemperatureK(ctx.skyArgs);
  }
  ctx.sysArgs.antennaTemperatureK = ta;
  const tsys = systemNoiseTemperatureK(ctx.sysArgs);
  out[o + TERM.gas] = gas;
  out[o + TERM.rain] = rain;
  out[o + TERM.cloud] = cl;
  out[o + TERM.scintillation] = scint;
  out[o + TERM.total] = total;
  out[o + TERM.antennaTemperatureK] = ta;
  out[o + TERM.systemTemperatureK] = tsys;
  ctx.gtArgs.systemTemperatureK = tsys;
  out[o + TERM.gOverTBoresightDBK] = gOverTDBK(ctx.gtArgs);
}

/**
 * Direct evaluation of every term, for every weather case, at one elevation
 * (deg, clamped to 0–90). Writes case-major blocks of TERM_COUNT into `out`.
 */
export function atmosphereAt(ctx: AtmosphereContext, elevationDeg: number, out: Float64Array): Float64Array {
  const el = Math.min(90, Math.max(0, elevationDeg));
  const { gas, cloudClear } = sharedTerms(ctx, el);
  let cloud = NaN;
  const cases = ctx.weatherCases;
  for (let i = 0; i < cases.length; i++) {
    const p = cases[i].exceedancePercent;
    if (p === null) { caseBlock(ctx, null, gas, cloudClear, 0, 0, out, i * TERM_COUNT); continue; }
    if (Number.isNaN(cloud)) cloud = caseCloud(ctx, el);
    ctx.rainArgs.elevationDeg = el; ctx.rainArgs.exceedancePercent = p;
    const rain = rainAttenuation(ctx.rainArgs).attenuationDB;
    ctx.scintArgs.elevationDeg = el; ctx.scintArgs.exceedancePercent = p;
    const scint = scintillationFade(ctx.scintArgs) * ctx.scintillationScale;
    caseBlock(ctx, p, gas, cloud, rain, scint, out, i * TERM_COUNT);
  }
  return out;
}

/**
 * The same terms as atmosphereAt for clear sky and then every p of `pPercent`
 * (0.001–5 %, blocks 0, 1 … n in `out`), at one elevation: the p-independent
 * parts of rain (A0.01) and scintillation (σ) once, then P.618-13's laws in p
 * (§2.2.1.1 steps 9–10, §2.4.1 steps 8–9). The same arithmetic as atmosphereAt,
 * so at a weather case's p both give the same numbers.
 */
export function atmosphereCurve(ctx: AtmosphereContext, elevationDeg: number, pPercent: Float64Array, out: Float64Array): Float64Array {
  const el = Math.min(90, Math.max(0, elevationDeg));
  const { gas, cloudClear } = sharedTerms(ctx, el);
  caseBlock(ctx, null, gas, cloudClear, 0, 0, out, 0);
  const cloud = caseCloud(ctx, el);
  ctx.rainArgs.elevationDeg = el; ctx.rainArgs.exceedancePercent = 1;
  const r001 = rainAttenuation001(ctx.rainArgs);
  ctx.scintArgs.elevationDeg = el; ctx.scintArgs.exceedancePercent = 1;
  const sigma = scintillationSigma(ctx.scintArgs);
  for (let g = 0; g < pPercent.length; g++) {
    const p = pPercent[g];
    const rain = rainAttenuationAt(r001, p);
    const scint = sigma * scintillationTimeFactor(p) * ctx.scintillationScale;
    caseBlock(ctx, p, gas, cloud, rain, scint, out, (g + 1) * TERM_COUNT);
  }
  return out;
}

/** Tabulated terms on a shared, non-uniform elevation grid (node-major: node × cases × TERM_COUNT). */
export interface ElevationTable {
  elevationsDeg: Float64Array;
  values: Float64Array;
  caseCount: number;
  /** Largest estimated interpolation error met while refining (dB). */
  toleranceDB: number;
  /** The weather-probability table on these nodes (weather.ts), attached by the engine. */
  weather?: WeatherTable;
}

/** Difference in dB between two values of a term (temperatures compared as 10 log10 ratios). */
function termErrorDB(term: number, a: number, b: number): number {
  if (term === TERM.antennaTemperatureK || term === TERM.systemTemperatureK) {
    if (a === b) return 0;
    return Math.abs(10 * Math.log10(Math.max(a, 1e-30) / Math.max(b, 1e-30)));
  }
  return Math.abs(a - b);
}

/**
 * Model discontinuities the grid must not interpolate across: at 5° the P.618
 * rain slant path switches form (a jump of a few %) and scintillation is held
 * below 5°; at 25° the P.618 β term switches (|φ| < 36°, p < 1 %). Each gets a
 * node just below and one at the breakpoint.
 */
const BREAKPOINTS_DEG = [5, 25];
const BREAK_EPS_DEG = 1e-9;
const SEED_DEG = [0, 0.25, 0.5, 1, 1.5, 2, 3, 4, 5, 6, 8, 10, 12.5, 15, 20, 25, 30, 40, 50, 60, 70, 80, 90];
const MIN_WIDTH_DEG = 1e-4;

/**
 * Build the elevation table: adaptive bisection from a seed grid until linear
 * interpolation agrees with direct evaluation at the quarter, mid and three-quarter
 * points of every interval to `toleranceDB` (default 0.0002 dB, so the error
 * anywhere stays well inside 0.001 dB), for every term of every case.
 */
export function buildElevationTable(ctx: AtmosphereContext, toleranceDB = 0.0002): ElevationTable {
  const n = ctx.weatherCases.length * TERM_COUNT;
  const seeds = new Set<number>(SEED_DEG);
  for (const b of BREAKPOINTS_DEG) { seeds.add(b); seeds.add(b - BREAK_EPS_DEG); }
  const nodes = [...seeds].sort((a, b) => a - b);
  const evalAt = (el: number) => atmosphereAt(ctx, el, new Float64Array(n));
  const done: Array<{ el: number; v: Float64Array }> = [];
  const probe = new Float64Array(n);
  const refine = (a: number, va: Float64Array, b: number, vb: Float64Array) => {
    const stack: Array<[number, Float64Array, number, Float64Array]> = [[a, va, b, vb]];
    while (stack.length) {
      const [x0, v0, x1, v1] = stack.pop()!;
      const w = x1 - x0;
      let ok = w < MIN_WIDTH_DEG;
      if (!ok) {
        ok = true;
        for (const f of [0.25, 0.5, 0.75]) {
          atmosphereAt(ctx, x0 + f * w, probe);
          for (let k = 0; k < n && ok; k++) {
            const lin = v0[k] + f * (v1[k] - v0[k]);
            if (termErrorDB(k % TERM_COUNT, lin, probe[k]) > toleranceDB) ok = false;
          }
          if (!ok) break;
        }
      }
      if (ok) { done.push({ el: x0, v: v0 }); continue; }
      const xm = x0 + w / 2;
      const vm = evalAt(xm);
      stack.push([xm, vm, x1, v1]);
      stack.push([x0, v0, xm, vm]);
    }
  };
  const values0 = nodes.map(evalAt);
  for (let i = 0; i + 1 < nodes.length; i++) refine(nodes[i], values0[i], nodes[i + 1], values0[i + 1]);
  done.push({ el: nodes[nodes.length - 1], v: values0[values0.length - 1] });
  done.sort((p, q) => p.el - q.el);
  const elevationsDeg = new Float64Array(done.length);
  const values = new Float64Array(done.length * n);
  done.forEach((d, i) => { elevationsDeg[i] = d.el; values.set(d.v, i * n); });
  return { elevationsDeg, values, caseCount: ctx.weatherCases.length, toleranceDB };
}

/** Linear interpolation of every term at `elevationDeg` (clamped to the grid). Binary search; no allocation. */
export function interpolateTable(table: ElevationTable, elevationDeg: number, out: Float64Array): Float64Array {
  const xs = table.elevationsDeg;
  const n = table.caseCount * TERM_COUNT;
  const last = xs.length - 1;
  const el = elevationDeg <= xs[0] ? xs[0] : elevationDeg >= xs[last] ? xs[last] : elevationDeg;
  let lo = 0, hi = last;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] <= el) lo = mid; else hi = mid;
  }
  const x0 = xs[lo], x1 = xs[hi];
  const f = x1 > x0 ? (el - x0) / (x1 - x0) : 0;
  const v = table.values, a = lo * n, b = hi * n;
  for (let k = 0; k < n; k++) out[k] = v[a + k] + f * (v[b + k] - v[a + k]);
  return out;
}

/**
 * The table interval of each elevation of a column (entries 0 … n−1), the same
 * as interpolateTable finds (largest node ≤ the clamped elevation, and the
 * fraction to the next), found by hunting from the previous entry's interval:
 * a pass's elevations move a node or two per step. `lo[i]` is the node row
 * offset (node index × terms per node), `hiOff[i]` that of the next node.
 */
export function tableIntervals(table: ElevationTable, elevationDeg: Float64Array, n: number, lo: Int32Array, hiOff: Int32Array, frac: Float64Array): void {
  const xs = table.elevationsDeg;
  const nt = table.caseCount * TERM_COUNT;
  const last = xs.length - 1;
  let j = 0;
  for (let i = 0; i < n; i++) {
    const e = elevationDeg[i];
    const el = e <= xs[0] ? xs[0] : e >= xs[last] ? xs[last] : e;
    if (last === 0) { lo[i] = 0; hiOff[i] = 0; frac[i] = 0; continue; }
    // Interval [j, j+1] with xs[j] ≤ el < xs[j+1] (j = last − 1 at the top end), as the bisection finds.
    while (j > 0 && xs[j] > el) j--;
    while (j < last - 1 && xs[j + 1] <= el) j++;
    const x0 = xs[j], x1 = xs[j + 1];
    lo[i] = j * nt; hiOff[i] = (j + 1) * nt;
    frac[i] = x1 > x0 ? (el - x0) / (x1 - x0) : 0;
  }
}

/**
 * Two tabulated terms (flat indices ka, kb) over a column's intervals, into
 * outA and outB: the pair the summaries always need (total attenuation and
 * G/T) in one pass over the table rows.
 */
export function tableTermPairColumn(
  table: ElevationTable, ka: number, kb: number, n: number, lo: Int32Array, hiOff: Int32Array, frac: Float64Array, outA: Float64Array, outB: Float64Array,
): void {
  const v = table.values;
  for (let i = 0; i < n; i++) {
    const l = lo[i], h = hiOff[i], f = frac[i];
    const a = v[l + ka], b = v[l + kb];
    outA[i] = a + f * (v[h + ka] - a);
    outB[i] = b + f * (v[h + kb] - b);
  }
}

/** One tabulated term (flat index k = case × TERM_COUNT + term) over a column's intervals, into out[0 … n−1]. */
export function tableTermColumn(table: ElevationTable, k: number, n: number, lo: Int32Array, hiOff: Int32Array, frac: Float64Array, out: Float64Array): void {
  const v = table.values;
  for (let i = 0; i < n; i++) {
    const a = v[lo[i] + k];
    out[i] = a + frac[i] * (v[hiOff[i] + k] - a);
  }
}
