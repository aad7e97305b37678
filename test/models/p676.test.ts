import { describe, expect, it } from 'vitest';
import {
  gasSlantAttenuation, gasSpecificAttenuation, gasZenithAttenuation, slantPathFactor, zenithWaterVapourAttenuation,
} from '../../src/models/p676.js';
import { loadTable, referencePath, relativeError } from './reference.js';

// Source: ITU-R SG3 validation examples (CG-3M3J-13-ValEx), ../shared/reference/itu-r/. Tolerance 1e-6 relative (README).
const TOL = 1e-6;

describe('P.676-13 Annex 1 specific attenuation vs ITU-R SG3 validation examples', () => {
  const rows = loadTable('p676-13_specific_attenuation.csv');
  it.skipIf(!rows)(`every row of ${referencePath('p676-13_specific_attenuation.csv')}`, () => {
    let worst = 0;
    for (const r of rows!) {
      const g = gasSpecificAttenuation({
        frequencyGHz: r.f_GHz, pressureDryHPa: r.p_dry_hPa, temperatureK: r.T_K, waterVapourDensityGM3: r.rho_g_m3,
      });
      const errs = [
        relativeError(g.oxygenDBPerKm, r.gamma_oxygen_dB_km),
        relativeError(g.waterDBPerKm, r.gamma_water_dB_km),
        relativeError(g.totalDBPerKm, r.gamma_total_dB_km),
      ];
      for (const e of errs) {
        if (e > TOL) throw new Error(`f=${r.f_GHz}: rel err ${e} (${JSON.stringify(g)} vs ${JSON.stringify(r)})`);
        worst = Math.max(worst, e);
      }
    }
    expect(rows!.length).toBeGreaterThan(100);
    expect(worst).toBeLessThanOrEqual(TOL);
  });
});

describe('P.676-12 Annex 2 zenith water vapour from V_t vs ITU-R SG3 validation examples', () => {
  const rows = loadTable('p676-12_zenith_water_vapour_attenuation.csv');
  it.skipIf(!rows)(`every row of ${referencePath('p676-12_zenith_water_vapour_attenuation.csv')}`, () => {
    for (const r of rows!) {
      const a = zenithWaterVapourAttenuation({
        frequencyGHz: r.f_GHz, waterVapourContentKgM2: r.V_t_kg_m2, stationHeightKm: r.station_height_km,
      });
      expect(relativeError(a, r.A_water_zenith_dB), `f=${r.f_GHz} Vt=${r.V_t_kg_m2}: ${a} vs ${r.A_water_zenith_dB}`)
        .toBeLessThanOrEqual(TOL);
    }
  });
});

describe('P.676-12 Annex 2 slant gaseous attenuation vs ITU-R SG3 validation examples', () => {
  const rows = loadTable('p676-12_slant_gaseous_attenuation.csv');
  it.skipIf(!rows)(`every row of ${referencePath('p676-12_slant_gaseous_attenuation.csv')}`, () => {
    for (const r of rows!) {
      const a = gasSlantAttenuation({
        frequencyGHz: r.f_GHz, elevationDeg: r.elevation_deg, pressureDryHPa: r.p_dry_hPa, temperatureK: r.T_K,
        waterVapourDensityGM3: r.rho_g_m3, waterVapourContentKgM2: r.V_t_kg_m2, stationHeightKm: r.station_height_km,
      });
      expect(relativeError(a, r.A_gas_dB), `f=${r.f_GHz} el=${r.elevation_deg}: ${a} vs ${r.A_gas_dB}`)
        .toBeLessThanOrEqual(TOL);
    }
  });
});

describe('slant gaseous attenuation from 0° to 90° (low-elevation handling of p676.ts)', () => {
  // Mid-latitude-like surface values (invented for the check); continuity criterion from the project brief.
  const base = { pressureDryHPa: 1000, temperatureK: 288.15, waterVapourDensityGM3: 7.5, stationHeightKm: 0.1 };
  for (const frequencyGHz of [2.2, 8.2, 26]) {
    it(`has no step > 1 % between elevations 0.01° apart at ${frequencyGHz} GHz, with and without V_t`, () => {
      for (const vt of [undefined, 20]) {
        const z = gasZenithAttenuation({ ...base, frequencyGHz, waterVapourContentKgM2: vt });
        let prev = NaN;
        let worst = 0;
        for (let i = 0; i <= 9000; i++) {
          const el = i / 100;
          const a = z.oxygenDB * slantPathFactor(el, z.oxygenHeightKm) + z.waterDB * slantPathFactor(el, z.waterHeightKm);
          expect(Number.isFinite(a)).toBe(true);
          if (i > 0) worst = Math.max(worst, Math.abs(a - prev) / prev);
          prev = a;
        }
        expect(worst).toBeLessThan(0.01);
      }
      // The full function agrees with the table form, and 0° is finite and larger than 5°.
      const a0 = gasSlantAttenuation({ ...base, frequencyGHz, elevationDeg: 0 });
      const a5 = gasSlantAttenuation({ ...base, frequencyGHz, elevationDeg: 5 });
      const a90 = gasSlantAttenuation({ ...base, frequencyGHz, elevationDeg: 90 });
      expect(a0).toBeGreaterThan(a5);
      expect(a5 / a90).toBeCloseTo(1 / Math.sin((5 * Math.PI) / 180), 9);
    });
  }
  it('matches 1/sin θ exactly from 5° up (P.676-12 Annex 2 eq. (28)) and is continuous at 5°', () => {
    expect(slantPathFactor(30, 6)).toBeCloseTo(2, 12);
    const below = slantPathFactor(5 - 1e-9, 6);
    expect(Math.abs(below - slantPathFactor(5, 6)) / below).toBeLessThan(1e-6);
  });
});
