import { describe, expect, it } from 'vitest';
import { cloudAttenuation, cloudSpecificCoefficient } from '../../src/models/p840.js';
import { saturationVapourPressureHPa, wetRefractivity } from '../../src/models/p453.js';
import { defaultIsothermHeightKm, rainHeightKm } from '../../src/models/p839.js';
import { rainRateForZone } from '../../src/models/p837.js';

describe('cloud attenuation (ITU-R P.840)', () => {
  it('K_l matches the check values of PHYSICS.md §6 computed from the P.840 equations: 0.771 at 30 GHz, 0.0655 at 8.4 GHz (0 °C)', () => {
    expect(cloudSpecificCoefficient({ frequencyGHz: 30, temperatureK: 273.15 })).toBeCloseTo(0.771, 3);
    expect(cloudSpecificCoefficient({ frequencyGHz: 8.4, temperatureK: 273.15 })).toBeCloseTo(0.0655, 4);
  });
  it('A = L K_l / sin θ from 5° up, and is continuous and finite below 5° (curved-path substitute)', () => {
    const kl = cloudSpecificCoefficient({ frequencyGHz: 20, temperatureK: 273.15 });
    expect(cloudAttenuation({ frequencyGHz: 20, elevationDeg: 30, liquidWaterKgM2: 0.5 })).toBeCloseTo(0.5 * kl * 2, 12);
    let prev = cloudAttenuation({ frequencyGHz: 20, elevationDeg: 0, liquidWaterKgM2: 0.5 });
    expect(Number.isFinite(prev)).toBe(true);
    for (let i = 1; i <= 1000; i++) {
      const a = cloudAttenuation({ frequencyGHz: 20, elevationDeg: i / 100, liquidWaterKgM2: 0.5 });
      expect(a).toBeLessThan(prev);
      expect((prev - a) / prev).toBeLessThan(0.01);
      prev = a;
    }
  });
});

describe('wet refractivity (ITU-R P.453)', () => {
  it('saturation vapour pressure is within 0.1 % of steam-table values at 0 °C and 20 °C (6.112 and 23.39 hPa, IAPWS; from memory)', () => {
    expect(Math.abs(saturationVapourPressureHPa({ temperatureC: 0 }) - 6.112) / 6.112).toBeLessThan(1e-3);
    expect(Math.abs(saturationVapourPressureHPa({ temperatureC: 20 }) - 23.39) / 23.39).toBeLessThan(1e-3);
  });
  it('N_wet = 3.732e5 e / T² with e = H e_s / 100, and is 0 in dry air', () => {
    const es = saturationVapourPressureHPa({ temperatureC: 15 });
    expect(wetRefractivity({ temperatureC: 15, relativeHumidityPercent: 60 })).toBeCloseTo((3.732e5 * 0.6 * es) / 288.15 ** 2, 10);
    expect(wetRefractivity({ temperatureC: 15, relativeHumidityPercent: 0 })).toBe(0);
  });
});

describe('rain height and rain climate defaults', () => {
  it('h_R = h_0 + 0.36 km (ITU-R P.839-4)', () => {
    expect(rainHeightKm({ isothermHeightKm: 3.2 })).toBeCloseTo(3.56, 12);
  });
  it('older P.839 latitude rule for h_0 (from memory)', () => {
    expect(defaultIsothermHeightKm({ latitudeDeg: 10 })).toBe(5);
    expect(defaultIsothermHeightKm({ latitudeDeg: -21 })).toBe(5);
    expect(defaultIsothermHeightKm({ latitudeDeg: 45 })).toBeCloseTo(5 - 0.075 * 22, 12);
    expect(defaultIsothermHeightKm({ latitudeDeg: -31 })).toBeCloseTo(4, 12);
    expect(defaultIsothermHeightKm({ latitudeDeg: 90 })).toBe(0);
  });
  it('P.837-1 zone rates (from memory) and RangeError for an unknown zone', () => {
    expect(rainRateForZone('K')).toBe(42);
    expect(rainRateForZone('P')).toBe(145);
    expect(() => rainRateForZone('I')).toThrow(/zone = "I" is outside A, B, C/);
    expect(() => rainRateForZone('toString')).toThrow(RangeError);
  });
});
