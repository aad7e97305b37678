import { describe, expect, it } from 'vitest';
import {
  BOLTZMANN_DBW_PER_K_HZ, gOverTDBK, meanRadiatingTemperatureK, noiseTemperatureFromFigureK, skyNoiseTemperatureK,
  systemNoiseTemperatureK,
} from '../../src/models/noise.js';
import { externalNoiseIsExtrapolated, externalNoiseTemperatureK, galacticNoiseTemperatureK } from '../../src/models/p372.js';

describe('Boltzmann constant in dB', () => {
  it('is 10 log10(1.380649e-23) (SI 2019, exact k) and rounds to the trade value −228.60 dBW/(K·Hz)', () => {
    expect(BOLTZMANN_DBW_PER_K_HZ).toBeCloseTo(-228.59917, 5);
    expect(Math.round(BOLTZMANN_DBW_PER_K_HZ * 100) / 100).toBe(-228.6);
  });
});

describe('sky noise temperature (ITU-R P.618-13 §3; T_mr and T_c from memory)', () => {
  it('is the cosmic background with no attenuation and tends to T_mr for an opaque path', () => {
    expect(skyNoiseTemperatureK({ attenuationDB: 0 })).toBeCloseTo(2.725, 12);
    expect(skyNoiseTemperatureK({ attenuationDB: 100, meanRadiatingTemperatureK: 260 })).toBeCloseTo(260, 6);
  });
  it('is the mean of T_mr and T_c at 3.0103 dB (half the power transmitted)', () => {
    expect(skyNoiseTemperatureK({ attenuationDB: 10 * Math.log10(2) })).toBeCloseTo((275 + 2.725) / 2, 9);
  });
  it('T_mr = 37.34 + 0.81 T_s (from memory)', () => {
    expect(meanRadiatingTemperatureK({ surfaceTemperatureK: 290 })).toBeCloseTo(272.24, 9);
  });
});

describe('system noise temperature and G/T (Friis; common practice)', () => {
  it('a 3.01 dB noise figure is 290 K (T = T0 (10^(NF/10) − 1))', () => {
    expect(noiseTemperatureFromFigureK(10 * Math.log10(2))).toBeCloseTo(290, 9);
  });
  it('with a lossless feed T_sys = T_A + T_rx; a lossy feed at 290 K seen by a 290 K antenna adds nothing', () => {
    expect(systemNoiseTemperatureK({ antennaTemperatureK: 50, feedLossDB: 0, receiverTemperatureK: 40 })).toBeCloseTo(90, 12);
    expect(systemNoiseTemperatureK({ antennaTemperatureK: 290, feedLossDB: 2, receiverTemperatureK: 40 })).toBeCloseTo(330, 9);
    // 0.5 dB feed: T_A·0.891251 + 290·0.108749 + T_rx.
    const g = 10 ** -0.05;
    expect(systemNoiseTemperatureK({ antennaTemperatureK: 30, feedLossDB: 0.5, receiverNoiseFigureDB: 1 }))
      .toBeCloseTo(30 * g + 290 * (1 - g) + 290 * (10 ** 0.1 - 1), 9);
  });
  it('G/T = G − L − 10 log10 T_sys', () => {
    expect(gOverTDBK({ gainDBi: 40, feedLossDB: 0.5, systemTemperatureK: 100 })).toBeCloseTo(19.5, 12);
  });
});

describe('external noise (ITU-R P.372, from memory)', () => {
  it('galactic: F_a = 52 − 23 log10 f(MHz), T = 290 · 10^(F_a/10)', () => {
    expect(galacticNoiseTemperatureK(100)).toBeCloseTo(290 * 10 ** 0.6, 9);
  });
  it('adds man-made to galactic, ordered city > residential > rural > quiet rural; none = 0 K', () => {
    const at = (environment: 'none' | 'city' | 'residential' | 'rural' | 'quiet-rural') => externalNoiseTemperatureK({ frequencyMHz: 145, environment });
    expect(at('none')).toBe(0);
    expect(at('city')).toBeCloseTo(290 * 10 ** ((76.8 - 27.7 * Math.log10(145)) / 10) + galacticNoiseTemperatureK(145), 9);
    expect(at('city')).toBeGreaterThan(at('residential'));
    expect(at('residential')).toBeGreaterThan(at('rural'));
    expect(at('rural')).toBeGreaterThan(at('quiet-rural'));
    expect(at('quiet-rural')).toBeGreaterThan(galacticNoiseTemperatureK(145));
  });
  it('flags use above 250 MHz as extrapolation and rejects unknown environments', () => {
    expect(externalNoiseIsExtrapolated(145)).toBe(false);
    expect(externalNoiseIsExtrapolated(437)).toBe(true);
    expect(() => externalNoiseTemperatureK({ frequencyMHz: 145, environment: 'suburb' as never })).toThrow(/environment = "suburb" is outside/);
  });
});
