/**
 * Element parsing: TLE/3LE per the NORAD two-line format (column layout and
 * modulo-10 checksum as in Spacetrack Report #3 / Vallado et al. AIAA
 * 2006-6753) and CCSDS OMM 502.0-B keywords in JSON.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { catalogNumberValue } from '../../src/elements/catalog.js';
import { tleChecksum, withTleChecksum } from '../../src/elements/checksum.js';
import { epochWarning, loadElementsFile, parseElementsText } from '../../src/elements/load.js';
import { createPropagator } from '../../src/orbit/propagator.js';

const L1 = '1 99981U 26901A   26324.00000000  .00001200  00000-0  15000-3 0  9993';
const L2 = '2 99981  97.4000 123.4567 0011000  90.0000 270.1234 15.22000000  1052';
const EPOCH = Date.UTC(2026, 10, 20) / 1000;

describe('checksum', () => {
  it('published example set (ISS-like line from the SGP4 verification file, catalogue 06251) sums as written', () => {
    // "1 06251U 62025E   06176.82412014  .00008885  00000-0  12808-3 0  3985" ends in 5.
    expect(tleChecksum('1 06251U 62025E   06176.82412014  .00008885  00000-0  12808-3 0  398')).toBe(5);
  });
  it('digits count their value, minus counts 1, others 0', () => {
    expect(tleChecksum('12-A.+ 9')).toBe((1 + 2 + 1 + 9) % 10);
    expect(withTleChecksum(L1.slice(0, 68))).toBe(L1);
  });
});

describe('catalogue numbers', () => {
  it.each([['99981', 99981], ['00005', 5], ['A0000', 100000], ['A1234', 101234], ['H9999', 179999], ['J0000', 180000], ['P0001', 230001], ['Z9999', 339999]])('%s = %d', (s, v) => {
    expect(catalogNumberValue(s)).toBe(v);
  });
  it.each(['I0000', 'O1234', 'AB123', '12 45'])('rejects %s', (s) => expect(catalogNumberValue(s)).toBeNaN());
});

describe('TLE and 3LE', () => {
  it('demo 3LE parses to the invented ORBILUX-3 elements', () => {
    const [e] = loadElementsFile('fixtures/demo/orbilux-3.tle');
    expect(e).toMatchObject({
      name: 'ORBILUX-3', catalogNumber: '99981', catalogNumberValue: 99981, internationalDesignator: '26901A',
      epochUnixS: EPOCH, meanMotionRevPerDay: 15.22, eccentricity: 0.0011, inclinationDeg: 97.4,
      raanDeg: 123.4567, argOfPerigeeDeg: 90, meanAnomalyDeg: 270.1234, elementSetNumber: 999, revolutionNumber: 105,
      source: { line: 1, format: 'tle' },
    });
    expect(e.bstarPerEarthRadius).toBeCloseTo(1.5e-4, 15);
    expect(e.meanMotionDotRevPerDay2).toBeCloseTo(1.2e-5, 15);
  });
  it('two sets in one file, "0 " name prefix on the first, none on the second', () => {
    const sets = loadElementsFile('fixtures/tle/orbilux-3-two-sets.tle');
    expect(sets.map((s) => [s.name, s.elementSetNumber, s.source.line])).toEqual([['ORBILUX-3', 999, 1], ['99981', 1000, 5]]);
    expect(sets[1].epochUnixS - sets[0].epochUnixS).toBe(2 * 86400);
  });
  it('two-line form and alpha-5 catalogue numbers', () => {
    const a1 = withTleChecksum(`1 A0042U${L1.slice(8, 68)}`);
    const a2 = withTleChecksum(`2 A0042${L2.slice(7, 68)}`);
    const [e] = parseElementsText(`${a1}\n${a2}\n`, 'a5.tle');
    expect(e.catalogNumber).toBe('A0042');
    expect(e.catalogNumberValue).toBe(100042);
    expect(e.name).toBe('A0042');
  });
  const bad: [string, string, RegExp][] = [
    ['bad checksum', `${L1.slice(0, 68)}4\n${L2}`, /^x\.tle:1:69: checksum is 4 but the line sums to 3/],
    ['short line', `${L1.slice(0, 60)}\n${L2}`, /^x\.tle:1:61: element line is 60 characters long \(exactly 69/],
    ['catalogue mismatch', `${L1}\n${withTleChecksum(`2 99982${L2.slice(7, 68)}`)}`, /^x\.tle:2:3: catalogue number 99982 does not match line 1's 99981/],
    ['line 2 first', `${L2}\n${L1}`, /^x\.tle:1:1: line 2 of an element set without its line 1/],
    ['missing line 2', `${L1}\n`, /^x\.tle:1:1: line 1 without a line 2/],
    ['bad inclination', `${L1}\n${withTleChecksum(`${L2.slice(0, 8)} 97.4x00${L2.slice(16, 68)}`)}`, /^x\.tle:2:9: inclination is not a number/],
    ['inclination > 180', `${L1}\n${withTleChecksum(`${L2.slice(0, 8)}197.4000${L2.slice(16, 68)}`)}`, /^x\.tle:2:9: inclination out of range/],
    ['zero mean motion', `${L1}\n${withTleChecksum(`${L2.slice(0, 52)} 0.00000000${L2.slice(63, 68)}`)}`, /^x\.tle:2:53: mean motion is 0 \(greater than 0/],
    ['bad bstar', `${withTleChecksum(`${L1.slice(0, 53)} 15.00-3${L1.slice(61, 68)}`)}\n${L2}`, /^x\.tle:1:54: B\* drag term is not in implied-decimal form/],
    ['bad epoch day', `${withTleChecksum(`${L1.slice(0, 20)}399.00000000${L1.slice(32, 68)}`)}\n${L2}`, /^x\.tle:1:21: epoch day of year out of range/],
    ['eccentricity not digits', `${L1}\n${withTleChecksum(`${L2.slice(0, 26)}0.01100${L2.slice(33, 68)}`)}`, /^x\.tle:2:27: eccentricity is not 7 digits/],
  ];
  it.each(bad)('rejects %s with one located line', (_n, text, re) => {
    expect(() => parseElementsText(text, 'x.tle')).toThrow(InputError);
    expect(() => parseElementsText(text, 'x.tle')).toThrow(re);
    try { parseElementsText(text, 'x.tle'); } catch (e) { expect((e as Error).message).not.toContain('\n'); }
  });
});

describe('OMM JSON', () => {
  it('the OMM fixture gives the same elements and the same state as the TLE (to the TLE rounding)', () => {
    const [o] = loadElementsFile('fixtures/tle/orbilux-3.omm.json');
    const [t] = loadElementsFile('fixtures/demo/orbilux-3.tle');
    expect(o).toMatchObject({ name: 'ORBILUX-3', catalogNumberValue: 99981, internationalDesignator: '2026-901A', epochUnixS: EPOCH, source: { format: 'omm-json', line: 2 } });
    const r1 = new Float64Array(3); const v1 = new Float64Array(3); const r2 = new Float64Array(3); const v2 = new Float64Array(3);
    createPropagator(o).stateTeme(EPOCH + 86400, r1, v1);
    createPropagator(t).stateTeme(EPOCH + 86400, r2, v2);
    for (let k = 0; k < 3; k++) { expect(Math.abs(r1[k] - r2[k])).toBeLessThan(1e-6); expect(Math.abs(v1[k] - v2[k])).toBeLessThan(1e-9); }
  });
  it('a single object (not an array) and string-valued numbers are accepted', () => {
    const obj = JSON.parse(readFileSync('fixtures/tle/orbilux-3.omm.json', 'utf8'))[0];
    obj.MEAN_MOTION = '15.22';
    const [e] = parseElementsText(JSON.stringify(obj, null, 2), 'one.json');
    expect(e.meanMotionRevPerDay).toBe(15.22);
  });
  it.each([
    ['ECCENTRICITY', 1.2, /^o\.json:\d+:\d+: ECCENTRICITY is 1\.2 \(allowed 0 <= e < 1\)/],
    ['MEAN_MOTION', -1, /MEAN_MOTION is -1 \(allowed revolutions per day, greater than 0 and at most 20\)/],
    ['EPOCH', '2026-13-01T00:00:00', /EPOCH is "2026-13-01T00:00:00"/],
    ['REF_FRAME', 'GCRF', /REF_FRAME is "GCRF" \(allowed TEME/],
    ['INCLINATION', 'abc', /INCLINATION is "abc"/],
  ])('rejects %s = %j, naming the line of the keyword', (key, value, re) => {
    const obj = JSON.parse(readFileSync('fixtures/tle/orbilux-3.omm.json', 'utf8'))[0];
    obj[key] = value;
    const text = JSON.stringify([obj], null, 2);
    const line = text.split('\n').findIndex((l) => l.includes(`"${key}"`)) + 1;
    expect(() => parseElementsText(text, 'o.json')).toThrow(re);
    expect(() => parseElementsText(text, 'o.json')).toThrow(new RegExp(`^o\\.json:${line}:5:`));
  });
  it('reports a JSON syntax error with its line and column', () => {
    expect(() => parseElementsText('[\n  {\n    "A": 1,\n  }\n]', 'bad.json')).toThrow(/^bad\.json:4:3: not valid JSON/);
  });
  it('a missing required keyword is named', () => {
    expect(() => parseElementsText('{"OBJECT_NAME": "X", "EPOCH": "2026-11-20T00:00:00"}', 'm.json')).toThrow(/lacks MEAN_MOTION/);
  });
});

describe('epoch warning (more than 7 days; accuracy degrades by a few km/day, from memory)', () => {
  const [e] = loadElementsFile('fixtures/demo/orbilux-3.tle');
  it.each([[0, false], [7 * 86400, false], [7 * 86400 + 1, true], [-8 * 86400, true]])('offset %d s warns: %s', (dt, warns) => {
    const w = epochWarning(e, EPOCH + dt);
    expect(w !== null).toBe(warns);
    if (w) expect(w).toMatch(/ORBILUX-3 \(99981\): window starts/);
  });
});
