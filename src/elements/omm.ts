/**
 * CCSDS Orbit Mean-Elements Message (CCSDS 502.0-B) in its JSON form: one
 * object or an array of objects with the standard keywords. Rejections name
 * FILE:LINE:COLUMN of the offending keyword (or of the JSON syntax error).
 */
import { InputError } from '../errors.js';
import type { ElementSet } from './types.js';

interface Located { file: string; text: string }

/** 1-based line and column of character offset `pos` in `text`. */
export function lineColumnAt(text: string, pos: number): { line: number; column: number } {
  let line = 1;
  let last = -1;
  for (let i = 0; i < pos && i < text.length; i++) {
    if (text.charCodeAt(i) === 10) { line++; last = i; }
  }
  return { line, column: pos - last };
}

/** 1-based line of character offset `pos`, by binary search over the text's line starts (built once). */
export function lineFinder(text: string): (pos: number) => number {
  const starts = [0];
  for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) starts.push(i + 1);
  return (pos) => {
    let lo = 0;
    let hi = starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (starts[mid] <= pos) lo = mid; else hi = mid - 1;
    }
    return lo + 1;
  };
}

/** Where the k-th (0-based) occurrence of `"KEY"` sits, or the k-th object's start when absent. */
function keyLocation(src: Located, key: string, objectIndex: number): string {
  const re = new RegExp(`"${key}"\\s*:`, 'g');
  let m: RegExpExecArray | null;
  // The first occurrence inside this entry's span of text (entries are top-level objects).
  const starts = objectStarts(src.text);
  const begin = starts[objectIndex] ?? 0;
  const end = starts[objectIndex + 1] ?? src.text.length;
  while ((m = re.exec(src.text)) !== null) {
    if (m.index >= begin && m.index < end) {
      const lc = lineColumnAt(src.text, m.index);
      return `${src.file}:${lc.line}:${lc.column}`;
    }
  }
  const lc = lineColumnAt(src.text, begin);
  return `${src.file}:${lc.line}:${lc.column}`;
}

/** Offsets of the '{' opening each top-level element object (depth 0 or 1). */
function objectStarts(text: string): number[] {
  const out: number[] = [];
  let depth = 0;
  let inStr = false;
  const top = text.trimStart().startsWith('[') ? 1 : 0;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (inStr) {
      if (c === '\\') i++;
      else if (c === '"') inStr = false;
      continue;
    }
    if (c === '"') inStr = true;
    else if (c === '{' || c === '[') {
      if (c === '{' && depth === top) out.push(i);
      depth++;
    } else if (c === '}' || c === ']') depth--;
  }
  return out;
}

const ISO_EPOCH = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})(\.\d+)?Z?$/;
const ISO_DOY_EPOCH = /^(\d{4})-(\d{3})T(\d{2}):(\d{2}):(\d{2})(\.\d+)?Z?$/;

/** OMM EPOCH (UTC; calendar or day-of-year form, no offset or 'Z') to Unix seconds, keeping sub-millisecond digits. */
export function parseOmmEpoch(s: string): number | null {
  let m = ISO_EPOCH.exec(s);
  if (m) {
    const [y, mo, d, h, mi, se] = m.slice(1, 7).map(Number);
    if (mo < 1 || mo > 12 || d < 1 || d > 31 || h > 23 || mi > 59 || se > 60) return null;
    const ms = Date.UTC(y, mo - 1, d, h, mi, se);
    if (new Date(ms).getUTCDate() !== d) return null;
    return ms / 1000 + (m[7] ? Number(m[7]) : 0);
  }
  m = ISO_DOY_EPOCH.exec(s);
  if (m) {
    const [y, doy, h, mi, se] = m.slice(1, 6).map(Number);
    if (doy < 1 || doy > 366 || h > 23 || mi > 59 || se > 60) return null;
    return Date.UTC(y, 0, 1) / 1000 + (doy - 1) * 86_400 + h * 3600 + mi * 60 + se + (m[6] ? Number(m[6]) : 0);
  }
  return null;
}

/**
 * Plausibility bounds shared with the TLE parser. Faster than 20 rev/day is
 * below the Earth's surface (a circular orbit at the surface makes about 17);
 * |B*| above 1 per Earth radius makes SGP4's drag model throw the orbit out
 * within days (published element sets stay far below 0.1).
 */
export const MAX_MEAN_MOTION_REV_PER_DAY = 20;
export const MAX_ABS_BSTAR = 1;

type Check = { key: string; required: boolean; lo?: number; hi?: number; hiOpen?: boolean; loOpen?: boolean; allowed: string };

const NUMERIC: Check[] = [
  { key: 'MEAN_MOTION', required: true, lo: 0, loOpen: true, hi: MAX_MEAN_MOTION_REV_PER_DAY, allowed: `revolutions per day, greater than 0 and at most ${MAX_MEAN_MOTION_REV_PER_DAY}` },
  { key: 'ECCENTRICITY', required: true, lo: 0, hi: 1, hiOpen: true, allowed: '0 <= e < 1' },
  { key: 'INCLINATION', required: true, lo: 0, hi: 180, allowed: '0 to 180 deg' },
  { key: 'RA_OF_ASC_NODE', required: true, lo: 0, hi: 360, allowed: '0 to 360 deg' },
  { key: 'ARG_OF_PERICENTER', required: true, lo: 0, hi: 360, allowed: '0 to 360 deg' },
  { key: 'MEAN_ANOMALY', required: true, lo: 0, hi: 360, allowed: '0 to 360 deg' },
  { key: 'NORAD_CAT_ID', required: true, lo: 0, hi: 339_999, allowed: 'a catalogue number 0 to 339999' },
  { key: 'ELEMENT_SET_NO', required: false, lo: 0, allowed: 'a whole number >= 0' },
  { key: 'REV_AT_EPOCH', required: false, lo: 0, allowed: 'a whole number >= 0' },
  { key: 'BSTAR', required: true, lo: -MAX_ABS_BSTAR, hi: MAX_ABS_BSTAR, allowed: `a number per Earth radius, -${MAX_ABS_BSTAR} to ${MAX_ABS_BSTAR}` },
  { key: 'MEAN_MOTION_DOT', required: true, allowed: 'a number (rev/day^2)' },
  { key: 'MEAN_MOTION_DDOT', required: true, allowed: 'a number (rev/day^3)' },
];

function toNumber(v: unknown): number {
  if (typeof v === 'number') return v;
  if (typeof v === 'string' && v.trim() !== '' && /^[\s+-.\deE]+$/.test(v)) return Number(v);
  return NaN;
}

/** Parse OMM JSON text (one object or an array) into element sets. */
export function parseOmmJson(text: string, file: string): ElementSet[] {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    const msg = (e as Error).message;
    const pos = /position (\d+)/.exec(msg);
    const lc = pos ? lineColumnAt(text, Number(pos[1])) : { line: 1, column: 1 };
    throw new InputError(`${file}:${lc.line}:${lc.column}: not valid JSON (${msg.replace(/ in JSON at position \d+.*$/, '')}; allowed an OMM object or an array of them)`);
  }
  const src = { file, text };
  const list = Array.isArray(doc) ? doc : [doc];
  if (list.length === 0) throw new InputError(`${file}:1:1: empty OMM array (allowed one or more OMM objects)`);
  // Entry starts and line numbers once for the whole text (a file may hold thousands of entries).
  const starts = objectStarts(text);
  const lineAt = lineFinder(text);
  return list.map((obj, k) => {
    if (obj === null || typeof obj !== 'object' || Array.isArray(obj)) {
      const lc = lineColumnAt(text, starts[k] ?? 0);
      throw new InputError(`${file}:${lc.line}:${lc.column}: OMM entry ${k + 1} is not an object (allowed an object with OMM keywords)`);
    }
    const line = lineAt(starts[k] ?? 0);
    return elementSetFromOmm(obj as Record<string, unknown>, {
      where: (key: string) => keyLocation(src, key, k), entry: k + 1, file, line, format: 'omm-json',
    });
  });
}

/** Where an OMM's keywords sit, for messages; `where(key)` is `FILE:LINE:COLUMN` of the keyword (or of its entry when absent). */
export interface OmmSource {
  where: (key: string) => string;
  /** 1-based entry number in the file. */
  entry: number;
  file: string;
  /** First line of the entry. */
  line: number;
  format: 'omm-json' | 'omm-xml';
}

/** MEAN_ELEMENT_THEORY values meaning SGP4 mean elements (CCSDS 502.0-B's own example writes SGP/SGP4, from memory). */
const SGP4_THEORIES = ['SGP4', 'SGP/SGP4'];

/**
 * One OMM's keywords (values as numbers or as text) → `ElementSet`, with
 * every check of the standard's SGP4 profile: the TLE-related keywords,
 * ranges, TEME/EARTH/UTC. Shared by the JSON and the XML forms.
 */
export function elementSetFromOmm(o: Record<string, unknown>, at: OmmSource): ElementSet {
  const { where, file } = at;
  const k = at.entry - 1;
  const values: Record<string, number> = {};
  for (const c of NUMERIC) {
    const raw = o[c.key];
    if (raw === undefined || raw === null || raw === '') {
      if (c.required) throw new InputError(`${where('OBJECT_NAME')}: OMM entry ${k + 1} lacks ${c.key} (allowed ${c.allowed})`);
      values[c.key] = 0;
      continue;
    }
    const v = toNumber(raw);
    const bad = !Number.isFinite(v)
      || (c.lo !== undefined && (c.loOpen ? v <= c.lo : v < c.lo))
      || (c.hi !== undefined && (c.hiOpen ? v >= c.hi : v > c.hi));
    if (bad) throw new InputError(`${where(c.key)}: ${c.key} is ${shown(raw)} (allowed ${c.allowed})`);
    values[c.key] = v;
  }
  const epochRaw = o.EPOCH;
  const epoch = typeof epochRaw === 'string' ? parseOmmEpoch(epochRaw.trim()) : null;
  if (epoch === null) {
    throw new InputError(`${where(epochRaw === undefined ? 'OBJECT_NAME' : 'EPOCH')}: EPOCH is ${shown(epochRaw)} (allowed UTC date-time like 2026-11-20T00:00:00.000000)`);
  }
  for (const key of ['OBJECT_NAME', 'OBJECT_ID']) {
    if (o[key] !== undefined && typeof o[key] !== 'string') throw new InputError(`${where(key)}: ${key} is not a string (allowed text)`);
  }
  for (const [key, want] of [['REF_FRAME', ['TEME']], ['CENTER_NAME', ['EARTH']], ['TIME_SYSTEM', ['UTC']], ['MEAN_ELEMENT_THEORY', SGP4_THEORIES]] as const) {
    if (o[key] !== undefined && !(want as readonly string[]).includes(String(o[key]).trim().toUpperCase())) {
      throw new InputError(`${where(key)}: ${key} is ${shown(o[key])} (allowed ${want.join(' or ')} for SGP4 mean elements)`);
    }
  }
  if (o.EPHEMERIS_TYPE !== undefined && toNumber(o.EPHEMERIS_TYPE) !== 0) {
    throw new InputError(`${where('EPHEMERIS_TYPE')}: EPHEMERIS_TYPE is ${shown(o.EPHEMERIS_TYPE)} (allowed 0, SGP4)`);
  }
  const cat = values.NORAD_CAT_ID;
  if (!Number.isInteger(cat)) throw new InputError(`${where('NORAD_CAT_ID')}: NORAD_CAT_ID is ${shown(o.NORAD_CAT_ID)} (allowed a whole number)`);
  const catText = String(cat).padStart(5, '0');
  return {
    name: typeof o.OBJECT_NAME === 'string' && o.OBJECT_NAME.trim() !== '' ? o.OBJECT_NAME.trim() : catText,
    catalogNumber: catText,
    catalogNumberValue: cat,
    internationalDesignator: typeof o.OBJECT_ID === 'string' ? o.OBJECT_ID.trim() : '',
    epochUnixS: epoch,
    meanMotionRevPerDay: values.MEAN_MOTION,
    eccentricity: values.ECCENTRICITY,
    inclinationDeg: values.INCLINATION,
    raanDeg: values.RA_OF_ASC_NODE,
    argOfPerigeeDeg: values.ARG_OF_PERICENTER,
    meanAnomalyDeg: values.MEAN_ANOMALY,
    bstarPerEarthRadius: values.BSTAR,
    meanMotionDotRevPerDay2: values.MEAN_MOTION_DOT,
    meanMotionDdotRevPerDay3: values.MEAN_MOTION_DDOT,
    elementSetNumber: values.ELEMENT_SET_NO,
    revolutionNumber: values.REV_AT_EPOCH,
    source: { file, line: at.line, format: at.format },
  };
}

/** A value as shown in a message: JSON form, long text cut. */
function shown(v: unknown): string {
  const t = JSON.stringify(v) ?? String(v);
  return t.length > 60 ? `${t.slice(0, 57)}...` : t;
}
