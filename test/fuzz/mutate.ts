/**
 * Mutations of the fixtures for the fuzz tests, as fast-check arbitraries:
 * a document is a fixture with 1 to 4 edits applied, each edit one of
 * delete, duplicate, replace by an extreme / non-finite / retyped / unicode /
 * very long value, rename a key to a wrong unit, scale a number by a wrong
 * unit's factor, or a textual edit of the serialised text (delete, repeat or
 * cut a line, insert a character). Pure functions of the generated plan, so a
 * seed gives the same documents every time.
 */
import fc from 'fast-check';
import { stringify } from 'yaml';
import { withTleChecksum } from '../../src/elements/checksum.js';

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };
type PathKey = string | number;

/** Every path in a value (containers and leaves), root excluded. */
export function paths(v: Json, at: PathKey[] = [], out: PathKey[][] = []): PathKey[][] {
  if (Array.isArray(v)) v.forEach((x, i) => { out.push([...at, i]); paths(x, [...at, i], out); });
  else if (v !== null && typeof v === 'object') for (const [k, x] of Object.entries(v)) { out.push([...at, k]); paths(x, [...at, k], out); }
  return out;
}

const clone = <T>(v: T): T => structuredClone(v);

function parentOf(root: Json, p: PathKey[]): { parent: Json[] | Record<string, Json>; key: PathKey } | null {
  let v: Json = root;
  for (const k of p.slice(0, -1)) {
    if (v === null || typeof v !== 'object') return null;
    v = (v as Record<PathKey, Json>)[k];
  }
  if (v === null || typeof v !== 'object') return null;
  return { parent: v as Json[] | Record<string, Json>, key: p[p.length - 1] };
}

/** Values that break things: extremes, non-finite, retyped, unicode, long. */
export const oddValue: fc.Arbitrary<Json | number> = fc.oneof(
  fc.constantFrom<Json | number>(0, -0, -1, 1e308, -1e308, 5e-324, 2 ** 53 + 2, -(2 ** 31), Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY,
    '', ' ', 'NaN', 'Infinity', '1e999', '-0', 'null', 'true', '0x10', '1,5', '١٢٣', '\u0000', '\u202e', 'ℵ₀', '🛰️', 'a\nb', '"quoted"', '&a', '*a', '!!binary AA==', '%YAML 1.1', '<x/>'),
  fc.double(),
  fc.integer(),
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc.string({ unit: 'grapheme', maxLength: 40 }),
  fc.boolean(),
  fc.constant(null),
  fc.array(fc.oneof(fc.integer(), fc.string({ maxLength: 5 })), { maxLength: 4 }),
  fc.dictionary(fc.string({ maxLength: 6 }), fc.integer(), { maxKeys: 3, noNullPrototype: true }),
  fc.tuple(fc.constantFrom('x', 'é', '𝔘', '9'), fc.integer({ min: 1_000, max: 200_000 })).map(([c, n]) => c.repeat(n)),
);

/** Unit suffixes and a wrong one for each (with the factor a value would need). */
const WRONG_UNITS: [RegExp, string][] = [[/_db$/, '_dbw'], [/_m$/, '_cm'], [/_ghz$/, '_hz'], [/_mhz$/, '_ghz'], [/_deg$/, '_rad'], [/_s$/, '_ms'], [/_k$/, '_c'], [/_w$/, '_mw'], [/_bps$/, '_kbps'], [/_mm_h$/, '_in_h'], [/_km$/, '_mi']];

export type Edit =
  | { op: 'delete'; at: number }
  | { op: 'duplicate'; at: number }
  | { op: 'replace'; at: number; value: Json | number }
  | { op: 'retype'; at: number }
  | { op: 'rename'; at: number }
  | { op: 'scale'; at: number; factor: number };

export const editArb: fc.Arbitrary<Edit> = fc.oneof(
  fc.record({ op: fc.constant('delete' as const), at: fc.nat() }),
  fc.record({ op: fc.constant('duplicate' as const), at: fc.nat() }),
  fc.record({ op: fc.constant('replace' as const), at: fc.nat(), value: oddValue }),
  fc.record({ op: fc.constant('replace' as const), at: fc.nat(), value: oddValue }),
  fc.record({ op: fc.constant('retype' as const), at: fc.nat() }),
  fc.record({ op: fc.constant('rename' as const), at: fc.nat() }),
  fc.record({ op: fc.constant('scale' as const), at: fc.nat(), factor: fc.constantFrom(1e-9, 1e-3, 1e3, 1e6, 1e9, -1, 1e300) }),
);

/** Apply edits to a copy of `base` (edits whose path no longer exists are skipped). */
export function applyEdits(base: Json, edits: readonly Edit[]): Json {
  const root = clone(base);
  for (const e of edits) {
    const all = paths(root);
    if (all.length === 0) break;
    const p = all[e.at % all.length];
    const loc = parentOf(root, p);
    if (!loc) continue;
    const { parent, key } = loc;
    const obj = parent as Record<PathKey, Json>;
    const cur = obj[key];
    switch (e.op) {
      case 'delete':
        if (Array.isArray(parent)) parent.splice(key as number, 1); else delete obj[key];
        break;
      case 'duplicate':
        if (Array.isArray(parent)) parent.splice(key as number, 0, clone(cur));
        else obj[`${String(key)}_copy`] = clone(cur);
        break;
      case 'replace':
        obj[key] = e.value as Json;
        break;
      case 'retype':
        obj[key] = typeof cur === 'number' ? String(cur) : typeof cur === 'string' ? (Number.isFinite(Number(cur)) ? Number(cur) : cur.length) : typeof cur === 'boolean' ? String(cur) : cur === null ? 0 : Array.isArray(cur) ? { list: cur } : [cur];
        break;
      case 'rename': {
        if (Array.isArray(parent) || typeof key !== 'string') break;
        const w = WRONG_UNITS.find(([re]) => re.test(key));
        const to = w ? key.replace(w[0], w[1]) : `${key}x`;
        delete obj[key];
        obj[to] = cur;
        break;
      }
      case 'scale':
        if (typeof cur === 'number') obj[key] = cur * e.factor;
        break;
    }
  }
  return root;
}

export type TextEdit =
  | { op: 'delete-line'; at: number }
  | { op: 'repeat-line'; at: number }
  | { op: 'cut'; at: number }
  | { op: 'insert'; at: number; text: string };

export const textEditArb: fc.Arbitrary<TextEdit> = fc.oneof(
  fc.record({ op: fc.constant('delete-line' as const), at: fc.nat() }),
  fc.record({ op: fc.constant('repeat-line' as const), at: fc.nat() }),
  fc.record({ op: fc.constant('cut' as const), at: fc.nat() }),
  fc.record({ op: fc.constant('insert' as const), at: fc.nat(), text: fc.oneof(fc.constantFrom(':', '-', '[', '{', '"', "'", '\t', '&x ', '*x', '!', '#', '\n  ', '<', '>', '&amp;', '&bogus;', ']]>', '\u0000', '\uFEFF', '\uD800'), fc.string({ unit: 'binary', maxLength: 8 })) }),
);

export function applyTextEdits(text: string, edits: readonly TextEdit[]): string {
  let t = text;
  for (const e of edits) {
    const lines = t.split('\n');
    const i = e.at % Math.max(1, lines.length);
    if (e.op === 'delete-line') lines.splice(i, 1);
    else if (e.op === 'repeat-line') lines.splice(i, 0, lines[i] ?? '');
    else if (e.op === 'cut') return t.slice(0, e.at % Math.max(1, t.length));
    else {
      const pos = e.at % Math.max(1, t.length + 1);
      t = t.slice(0, pos) + e.text + t.slice(pos);
      continue;
    }
    t = lines.join('\n');
  }
  return t;
}

/** YAML or JSON text of a value (JSON turns non-finite numbers into null; YAML writes .nan and .inf). */
export function serialise(v: Json, format: 'yaml' | 'json'): string {
  if (format === 'json') return JSON.stringify(v, null, 2);
  return stringify(v, { lineWidth: 0 });
}

/** A mutated structured document: edits on the value, then maybe textual edits. */
export const docPlanArb = fc.record({
  edits: fc.array(editArb, { minLength: 1, maxLength: 4 }),
  format: fc.constantFrom('yaml' as const, 'json' as const),
  text: fc.array(textEditArb, { maxLength: 2 }),
  textChance: fc.nat({ max: 3 }),
});
export type DocPlan = typeof docPlanArb extends fc.Arbitrary<infer T> ? T : never;

export function buildDoc(base: Json, plan: DocPlan): string {
  const text = serialise(applyEdits(base, plan.edits), plan.format);
  return plan.textChance === 0 ? applyTextEdits(text, plan.text) : text;
}

// ---------------------------------------------------------------- TLE lines

const TLE_CHARS = '0123456789 +-.ABCUZé\t';
export const tleEditArb = fc.oneof(
  fc.record({ op: fc.constant('char' as const), line: fc.nat(), col: fc.nat({ max: 80 }), ch: fc.oneof(fc.constantFrom(...TLE_CHARS.split('')), fc.string({ unit: 'binary', minLength: 1, maxLength: 1 })) }),
  fc.record({ op: fc.constant('field' as const), line: fc.nat(), col: fc.nat({ max: 68 }), digits: fc.stringMatching(/^[0-9 .+-]{1,12}$/) }),
  fc.record({ op: fc.constant('delete-char' as const), line: fc.nat(), col: fc.nat({ max: 80 }) }),
  fc.record({ op: fc.constant('lines' as const), kind: fc.constantFrom('swap', 'drop', 'repeat', 'blank', 'long'), line: fc.nat() }),
);
export type TleEdit = typeof tleEditArb extends fc.Arbitrary<infer T> ? T : never;

/** Edit TLE text; with `fixChecksums` every line starting "1 " or "2 " gets its checksum recomputed, so parsing goes deeper. */
export function mutateTle(text: string, edits: readonly TleEdit[], fixChecksums: boolean): string {
  const lines = text.split('\n').filter((l) => l !== '' && !l.startsWith('#'));
  for (const e of edits) {
    const i = e.line % lines.length;
    const l = lines[i] ?? '';
    if (e.op === 'char') lines[i] = l.slice(0, e.col) + e.ch + l.slice(e.col + 1);
    else if (e.op === 'field') lines[i] = l.slice(0, e.col) + e.digits + l.slice(e.col + e.digits.length);
    else if (e.op === 'delete-char') lines[i] = l.slice(0, e.col) + l.slice(e.col + 1);
    else if (e.kind === 'swap') { const j = (i + 1) % lines.length; [lines[i], lines[j]] = [lines[j], lines[i]]; }
    else if (e.kind === 'drop') lines.splice(i, 1);
    else if (e.kind === 'repeat') lines.splice(i, 0, l);
    else if (e.kind === 'blank') lines.splice(i, 0, '');
    else lines[i] = l + '9'.repeat(100_000);
    if (lines.length === 0) lines.push('');
  }
  const out = fixChecksums ? lines.map((l) => (/^[12] /.test(l) && l.length >= 68 && l.length <= 69 ? withTleChecksum(l) : l)) : lines;
  return `${out.join('\n')}\n`;
}

// ---------------------------------------------------------------- OMM XML

/** Replace the text of the n-th keyword element, drop it, repeat it or change its units attribute. */
export const xmlEditArb = fc.oneof(
  fc.record({ op: fc.constant('value' as const), at: fc.nat(), value: oddValue }),
  fc.record({ op: fc.constant('drop' as const), at: fc.nat() }),
  fc.record({ op: fc.constant('repeat' as const), at: fc.nat() }),
  fc.record({ op: fc.constant('units' as const), at: fc.nat(), units: fc.constantFrom('rad', 'deg', 'rev/day', 'km', '', 'DEG', 'rev / day', '1/ER', '"') }),
  fc.record({ op: fc.constant('many' as const), count: fc.integer({ min: 2, max: 400 }) }),
);
export type XmlEdit = typeof xmlEditArb extends fc.Arbitrary<infer T> ? T : never;

const escapeXml = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

export function mutateXml(text: string, edits: readonly XmlEdit[]): string {
  let t = text;
  for (const e of edits) {
    const keywords = [...t.matchAll(/^(\s*)<([A-Z_]+)([^>]*)>([^<]*)<\/\2>\s*$/gm)];
    if (e.op === 'many') {
      const omm = /<omm[\s\S]*<\/omm>/.exec(t)?.[0];
      // Once: repeating an already repeated document would only test the memory of the machine.
      // At most about 4 MB in all: a large catalogue, not a test of raw parsing speed on tens of megabytes.
      const count = omm ? Math.max(1, Math.min(e.count, Math.floor(4e6 / omm.length))) : 0;
      if (omm && !t.includes('<ndm>\n<omm')) t = `<?xml version="1.0"?>\n<ndm>\n${Array(count).fill(omm).join('\n')}\n</ndm>\n`;
      continue;
    }
    if (keywords.length === 0) continue;
    const m = keywords[e.at % keywords.length];
    const [whole, indent, name, attrs] = m;
    let rep = whole;
    if (e.op === 'value') rep = `${indent}<${name}${attrs}>${escapeXml(typeof e.value === 'object' && e.value !== null ? JSON.stringify(e.value) : String(e.value))}</${name}>`;
    else if (e.op === 'drop') rep = '';
    else if (e.op === 'repeat') rep = `${whole}\n${whole}`;
    else rep = `${indent}<${name} units="${escapeXml(e.units).replace(/"/g, '&quot;')}">${m[4]}</${name}>`;
    t = t.slice(0, m.index) + rep + t.slice(m.index! + whole.length);
  }
  return t;
}
