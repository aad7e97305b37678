/**
 * The scenario loader: the demo and the base fixture resolve into the engine's
 * objects with the right counts, units and defaults. Reference values are
 * named beside each check.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadScenario, parseScenarioText } from '../../src/scenario/index.js';
import { BASE_SCENARIO, PROJECT_ROOT, baseText } from './bad-cases.js';

const DEMO = path.join(PROJECT_ROOT, 'fixtures/demo/scenario.yaml');
const DEMO_TLE = path.join(PROJECT_ROOT, 'fixtures/demo/orbilux-3.tle');

describe('demo scenario orbilux-demo', () => {
  const s = loadScenario(DEMO);

  it('resolves 8 links: uhf-tm × 3 stations, s-band × 2 (stations with an S-band dish), x-band × 3', () => {
    expect(s.name).toBe('orbilux-demo');
    expect(s.links.map((l) => `${l.name}@${l.station}`)).toEqual([
      'uhf-tm@Kaldfjell', 'uhf-tm@Pico Verde', 'uhf-tm@Maraka',
      's-band@Kaldfjell', 's-band@Pico Verde',
      'x-band@Kaldfjell', 'x-band@Pico Verde', 'x-band@Maraka',
    ]);
    expect(s.satellites).toHaveLength(1);
    expect(s.satellites[0].elements.catalogNumber.trim()).toBe('99981');
    expect(s.stations.map((x) => x.station.name)).toEqual(['Kaldfjell', 'Pico Verde', 'Maraka']);
  });

  it('window 2026-11-21T00:00Z + 7 d at 1 s, weather clear / 1 % / 0.1 %', () => {
    expect(s.window.startS).toBe(Date.UTC(2026, 10, 21) / 1000);
    expect(s.window.endS - s.window.startS).toBe(7 * 86_400);
    expect(s.window.stepS).toBe(1);
    expect(s.weatherCases).toEqual([
      { name: 'clear', exceedancePercent: null },
      { name: '1%', exceedancePercent: 1 },
      { name: '0.1%', exceedancePercent: 0.1 },
    ]);
  });

  it('units: W → dBW (10 log10 2 = 3.0103), MHz → GHz, axial ratio dB → signed voltage ratio', () => {
    const [uhf, , , sband, , xband] = s.links;
    expect(uhf.frequencyGHz).toBeCloseTo(0.4372, 12);
    expect(uhf.spacecraft.txPowerDBW).toBeCloseTo(0, 12);
    expect(xband.spacecraft.txPowerDBW).toBeCloseTo(3.0103, 4);
    expect(uhf.spacecraft.polarisation.axialRatio).toBe(Infinity);
    expect(uhf.ground.polarisation.axialRatio).toBe(1);
    // AR 3 dB → r = 10^(3/20) = 1.4125, right-hand positive.
    expect(sband.spacecraft.polarisation.axialRatio).toBeCloseTo(1.41254, 5);
    expect(xband.ground.antenna).toEqual({ kind: 'parabolic', diameterM: 3.7, efficiency: 0.6 });
    expect(xband.ground.pointing).toEqual({ kind: 'track', pointingErrorDeg: 0.1, maxAzimuthRateDegS: 5, maxElevationRateDegS: 3 });
    expect(s.links.every((l) => l.requiredMarginDB === 3)).toBe(true);
  });

  it('modulation and coding: non-coherent BFSK 1e-5 needs 13.35 dB; conv r=1/2 K=7 4.4 dB (from memory); DVB-S2 28 MODCODs', () => {
    const [uhf, , , sband, , xband] = s.links;
    // Non-coherent BFSK: ½ exp(−Eb/2N0) = 1e-5 → Eb/N0 = 2 ln(5e4) = 21.640 → 13.352 dB (Sklar, Digital Communications).
    expect(uhf.modcod).toMatchObject({ kind: 'fixed', bitRateBps: 9600, modulation: 'bfsk-noncoherent', coding: 'uncoded', bitsPerSymbol: 1 });
    if (uhf.modcod.kind === 'fixed') expect(uhf.modcod.requiredEbN0DB).toBeCloseTo(13.3525, 3);
    // Convolutional r = 1/2, K = 7 soft decision ≈ 4.4 dB at 1e-5 (PHYSICS.md §12, from memory).
    expect(sband.modcod).toMatchObject({ kind: 'fixed', bitRateBps: 1e6, requiredEbN0DB: 4.4, bitsPerSymbol: 0.5 });
    expect(xband.modcod.kind).toBe('adaptive');
    if (xband.modcod.kind === 'adaptive') {
      expect(xband.modcod.symbolRateBaud).toBe(10e6);
      expect(xband.modcod.modes).toHaveLength(28);
      // ETSI EN 302 307-1 Table 13 (from memory): QPSK 1/2 at 1.00 dB, η 0.988858.
      expect(xband.modcod.modes.find((m) => m.name === 'QPSK 1/2')).toEqual({ name: 'QPSK 1/2', requiredEsN0DB: 1.0, efficiencyBitsPerSymbol: 0.988858 });
    }
  });

  it('climates: Kaldfjell R0.01 28 mm/h, h_R = 1.9 + 0.36 km (P.839); Pico Verde zone H = 32 mm/h (P.837-1, from memory); Maraka dry pressure', () => {
    const [k, p, m] = s.stations.map((x) => x.climate);
    expect(k.rainRate001MmH).toBe(28);
    expect(k.rainHeightKm).toBeCloseTo(2.26, 12);
    expect(p.rainRate001MmH).toBe(32);
    // Older P.839 latitude rule (from memory): 5 − 0.075 (42.14 − 23) = 3.5645 km, + 0.36 km.
    expect(p.rainHeightKm).toBeCloseTo(3.9245, 10);
    // ISO 2533 standard atmosphere at 980 m: 900.9 hPa (tables, from memory); minus e = 0.62 × e_s(11 °C) = 0.62 × 13.12 hPa (P.453).
    expect(p.pressureDryHPa).toBeCloseTo(900.93 - 0.62 * 13.123, 1);
    expect(p.waterVapourContentKgM2).toBe(14);
    // Maraka: e = ρ T / 216.7 = 11.5 × 290.65 / 216.7 = 15.424 hPa; p = 812 − 15.424.
    expect(m.pressureDryHPa).toBeCloseTo(812 - (11.5 * 290.65) / 216.7, 9);
    expect(m.rainRate001MmH).toBe(88);
    expect(m.rainHeightKm).toBeCloseTo(5.16, 12);
    expect(s.stations[1].station.mask).toEqual({ kind: 'table', points: [[0, 4], [60, 9], [120, 12], [180, 6], [240, 3], [300, 7]] });
    expect(s.stations[0].station.mask).toEqual({ kind: 'constant', elevationDeg: 5 });
  });

  it('lists every default it applied, with (from memory) where the value is', () => {
    const paths = s.defaultsApplied.map((d) => d.path).sort();
    expect(paths).toEqual([
      'exact_orbit',
      'network.policy',
      'output.dir',
      'satellites[0].element_error.along_track_km_per_day',
      'satellites[0].element_error.at_epoch_km',
      'satellites[0].element_error.cross_track_km_per_day',
      'satellites[0].links[0].modcod.required_eb_n0_db',
      'satellites[0].links[0].spacecraft.pointing.boresight_body',
      'satellites[0].links[0].stations',
      'satellites[0].links[1].modcod.required_eb_n0_db',
      'satellites[0].links[1].stations',
      'satellites[0].links[2].spacecraft.pointing.boresight_body',
      'satellites[0].links[2].stations',
      ...[0, 1, 2].flatMap((i) => [
        `stations[${i}].climate.clear_sky_cloud_liquid_water_kg_m2`,
        `stations[${i}].climate.mean_radiating_temperature_k`,
        `stations[${i}].climate.n_wet`,
        `stations[${i}].climate.pressure_dry_hpa`,
        `stations[${i}].climate.rain_height_km`,
      ]),
      'stations[0].climate.water_vapour_density_g_m3',
      'stations[0].mask_on',
      'stations[1].climate.isotherm_height_km',
      'stations[1].climate.pressure_hpa',
      'stations[1].climate.rain_rate_001_mm_h',
      'stations[1].climate.water_vapour_density_g_m3',
      'stations[2].mask_on',
      'sun.activity_factor',
      'sun.noise',
    ].sort());
    const byPath = new Map(s.defaultsApplied.map((d) => [d.path, d]));
    for (const p of ['satellites[0].element_error.at_epoch_km', 'sun.activity_factor', 'stations[1].climate.isotherm_height_km', 'stations[1].climate.rain_rate_001_mm_h', 'stations[1].climate.pressure_hpa', 'stations[0].climate.mean_radiating_temperature_k']) {
      expect(byPath.get(p)!.reason).toContain('(from memory)');
    }
    expect(Number(byPath.get('stations[1].climate.isotherm_height_km')!.value)).toBeCloseTo(3.5645, 3);
  });

  it('inputs hash = SHA-256 of the scenario bytes followed by the element file bytes', () => {
    const h = createHash('sha256').update(readFileSync(DEMO)).update(readFileSync(DEMO_TLE)).digest('hex');
    expect(s.inputsSha256).toBe(h);
    expect(s.file).toBe(DEMO);
    expect(s.output.dir).toBeNull(); // the run then writes to out/<name> under the working directory
    expect(loadScenario(DEMO, { outDir: 'elsewhere' }).output.dir).toBe(path.resolve('elsewhere'));
  });
});

describe('base fixture (every branch of the file format)', () => {
  const s = loadScenario(BASE_SCENARIO);

  it('links, stations selection and ends', () => {
    expect(s.links.map((l) => `${l.name}@${l.station}`)).toEqual(['x-dl@Alpha', 's-dl@Alpha', 's-dl@Beta', 's-ul@Beta']);
    const ul = s.links[3];
    expect(ul.direction).toBe('uplink');
    // 50 W → 16.990 dBW.
    expect(ul.ground.txPowerDBW).toBeCloseTo(16.9897, 4);
    expect(ul.ground.lineLossDB).toBe(2);
    expect(ul.spacecraft.receiver).toEqual({ noiseFigureDB: 3, feedLossDB: 0, spilloverK: 0, environment: 'rural' });
    expect(ul.ground.antenna).toEqual({ kind: 'table', offBoresightDeg: [0, 5, 20, 180], gainDBi: [30, 20, 0, -10] });
    // LHCP with axial ratio 1.5 dB → r = −10^(1.5/20) = −1.18850.
    expect(ul.ground.polarisation.axialRatio).toBeCloseTo(-1.1885, 4);
    expect(ul.ground.pointing).toEqual({ kind: 'fixed', azimuthDeg: 180, elevationDeg: 45 });
    expect(s.links[1].spacecraft.antenna).toEqual({ kind: 'isotropic', gainDBi: 0 });
    // BPSK 1e-5 uncoded needs 9.6 dB (Sklar, Digital Communications).
    if (ul.modcod.kind === 'fixed') expect(ul.modcod.requiredEbN0DB).toBeCloseTo(9.59, 2);
    expect(s.links[0].modcod).toEqual({ kind: 'adaptive', symbolRateBaud: 5e6, modes: [
      { name: 'low', requiredEsN0DB: 1, efficiencyBitsPerSymbol: 0.99 },
      { name: 'high', requiredEsN0DB: 6.6, efficiencyBitsPerSymbol: 1.98 },
    ] });
  });

  it('climate defaults from the reference atmosphere and P.453', () => {
    const [a, b] = s.stations.map((x) => x.climate);
    // Saturation vapour pressure at 20 °C is 23.37 hPa (P.453 formula; the usual tables give 23.37, from memory): e = 0.7 × 23.37.
    const e = 0.7 * 23.373;
    expect(a.waterVapourDensityGM3).toBeCloseTo((216.7 * e) / 293.15, 2);
    expect(a.nWet).toBeCloseTo((3.732e5 * e) / 293.15 ** 2, 1);
    // ISO 2533 standard atmosphere at 300 m: 977.7 hPa (tables, from memory).
    expect(a.pressureDryHPa + e).toBeCloseTo(977.7, 0);
    expect(a.temperatureK).toBeCloseTo(293.15, 12);
    // Beta: zone K 42 mm/h (P.837-1, from memory); isotherm at 35° S: 5 + 0.1 (−35 + 21) = 3.6 km (older P.839, from memory).
    expect(b.rainRate001MmH).toBe(42);
    expect(b.rainHeightKm).toBeCloseTo(3.96, 10);
    expect(b.pressureDryHPa).toBe(1000);
    // P.835 reference T at 50 m: 288.15 − 6.5 × 0.05 = 287.825 K (from memory).
    expect(b.temperatureK).toBeCloseTo(287.825, 10);
    expect(b.waterVapourDensityGM3).toBe(9);
  });

  it('network, finders and output', () => {
    expect(s.network).toEqual({ kind: 'priority', order: ['Beta', 'Alpha'] });
    expect(s.maskFraction).toBe(0.9);
    // 2 per decade from 1 kb/s to 100 kb/s: 10^(k/2) × 1000.
    expect(s.rateCandidatesBps).toEqual([1000, 3162.28, 10000, 31622.8, 100000]);
    expect(s.output).toEqual({ dir: path.join(PROJECT_ROOT, 'fixtures/scenarios/out/base'), steps: 'csv' });
    expect(s.window.stepS).toBe(10);
    expect(s.warnings.some((w) => w.includes('element epoch'))).toBe(false);
  });

  it('JSON and YAML forms resolve to the same links', () => {
    const fromJson = parseScenarioText(baseText('json'), 'base.json', path.dirname(BASE_SCENARIO));
    const fromYaml = parseScenarioText(baseText('yaml'), 'base.yaml', path.dirname(BASE_SCENARIO));
    expect(fromJson.links).toEqual(fromYaml.links);
    expect(fromJson.stations).toEqual(fromYaml.stations);
  });
});
