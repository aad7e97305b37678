import { describe, expect, it } from 'vitest';
import { elementErrorKm, elementPointingErrorDeg, groundTrackSpeedKmS, timingUncertaintyS } from '../../src/models/elementError.js';

const DEG = Math.PI / 180;

describe('element-set error growth (linear; rates from memory, rough)', () => {
  it('grows linearly from the error at epoch, backwards as forwards', () => {
    const rates = { atEpochKm: 1, alongTrackKmPerDay: 2, crossTrackKmPerDay: 0.2 };
    expect(elementErrorKm({ ...rates, ageDays: 3 })).toEqual({ alongTrackKm: 7, crossTrackKm: 1 + 0.2 * 3 });
    expect(elementErrorKm({ ...rates, ageDays: -3 })).toEqual(elementErrorKm({ ...rates, ageDays: 3 }));
    expect(elementErrorKm({ atEpochKm: 0, alongTrackKmPerDay: 0, crossTrackKmPerDay: 0, ageDays: 9 })).toEqual({ alongTrackKm: 0, crossTrackKm: 0 });
    expect(() => elementErrorKm({ ...rates, alongTrackKmPerDay: -1, ageDays: 1 })).toThrow(RangeError);
  });
});

describe('pointing error at the station from an element error (geometry)', () => {
  it('an along-track error across the line of sight is atan(error / range) (to 1e-9°)', () => {
    // Satellite overhead at 500 km moving along +y: the line of sight (z) is perpendicular to the track.
    const got = elementPointingErrorDeg({
      alongTrackKm: 5, crossTrackKm: 0, rangeKm: 500, los: [0, 0, 1], positionKm: [0, 0, 6878], velocityKmS: [0, 7.6, 0],
    });
    expect(Math.abs(got - Math.atan(5 / 500) / DEG)).toBeLessThan(1e-9);
  });
  it('equals the angle of the displacement perpendicular to an oblique line of sight (to 1e-9°)', () => {
    // A line of sight at 35° to the velocity: e⊥ = e sin 35°, independent of the cross-track part (which is along the normal here).
    const los = [Math.cos(35 * DEG), Math.sin(35 * DEG), 0];
    const got = elementPointingErrorDeg({ alongTrackKm: 4, crossTrackKm: 0, rangeKm: 1800, los, positionKm: [0, 0, 7000], velocityKmS: [7.5, 0, 0] });
    expect(Math.abs(got - Math.atan((4 * Math.sin(35 * DEG)) / 1800) / DEG)).toBeLessThan(1e-9);
    // Along the line of sight the along-track error does not move the satellite in the beam.
    expect(elementPointingErrorDeg({ alongTrackKm: 4, crossTrackKm: 0, rangeKm: 1800, los: [1, 0, 0], positionKm: [0, 0, 7000], velocityKmS: [7.5, 0, 0] })).toBe(0);
  });
  it('adds the cross-track part as an independent error (root sum of squares)', () => {
    // r along z, v along x: the orbit normal r × v is along y; the line of sight along z sees both errors whole.
    const got = elementPointingErrorDeg({ alongTrackKm: 3, crossTrackKm: 4, rangeKm: 1000, los: [0, 0, -1], positionKm: [0, 0, 7000], velocityKmS: [7.5, 0, 0] });
    expect(Math.abs(got - Math.atan(5 / 1000) / DEG)).toBeLessThan(1e-9);
  });
});

describe('ground-track speed and AOS/LOS uncertainty', () => {
  it('a 500 km circular orbit over the equator (no Earth rotation in the given Earth-fixed velocity) gives v R_E / r', () => {
    const r = 6378.137 + 500, v = Math.sqrt(398_600.4418 / r);
    const g = groundTrackSpeedKmS({ positionEcefKm: [r, 0, 0], velocityEcefKmS: [0, v, 0] });
    expect(g).toBeCloseTo((v * 6378.137) / r, 9);
    // About 7.06 km/s for LEO at 500 km (fact of the trade).
    expect(g).toBeGreaterThan(7.0); expect(g).toBeLessThan(7.1);
  });
  it('the uncertainty is the along-track error over the ground-track speed', () => {
    expect(timingUncertaintyS({ alongTrackKm: 7.06, groundTrackSpeedKmS: 7.06 })).toBe(1);
    expect(() => timingUncertaintyS({ alongTrackKm: 1, groundTrackSpeedKmS: 0 })).toThrow(RangeError);
  });
});
