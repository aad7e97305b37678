import { describe, expect, it } from 'vitest';
import { rainAttenuation, scintillationFade, totalAttenuation } from '../../src/models/p618.js';
import { loadTable, referencePath, relativeError } from './reference.js';

// Source: ITU-R SG3 validation examples (CG-3M3J-13-ValEx), P.618-13 tables. Tolerance 1e-6 relative (README).
const TOL = 1e-6;

describe('P.618-13 §2.2.1.1 rain attenuation vs ITU-R SG3 validation examples', () => {
  const rows = loadTable('p618-13_rain_attenuation.csv');
  it.skipIf(!rows)(`every row of ${referencePath('p618-13_rain_attenuation.csv')}`, () => {
    for (const r of rows!) {
      const a = rainAttenuation({
        latitudeDeg: r.lat_deg, stationHeightKm: r.station_height_km, frequencyGHz: r.f_GHz, elevationDeg: r.elevation_deg,
        tiltDeg: r.tilt_deg, exceedancePercent: r.p_percent, rainRate001MmH: r.R001_mm_h, rainHeightKm: r.rain_height_km,
      });
      const tag = `lat=${r.lat_deg} f=${r.f_GHz} p=${r.p_percent}`;
      expect(relativeError(a.slantPathKm, r.Ls_km), `${tag} Ls=${a.slantPathKm}`).toBeLessThanOrEqual(TOL);
      expect(relativeError(a.attenuationDB, r.A_rain_dB), `${tag} A=${a.attenuationDB} vs ${r.A_rain_dB}`).toBeLessThanOrEqual(TOL);
    }
  });
});

describe('P.618-13 §2.4.1 scintillation vs ITU-R SG3 validation examples', () => {
  const rows = loadTable('p618-13_scintillation.csv');
  it.skipIf(!rows)(`every row of ${referencePath('p618-13_scintillation.csv')}`, () => {
    for (const r of rows!) {
      const a = scintillationFade({
        frequencyGHz: r.f_GHz, elevationDeg: r.elevation_deg, exceedancePercent: r.p_percent,
        antennaDiameterM: r.antenna_diameter_m, antennaEfficiency: r.antenna_efficiency, nWet: r.N_wet,
      });
      expect(relativeError(a, r.A_scintillation_dB), `f=${r.f_GHz} el=${r.elevation_deg} p=${r.p_percent}: ${a}`)
        .toBeLessThanOrEqual(TOL);
    }
  });
});

describe('P.618-13 §2.5 total attenuation vs ITU-R SG3 validation examples', () => {
  const rows = loadTable('p618-13_total_attenuation.csv');
  it.skipIf(!rows)(`every row of ${referencePath('p618-13_total_attenuation.csv')}`, () => {
    for (const r of rows!) {
      const a = totalAttenuation({
        exceedancePercent: r.p_percent, gasDB: r.A_gas_dB, gasAt1PctDB: r.A_gas_at_1pct_dB, cloudDB: r.A_cloud_dB,
        cloudAt1PctDB: r.A_cloud_at_1pct_dB, rainDB: r.A_rain_dB, scintillationDB: r.A_scintillation_dB,
      });
      expect(relativeError(a, r.A_total_dB), `p=${r.p_percent}: ${a} vs ${r.A_total_dB}`).toBeLessThanOrEqual(TOL);
    }
  });
});

describe('rain attenuation behaviour (P.618-13 §2.2.1.1 properties)', () => {
  const site = { latitudeDeg: 45, stationHeightKm: 0.2, frequencyGHz: 20, elevationDeg: 30, tiltDeg: 45, rainHeightKm: 3.5 };
  it('increases with rain rate and decreases with exceedance percentage', () => {
    let prev = 0;
    for (let r = 5; r <= 150; r += 5) {
      const a = rainAttenuation({ ...site, exceedancePercent: 0.1, rainRate001MmH: r }).attenuationDB;
      expect(a).toBeGreaterThan(prev);
      prev = a;
    }
    // Exceedance: all four β branches of step 10 (|φ| ≥ 36°; |φ| < 36° with θ ≥ 25° and θ < 25°).
    const cases: [number, number, number][] = [[45, 10, 0.001], [45, 30, 0.001], [10, 30, 0.001], [10, 10, 0.005]];
    for (const [lat, el, pMin] of cases) {
      let last = Infinity;
      for (const p of [0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 0.99, 1, 2, 5]) {
        if (p < pMin) continue;
        const a = rainAttenuation({ ...site, latitudeDeg: lat, elevationDeg: el, exceedancePercent: p, rainRate001MmH: 40 }).attenuationDB;
        expect(a, `lat=${lat} el=${el} p=${p}`).toBeLessThan(last);
        last = a;
      }
    }
  });
  it('reproduces the published step-10 exponent even where it is not monotone (tropics, low elevation, p < 0.005 %)', () => {
    // P.618-13 eq. for A_p with β = −0.005(|φ| − 36) + 1.8 − 4.25 sin θ: at φ = 10°, θ = 10°, R = 40 mm/h the
    // exponent is close to 0 near p = 0.001 %, so A(0.002 %) slightly exceeds A(0.001 %). We keep the model as published.
    const at = (p: number) => rainAttenuation({ ...site, latitudeDeg: 10, elevationDeg: 10, exceedancePercent: p, rainRate001MmH: 40 }).attenuationDB;
    expect(at(0.002)).toBeGreaterThan(at(0.001));
    expect(at(0.002) - at(0.001)).toBeLessThan(0.1);
  });
  it('is finite at 0° elevation, 0 with no rain or with the station above the rain', () => {
    const a0 = rainAttenuation({ ...site, elevationDeg: 0, exceedancePercent: 0.01, rainRate001MmH: 40 });
    // Step 2 curved form at θ = 0: Ls = sqrt(2 Δh R_e), R_e = 8500 km.
    expect(a0.slantPathKm).toBeCloseTo(Math.sqrt(2 * 3.3 * 8500), 9);
    expect(Number.isFinite(a0.attenuationDB)).toBe(true);
    expect(a0.attenuationDB).toBeGreaterThan(rainAttenuation({ ...site, elevationDeg: 5, exceedancePercent: 0.01, rainRate001MmH: 40 }).attenuationDB);
    expect(rainAttenuation({ ...site, exceedancePercent: 0.01, rainRate001MmH: 0 }).attenuationDB).toBe(0);
    expect(rainAttenuation({ ...site, stationHeightKm: 4, exceedancePercent: 0.01, rainRate001MmH: 40 }).attenuationDB).toBe(0);
  });
});

describe('scintillation below 5° (documented handling: value at 5°)', () => {
  it('holds the 5° value and stays finite at 0°', () => {
    const base = { frequencyGHz: 14.25, exceedancePercent: 1, antennaDiameterM: 1, antennaEfficiency: 0.65, nWet: 50 };
    expect(scintillationFade({ ...base, elevationDeg: 0 })).toBe(scintillationFade({ ...base, elevationDeg: 5 }));
    expect(scintillationFade({ ...base, elevationDeg: 5 })).toBeGreaterThan(scintillationFade({ ...base, elevationDeg: 6 }));
  });
});
