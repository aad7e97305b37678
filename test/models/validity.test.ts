import { describe, expect, it } from 'vitest';
import * as m from '../../src/models/index.js';

// Each model refuses inputs outside its declared validity with `fn: arg = value is outside range`.
const atm = { pressureDryHPa: 1013.25, temperatureK: 288.15, waterVapourDensityGM3: 7.5 };
const rain = { latitudeDeg: 45, stationHeightKm: 0.1, frequencyGHz: 20, elevationDeg: 30, tiltDeg: 45, exceedancePercent: 0.01, rainRate001MmH: 40, rainHeightKm: 3 };
const scint = { frequencyGHz: 14, elevationDeg: 30, exceedancePercent: 1, antennaDiameterM: 1, antennaEfficiency: 0.6, nWet: 50 };

const cases: [string, () => unknown, RegExp][] = [
  ['P.676 frequency', () => m.gasSpecificAttenuation({ ...atm, frequencyGHz: 1200 }), /^gasSpecificAttenuation: frequencyGHz = 1200 is outside 1–1000 GHz$/],
  ['P.676 frequency low', () => m.gasSpecificAttenuation({ ...atm, frequencyGHz: 0.5 }), /frequencyGHz = 0.5 is outside 1–1000 GHz/],
  ['P.676 pressure', () => m.gasSpecificAttenuation({ ...atm, frequencyGHz: 10, pressureDryHPa: -1 }), /pressureDryHPa = -1 is outside > 0 hPa/],
  ['P.676 slant elevation', () => m.gasSlantAttenuation({ ...atm, frequencyGHz: 10, stationHeightKm: 0, elevationDeg: -0.5 }), /gasSlantAttenuation: elevationDeg = -0.5 is outside 0–90 deg/],
  ['P.676 V_t', () => m.zenithWaterVapourAttenuation({ frequencyGHz: 10, waterVapourContentKgM2: 0, stationHeightKm: 0 }), /waterVapourContentKgM2 = 0 is outside > 0/],
  ['P.838 frequency', () => m.rainSpecificCoefficients({ frequencyGHz: 0.9, elevationDeg: 10, tiltDeg: 0 }), /rainSpecificCoefficients: frequencyGHz = 0.9 is outside 1–1000 GHz/],
  ['P.618 rain frequency', () => m.rainAttenuation({ ...rain, frequencyGHz: 60 }), /^rainAttenuation: frequencyGHz = 60 is outside 1–55 GHz$/],
  ['P.618 rain exceedance', () => m.rainAttenuation({ ...rain, exceedancePercent: 10 }), /exceedancePercent = 10 is outside 0.001–5 %/],
  ['P.618 rain elevation', () => m.rainAttenuation({ ...rain, elevationDeg: 91 }), /elevationDeg = 91 is outside 0–90 deg/],
  ['P.618 rain rate', () => m.rainAttenuation({ ...rain, rainRate001MmH: -3 }), /rainRate001MmH = -3 is outside ≥ 0 mm\/h/],
  ['P.618 rain NaN', () => m.rainAttenuation({ ...rain, elevationDeg: NaN }), /elevationDeg = NaN is outside 0–90 deg/],
  ['P.618 scintillation frequency', () => m.scintillationFade({ ...scint, frequencyGHz: 2 }), /scintillationFade: frequencyGHz = 2 is outside 4–55 GHz/],
  ['P.618 scintillation exceedance', () => m.scintillationFade({ ...scint, exceedancePercent: 60 }), /exceedancePercent = 60 is outside 0.001–50 %/],
  ['P.618 total exceedance', () => m.totalAttenuation({ exceedancePercent: 0, gasDB: 0, gasAt1PctDB: 0, cloudDB: 0, cloudAt1PctDB: 0, rainDB: 0, scintillationDB: 0 }), /totalAttenuation: exceedancePercent = 0 is outside/],
  ['P.840 frequency', () => m.cloudSpecificCoefficient({ frequencyGHz: 2000, temperatureK: 273.15 }), /cloudSpecificCoefficient: frequencyGHz = 2000 is outside 1–1000 GHz/],
  ['P.840 water', () => m.cloudAttenuation({ frequencyGHz: 20, elevationDeg: 10, liquidWaterKgM2: -1 }), /liquidWaterKgM2 = -1 is outside ≥ 0/],
  ['P.453 humidity', () => m.wetRefractivity({ temperatureC: 20, relativeHumidityPercent: 120 }), /wetRefractivity: relativeHumidityPercent = 120 is outside 0–100 %/],
  ['P.453 temperature', () => m.wetRefractivity({ temperatureC: 70, relativeHumidityPercent: 50 }), /temperatureC = 70 is outside -40–50 °C/],
  ['P.839 latitude', () => m.defaultIsothermHeightKm({ latitudeDeg: 100 }), /latitudeDeg = 100 is outside -90–90 deg/],
  ['P.372 frequency', () => m.externalNoiseTemperatureK({ frequencyMHz: 0.1, environment: 'rural' }), /frequencyMHz = 0.1 is outside ≥ 0.3 MHz/],
  ['P.531 frequency', () => m.faradayRotationDeg({ frequencyMHz: 10, electronContentTECU: 10 }), /faradayRotationDeg: frequencyMHz = 10 is outside 30–30000 MHz/],
  ['antenna efficiency', () => m.parabolicGainDBi({ diameterM: 1, frequencyGHz: 2, efficiency: 1.5 }), /efficiency = 1.5 is outside/],
  ['antenna beamwidth', () => m.cosinePowerExponent({ beamwidthDeg: 200 }), /beamwidthDeg = 200 is outside/],
  ['BER modulation', () => m.bitErrorRate({ modulation: '8psk' as never, ebN0DB: 5 }), /modulation = "8psk" is outside bpsk, qpsk/],
  ['BER target', () => m.requiredEbN0DB({ modulation: 'bpsk', bitErrorRate: 0.6 }), /requiredEbN0DB: bitErrorRate = 0.6 is outside/],
  ['sky noise', () => m.skyNoiseTemperatureK({ attenuationDB: -1 }), /attenuationDB = -1 is outside ≥ 0 dB/],
  ['system noise', () => m.systemNoiseTemperatureK({ antennaTemperatureK: 50, feedLossDB: -0.1, receiverTemperatureK: 40 }), /feedLossDB = -0.1 is outside ≥ 0 dB/],
];

describe('out-of-range calls throw a RangeError naming function, argument, value and range', () => {
  it.each(cases)('%s', (_label, call, message) => {
    expect(call).toThrow(RangeError);
    expect(call).toThrow(message);
  });
  it('validity ranges are exported as data for the scenario loader', () => {
    expect(m.P618_RAIN_VALIDITY).toEqual({ frequencyGHz: [1, 55], exceedancePercent: [0.001, 5], elevationDeg: [0, 90] });
    expect(m.P676_SPECIFIC_VALIDITY.frequencyGHz).toEqual([1, 1000]);
    expect(m.P618_SCINTILLATION_VALIDITY.frequencyGHz).toEqual([4, 55]);
    expect(m.P838_VALIDITY.frequencyGHz).toEqual([1, 1000]);
    expect(m.P840_VALIDITY.frequencyGHz).toEqual([1, 1000]);
  });
});
