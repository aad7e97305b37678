/** Horizon mask interpolation (linear in azimuth, wrapping at 360 deg) and validation. */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { maskElevationDeg, maskMinimumDeg, validateMask } from '../../src/geometry/mask.js';
import { PICO_VERDE } from './demo-stations.js';

const terrain = validateMask(PICO_VERDE.mask, 'test');

describe('maskElevationDeg', () => {
  it.each([
    [0, 4], [30, 6.5], [60, 9], [90, 10.5], [150, 9], [210, 4.5], [270, 5], [300, 7],
    [330, 5.5], [359, 4.05], [360, 4], [-30, 5.5], [720 + 90, 10.5],
  ])('terrain table at azimuth %d is %d deg', (az, el) => {
    expect(maskElevationDeg(terrain, az)).toBeCloseTo(el, 12);
  });
  it('wraps when the first point is not at 0 deg', () => {
    const m = validateMask({ kind: 'table', points: [[350, 10], [10, 0]] }, 'test');
    expect(maskElevationDeg(m, 0)).toBeCloseTo(5, 12);
    expect(maskElevationDeg(m, 180)).toBeCloseTo(0 + (170 / 340) * 10, 12);
    expect(maskElevationDeg(m, 355)).toBeCloseTo(7.5, 12);
  });
  it('constant and single-point masks', () => {
    expect(maskElevationDeg({ kind: 'constant', elevationDeg: 5 }, 123)).toBe(5);
    expect(maskElevationDeg({ kind: 'table', points: [[10, 3]] }, 200)).toBe(3);
    expect(maskMinimumDeg(terrain)).toBe(3);
  });
  it.each([
    [{ kind: 'constant', elevationDeg: 90 }, /mask elevation 90 out of range/],
    [{ kind: 'constant', elevationDeg: NaN }, /out of range/],
    [{ kind: 'table', points: [] }, /no points/],
    [{ kind: 'table', points: [[360, 1]] }, /azimuth 360 out of range/],
    [{ kind: 'table', points: [[10, 1], [10, 2]] }, /given twice/],
  ])('rejects %j', (mask, re) => {
    expect(() => validateMask(mask as never, 'station X mask')).toThrow(InputError);
    expect(() => validateMask(mask as never, 'station X mask')).toThrow(re);
  });
});
