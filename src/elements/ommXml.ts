/**
 * CCSDS Orbit Mean-Elements Message (CCSDS 502.0-B) in its XML form (the NDM/XML
 * schema of CCSDS 505.0-B): `<omm>` with `<header>` and
 * `<body><segment><metadata>…</metadata><data><meanElements>…</meanElements>
 * <tleParameters>…</tleParameters></data></segment></body>`, or several
 * `<omm>` inside an `<ndm>` container. Keyword elements carry the OMM
 * keywords (`<ECCENTRICITY>`, `<NORAD_CAT_ID>`…), optionally with a `units`
 * attribute, which must then be the keyword's unit.
 *
 * Parsed with saxes (a strict, non-validating XML parser that reports
 * positions and expands no external or user-defined entities), then checked
 * by the same rules as OMM JSON. Rejections name FILE:LINE:COLUMN of the
 * keyword element, of its `<omm>` when the keyword is missing, or of the XML
 * error.
 */
import { SaxesParser } from 'saxes';
import { InputError } from '../errors.js';
import { elementSetFromOmm, lineColumnAt, lineFinder } from './omm.js';
import type { ElementSet } from './types.js';

interface XmlElement {
  name: string;
  attributes: Record<string, string>;
  text: string;
  /** Offset of its '<' in the text. */
  offset: number;
  children: XmlElement[];
}

/** Elements nested deeper than this are refused (an OMM nests 6). */
const MAX_DEPTH = 32;

/** Units a keyword element may state in its `units` attribute (compared without case or spaces). */
const UNITS: Record<string, string[]> = {
  MEAN_MOTION: ['rev/day'],
  INCLINATION: ['deg'],
  RA_OF_ASC_NODE: ['deg'],
  ARG_OF_PERICENTER: ['deg'],
  MEAN_ANOMALY: ['deg'],
  GM: ['km**3/s**2'],
  SEMI_MAJOR_AXIS: ['km'],
  BSTAR: ['1/er'],
  MEAN_MOTION_DOT: ['rev/day**2'],
  MEAN_MOTION_DDOT: ['rev/day**3'],
};

/** The OMM keywords read from `<metadata>`, `<meanElements>` and `<tleParameters>`. */
const KEYWORDS = new Set([
  'OBJECT_NAME', 'OBJECT_ID', 'CENTER_NAME', 'REF_FRAME', 'TIME_SYSTEM', 'MEAN_ELEMENT_THEORY',
  'EPOCH', 'MEAN_MOTION', 'SEMI_MAJOR_AXIS', 'ECCENTRICITY', 'INCLINATION', 'RA_OF_ASC_NODE', 'ARG_OF_PERICENTER', 'MEAN_ANOMALY', 'GM',
  'EPHEMERIS_TYPE', 'CLASSIFICATION_TYPE', 'NORAD_CAT_ID', 'ELEMENT_SET_NO', 'REV_AT_EPOCH', 'BSTAR', 'MEAN_MOTION_DOT', 'MEAN_MOTION_DDOT',
]);

/** True when `text` looks like XML (first non-blank character '<'). */
export function looksLikeXml(text: string): boolean {
  return text.trimStart().startsWith('<');
}

function parseXml(text: string, file: string): XmlElement {
  const parser = new SaxesParser({ position: true });
  const at = (pos: number) => {
    const lc = lineColumnAt(text, Math.max(0, Math.min(pos, text.length)));
    return `${file}:${lc.line}:${lc.column}`;
  };
  const stack: XmlElement[] = [];
  let root: XmlElement | null = null;
  parser.on('error', (e) => {
    const what = e.message.replace(/^[^:]*:\d+:\d+: /, '').replace(/^\d+:\d+: /, '');
    throw new InputError(`${at(parser.position - 1)}: not well-formed XML (${what}; allowed an OMM XML document, CCSDS 502.0-B)`);
  });
  parser.on('doctype', () => {
    throw new InputError(`${at(parser.position - 1)}: a DOCTYPE declaration (allowed an OMM XML document without DTD)`);
  });
  parser.on('opentagstart', (tag) => {
    const offset = Math.max(0, text.lastIndexOf(`<${tag.name}`, parser.position));
    if (stack.length >= MAX_DEPTH) throw new InputError(`${at(offset)}: XML nested more than ${MAX_DEPTH} levels (allowed an OMM XML document)`);
    const el: XmlElement = { name: tag.name, attributes: {}, text: '', offset, children: [] };
    if (stack.length > 0) stack[stack.length - 1].children.push(el);
    else root = el;
    stack.push(el);
  });
  parser.on('opentag', (tag) => {
    const el = stack[stack.length - 1];
    for (const [k, v] of Object.entries(tag.attributes)) el.attributes[k] = typeof v === 'string' ? v : v.value;
  });
  parser.on('text', (t) => { if (stack.length > 0) stack[stack.length - 1].text += t; });
  parser.on('cdata', (t) => { if (stack.length > 0) stack[stack.length - 1].text += t; });
  parser.on('closetag', () => { stack.pop(); });
  parser.write(text).close();
  if (!root) throw new InputError(`${file}:1:1: no XML element found (allowed an OMM XML document)`);
  return root;
}

/** Local name without a namespace prefix (`ndm:omm` → `omm`). */
const local = (name: string) => name.slice(name.indexOf(':') + 1);

/** Parse OMM XML text (an `<omm>` or an `<ndm>` holding several) into element sets. */
export function parseOmmXml(text: string, file: string): ElementSet[] {
  const root = parseXml(text, file);
  const where = (el: XmlElement) => {
    const lc = lineColumnAt(text, el.offset);
    return `${file}:${lc.line}:${lc.column}`;
  };
  // Line numbers by binary search: an <ndm> may hold thousands of <omm>.
  const lineOf = lineFinder(text);
  const rootName = local(root.name);
  let omms: XmlElement[];
  if (rootName === 'omm') omms = [root];
  else if (rootName === 'ndm') omms = root.children.filter((c) => local(c.name) === 'omm');
  else throw new InputError(`${where(root)}: root element <${root.name}> (allowed <omm> or <ndm> holding <omm> elements, CCSDS 502.0-B)`);
  if (omms.length === 0) throw new InputError(`${where(root)}: <ndm> holds no <omm> (allowed one or more <omm> elements)`);

  return omms.map((omm, k) => {
    const body = omm.children.find((c) => local(c.name) === 'body');
    if (!body) throw new InputError(`${where(omm)}: <omm> ${k + 1} has no <body> (allowed <header> then <body><segment>…)`);
    const segments = body.children.filter((c) => local(c.name) === 'segment');
    if (segments.length !== 1) throw new InputError(`${where(body)}: <body> holds ${segments.length} <segment> elements (allowed exactly one)`);
    const seg = segments[0];
    const values: Record<string, string> = {};
    const found = new Map<string, XmlElement>();
    const take = (parent: XmlElement | undefined) => {
      for (const el of parent?.children ?? []) {
        const key = local(el.name);
        if (!KEYWORDS.has(key)) continue;
        if (found.has(key)) throw new InputError(`${where(el)}: ${key} given twice in <omm> ${k + 1} (allowed once)`);
        if (el.children.length > 0) throw new InputError(`${where(el)}: ${key} holds elements (allowed a value)`);
        const units = el.attributes.units;
        if (units !== undefined) {
          const allowed = UNITS[key];
          const norm = (u: string) => u.replace(/\s+/g, '').toLowerCase();
          if (!allowed || !allowed.includes(norm(units))) {
            throw new InputError(`${where(el)}: ${key} has units ${JSON.stringify(units)} (allowed ${allowed ? allowed.join(' or ') : 'no units attribute'})`);
          }
        }
        found.set(key, el);
        values[key] = el.text.trim();
      }
    };
    const child = (el: XmlElement | undefined, name: string) => el?.children.find((c) => local(c.name) === name);
    const metadata = child(seg, 'metadata');
    const data = child(seg, 'data');
    if (!metadata) throw new InputError(`${where(seg)}: <segment> has no <metadata> (allowed <metadata> then <data>)`);
    if (!data) throw new InputError(`${where(seg)}: <segment> has no <data> (allowed <metadata> then <data>)`);
    take(metadata);
    take(child(data, 'meanElements'));
    take(child(data, 'tleParameters'));
    if (values.MEAN_MOTION === undefined && values.SEMI_MAJOR_AXIS !== undefined) {
      throw new InputError(`${where(found.get('SEMI_MAJOR_AXIS')!)}: SEMI_MAJOR_AXIS given instead of MEAN_MOTION (allowed MEAN_MOTION in rev/day, as SGP4 mean elements use)`);
    }
    return elementSetFromOmm(values, {
      where: (key) => where(found.get(key) ?? omm),
      entry: k + 1,
      file,
      line: lineOf(omm.offset),
      format: 'omm-xml',
    });
  });
}
