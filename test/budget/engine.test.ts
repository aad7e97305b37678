/**
 * The engine against a budget worked by hand, and reciprocity of downlink/uplink.
 * Sources: ITU-R P.525 (free-space loss), the aperture gain G = η(πD/λ)²,
 * Friis system temperature at the LNA input, k = 1.380649e-23 J/K (2019 SI),
 * i.e. −228.60 dBW/K/Hz. The atmospheric terms come from the models (tested
 * separately against the ITU-R SG3 validation tables) and are compared here by
 * calling the same models directly.
 */
import { describe, expect, it } from 'vitest';
import { createLinkEngine } from '../../src/budget/engine.js';
import {
  gasSlantAttenuation, polarisationLossDB, skyNoiseTemperatureK,
} from '../../src/models/index.js';
import { InputError } from '../../src/errors.js';
import type { LinkSpec } from '../../src/budget/types.js';
import { baseClimate, baseLink, CASES, sampleAtElevation } from './fixtures.js';

const dryClimate = baseClimate({ rainRate001MmH: 0, cloudLiquidWaterKgM2: 0 });

describe('worked example, X-band downlink, every term by hand', () => {
  // Geometry: 8.2 GHz, 500 km altitude, elevation chosen so the slant range is 1500 km.
  // Range d(ε) on a sphere: d = −R sin ε + sqrt(R² sin² ε + 2 R h + h²); we search ε for d = 1500 km.
  // The range falls monotonically with elevation: bisection.
  let lo = 0, hi = 90;
  for (let i = 0; i < 80; i++) {
    const mid = (lo + hi) / 2;
    if (sampleAtElevation(mid).rangeKm > 1500) lo = mid; else hi = mid;
  }
  const el = (lo + hi) / 2;
  const sample = sampleAtElevation(el);
  const engine = createLinkEngine({ link: baseLink(), climate: dryClimate, weatherCases: [CASES[0]] });
  const step = engine.evaluate(sample);
  const c = step.cases[0];

  it('uses a 1500 km slant range', () => {
    expect(step.range_km).toBeCloseTo(1500, 6);
  });
  it('free-space loss, P.525', () => {
    // L = 20 log10(4π d f / c) = 20 log10(4π · 1.5e6 m · 8.2e9 Hz / 299 792 458 m/s)
    //   = 20 log10(5.15577e8) = 174.2459 dB
    expect(step.free_space_loss_db).toBeCloseTo(174.2459, 2);
  });
  it('EIRP = P − L_line + G: 10 dBW − 1 dB + 3 dBi = 12 dBW (isotropic 3 dBi, tracking, no error)', () => {
    expect(step.eirp_dbw).toBeCloseTo(12, 10);
    expect(step.tx_off_boresight_deg).toBe(0);
    expect(step.tx_pointing_loss_db).toBe(0);
  });
  it('dish gain G = η(πD/λ)² and Friis system temperature give G/T', () => {
    // λ = c/f = 0.0365601 m; πD/λ = 257.79; η(πD/λ)² = 0.6 · 66455.1 = 39873.1 → 46.0068 dBi
    expect(engine.groundAntenna.peakGainDBi).toBeCloseTo(46.0068, 3);
    // Antenna temperature given as 100 K (override, so no sky model here).
    // a = 10^(−0.3/10) = 0.933254; T_A a = 93.3254 K; T0 (1 − a) = 19.3563 K;
    // T_rx = 290 (10^(1/10) − 1) = 75.0884 K; T_sys = 187.7701 K
    expect(c.antenna_temperature_k).toBeCloseTo(100, 6);
    expect(c.system_temperature_k).toBeCloseTo(187.7701, 3);
    // G/T = 46.0068 − 0.3 − 10 log10(187.7701) = 46.0068 − 0.3 − 22.7363 = 22.9705 dB/K
    expect(c.g_over_t_dbk).toBeCloseTo(22.9705, 2);
  });
  it('gas attenuation is the P.676 slant value at the apparent elevation; nothing else in a dry clear sky', () => {
    const gas = gasSlantAttenuation({
      frequencyGHz: 8.2, elevationDeg: el, pressureDryHPa: 990, temperatureK: 290, waterVapourDensityGM3: 9, stationHeightKm: 0.2,
    });
    expect(c.gas_loss_db).toBeCloseTo(gas, 3);
    expect(c.rain_loss_db).toBe(0);
    expect(c.cloud_loss_db).toBe(0);
    expect(c.scintillation_db).toBe(0);
    expect(c.atmospheric_loss_db).toBeCloseTo(gas, 3);
  });
  it('C/N0, Eb/N0, Es/N0 and margin', () => {
    const gas = c.gas_loss_db;
    // C/N0 = 12 − 174.2459 − A_gas − 0 (pol.) − 0 − 0 (pointing) − 0.5 (other) + 22.9705 + 228.5992 = 88.8238 − A_gas
    expect(c.c_over_n0_dbhz).toBeCloseTo(88.8238 - gas, 2);
    // Eb/N0 = C/N0 − 10 log10(1e6) = C/N0 − 60
    expect(c.eb_over_n0_db).toBeCloseTo(28.8238 - gas, 2);
    // Es/N0 = C/N0 − 10 log10(1e6 / 0.5) = C/N0 − 63.0103
    expect(c.es_over_n0_db).toBeCloseTo(88.8238 - gas - 63.0103, 2);
    // margin = Eb/N0 − 4.4 (required) − 1 (implementation) = 23.4238 − A_gas
    expect(c.required_eb_over_n0_db).toBe(4.4);
    expect(c.margin_db).toBeCloseTo(23.4238 - gas, 2);
    expect(c.usable).toBe(true);
    expect(c.information_rate_bps).toBe(1e6);
    expect(c.mode).toBe('');
  });
  it('Doppler −f ṙ/c from the range rate', () => {
    // ṙ is set by the hand geometry; at 8.2 GHz, 1 km/s gives −27 352.5 Hz (8.2e9 / 299 792.458).
    expect(step.doppler_hz).toBeCloseTo((-8.2e9 * sample.rangeRateKmS) / 299_792.458, 6);
    expect(step.doppler_hz).toBeCloseTo(-27_352.5 * sample.rangeRateKmS, 0);
  });
  it('sky-noise antenna temperature when no override: P.618 §3 from the attenuation, plus spill-over', () => {
    const link = baseLink();
    delete link.ground.receiver!.antennaTemperatureK;
    const e2 = createLinkEngine({ link, climate: dryClimate, weatherCases: [CASES[0]] });
    const c2 = e2.evaluate(sample).cases[0];
    const gas = gasSlantAttenuation({
      frequencyGHz: 8.2, elevationDeg: el, pressureDryHPa: 990, temperatureK: 290, waterVapourDensityGM3: 9, stationHeightKm: 0.2,
    });
    const tSky = skyNoiseTemperatureK({ attenuationDB: gas, meanRadiatingTemperatureK: 275 });
    // Tolerance 0.01 K: the engine interpolates its elevation table (≤ 0.001 dB, i.e. ≤ 0.006 K at 25 K).
    expect(Math.abs(c2.antenna_temperature_k - (tSky + 10))).toBeLessThan(0.01);
    // Friis by hand with that T_A: T_A·0.933254 + 19.3563 + 75.0884
    expect(Math.abs(c2.system_temperature_k - ((tSky + 10) * 0.933254 + 19.3563 + 75.0884))).toBeLessThan(0.01);
  });
  it('below the margin the fixed link is unusable and delivers 0 b/s', () => {
    const link = baseLink({ requiredMarginDB: 40 });
    const e3 = createLinkEngine({ link, climate: dryClimate, weatherCases: [CASES[0]] });
    const c3 = e3.evaluate(sample).cases[0];
    expect(c3.margin_db).toBeCloseTo(c.margin_db, 10);
    expect(c3.usable).toBe(false);
    expect(c3.information_rate_bps).toBe(0);
  });
});

describe('downlink and uplink reverse the roles (reciprocity of the path)', () => {
  const down: LinkSpec = baseLink({ frequencyGHz: 8.2 });
  down.spacecraft.polarisation = { axialRatio: 2, tiltDeg: 10 };
  down.ground.polarisation = { axialRatio: 1.5, tiltDeg: 40 };
  down.spacecraft.antenna = { kind: 'cosine-power', peakGainDBi: 6, beamwidthDeg: 70 };
  down.spacecraft.pointing = { kind: 'nadir', boresightBody: [0, 0, 1], attitudeErrorDeg: 0 };
  delete down.ground.receiver!.antennaTemperatureK;
  const up: LinkSpec = structuredClone(down);
  up.direction = 'uplink';
  up.ground.txPowerDBW = 20;
  up.ground.lineLossDB = 2;
  delete up.spacecraft.txPowerDBW;
  delete up.ground.receiver;
  up.spacecraft.receiver = { noiseFigureDB: 2, feedLossDB: 0.5, spilloverK: 0, environment: 'none' };
  const climate = baseClimate();
  const ed = createLinkEngine({ link: down, climate, weatherCases: CASES });
  const eu = createLinkEngine({ link: up, climate, weatherCases: CASES });
  const s = sampleAtElevation(25);
  const d = structuredClone(ed.evaluate(s));
  const u = eu.evaluate(s);

  it('same free-space loss, atmosphere and polarisation loss', () => {
    expect(u.free_space_loss_db).toBe(d.free_space_loss_db);
    expect(u.polarisation_loss_db).toBeCloseTo(d.polarisation_loss_db, 12);
    // Non-trivial mismatch between the two elliptical polarisations (model value).
    expect(d.polarisation_loss_db).toBeCloseTo(polarisationLossDB({ axialRatioTx: 2, axialRatioRx: 1.5, tiltDifferenceDeg: -30 }), 12);
    expect(d.polarisation_loss_db).toBeGreaterThan(0.05);
    for (let i = 0; i < CASES.length; i++) {
      expect(u.cases[i].atmospheric_loss_db).toBe(d.cases[i].atmospheric_loss_db);
      expect(u.cases[i].rain_loss_db).toBe(d.cases[i].rain_loss_db);
    }
    expect(d.cases[2].rain_loss_db).toBeGreaterThan(0.5);
  });
  it('EIRP and off-boresight angles swap ends', () => {
    // Downlink EIRP: 10 − 1 + G_sc(θ); uplink: 20 − 2 + 46.0068 (dish on boresight).
    expect(d.tx_off_boresight_deg).toBe(u.rx_off_boresight_deg);
    expect(d.rx_off_boresight_deg).toBe(u.tx_off_boresight_deg);
    expect(u.eirp_dbw).toBeCloseTo(20 - 2 + 46.0068, 3);
    expect(d.eirp_dbw).toBeCloseTo(10 - 1 + ed.spacecraftAntenna.gainAtDBi(d.tx_off_boresight_deg), 10);
  });
  it('uplink G/T: spacecraft antenna at its off-boresight angle, Earth-filled 290 K beam', () => {
    // T_A = 290 K; a = 10^(−0.05) = 0.891251; T_sys = 290·a + 290(1 − a) + 290(10^0.2 − 1) = 290 + 169.6 = 459.6 K
    const tsys = 290 + 290 * (10 ** 0.2 - 1);
    expect(u.cases[0].antenna_temperature_k).toBe(290);
    expect(u.cases[0].system_temperature_k).toBeCloseTo(tsys, 6);
    const gsc = eu.spacecraftAntenna.gainAtDBi(u.rx_off_boresight_deg);
    expect(u.cases[0].g_over_t_dbk).toBeCloseTo(gsc - 0.5 - 10 * Math.log10(tsys), 3);
    // Same T_sys in every weather case (the spacecraft sees the Earth, not the sky).
    expect(u.cases[2].system_temperature_k).toBeCloseTo(tsys, 6);
  });
  it('rain raises the downlink antenna temperature (sky noise) but not the uplink one', () => {
    expect(d.cases[2].antenna_temperature_k).toBeGreaterThan(d.cases[0].antenna_temperature_k + 20);
  });
});

describe('bad link input: one InputError line naming the field', () => {
  const bad: Array<[string, (l: LinkSpec) => void, RegExp]> = [
    ['no transmit power', (l) => { delete l.spacecraft.txPowerDBW; }, /spacecraft\.txPowerDBW is missing/],
    ['no receiver', (l) => { delete l.ground.receiver; }, /ground\.receiver is missing/],
    ['zero bit rate', (l) => { (l.modcod as { bitRateBps: number }).bitRateBps = 0; }, /bitRateBps = 0 must be > 0/],
    ['axial ratio below 1', (l) => { l.ground.polarisation.axialRatio = 0.5; }, /polarisation: .*\|r\| ≥ 1/],
    ['zero dish diameter', (l) => { l.ground.antenna = { kind: 'parabolic', diameterM: 0, efficiency: 0.6 }; }, /ground\.antenna: .*diameterM/],
    ['above 55 GHz', (l) => { l.frequencyGHz = 60; }, /frequencyGHz = 60 .*1–55 GHz/],
    ['no noise figure or temperature', (l) => { delete l.ground.receiver!.noiseFigureDB; }, /noiseFigureDB or noiseTemperatureK/],
  ];
  for (const [what, mutate, re] of bad) {
    it(what, () => {
      const l = baseLink();
      mutate(l);
      expect(() => createLinkEngine({ link: l, climate: baseClimate(), weatherCases: CASES })).toThrow(InputError);
      expect(() => createLinkEngine({ link: l, climate: baseClimate(), weatherCases: CASES })).toThrow(re);
    });
  }
  it('exceedance outside 0.001–5 %', () => {
    expect(() => createLinkEngine({ link: baseLink(), climate: baseClimate(), weatherCases: [{ name: 'x', exceedancePercent: 10 }] }))
      .toThrow(/weatherCases\[0\]\.exceedancePercent: 10 % .*0\.001–5 %/);
  });
});
