/**
 * Station climate: the user's surface values, with defaults, resolved into the
 * `Climate` the atmospheric models consume. Pure: errors and defaults go
 * through the callbacks so they carry the scenario line.
 */
import type { Climate } from '../budget/types.js';
import type { AppliedDefault } from './types.js';
import type { ClimateInput } from './schema.js';
import type { Path } from './source.js';
import {
  defaultIsothermHeightKm, rainHeightKm, rainRateForZone, saturationVapourPressureHPa, wetRefractivity,
} from '../models/index.js';

export interface ResolveContext {
  fail(path: Path, message: string): never;
  recordDefault(d: AppliedDefault): void;
  warn(message: string): void;
  formatPath(path: Path): string;
}

/** ITU-R P.835 mean annual global reference atmosphere, h in km below 11 km (from memory). */
export function referenceAtmosphere(heightKm: number): { temperatureK: number; pressureHPa: number; waterVapourDensityGM3: number } {
  const h = Math.max(0, heightKm);
  const temperatureK = 288.15 - 6.5 * h;
  return {
    temperatureK,
    pressureHPa: 1013.25 * (288.15 / temperatureK) ** (-34.1632 / 6.5),
    waterVapourDensityGM3: 7.5 * Math.exp(-h / 2),
  };
}

const fmt = (x: number, digits = 3) => String(Number(x.toFixed(digits)));

function both(ctx: ResolveContext, at: Path, input: object, a: string, b: string): void {
  const o = input as Record<string, unknown>;
  if (o[a] !== undefined && o[b] !== undefined) {
    ctx.fail([...at, b], `give either ${a} or ${b}, not both`);
  }
}

export function resolveClimate(
  c: ClimateInput,
  station: { latitudeDeg: number; heightM: number },
  at: Path,
  ctx: ResolveContext,
): Climate {
  const P = (k: string) => ctx.formatPath([...at, k]);
  const hKm = station.heightM / 1000;
  const ref = referenceAtmosphere(hKm);
  for (const [a, b] of [['temperature_c', 'temperature_k'], ['pressure_hpa', 'pressure_dry_hpa'], ['rain_rate_001_mm_h', 'rain_zone'], ['isotherm_height_km', 'rain_height_km']] as const) {
    both(ctx, at, c, a, b);
  }

  // Temperature.
  let temperatureK: number;
  if (c.temperature_k !== undefined) temperatureK = c.temperature_k;
  else if (c.temperature_c !== undefined) temperatureK = c.temperature_c + 273.15;
  else {
    temperatureK = ref.temperatureK;
    ctx.recordDefault({ path: P('temperature_k'), value: fmt(temperatureK, 2), reason: 'ITU-R P.835 mean annual global reference atmosphere at the station height, T = 288.15 − 6.5 h K (from memory)' });
  }
  const temperatureC = temperatureK - 273.15;

  // Water vapour: density for P.676, partial pressure e for the dry pressure, N_wet for scintillation.
  let waterVapourDensityGM3: number;
  let eHPa: number;
  if (c.water_vapour_density_g_m3 !== undefined) {
    waterVapourDensityGM3 = c.water_vapour_density_g_m3;
    eHPa = (waterVapourDensityGM3 * temperatureK) / 216.7;
  } else if (c.relative_humidity_pct !== undefined) {
    // ITU-R P.453: e = H e_s / 100; ρ = 216.7 e / T.
    eHPa = (c.relative_humidity_pct * saturationVapourPressureHPa({ temperatureC })) / 100;
    waterVapourDensityGM3 = (216.7 * eHPa) / temperatureK;
    ctx.recordDefault({ path: P('water_vapour_density_g_m3'), value: fmt(waterVapourDensityGM3), reason: `from relative_humidity_pct and temperature: e = H e_s / 100 (ITU-R P.453), ρ = 216.7 e / T` });
  } else {
    waterVapourDensityGM3 = ref.waterVapourDensityGM3;
    eHPa = (waterVapourDensityGM3 * temperatureK) / 216.7;
    ctx.recordDefault({ path: P('water_vapour_density_g_m3'), value: fmt(waterVapourDensityGM3), reason: 'ITU-R P.835 reference water-vapour density ρ = 7.5 exp(−h / 2) g/m³ at the station height (from memory)' });
  }

  let nWet: number;
  if (c.n_wet !== undefined) nWet = c.n_wet;
  else if (c.relative_humidity_pct !== undefined) {
    nWet = wetRefractivity({ temperatureC, relativeHumidityPercent: c.relative_humidity_pct });
    ctx.recordDefault({ path: P('n_wet'), value: fmt(nWet), reason: 'from relative_humidity_pct and temperature, ITU-R P.453 (N_wet = 3.732e5 e / T²)' });
  } else {
    nWet = (3.732e5 * eHPa) / (temperatureK * temperatureK);
    ctx.recordDefault({ path: P('n_wet'), value: fmt(nWet), reason: 'from the water-vapour density and temperature, ITU-R P.453 (N_wet = 3.732e5 e / T², e = ρ T / 216.7)' });
  }

  // Pressure: P.676 wants the dry-air pressure p; a total pressure P gives p = P − e.
  let pressureDryHPa: number;
  if (c.pressure_dry_hpa !== undefined) pressureDryHPa = c.pressure_dry_hpa;
  else {
    const total = c.pressure_hpa ?? ref.pressureHPa;
    if (c.pressure_hpa === undefined) {
      ctx.recordDefault({ path: P('pressure_hpa'), value: fmt(total, 2), reason: 'ITU-R P.835 reference atmosphere total pressure at the station height (from memory)' });
    }
    pressureDryHPa = total - eHPa;
    ctx.recordDefault({ path: P('pressure_dry_hpa'), value: fmt(pressureDryHPa, 2), reason: 'dry-air pressure p = P − e from the total pressure (ITU-R P.676 uses dry-air pressure)' });
    if (!(pressureDryHPa > 0)) ctx.fail([...at, c.pressure_hpa !== undefined ? 'pressure_hpa' : 'water_vapour_density_g_m3'], `the dry-air pressure P − e is ${fmt(pressureDryHPa)} hPa (must be > 0)`);
  }

  // Rain rate R0.01.
  let rainRate001MmH: number;
  if (c.rain_rate_001_mm_h !== undefined) rainRate001MmH = c.rain_rate_001_mm_h;
  else if (c.rain_zone !== undefined) {
    rainRate001MmH = rainRateForZone(c.rain_zone);
    ctx.recordDefault({ path: P('rain_rate_001_mm_h'), value: fmt(rainRate001MmH), reason: `ITU-R P.837-1 rain-climate zone ${c.rain_zone} (from memory)` });
  } else {
    return ctx.fail([...at, 'rain_rate_001_mm_h'], 'missing (give rain_rate_001_mm_h in mm/h or rain_zone, a P.837-1 zone letter)');
  }

  // Rain height h_R (P.839: h_R = h_0 + 0.36 km).
  let rainHeight: number;
  if (c.rain_height_km !== undefined) rainHeight = c.rain_height_km;
  else {
    let iso = c.isotherm_height_km;
    if (iso === undefined) {
      iso = defaultIsothermHeightKm({ latitudeDeg: station.latitudeDeg });
      ctx.recordDefault({ path: P('isotherm_height_km'), value: fmt(iso), reason: 'older ITU-R P.839 latitude rule for the 0 °C isotherm height (from memory), rough' });
    }
    rainHeight = rainHeightKm({ isothermHeightKm: iso });
    ctx.recordDefault({ path: P('rain_height_km'), value: fmt(rainHeight), reason: 'ITU-R P.839: h_R = h_0 + 0.36 km' });
  }
  if (rainHeight <= hKm) ctx.warn(`${P('rain_height_km')}: rain height ${fmt(rainHeight)} km is at or below the station (${fmt(hKm)} km): rain attenuation will be 0`);

  let cloud = c.cloud_liquid_water_kg_m2;
  if (cloud === undefined) {
    cloud = 0.5;
    ctx.recordDefault({ path: P('cloud_liquid_water_kg_m2'), value: '0.5', reason: 'rough columnar liquid water exceeded about 1 % of the year at mid-latitudes (from memory); take the site value from the ITU-R P.840 maps' });
  }
  let clearCloud = c.clear_sky_cloud_liquid_water_kg_m2;
  if (clearCloud === undefined) {
    clearCloud = 0;
    ctx.recordDefault({ path: P('clear_sky_cloud_liquid_water_kg_m2'), value: '0', reason: 'clear sky means gases only' });
  }
  let tmr = c.mean_radiating_temperature_k;
  if (tmr === undefined) {
    tmr = 37.34 + 0.81 * temperatureK;
    ctx.recordDefault({ path: P('mean_radiating_temperature_k'), value: fmt(tmr, 2), reason: 'T_mr = 37.34 + 0.81 T_s, ITU-R P.618 §3 (from memory)' });
  }

  const climate: Climate = {
    latitudeDeg: station.latitudeDeg,
    stationHeightKm: hKm,
    pressureDryHPa,
    temperatureK,
    waterVapourDensityGM3,
    nWet,
    rainRate001MmH,
    rainHeightKm: rainHeight,
    cloudLiquidWaterKgM2: cloud,
    clearSkyCloudLiquidWaterKgM2: clearCloud,
    meanRadiatingTemperatureK: tmr,
  };
  if (c.water_vapour_content_kg_m2 !== undefined) climate.waterVapourContentKgM2 = c.water_vapour_content_kg_m2;
  return climate;
}
