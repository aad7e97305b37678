/**
 * Attenuation by atmospheric gases — ITU-R P.676.
 *
 * - Specific attenuation: P.676-13 Annex 1, eqs. (1)–(9), line-by-line sum over
 *   the oxygen (Table 1) and water-vapour (Table 2) lines plus the dry continuum.
 * - Slant path: P.676-12 Annex 2, equivalent heights h_o (oxygen, §2.1) and h_w
 *   (water vapour, §2.2), or the water-vapour zenith attenuation from the
 *   integrated content V_t (§2.3).
 *
 * Pressures are dry-air pressures p (hPa); e = ρ T / 216.7 is the water-vapour
 * partial pressure, the total pressure is p + e.
 */
import { checkAtLeast, checkRange, type Interval } from './range.js';
import { DEG } from './constants.js';

export const P676_SPECIFIC_VALIDITY = { frequencyGHz: [1, 1000] as Interval };
/** Annex 2 (P.676-12): 1–1000 GHz (the -12 equivalent heights carry lines up to 834 GHz; from memory). Elevation: see slantPathFactor. */
export const P676_SLANT_VALIDITY = { frequencyGHz: [1, 1000] as Interval, elevationDeg: [0, 90] as Interval };

// P.676-13 Annex 1 Table 1 (oxygen): f0, a1..a6.
const OXYGEN = new Float64Array([
  50.474214, 0.975, 9.651, 6.69, 0.0, 2.566, 6.85,
  50.987745, 2.529, 8.653, 7.17, 0.0, 2.246, 6.8,
  51.50336, 6.193, 7.709, 7.64, 0.0, 1.947, 6.729,
  52.021429, 14.32, 6.819, 8.11, 0.0, 1.667, 6.64,
  52.542418, 31.24, 5.983, 8.58, 0.0, 1.388, 6.526,
  53.066934, 64.29, 5.201, 9.06, 0.0, 1.349, 6.206,
  53.595775, 124.6, 4.474, 9.55, 0.0, 2.227, 5.085,
  54.130025, 227.3, 3.8, 9.96, 0.0, 3.17, 3.75,
  54.67118, 389.7, 3.182, 10.37, 0.0, 3.558, 2.654,
  55.221384, 627.1, 2.618, 10.89, 0.0, 2.56, 2.952,
  55.783815, 945.3, 2.109, 11.34, 0.0, -1.172, 6.135,
  56.264774, 543.4, 0.014, 17.03, 0.0, 3.525, -0.978,
  56.363399, 1331.8, 1.654, 11.89, 0.0, -2.378, 6.547,
  56.968211, 1746.6, 1.255, 12.23, 0.0, -3.545, 6.451,
  57.612486, 2120.1, 0.91, 12.62, 0.0, -5.416, 6.056,
  58.323877, 2363.7, 0.621, 12.95, 0.0, -1.932, 0.436,
  58.446588, 1442.1, 0.083, 14.91, 0.0, 6.768, -1.273,
  59.164204, 2379.9, 0.387, 13.53, 0.0, -6.561, 2.309,
  59.590983, 2090.7, 0.207, 14.08, 0.0, 6.957, -0.776,
  60.306056, 2103.4, 0.207, 14.15, 0.0, -6.395, 0.699,
  60.434778, 2438.0, 0.386, 13.39, 0.0, 6.342, -2.825,
  61.150562, 2479.5, 0.621, 12.92, 0.0, 1.014, -0.584,
  61.800158, 2275.9, 0.91, 12.63, 0.0, 5.014, -6.619,
  62.41122, 1915.4, 1.255, 12.17, 0.0, 3.029, -6.759,
  62.486253, 1503.0, 0.083, 15.13, 0.0, -4.499, 0.844,
  62.997984, 1490.2, 1.654, 11.74, 0.0, 1.856, -6.675,
  63.568526, 1078.0, 2.108, 11.34, 0.0, 0.658, -6.139,
  64.127775, 728.7, 2.617, 10.88, 0.0, -3.036, -2.895,
  64.67891, 461.3, 3.181, 10.38, 0.0, -3.968, -2.59,
  65.224078, 274.0, 3.8, 9.96, 0.0, -3.528, -3.68,
  65.764779, 153.0, 4.473, 9.55, 0.0, -2.548, -5.002,
  66.302096, 80.4, 5.2, 9.06, 0.0, -1.66, -6.091,
  66.836834, 39.8, 5.982, 8.58, 0.0, -1.68, -6.393,
  67.369601, 18.56, 6.818, 8.11, 0.0, -1.956, -6.475,
  67.900868, 8.172, 7.708, 7.64, 0.0, -2.216, -6.545,
  68.431006, 3.397, 8.652, 7.17, 0.0, -2.492, -6.6,
  68.960312, 1.334, 9.65, 6.69, 0.0, -2.773, -6.65,
  118.750334, 940.3, 0.01, 16.64, 0.0, -0.439, 0.079,
  368.498246, 67.4, 0.048, 16.4, 0.0, 0.0, 0.0,
  424.76302, 637.7, 0.044, 16.4, 0.0, 0.0, 0.0,
  487.249273, 237.4, 0.049, 16.0, 0.0, 0.0, 0.0,
  715.392902, 98.1, 0.145, 16.0, 0.0, 0.0, 0.0,
  773.83949, 572.3, 0.141, 16.2, 0.0, 0.0, 0.0,
  834.145546, 183.1, 0.145, 14.7, 0.0, 0.0, 0.0,
]);

// P.676-13 Annex 1 Table 2 (water vapour): f0, b1..b6 (the 1780 GHz pseudo-line included).
const WATER = new Float64Array([
  22.23508, 0.1079, 2.144, 26.38, 0.76, 5.087, 1.0,
  67.80396, 0.0011, 8.732, 28.58, 0.69, 4.93, 0.82,
  119.99594, 0.0007, 8.353, 29.48, 0.7, 4.78, 0.79,
  183.310087, 2.273, 0.668, 29.06, 0.77, 5.022, 0.85,
  321.22563, 0.047, 6.179, 24.04, 0.67, 4.398, 0.54,
  325.152888, 1.514, 1.541, 28.23, 0.64, 4.893, 0.74,
  336.227764, 0.001, 9.825, 26.93, 0.69, 4.74, 0.61,
  380.197353, 11.67, 1.048, 28.11, 0.54, 5.063, 0.89,
  390.134508, 0.0045, 7.347, 21.52, 0.63, 4.81, 0.55,
  437.346667, 0.0632, 5.048, 18.45, 0.6, 4.23, 0.48,
  439.150807, 0.9098, 3.595, 20.07, 0.63, 4.483, 0.52,
  443.018343, 0.192, 5.048, 15.55, 0.6, 5.083, 0.5,
  448.001085, 10.41, 1.405, 25.64, 0.66, 5.028, 0.67,
  470.888999, 0.3254, 3.597, 21.34, 0.66, 4.506, 0.65,
  474.689092, 1.26, 2.379, 23.2, 0.65, 4.804, 0.64,
  488.490108, 0.2529, 2.852, 25.86, 0.69, 5.201, 0.72,
  503.568532, 0.0372, 6.731, 16.12, 0.61, 3.98, 0.43,
  504.482692, 0.0124, 6.731, 16.12, 0.61, 4.01, 0.45,
  547.67644, 0.9785, 0.158, 26.0, 0.7, 4.5, 1.0,
  552.02096, 0.184, 0.158, 26.0, 0.7, 4.5, 1.0,
  556.935985, 497.0, 0.159, 30.86, 0.69, 4.552, 1.0,
  620.700807, 5.015, 2.391, 24.38, 0.71, 4.856, 0.68,
  645.766085, 0.0067, 8.633, 18.0, 0.6, 4.0, 0.5,
  658.00528, 0.2732, 7.816, 32.1, 0.69, 4.14, 1.0,
  752.033113, 243.4, 0.396, 30.86, 0.68, 4.352, 0.84,
  841.051732, 0.0134, 8.177, 15.9, 0.33, 5.76, 0.45,
  859.965698, 0.1325, 8.055, 30.6, 0.68, 4.09, 0.84,
  899.303175, 0.0547, 7.914, 29.85, 0.68, 4.53, 0.9,
  902.611085, 0.0386, 8.429, 28.65, 0.7, 5.1, 0.95,
  906.205957, 0.1836, 5.11, 24.08, 0.7, 4.7, 0.53,
  916.171582, 8.4, 1.441, 26.73, 0.7, 5.15, 0.78,
  923.112692, 0.0079, 10.293, 29.0, 0.7, 5.0, 0.8,
  970.315022, 9.009, 1.919, 25.5, 0.64, 4.94, 0.67,
  987.926764, 134.6, 0.257, 29.85, 0.68, 4.55, 0.9,
  1780.0, 17506.0, 0.952, 196.3, 2.0, 24.15, 5.0,
]);

/** Line shape factor F_i — P.676-13 Annex 1. */
function lineShape(f: number, fi: number, df: number, delta: number): number {
  return (f / fi) * ((df - delta * (fi - f)) / ((fi - f) ** 2 + df * df)
    + (df - delta * (fi + f)) / ((fi + f) ** 2 + df * df));
}

/** N''_ox = Σ S_i F_i + N''_D (P.676-13 Annex 1), p dry and e in hPa. */
function oxygenImaginaryRefractivity(f: number, p: number, e: number, theta: number): number {
  let sum = 0;
  for (let j = 0; j < OXYGEN.length; j += 7) {
    const fi = OXYGEN[j], a1 = OXYGEN[j + 1], a2 = OXYGEN[j + 2], a3 = OXYGEN[j + 3];
    const a4 = OXYGEN[j + 4], a5 = OXYGEN[j + 5], a6 = OXYGEN[j + 6];
    const s = a1 * 1e-7 * p * theta ** 3 * Math.exp(a2 * (1 - theta));
    let df = a3 * 1e-4 * (p * theta ** (0.8 - a4) + 1.1 * e * theta);
    df = Math.sqrt(df * df + 2.25e-6); // Zeeman splitting of the oxygen lines (P.676-13 Annex 1)
    const delta = (a5 + a6 * theta) * 1e-4 * (p + e) * theta ** 0.8;
    sum += s * lineShape(f, fi, df, delta);
  }
  // Dry continuum (P.676-13 Annex 1).
  const d = 5.6e-4 * (p + e) * theta ** 0.8;
  const nd = f * p * theta * theta * (6.14e-5 / (d * (1 + (f / d) ** 2))
    + (1.4e-12 * p * theta ** 1.5) / (1 + 1.9e-5 * f ** 1.5));
  return sum + nd;
}

/** N''_wv = Σ S_i F_i (P.676-13 Annex 1), δ = 0 for water lines. */
function waterImaginaryRefractivity(f: number, p: number, e: number, theta: number): number {
  let sum = 0;
  for (let j = 0; j < WATER.length; j += 7) {
    const fi = WATER[j], b1 = WATER[j + 1], b2 = WATER[j + 2], b3 = WATER[j + 3];
    const b4 = WATER[j + 4], b5 = WATER[j + 5], b6 = WATER[j + 6];
    const s = b1 * 1e-1 * e * theta ** 3.5 * Math.exp(b2 * (1 - theta));
    let df = b3 * 1e-4 * (p * theta ** b4 + b5 * e * theta ** b6);
    df = 0.535 * df + Math.sqrt(0.217 * df * df + (2.1316e-12 * fi * fi) / theta); // Doppler broadening
    sum += s * lineShape(f, fi, df, 0);
  }
  return sum;
}

export interface GasSpecificAttenuation { oxygenDBPerKm: number; waterDBPerKm: number; totalDBPerKm: number }

export interface GasAtmosphere {
  frequencyGHz: number;
  /** Dry-air pressure p (hPa). */
  pressureDryHPa: number;
  temperatureK: number;
  waterVapourDensityGM3: number;
}

function checkAtmosphere(fn: string, a: GasAtmosphere): void {
  checkAtLeast(fn, 'pressureDryHPa', a.pressureDryHPa, 0, 'hPa', true);
  checkAtLeast(fn, 'temperatureK', a.temperatureK, 0, 'K', true);
  checkAtLeast(fn, 'waterVapourDensityGM3', a.waterVapourDensityGM3, 0, 'g/m³');
}

/** γ = γo + γw = 0.1820 f (N''_ox + N''_wv) dB/km — ITU-R P.676-13 Annex 1. */
export function gasSpecificAttenuation(a: GasAtmosphere): GasSpecificAttenuation {
  const fn = 'gasSpecificAttenuation';
  checkRange(fn, 'frequencyGHz', a.frequencyGHz, P676_SPECIFIC_VALIDITY.frequencyGHz, 'GHz');
  checkAtmosphere(fn, a);
  const f = a.frequencyGHz, p = a.pressureDryHPa, T = a.temperatureK;
  const theta = 300 / T;
  const e = (a.waterVapourDensityGM3 * T) / 216.7;
  const oxygenDBPerKm = 0.182 * f * oxygenImaginaryRefractivity(f, p, e, theta);
  const waterDBPerKm = 0.182 * f * waterImaginaryRefractivity(f, p, e, theta);
  return { oxygenDBPerKm, waterDBPerKm, totalDBPerKm: oxygenDBPerKm + waterDBPerKm };
}

/** Water-vapour specific attenuation only (dB/km), P.676-13 Annex 1, without range checks. */
function waterSpecific(f: number, p: number, T: number, rho: number): number {
  const theta = 300 / T;
  return 0.182 * f * waterImaginaryRefractivity(f, p, (rho * T) / 216.7, theta);
}

const O2_T2_LINES = [
  [0.1597, 118.750334], [0.1066, 368.498246], [0.1325, 424.76302], [0.1242, 487.249273],
  [0.0938, 715.392902], [0.1448, 773.83949], [0.1374, 834.145546],
] as const;

/** Oxygen equivalent height h_o (km) — ITU-R P.676-12 Annex 2 §2.1. */
export function oxygenEquivalentHeightKm(a: GasAtmosphere): number {
  const f = a.frequencyGHz, T = a.temperatureK;
  const e = (a.waterVapourDensityGM3 * T) / 216.7;
  const rp = (a.pressureDryHPa + e) / 1013.25;
  const t1 = (5.104 / (1 + 0.066 * rp ** -2.3)) * Math.exp(-(((f - 59.7) / (2.87 + 12.4 * Math.exp(-7.9 * rp))) ** 2));
  let t2 = 0;
  for (const [ci, fi] of O2_T2_LINES) t2 += (ci * Math.exp(2.12 * rp)) / ((f - fi) ** 2 + 0.025 * Math.exp(2.2 * rp));
  const t3 = ((0.0114 * f) / (1 + 0.14 * rp ** -2.6))
    * ((15.02 * f * f - 1353 * f + 5.333e4) / (f ** 3 - 151.3 * f * f + 9629 * f - 6803));
  const aT = 0.7832 + 0.00709 * (T - 273.15);
  const ho = ((6.1 * aT) / (1 + 0.17 * rp ** -1.1)) * (1 + t1 + t2 + t3);
  return f < 70 ? Math.min(ho, 10.7 * rp ** 0.3) : ho;
}

const H2O_HW_LINES = [
  [22.23508, 1.52, 2.56], [183.310087, 7.62, 10.2], [325.152888, 1.56, 2.7], [380.197353, 4.15, 5.7],
  [439.150807, 0.2, 0.91], [448.001085, 1.63, 2.46], [474.689092, 0.76, 2.22], [488.490108, 0.26, 2.49],
  [556.935985, 7.81, 10], [620.70087, 1.25, 2.35], [752.033113, 16.2, 20], [916.171582, 1.47, 2.58],
  [970.315022, 1.36, 2.44], [987.926764, 1.6, 1.86],
] as const;

/** Water-vapour equivalent height h_w (km) — ITU-R P.676-12 Annex 2 §2.2. */
export function waterEquivalentHeightKm(a: GasAtmosphere): number {
  const f = a.frequencyGHz, T = a.temperatureK, rho = a.waterVapourDensityGM3;
  const e = (rho * T) / 216.7;
  const rp = (a.pressureDryHPa + e) / 1013.25;
  const aw = 1.9298 - 0.04166 * (T - 273.15) + 0.0517 * rho;
  const bw = 1.1674 - 0.00622 * (T - 273.15) + 0.0063 * rho;
  const sw = 1.013 / (1 + Math.exp(-8.6 * (rp - 0.57)));
  let s = 0;
  for (const [fi, ai, bi] of H2O_HW_LINES) s += (ai * sw) / ((f - fi) ** 2 + bi * sw);
  return aw + bw * s;
}

/**
 * Zenith water-vapour attenuation (dB) from the integrated content V_t (kg/m²)
 * — ITU-R P.676-12 Annex 2 §2.3: scaled from γw at 845 hPa and
 * 20.6 GHz, with the station-height correction (a h^b + 1) for f ≥ 20 GHz, h in [0, 4] km.
 */
export function zenithWaterVapourAttenuation(a: {
  frequencyGHz: number; waterVapourContentKgM2: number; stationHeightKm: number;
}): number {
  const fn = 'zenithWaterVapourAttenuation';
  checkRange(fn, 'frequencyGHz', a.frequencyGHz, P676_SLANT_VALIDITY.frequencyGHz, 'GHz');
  checkAtLeast(fn, 'waterVapourContentKgM2', a.waterVapourContentKgM2, 0, 'kg/m²', true);
  checkAtLeast(fn, 'stationHeightKm', a.stationHeightKm, -Infinity, 'km');
  const f = a.frequencyGHz, vt = a.waterVapourContentKgM2;
  const rhoRef = vt / 2.38;
  const tRefK = 14 * Math.log((0.22 * vt) / 2.38) + 3 + 273.15;
  const aw = (0.0176 * vt * waterSpecific(f, 845, tRefK, rhoRef)) / waterSpecific(20.6, 845, tRefK, rhoRef);
  if (f < 20) return aw;
  const h = Math.min(Math.max(a.stationHeightKm, 0), 4);
  const ca = 0.2048 * Math.exp(-(((f - 22.43) / 3.097) ** 2)) + 0.2326 * Math.exp(-(((f - 183.5) / 4.096) ** 2))
    + 0.2073 * Math.exp(-(((f - 325) / 3.651) ** 2)) - 0.1113;
  const cb = 8.741e4 * Math.exp(-0.587 * f) + 312.2 * f ** -2.38 + 0.723;
  return aw * (ca * h ** cb + 1);
}

export interface GasZenith {
  /** Zenith oxygen (dry-air) attenuation γo h_o (dB). */
  oxygenDB: number;
  /** Zenith water-vapour attenuation (dB): from V_t when given, else γw h_w. */
  waterDB: number;
  oxygenHeightKm: number;
  waterHeightKm: number;
}

export interface GasPathInput extends GasAtmosphere {
  stationHeightKm: number;
  /** Integrated water-vapour content V_t (kg/m²); when given, the water term uses P.676-12 §2.3. */
  waterVapourContentKgM2?: number;
}

/** Zenith parts of the slant gaseous attenuation — ITU-R P.676-12 Annex 2 §2.1–2.3. */
export function gasZenithAttenuation(a: GasPathInput): GasZenith {
  const fn = 'gasZenithAttenuation';
  checkRange(fn, 'frequencyGHz', a.frequencyGHz, P676_SLANT_VALIDITY.frequencyGHz, 'GHz');
  checkAtmosphere(fn, a);
  const g = gasSpecificAttenuation(a);
  const oxygenHeightKm = oxygenEquivalentHeightKm(a);
  const waterHeightKm = waterEquivalentHeightKm(a);
  const waterDB = a.waterVapourContentKgM2 !== undefined
    ? zenithWaterVapourAttenuation({
      frequencyGHz: a.frequencyGHz, waterVapourContentKgM2: a.waterVapourContentKgM2, stationHeightKm: a.stationHeightKm,
    })
    : g.waterDBPerKm * waterHeightKm;
  return { oxygenDB: g.oxygenDBPerKm * oxygenHeightKm, waterDB, oxygenHeightKm, waterHeightKm };
}

/** Effective Earth radius for the curved-path form (km), as in earlier P.676 editions (from memory). */
const RE_CURVED_KM = 8500;
const SIN5 = Math.sin(5 * DEG);

/** Curved-path path-length factor of an exponential layer of scale height h (from memory of earlier P.676 editions). */
function curvedFactor(thetaRad: number, h: number): number {
  const s = Math.sqrt(RE_CURVED_KM / h);
  const x = Math.tan(thetaRad) * s;
  return (s / Math.cos(thetaRad)) / (0.661 * x + 0.339 * Math.sqrt(x * x + 5.51));
}

/**
 * Ratio of slant to zenith attenuation for a layer of equivalent height h (km).
 * θ ≥ 5°: 1 / sin θ (P.676-12 Annex 2).
 * θ < 5°: the curved-path equivalent-height form of earlier P.676 editions
 * (from memory): sqrt(R/h) F(tan θ sqrt(R/h)) / cos θ with F(x) = 1/(0.661 x +
 * 0.339 sqrt(x² + 5.51)) and R = 8500 km, scaled by a constant so that it
 * equals 1/sin 5° at 5° (continuous; the unscaled form is ~7 % lower there).
 * (PHYSICS.md §4 writes the form without the 1/cos θ; without it the form would
 * not tend to 1/sin θ at high elevation, so we keep the 1/cos θ.)
 * At 0° it stays finite (≈ 1.257 sqrt(R/h) × scale). Negative elevations are refused.
 */
export function slantPathFactor(elevationDeg: number, equivalentHeightKm: number): number {
  if (!(elevationDeg >= 0 && elevationDeg <= 90)) {
    throw new RangeError(`slantPathFactor: elevationDeg = ${elevationDeg} is outside 0–90 deg`);
  }
  if (elevationDeg >= 5) return 1 / Math.sin(elevationDeg * DEG);
  const h = equivalentHeightKm > 0 ? equivalentHeightKm : 1e-3;
  return (curvedFactor(elevationDeg * DEG, h) * (1 / SIN5)) / curvedFactor(5 * DEG, h);
}

/**
 * Slant-path gaseous attenuation (dB) — ITU-R P.676-12 Annex 2:
 * A = γo h_o M(θ, h_o) + A_w M(θ, h_w), with A_w from V_t (§2.3) when given,
 * else γw h_w (§2.2); M = 1/sin θ from 5° to 90°, below 5° see slantPathFactor.
 */
export function gasSlantAttenuation(a: GasPathInput & { elevationDeg: number }): number {
  checkRange('gasSlantAttenuation', 'elevationDeg', a.elevationDeg, P676_SLANT_VALIDITY.elevationDeg, 'deg');
  return gasSlantFromZenith(gasZenithAttenuation(a), a.elevationDeg);
}

/** The slant form of gasSlantAttenuation from zenith parts already computed (they do not depend on elevation). */
export function gasSlantFromZenith(z: GasZenith, elevationDeg: number): number {
  checkRange('gasSlantFromZenith', 'elevationDeg', elevationDeg, P676_SLANT_VALIDITY.elevationDeg, 'deg');
  return z.oxygenDB * slantPathFactor(elevationDeg, z.oxygenHeightKm)
    + z.waterDB * slantPathFactor(elevationDeg, z.waterHeightKm);
}
