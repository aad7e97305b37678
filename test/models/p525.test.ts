import { describe, expect, it } from 'vitest';
import { freeSpaceLossDB } from '../../src/models/p525.js';

describe('free-space loss (ITU-R P.525)', () => {
  it('is 32.45 dB at 1 MHz and 1 km (P.525: 32.4 + 20 log f(MHz) + 20 log d(km), constant 32.45 to two decimals)', () => {
    expect(freeSpaceLossDB({ distanceKm: 1, frequencyGHz: 0.001 })).toBeCloseTo(32.45, 2);
  });
  it('equals 20 log10(4π d f / c) and grows 20 dB per decade of distance and of frequency', () => {
    const d = 1234.5, f = 8.2;
    const direct = 20 * Math.log10((4 * Math.PI * d * 1e3 * f * 1e9) / 299_792_458);
    expect(freeSpaceLossDB({ distanceKm: d, frequencyGHz: f })).toBeCloseTo(direct, 10);
    expect(freeSpaceLossDB({ distanceKm: 10 * d, frequencyGHz: f }) - freeSpaceLossDB({ distanceKm: d, frequencyGHz: f })).toBeCloseTo(20, 10);
    expect(freeSpaceLossDB({ distanceKm: d, frequencyGHz: 10 * f }) - freeSpaceLossDB({ distanceKm: d, frequencyGHz: f })).toBeCloseTo(20, 10);
  });
});
