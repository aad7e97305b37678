/**
 * Two-line and three-line element sets (NORAD TLE/3LE; column layout as in
 * Spacetrack Report #3 and Vallado et al., AIAA 2006-6753, Appendix). Several
 * sets per text; an optional name line before each, optionally prefixed "0 ".
 * Every rejection is one `InputError` line: `FILE:LINE:COLUMN: what (allowed)`.
 */
import { InputError } from '../errors.js';
import { catalogNumberValue } from './catalog.js';
import { tleChecksum } from './checksum.js';
import { MAX_ABS_BSTAR, MAX_MEAN_MOTION_REV_PER_DAY } from './omm.js';
import type { ElementSet } from './types.js';

const TLE_LENGTH = 69;
const DECIMAL = /^\s*[+-]?(\d+\.?\d*|\.\d+)\s*$/;
/** Implied-decimal exponent field, e.g. " 12345-4" = 0.12345e-4. */
const IMPLIED_EXP = /^([ +-])(\d{5})([+-])(\d)$/;

interface Ctx { file: string; lineNo: number; line: string }

function fail(ctx: Ctx, col: number, what: string, allowed: string): never {
  throw new InputError(`${ctx.file}:${ctx.lineNo}:${col}: ${what} (${allowed})`);
}

/** Field at 1-based columns [c0, c1]. */
function field(ctx: Ctx, c0: number, c1: number): string {
  return ctx.line.slice(c0 - 1, c1);
}

function decimal(ctx: Ctx, c0: number, c1: number, name: string, lo: number, hi: number, hiOpen = false): number {
  const s = field(ctx, c0, c1);
  if (!DECIMAL.test(s)) fail(ctx, c0, `${name} is not a number (got ${JSON.stringify(s)})`, `a decimal in columns ${c0}-${c1}`);
  const v = Number(s);
  if (v < lo || (hiOpen ? v >= hi : v > hi)) {
    fail(ctx, c0, `${name} out of range (got ${v})`, `${lo} to ${hi}${hiOpen ? ' exclusive' : ''}`);
  }
  return v;
}

function impliedExp(ctx: Ctx, c0: number, name: string): number {
  const s = field(ctx, c0, c0 + 7);
  const m = IMPLIED_EXP.exec(s);
  if (!m) fail(ctx, c0, `${name} is not in implied-decimal form (got ${JSON.stringify(s)})`, `sign, 5 digits, exponent sign and digit, e.g. " 15000-3"`);
  const mant = Number(`0.${m[2]}`) * (m[1] === '-' ? -1 : 1);
  return mant * 10 ** (Number(m[4]) * (m[3] === '-' ? -1 : 1));
}

function integerOrBlank(ctx: Ctx, c0: number, c1: number, name: string): number {
  const s = field(ctx, c0, c1);
  if (s.trim() === '') return 0;
  if (!/^\s*\d+$/.test(s)) fail(ctx, c0, `${name} is not a whole number (got ${JSON.stringify(s)})`, `digits in columns ${c0}-${c1}`);
  return Number(s);
}

function checkFrame(ctx: Ctx, lineDigit: '1' | '2', verifyChecksum: boolean): void {
  const n = ctx.line.length;
  if (n !== TLE_LENGTH) fail(ctx, Math.min(n, TLE_LENGTH) + 1, `element line is ${n} characters long`, `exactly ${TLE_LENGTH} characters`);
  if (ctx.line[0] !== lineDigit) fail(ctx, 1, `line number is ${JSON.stringify(ctx.line[0])}`, `'${lineDigit}' on this line of the set`);
  if (ctx.line[1] !== ' ') fail(ctx, 2, 'column 2 is not blank', 'a space after the line number');
  const ck = ctx.line[68];
  if (!/\d/.test(ck)) fail(ctx, 69, `checksum is not a digit (got ${JSON.stringify(ck)})`, 'a digit 0-9');
  const want = tleChecksum(ctx.line);
  if (verifyChecksum && Number(ck) !== want) fail(ctx, 69, `checksum is ${ck} but the line sums to ${want}`, 'modulo-10 sum of digits, minus signs count 1');
}

function catalog(ctx: Ctx): { text: string; value: number } {
  const text = field(ctx, 3, 7);
  const value = catalogNumberValue(text);
  if (!Number.isFinite(value)) fail(ctx, 3, `catalogue number is not valid (got ${JSON.stringify(text)})`, '5 digits, or a letter A-Z without I/O and 4 digits (alpha-5)');
  return { text: text.trim(), value };
}

/** Unix seconds of a TLE epoch (2-digit year: 57-99 → 19xx, 00-56 → 20xx) and fractional day of year (1 = 1 Jan 00:00). */
export function tleEpochUnix(year2: number, dayOfYear: number): number {
  const year = year2 < 57 ? 2000 + year2 : 1900 + year2;
  return Date.UTC(year, 0, 1) / 1000 + (dayOfYear - 1) * 86_400;
}

/** Parse lines 1 and 2 (already length/format checked by the caller's context) into an ElementSet. */
function parsePair(c1: Ctx, c2: Ctx, name: string | null, file: string, firstLine: number, verifyChecksum: boolean): ElementSet {
  checkFrame(c1, '1', verifyChecksum);
  checkFrame(c2, '2', verifyChecksum);
  const cat1 = catalog(c1);
  const cat2 = catalog(c2);
  if (cat1.value !== cat2.value) {
    fail(c2, 3, `catalogue number ${cat2.text} does not match line 1's ${cat1.text}`, 'the same catalogue number on both lines');
  }
  const cls = field(c1, 8, 8);
  if (!/^[UCS ]$/.test(cls)) fail(c1, 8, `classification is ${JSON.stringify(cls)}`, 'U, C, S or blank');
  const yy = field(c1, 19, 20);
  if (!/^\d\d$/.test(yy)) fail(c1, 19, `epoch year is not two digits (got ${JSON.stringify(yy)})`, '00-99; 57-99 mean 19xx, 00-56 mean 20xx');
  const year2 = Number(yy);
  const yearFull = year2 < 57 ? 2000 + year2 : 1900 + year2;
  const leap = (yearFull % 4 === 0 && yearFull % 100 !== 0) || yearFull % 400 === 0;
  const day = decimal(c1, 21, 32, 'epoch day of year', 1, leap ? 367 : 366, true);
  const ndot = decimal(c1, 34, 43, 'mean motion first derivative', -1, 1);
  const nddot = impliedExp(c1, 45, 'mean motion second derivative');
  const bstar = impliedExp(c1, 54, 'B* drag term');
  if (Math.abs(bstar) > MAX_ABS_BSTAR) fail(c1, 54, `B* drag term is ${bstar}`, `-${MAX_ABS_BSTAR} to ${MAX_ABS_BSTAR} per Earth radius`);
  const eph = field(c1, 63, 63);
  if (!/^[0-9 ]$/.test(eph)) fail(c1, 63, `ephemeris type is ${JSON.stringify(eph)}`, 'a digit or blank');
  const elset = integerOrBlank(c1, 65, 68, 'element set number');

  const incl = decimal(c2, 9, 16, 'inclination', 0, 180);
  const raan = decimal(c2, 18, 25, 'right ascension of the ascending node', 0, 360);
  const eccText = field(c2, 27, 33);
  if (!/^\d{7}$/.test(eccText)) fail(c2, 27, `eccentricity is not 7 digits (got ${JSON.stringify(eccText)})`, 'seven digits with an implied leading decimal point, so 0 <= e < 1');
  const ecc = Number(`0.${eccText}`);
  const argp = decimal(c2, 35, 42, 'argument of perigee', 0, 360);
  const ma = decimal(c2, 44, 51, 'mean anomaly', 0, 360);
  const nText = field(c2, 53, 63);
  if (!DECIMAL.test(nText)) fail(c2, 53, `mean motion is not a number (got ${JSON.stringify(nText)})`, 'revolutions per day in columns 53-63');
  const n = Number(nText);
  if (!(n > 0 && n <= MAX_MEAN_MOTION_REV_PER_DAY)) fail(c2, 53, `mean motion is ${n}`, `greater than 0 and at most ${MAX_MEAN_MOTION_REV_PER_DAY} revolutions per day`);
  const rev = integerOrBlank(c2, 64, 68, 'revolution number');

  return {
    name: name && name.length > 0 ? name : cat1.text,
    catalogNumber: cat1.text,
    catalogNumberValue: cat1.value,
    internationalDesignator: field(c1, 10, 17).trim(),
    epochUnixS: tleEpochUnix(year2, day),
    meanMotionRevPerDay: n,
    eccentricity: ecc,
    inclinationDeg: incl,
    raanDeg: raan,
    argOfPerigeeDeg: argp,
    meanAnomalyDeg: ma,
    bstarPerEarthRadius: bstar,
    meanMotionDotRevPerDay2: ndot,
    meanMotionDdotRevPerDay3: nddot,
    elementSetNumber: elset,
    revolutionNumber: rev,
    source: { file, line: firstLine, format: 'tle' },
    tleLines: [c1.line, c2.line],
  };
}

const looksLikeLine1 = (s: string) => /^1 /.test(s) || (s.length === TLE_LENGTH && s[0] === '1');
const looksLikeLine2 = (s: string) => /^2 /.test(s) || (s.length === TLE_LENGTH && s[0] === '2');

export interface TleParseOptions {
  /**
   * Check the column-69 checksum (default true). Only for known test data
   * whose checksums are not maintained, such as the SGP4 verification file.
   */
  verifyChecksum?: boolean;
}

/**
 * Parse every element set in a TLE/3LE text. Blank lines and lines starting
 * with '#' are skipped; trailing whitespace is ignored.
 */
export function parseTleText(text: string, file: string, options: TleParseOptions = {}): ElementSet[] {
  const verifyChecksum = options.verifyChecksum ?? true;
  const raw = text.split(/\r?\n/);
  const lines: { no: number; s: string }[] = [];
  raw.forEach((s, i) => {
    const t = s.replace(/\s+$/, '');
    if (t.trim() === '' || t.startsWith('#')) return;
    lines.push({ no: i + 1, s: t });
  });
  const out: ElementSet[] = [];
  let i = 0;
  while (i < lines.length) {
    let name: string | null = null;
    const first = lines[i];
    if (!looksLikeLine1(first.s)) {
      if (looksLikeLine2(first.s)) {
        fail({ file, lineNo: first.no, line: first.s }, 1, 'line 2 of an element set without its line 1', 'an optional name line, then line 1, then line 2');
      }
      name = first.s.replace(/^0 /, '').trim();
      i++;
      if (i >= lines.length) fail({ file, lineNo: first.no, line: first.s }, 1, 'name line without an element set after it', 'a name line followed by lines 1 and 2');
      if (!looksLikeLine1(lines[i].s)) {
        const l = lines[i];
        fail({ file, lineNo: l.no, line: l.s }, 1, `expected line 1 of an element set after the name line (got ${JSON.stringify(l.s.slice(0, 20))})`, "a line starting '1 '");
      }
    }
    const l1 = lines[i];
    const l2 = lines[i + 1];
    if (!l2) fail({ file, lineNo: l1.no, line: l1.s }, 1, 'line 1 without a line 2 after it', "line 2 (starting '2 ') right after line 1");
    const c1 = { file, lineNo: l1.no, line: l1.s };
    const c2 = { file, lineNo: l2.no, line: l2.s };
    if (!looksLikeLine2(l2.s)) fail(c2, 1, `expected line 2 of the element set (got ${JSON.stringify(l2.s.slice(0, 20))})`, "a line starting '2 ' right after line 1");
    out.push(parsePair(c1, c2, name, file, name !== null ? first.no : l1.no, verifyChecksum));
    i += 2;
  }
  return out;
}
