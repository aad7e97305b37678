/**
 * Elevation table: linear interpolation on the engine's adaptive grid agrees with
 * direct evaluation of the models (ITU-R P.676-12 Annex 2, P.618-13 §2.2.1.1,
 * §2.4.1, §2.5 and §3, P.840, P.372) to ≤ 0.001 dB at every elevation 0–90°, for
 * every tabulated term and every weather case, at X-band and at UHF.
 * Temperatures are compared as 10 log10 ratios (dB).
 */
import { describe, expect, it } from 'vitest';
import { createLinkEngine } from '../../src/budget/engine.js';
import { interpolateTable, TERM, TERM_COUNT, TERM_NAMES } from '../../src/budget/atmosphere.js';
import type { LinkSpec } from '../../src/budget/types.js';
import { externalNoiseTemperatureK, skyNoiseTemperatureK } from '../../src/models/index.js';
import { baseClimate, baseLink, CASES } from './fixtures.js';

function errorDB(term: number, a: number, b: number): number {
  if (term === TERM.antennaTemperatureK || term === TERM.systemTemperatureK) return Math.abs(10 * Math.log10(a / b));
  return Math.abs(a - b);
}

function elevations(): number[] {
  const els: number[] = [];
  for (let e = 0; e <= 90; e += 0.0173) els.push(e);
  els.push(90, 1e-4, 0.003, 0.011, 4.999999, 5, 5.000001, 24.999999, 25, 25.000001, 89.9999);
  return els;
}

function worstErrors(link: LinkSpec) {
  const engine = createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES });
  const n = CASES.length * TERM_COUNT;
  const direct = new Float64Array(n), interp = new Float64Array(n);
  const worst = new Float64Array(n);
  const at = new Float64Array(n);
  for (const el of elevations()) {
    engine.atmosphereDirect(el, direct);
    interpolateTable(engine.table, el, interp);
    for (let k = 0; k < n; k++) {
      const e = errorDB(k % TERM_COUNT, interp[k], direct[k]);
      if (e > worst[k]) { worst[k] = e; at[k] = el; }
    }
  }
  return { engine, worst, at, direct };
}

function report(worst: Float64Array, at: Float64Array): string {
  return Array.from(worst, (w, k) => `${CASES[Math.floor(k / TERM_COUNT)].name}.${TERM_NAMES[k % TERM_COUNT]} ${w.toExponential(2)} dB at ${at[k].toFixed(4)}°`).join('\n');
}

describe('elevation table interpolation ≤ 0.001 dB', () => {
  it('X-band 8.2 GHz downlink, dish, sky noise, clear / 1 % / 0.1 %', () => {
    const link = baseLink();
    delete link.ground.receiver!.antennaTemperatureK;
    const { engine, worst, at } = worstErrors(link);
    const max = Math.max(...worst);
    expect(max, report(worst, at)).toBeLessThanOrEqual(0.001);
    // The terms really vary (the check is not vacuous): rain at 0.1 % at 10° is several dB here.
    const d = engine.atmosphereDirect(10);
    expect(d[2 * TERM_COUNT + TERM.rain]).toBeGreaterThan(2);
    expect(d[1 * TERM_COUNT + TERM.scintillation]).toBeGreaterThan(0.05);
    expect(d[2 * TERM_COUNT + TERM.antennaTemperatureK]).toBeGreaterThan(d[TERM.antennaTemperatureK] + 50);
    expect(engine.table.elevationsDeg.length).toBeLessThan(5000);
  });

  it('UHF 437.2 MHz downlink, cosine-power ground antenna, rural external noise', () => {
    const link = baseLink({ frequencyGHz: 0.4372 });
    link.ground.antenna = { kind: 'cosine-power', peakGainDBi: 14, beamwidthDeg: 30 };
    link.ground.receiver = { noiseFigureDB: 0.8, feedLossDB: 0.5, spilloverK: 15, environment: 'rural' };
    const { engine, worst, at } = worstErrors(link);
    expect(Math.max(...worst), report(worst, at)).toBeLessThanOrEqual(0.001);
    // Clear-sky T_A = sky (P.618 §3 from the gas attenuation) + spill-over + P.372 rural external noise (from memory).
    // At 437.2 MHz: man-made F_a = 67.2 − 27.7 log10 437.2 = −5.95 dB → 73.7 K; galactic 52 − 23 log10 437.2 = −8.74 dB → 38.8 K.
    const d45 = engine.atmosphereDirect(45);
    const ext = externalNoiseTemperatureK({ frequencyMHz: 437.2, environment: 'rural' });
    expect(ext).toBeCloseTo(112.4, 0);
    const sky = skyNoiseTemperatureK({ attenuationDB: d45[TERM.gas], meanRadiatingTemperatureK: 275 });
    expect(d45[TERM.antennaTemperatureK]).toBeCloseTo(sky + 15 + ext, 9);
    // Models below their frequency range are named in the notes.
    expect(engine.notes.join('\n')).toMatch(/gas attenuation evaluated at 1 GHz/);
    expect(engine.notes.join('\n')).toMatch(/scintillation evaluated at 4 GHz/);
    expect(engine.notes.join('\n')).toMatch(/extrapolated above 250 MHz/);
  });

  it('uplink (spacecraft receives): constant noise, elevation-dependent path', () => {
    const link = baseLink({ direction: 'uplink' });
    link.ground.txPowerDBW = 15;
    delete link.ground.receiver;
    link.spacecraft.receiver = { noiseTemperatureK: 400, feedLossDB: 1, spilloverK: 0, environment: 'none' };
    const { engine, worst, at } = worstErrors(link);
    expect(Math.max(...worst), report(worst, at)).toBeLessThanOrEqual(0.001);
    // T_sys = 290·a + 290(1 − a) + 400 = 690 K at every elevation (Friis, T_A = 290 K Earth).
    expect(engine.atmosphereDirect(3)[TERM.systemTemperatureK]).toBeCloseTo(690, 9);
    expect(engine.atmosphereDirect(80)[TERM.systemTemperatureK]).toBeCloseTo(690, 9);
  });

  it('clamps below 0° and above 90°', () => {
    const engine = createLinkEngine({ link: baseLink(), climate: baseClimate(), weatherCases: CASES });
    const n = CASES.length * TERM_COUNT;
    expect(Array.from(interpolateTable(engine.table, -3, new Float64Array(n)))).toEqual(Array.from(engine.atmosphereDirect(0)));
    expect(Array.from(interpolateTable(engine.table, 95, new Float64Array(n)))).toEqual(Array.from(engine.atmosphereDirect(90)));
  });
});
