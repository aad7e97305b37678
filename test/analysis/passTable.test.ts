/**
 * The compact pass-link table gives back exactly the records pushed into it
 * (nulls, NaN margins, booleans, non-ASCII names), sorts them as the pass
 * outputs list them, and appends another table's exported rows with its
 * strings re-indexed.
 */
import { describe, expect, it } from 'vitest';
import { PassLinkTable } from '../../src/analysis/passTable.js';
import type { PassLinkSummary } from '../../src/analysis/types.js';

function rec(i: number, station: string, link: string, aosS: number, adaptive: boolean): PassLinkSummary {
  return {
    passId: `SAT-1/${station}/${i}`, satellite: 'SAT-1', station, link, direction: i % 2 ? 'uplink' : 'downlink',
    aosS, tcaS: aosS + 300.25, losS: aosS + 600.5, maxElevationDeg: 12.345 + i, durationS: 600.5, clippedStart: i === 0, clippedEnd: false, steps: 600 + i,
    expectedVolumeBits: 1e6 * i + 0.5, expectedUsableS: 480.25 - i, sweptS: 600 + i, closesThroughoutProbability: 0.95 + i / 1000,
    timingUncertaintyS: 0.25 * i, minSunSeparationDeg: i === 2 ? NaN : 40 - i, maxSunLossDB: i === 1 ? 0.5 : 0, sunAffected: i === 1,
    cases: ['clear', '0.1%'].map((w, j) => ({
      weather: w, usableStartS: j ? null : aosS + 10, usableEndS: j ? null : aosS + 500, usableDurationS: j ? 0 : 491,
      minMarginDB: j ? NaN : -1.5, meanMarginDB: j ? NaN : 2.25, maxMarginDB: j ? NaN : 6.75,
      fixedVolumeBits: 9600 * 491, adaptiveVolumeBits: adaptive ? 1.5e9 + i : null,
      verdict: j ? 'unusable' : 'usable', verdictRule: j ? 'unusable: no step met the required margin' : `usable: rule ${i % 2}`,
      sunLostS: j ? 0 : i,
    })),
  };
}

describe('PassLinkTable', () => {
  it('round-trips records, sorts by AOS, station, link, and appends exported rows', () => {
    const t = new PassLinkTable(['clear', '0.1%']);
    const rs = [rec(1, 'Ølkjær "Nord"', 'x', 2000, true), rec(2, 'Alpha', 'uhf', 1000, false), rec(3, 'Alpha', 'a', 1000, false), rec(0, 'Beta', 'x', 1000, true)];
    for (const r of rs) t.push(r);
    expect(t.length).toBe(4);
    expect(t.get(0)).toEqual(rs[0]);
    expect([...t]).toEqual(rs);
    t.sort();
    expect(t.toArray().map((r) => `${r.aosS} ${r.station} ${r.link}`)).toEqual(['1000 Alpha a', '1000 Alpha uhf', '1000 Beta x', '2000 Ølkjær "Nord" x']);
    const u = new PassLinkTable(['clear', '0.1%']);
    u.push(rec(9, 'Gamma', 'uhf', 5, false));
    u.append(t.exportState());
    expect(u.length).toBe(5);
    expect(u.get(4)).toEqual(rs[0]);
    expect(u.get(0).station).toBe('Gamma');
    expect(() => new PassLinkTable(['clear']).push(rs[0])).toThrow(/weather cases/);
  });
});
