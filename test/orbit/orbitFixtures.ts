/**
 * Invented element sets for the interpolation checks: circular and eccentric
 * orbits by perigee height and eccentricity (names and catalogue numbers are
 * ours; the numbers are plausible LEO values, not real objects).
 */
import type { ElementSet } from '../../src/elements/types.js';

const MU_KM3_S2 = 398_600.8;
const RE_KM = 6378.135;

export const EPOCH_S = Date.UTC(2026, 10, 21) / 1000;

/** Mean elements with perigee height `perigeeKm` and eccentricity `e` (mean motion from a = (R + h_p)/(1 − e)). */
export function syntheticElements(perigeeKm: number, e: number, over: Partial<ElementSet> = {}): ElementSet {
  const a = (RE_KM + perigeeKm) / (1 - e);
  const nRadS = Math.sqrt(MU_KM3_S2 / (a * a * a));
  return {
    name: `TEST-${perigeeKm}-${e}`, catalogNumber: '99900', catalogNumberValue: 99900, internationalDesignator: '26900A',
    epochUnixS: EPOCH_S, meanMotionRevPerDay: (nRadS * 86_400) / (2 * Math.PI), eccentricity: e,
    inclinationDeg: 97.4, raanDeg: 40, argOfPerigeeDeg: 30, meanAnomalyDeg: 10,
    bstarPerEarthRadius: perigeeKm < 400 ? 2e-4 : 5e-5, meanMotionDotRevPerDay2: 0, meanMotionDdotRevPerDay3: 0,
    elementSetNumber: 999, revolutionNumber: 1, source: { file: 'synthetic', line: 1, format: 'omm-json' },
    ...over,
  };
}
