import { readFileSync, statSync } from 'node:fs';
import { InputError } from '../errors.js';
import { parseOmmJson } from './omm.js';
import { parseOmmXml } from './ommXml.js';
import { parseTleText } from './tle.js';
import type { ElementSet } from './types.js';

export type ElementsFormat = 'tle' | 'omm-json' | 'omm-xml';

/**
 * The format of an element text: by extension when it is `.xml` or `.json`,
 * else by content (first non-blank character '<' is OMM XML, '{' or '[' OMM
 * JSON, anything else TLE/3LE).
 */
export function detectElementsFormat(text: string, fileLabel: string): ElementsFormat {
  const ext = /\.([A-Za-z]+)$/.exec(fileLabel)?.[1]?.toLowerCase();
  if (ext === 'xml') return 'omm-xml';
  if (ext === 'json') return 'omm-json';
  const first = text.trimStart()[0];
  if (first === '<') return 'omm-xml';
  return first === '{' || first === '[' ? 'omm-json' : 'tle';
}

/** Parse element sets from text (TLE/3LE, OMM JSON or OMM XML; see `detectElementsFormat`). */
export function parseElementsText(text: string, fileLabel: string): ElementSet[] {
  const body = text.replace(/^\uFEFF/, '');
  const format = detectElementsFormat(body, fileLabel);
  const sets = format === 'omm-xml' ? parseOmmXml(body, fileLabel) : format === 'omm-json' ? parseOmmJson(body, fileLabel) : parseTleText(body, fileLabel);
  if (sets.length === 0) throw new InputError(`${fileLabel}:1:1: no element sets found (allowed TLE/3LE lines, OMM JSON or OMM XML)`);
  return sets;
}

/** Read and parse an element file (TLE/3LE, OMM JSON or OMM XML). */
export function loadElementsFile(path: string): ElementSet[] {
  const text = readTextFile(path, 'elements file', 'a readable TLE/3LE or OMM JSON/XML file');
  return parseElementsText(text, path);
}

/** Days between window start and epoch beyond which a warning is given. */
export const EPOCH_WARNING_DAYS = 7;

/**
 * Warn (never fail) when the analysis window starts more than 7 days from the
 * element epoch: the along-track error of SGP4 element sets for LEO grows by
 * roughly a few km per day (common practice, from memory).
 */
export function epochWarning(elements: ElementSet, windowStartS: number): string | null {
  const days = (windowStartS - elements.epochUnixS) / 86_400;
  if (Math.abs(days) <= EPOCH_WARNING_DAYS) return null;
  const side = days > 0 ? 'after' : 'before';
  return `warning: ${elements.name} (${elements.catalogNumber}): window starts ${Math.abs(days).toFixed(1)} days ${side} the element epoch `
    + `(more than ${EPOCH_WARNING_DAYS} d; positions may be off by several km per day, from memory)`;
}

/** Words for the errno codes a person meets when a file cannot be read. */
export const READ_FAILURES: Record<string, string> = {
  ENOENT: 'not found',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EISDIR: 'is a folder, not a file',
  ENOTDIR: 'a part of the path is not a folder',
  ELOOP: 'too many symbolic links',
  ENAMETOOLONG: 'the path is too long',
  EIO: 'input/output error',
};

/**
 * Read a text file for a loader, or throw one `InputError` line naming the
 * file and why it cannot be read (a folder says so; so does a missing file).
 */
export function readTextFile(path: string, what: string, allowed: string): string {
  try {
    if (statSync(path).isDirectory()) throw Object.assign(new Error('folder'), { code: 'EISDIR' });
    return readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code ?? 'read error';
    throw new InputError(`${path}: cannot read the ${what}: ${READ_FAILURES[code] ?? code} (allowed ${allowed})`);
  }
}
