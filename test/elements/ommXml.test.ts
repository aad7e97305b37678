/**
 * CCSDS OMM (502.0-B) in XML: the same elements and the same propagated state
 * as the equivalent TLE, the standard's own example values where recalled
 * (GOES 9 of CCSDS 502.0-B-2, FROM MEMORY: no copy of the standard is in
 * ../shared/reference/), and located one-line rejections as for OMM JSON.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { detectElementsFormat, loadElementsFile, parseElementsText } from '../../src/elements/load.js';
import type { ElementSet } from '../../src/elements/types.js';
import { createPropagator } from '../../src/orbit/propagator.js';

const XML = 'fixtures/tle/orbilux-3.omm.xml';
const GOES_XML = 'fixtures/tle/ccsds-omm-example-goes9.omm.xml';
const GOES_TLE = 'fixtures/tle/ccsds-omm-example-goes9.tle';

/** TEME position (km) and velocity (km/s) of an element set at `t` (Unix s). */
function state(e: ElementSet, t: number): { r: number[]; v: number[] } {
  const r = new Float64Array(3);
  const v = new Float64Array(3);
  createPropagator(e).stateTeme(t, r, v);
  return { r: [...r], v: [...v] };
}

const elementFields = (e: ElementSet) => {
  const { source: _s, tleLines: _t, ...rest } = e;
  return rest;
};

describe('OMM XML against the equivalent TLE', () => {
  it('ORBILUX-3: the XML gives the same elements as the OMM JSON fixture and the TLE', () => {
    const [x] = loadElementsFile(XML);
    const [j] = loadElementsFile('fixtures/tle/orbilux-3.omm.json');
    const [t] = loadElementsFile('fixtures/demo/orbilux-3.tle');
    expect(x.source).toEqual({ file: XML, line: 3, format: 'omm-xml' });
    expect(elementFields(x)).toEqual(elementFields(j));
    expect(x).toMatchObject({ name: 'ORBILUX-3', catalogNumberValue: 99981, epochUnixS: t.epochUnixS, meanMotionRevPerDay: 15.22, eccentricity: 0.0011 });
  });

  it.each([0, 0.5, 1, 3])('ORBILUX-3: same propagated TEME state as the TLE %d days after epoch (1 mm, 1 µm/s)', (days) => {
    const [x] = loadElementsFile(XML);
    const [t] = loadElementsFile('fixtures/demo/orbilux-3.tle');
    const a = state(x, x.epochUnixS + days * 86_400);
    const b = state(t, t.epochUnixS + days * 86_400);
    for (let k = 0; k < 3; k++) {
      expect(Math.abs(a.r[k] - b.r[k])).toBeLessThan(1e-6);
      expect(Math.abs(a.v[k] - b.v[k])).toBeLessThan(1e-9);
    }
    // and a real orbit: |r| near the semi-major axis of 15.22 rev/day (about 6.9e3 km)
    expect(Math.hypot(...a.r)).toBeGreaterThan(6700);
    expect(Math.hypot(...a.r)).toBeLessThan(7100);
  });
});

describe('the CCSDS 502.0-B-2 OMM example, GOES 9 (values from memory)', () => {
  // (from memory) EPOCH = 2007-064T10:34:41.4264, MEAN_MOTION = 1.00273272 rev/day, ECCENTRICITY = 0.0005013,
  // INCLINATION = 3.0539, RA_OF_ASC_NODE = 81.7939, ARG_OF_PERICENTER = 249.2363, MEAN_ANOMALY = 150.1602 deg,
  // NORAD_CAT_ID = 23581, ELEMENT_SET_NO = 0925, REV_AT_EPOCH = 4316, BSTAR = 0.0001, MEAN_MOTION_DOT = -0.00000113.
  const [g] = loadElementsFile(GOES_XML);
  const [t] = loadElementsFile(GOES_TLE);

  it('reads every keyword as written (the <ndm> container, day-of-year EPOCH, SGP/SGP4 theory)', () => {
    expect(g).toMatchObject({
      name: 'GOES 9', catalogNumber: '23581', catalogNumberValue: 23581, internationalDesignator: '1995-025A',
      meanMotionRevPerDay: 1.00273272, eccentricity: 0.0005013, inclinationDeg: 3.0539, raanDeg: 81.7939,
      argOfPerigeeDeg: 249.2363, meanAnomalyDeg: 150.1602, bstarPerEarthRadius: 0.0001,
      meanMotionDotRevPerDay2: -0.00000113, meanMotionDdotRevPerDay3: 0, elementSetNumber: 925, revolutionNumber: 4316,
      source: { format: 'omm-xml', line: 9 },
    });
    expect(g.epochUnixS).toBe(Date.UTC(2007, 0, 1) / 1000 + 63 * 86_400 + 10 * 3600 + 34 * 60 + 41.4264);
  });

  it('the recalled TLE has the same elements; its epoch day 064.44075725 is the same instant to 1 ms', () => {
    expect(Math.abs(t.epochUnixS - g.epochUnixS)).toBeLessThan(1e-3);
    for (const k of ['meanMotionRevPerDay', 'eccentricity', 'inclinationDeg', 'raanDeg', 'argOfPerigeeDeg', 'meanAnomalyDeg', 'bstarPerEarthRadius', 'meanMotionDotRevPerDay2'] as const) {
      expect(t[k], k).toBeCloseTo(g[k], 12);
    }
    expect([t.elementSetNumber, t.revolutionNumber]).toEqual([925, 4316]);
  });

  it.each([0, 1, 10])('same deep-space (SDP4) state as the TLE %d days after epoch, at geostationary radius', (days) => {
    const a = state(g, g.epochUnixS + days * 86_400);
    const b = state(t, g.epochUnixS + days * 86_400);
    for (let k = 0; k < 3; k++) {
      expect(Math.abs(a.r[k] - b.r[k])).toBeLessThan(1e-3);
      expect(Math.abs(a.v[k] - b.v[k])).toBeLessThan(1e-6);
    }
    // 1.0027 rev/day is geosynchronous: |r| ≈ 42 164 km (Kepler's third law), e = 0.0005 keeps it within ±30 km.
    expect(Math.abs(Math.hypot(...a.r) - 42_164)).toBeLessThan(60);
  });
});

describe('format detection', () => {
  it.each([
    ['x.xml', 'anything', 'omm-xml'], ['x.json', '1 2', 'omm-json'], ['x.txt', '  <omm/>', 'omm-xml'],
    ['x.txt', '[{}]', 'omm-json'], ['x', '1 99981U', 'tle'], ['X.XML', '', 'omm-xml'],
  ] as const)('%s with %j → %s', (file, text, want) => {
    expect(detectElementsFormat(text, file)).toBe(want);
  });
  it('an .xml file holding TLE lines is refused as XML, located', () => {
    expect(() => parseElementsText(readFileSync('fixtures/demo/orbilux-3.tle', 'utf8'), 'sat.xml')).toThrow(/^sat\.xml:\d+:\d+: not well-formed XML/);
  });
});

/** The fixture with one text replaced; the expected line is where `marker` sits in the result. */
function mutated(from: string, to: string, marker: string = to): { text: string; line: number } {
  const base = readFileSync(XML, 'utf8');
  if (!base.includes(from)) throw new Error(`fixture lacks ${from}`);
  const text = base.replace(from, to);
  const at = text.indexOf(marker);
  return { text, line: text.slice(0, at).split('\n').length };
}

describe('rejections: one line, FILE:LINE:COLUMN of the keyword (or of <omm>, or of the XML error)', () => {
  const cases: [string, string, string, string | undefined, RegExp][] = [
    ['eccentricity 1.2', '<ECCENTRICITY>0.0011', '<ECCENTRICITY>1.2', undefined, /ECCENTRICITY is "1\.2" \(allowed 0 <= e < 1\)/],
    ['inclination not a number', '>97.4<', '>ninety<', '<INCLINATION', /INCLINATION is "ninety"/],
    ['inclination in radians', '<INCLINATION units="deg">', '<INCLINATION units="rad">', undefined, /INCLINATION has units "rad" \(allowed deg\)/],
    ['mean motion in rad/s', '<MEAN_MOTION units="rev/day">', '<MEAN_MOTION units="rad/s">', undefined, /MEAN_MOTION has units "rad\/s" \(allowed rev\/day\)/],
    ['REF_FRAME GCRF', '<REF_FRAME>TEME', '<REF_FRAME>GCRF', undefined, /REF_FRAME is "GCRF" \(allowed TEME/],
    ['theory DSST', '<MEAN_ELEMENT_THEORY>SGP4', '<MEAN_ELEMENT_THEORY>DSST', undefined, /MEAN_ELEMENT_THEORY is "DSST" \(allowed SGP4 or SGP\/SGP4/],
    ['bad epoch', '2026-11-20T00:00:00.000000', '2026-02-30T00:00:00', '<EPOCH', /EPOCH is "2026-02-30T00:00:00"/],
    ['keyword twice', '<ECCENTRICITY>0.0011</ECCENTRICITY>', '<ECCENTRICITY>0.0011</ECCENTRICITY>\n          <ECCENTRICITY>0.0012</ECCENTRICITY>', '<ECCENTRICITY>0.0012', /ECCENTRICITY given twice/],
    ['missing mean motion (names OBJECT_NAME, as OMM JSON does)', '<MEAN_MOTION units="rev/day">15.22</MEAN_MOTION>', '', '<OBJECT_NAME>', /lacks MEAN_MOTION/],
    ['semi-major axis instead', '<MEAN_MOTION units="rev/day">15.22</MEAN_MOTION>', '<SEMI_MAJOR_AXIS units="km">6900</SEMI_MAJOR_AXIS>', undefined, /SEMI_MAJOR_AXIS given instead of MEAN_MOTION/],
    ['negative catalogue number', '<NORAD_CAT_ID>99981', '<NORAD_CAT_ID>-5', undefined, /NORAD_CAT_ID is "-5"/],
    ['unclosed element', '</INCLINATION>', '</INCLINATIO>', undefined, /not well-formed XML/],
    ['wrong root', '<omm id="CCSDS_OMM_VERS" version="2.0">', '<opm id="CCSDS_OPM_VERS" version="2.0">', undefined, /not well-formed XML|root element <opm>/],
    ['entity defined in a DTD', '<?xml version="1.0" encoding="UTF-8"?>', '<?xml version="1.0" encoding="UTF-8"?>\n<!DOCTYPE omm [<!ENTITY a "aaaaaaaa">]>', '<!DOCTYPE', /DOCTYPE declaration/],
  ];
  it.each(cases)('%s', (_n, from, to, marker, re) => {
    const { text, line } = mutated(from, to, marker ?? to);
    let err: unknown;
    try { parseElementsText(text, 'o.xml'); } catch (e) { err = e; }
    expect(err).toBeInstanceOf(InputError);
    const msg = (err as Error).message;
    expect(msg).toMatch(re);
    expect(msg.split('\n')).toHaveLength(1);
    if (!/well-formed|DOCTYPE/.test(msg)) expect(msg, msg).toMatch(new RegExp(`^o\\.xml:${line}:\\d+: `));
    else expect(msg).toMatch(/^o\.xml:\d+:\d+: /);
  });

  it('the column is that of the keyword element', () => {
    const { text, line } = mutated('<ECCENTRICITY>0.0011', '<ECCENTRICITY>1.2');
    const col = text.split('\n')[line - 1].indexOf('<ECCENTRICITY') + 1;
    expect(() => parseElementsText(text, 'o.xml')).toThrow(new RegExp(`^o\\.xml:${line}:${col}: ECCENTRICITY`));
  });

  it('the XML error names its line: an unclosed tag on line 23', () => {
    const { text, line } = mutated('</INCLINATION>', '</INCLINATIO>');
    expect(line).toBe(23);
    expect(() => parseElementsText(text, 'o.xml')).toThrow(/^o\.xml:23:\d+: not well-formed XML/);
  });
});
