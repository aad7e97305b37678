/**
 * Spacecraft off-boresight angles. Check source: Wertz & Larson, Space Mission
 * Analysis and Design (SMAD), spherical-Earth geometry: the off-nadir angle η of
 * a station seen at elevation ε from altitude h obeys sin η = R cos ε / (R + h).
 * On the hand-built spherical samples the agreement is exact (float rounding);
 * with the WGS-84 geometry stage it holds within the ellipsoid difference.
 */
import { describe, expect, it } from 'vitest';
import { createLinkEngine } from '../../src/budget/engine.js';
import { spacecraftOffBoresightDeg, unitVector } from '../../src/budget/attitude.js';
import { createPropagator } from '../../src/orbit/propagator.js';
import { createStationGeometry } from '../../src/geometry/station.js';
import { createGeometrySample } from '../../src/geometry/types.js';
import type { ElementSet } from '../../src/elements/types.js';
import { baseClimate, baseLink, CASES, R_KM, sampleAtElevation } from './fixtures.js';

const RAD = Math.PI / 180;
const smadOffNadirDeg = (elevationDeg: number, altitudeKm: number, rKm = R_KM) =>
  Math.asin((rKm * Math.cos(elevationDeg * RAD)) / (rKm + altitudeKm)) / RAD;

describe('nadir-pointing off-boresight angle = SMAD off-nadir angle', () => {
  const nadir = { kind: 'nadir', boresightBody: [0, 0, 1], attitudeErrorDeg: 0 } as const;
  for (const el of [0, 5, 10, 30, 45, 60, 85, 89.9]) {
    for (const h of [400, 800]) {
      it(`ε = ${el}°, h = ${h} km`, () => {
        const s = sampleAtElevation(el, h);
        const got = spacecraftOffBoresightDeg(nadir, [0, 0, 1], s);
        expect(got).toBeCloseTo(smadOffNadirDeg(el, h), 9);
        // SMAD: at 500 km the horizon (ε = 0) is at η = asin(6378.137/6878.137) = 68.0°.
      });
    }
  }
  it('horizon at 500 km is 68.0° off nadir (SMAD)', () => {
    expect(smadOffNadirDeg(0, 500)).toBeCloseTo(68.0, 1);
    expect(spacecraftOffBoresightDeg(nadir, [0, 0, 1], sampleAtElevation(0, 500))).toBeCloseTo(68.0, 1);
  });
  it('a boresight tilted in the body frame: +X (velocity) boresight is 90° from a station due "north" with eastward velocity', () => {
    // Station due north of the sub-satellite direction, velocity east (+y): the line of sight has no y component, so 90°.
    const s = sampleAtElevation(30, 500);
    expect(spacecraftOffBoresightDeg({ ...nadir, boresightBody: [1, 0, 0] }, [1, 0, 0], s)).toBeCloseTo(90, 9);
    // +Y = Z × X: with Z near −x̂ (nadir) and X = ŷ, Y is near −x̂ × ŷ = −ẑ. The satellite is seen due north, so the
    // station lies south of it (−z side): the line of sight leans from nadir toward +Y, at 90° − off-nadir.
    expect(spacecraftOffBoresightDeg({ ...nadir, boresightBody: [0, 1, 0] }, [0, 1, 0], s)).toBeCloseTo(90 - smadOffNadirDeg(30, 500), 9);
    expect(spacecraftOffBoresightDeg({ ...nadir, boresightBody: [0, -1, 0] }, [0, -1, 0], s)).toBeCloseTo(90 + smadOffNadirDeg(30, 500), 9);
  });
  it('station tracking gives 0°; inertial boresight along the line of sight gives 0°, opposite 180°', () => {
    const s = sampleAtElevation(20, 600);
    expect(spacecraftOffBoresightDeg({ kind: 'tracking', attitudeErrorDeg: 1 }, [0, 0, 1], s)).toBe(0);
    const los = [6378.137 - s.satPositionTemeKm[0], -s.satPositionTemeKm[1], -s.satPositionTemeKm[2]] as [number, number, number];
    const b = unitVector(los);
    expect(spacecraftOffBoresightDeg({ kind: 'inertial', boresightTeme: b, attitudeErrorDeg: 0 }, b, s)).toBeCloseTo(0, 6);
    const nb = b.map((x) => -x);
    expect(spacecraftOffBoresightDeg({ kind: 'inertial', boresightTeme: nb as [number, number, number], attitudeErrorDeg: 0 }, nb, s)).toBeCloseTo(180, 6);
  });
  it('the engine puts the nadir angle into the spacecraft antenna gain (downlink tx side)', () => {
    const link = baseLink();
    link.spacecraft.antenna = { kind: 'cosine-power', peakGainDBi: 6, beamwidthDeg: 80 };
    link.spacecraft.pointing = { kind: 'nadir', boresightBody: [0, 0, 1], attitudeErrorDeg: 5 };
    const e = createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES });
    const s = sampleAtElevation(30, 500);
    const step = e.evaluate(s);
    const eta = smadOffNadirDeg(30, 500);
    expect(step.tx_off_boresight_deg).toBeCloseTo(eta, 9);
    expect(step.eirp_dbw).toBeCloseTo(10 - 1 + e.spacecraftAntenna.gainAtDBi(eta), 9);
    // Attitude error as a worst-case extra angle: loss = G(η) − G(η + 5°) > 0.
    expect(step.tx_pointing_loss_db).toBeCloseTo(e.spacecraftAntenna.gainAtDBi(eta) - e.spacecraftAntenna.gainAtDBi(eta + 5), 9);
    expect(step.tx_pointing_loss_db).toBeGreaterThan(0.1);
  });
});

describe('with the propagator and WGS-84 geometry (invented elements)', () => {
  // Invented object KESTREL-9, catalogue 99970: a 550 km circular orbit at 97.6° inclination.
  const elements: ElementSet = {
    name: 'KESTREL-9', catalogNumber: '99970', catalogNumberValue: 99970, internationalDesignator: '26001A',
    epochUnixS: Date.UTC(2026, 10, 21) / 1000, meanMotionRevPerDay: 15.0, eccentricity: 0.0005, inclinationDeg: 97.6,
    raanDeg: 40, argOfPerigeeDeg: 90, meanAnomalyDeg: 0, bstarPerEarthRadius: 0, meanMotionDotRevPerDay2: 0,
    meanMotionDdotRevPerDay3: 0, elementSetNumber: 1, revolutionNumber: 1, source: { file: 'test', line: 1, format: 'omm-json' },
  };
  it('agrees with SMAD within the ellipsoid difference (≤ 0.3°) at every visible minute of a day', () => {
    const prop = createPropagator(elements);
    const geo = createStationGeometry({ name: 'STN-ALPHA', latitudeDeg: 48, longitudeDeg: 11, heightM: 500, mask: { kind: 'constant', elevationDeg: 0 } });
    const s = createGeometrySample();
    let n = 0, worst = 0;
    for (let t = elements.epochUnixS; t < elements.epochUnixS + 86_400; t += 30) {
      geo.sample(prop, t, s);
      if (s.elevationDeg < 0) continue;
      n++;
      const got = spacecraftOffBoresightDeg({ kind: 'nadir', boresightBody: [0, 0, 1], attitudeErrorDeg: 0 }, [0, 0, 1], s);
      // Spherical reference with the geocentric radius of the station and the satellite's geocentric radius.
      const rs = Math.hypot(...s.stationEcefKm), rsat = Math.hypot(...s.satPositionEcefKm);
      worst = Math.max(worst, Math.abs(got - smadOffNadirDeg(s.elevationDeg, rsat - rs, rs)));
    }
    expect(n).toBeGreaterThan(50);
    expect(worst).toBeLessThan(0.3);
  });
});
