/**
 * Scenario text → plain value, keeping source positions so that every error
 * names `FILE:LINE path`. The `yaml` package parses JSON as well (JSON is
 * YAML 1.2 flow syntax), so both formats get line numbers.
 */
import {
  LineCounter, isAlias, isCollection, isMap, isScalar, isSeq, parseDocument, visit, type Alias, type Document, type Node as YamlNode,
} from 'yaml';
import type { z } from 'zod';
import { InputError } from '../errors.js';

export type PathKey = string | number;
export type Path = readonly PathKey[];

/** Format a scenario path: `stations[1].terminals.xband.antenna.diameter_m`. */
export function formatPath(path: Path): string {
  let out = '';
  for (const k of path) {
    if (typeof k === 'number') out += `[${k}]`;
    else if (/^[A-Za-z_][A-Za-z0-9_-]*$/.test(k)) out += out ? `.${k}` : k;
    else out += `[${JSON.stringify(k)}]`;
  }
  return out || '(top level)';
}

/** A parsed scenario text: the plain value and a way to turn paths into `FILE:LINE path` prefixes. */
export interface ScenarioSource {
  fileLabel: string;
  value: unknown;
  /** 1-based line of the node at `path`, or of its nearest existing ancestor. */
  lineOf(path: Path): number;
  /** `FILE:LINE path` */
  where(path: Path): string;
  /** Throw `InputError("FILE:LINE path: message")`. */
  fail(path: Path, message: string): never;
}

/** Deepest nesting of mappings and lists accepted (a scenario needs about 10). */
export const MAX_NESTING = 64;
/** Most values a document may expand to once its aliases are followed (a scenario has a few hundred). */
export const MAX_EXPANDED_VALUES = 100_000;

/** The parser's error codes that are limits, not syntax, worded for a person. */
const LIMIT_WORDS: Partial<Record<string, string>> = {
  RESOURCE_EXHAUSTION: 'nested too deeply for the YAML/JSON parser',
};

export function parseScenarioSource(text: string, fileLabel: string): ScenarioSource {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text.replace(/^\uFEFF/, ''), { lineCounter, prettyErrors: false, uniqueKeys: true });
  const at = (offset: number | undefined) => {
    const pos = lineCounter.linePos(offset ?? 0);
    return `${fileLabel}:${pos.line}:${pos.col}`;
  };
  const first = doc.errors[0];
  if (first) {
    const limit = LIMIT_WORDS[first.code];
    if (limit) throw new InputError(`${at(first.pos[0])}: ${limit} (allowed: YAML 1.2 or JSON nested at most ${MAX_NESTING} levels)`);
    const what = first.message.split('\n')[0].replace(/\s+at line \d+, column \d+:?\s*$/, '').trim();
    throw new InputError(`${at(first.pos[0])}: YAML/JSON syntax error: ${what} (allowed: YAML 1.2 or JSON, keys unique)`);
  }
  checkStructure(doc, at);
  let value: unknown;
  try {
    // checkStructure already bounds what aliases expand to; yaml's own count stays as a second guard.
    value = doc.toJS({ maxAliasCount: 10_000 }) as unknown;
  } catch (e) {
    if (!(e instanceof ReferenceError)) throw e;
    const alias = firstAlias(doc);
    throw new InputError(`${at(alias?.range?.[0])}: YAML aliases could not be expanded (${e.message}; allowed: aliases that each follow their anchor, expanding to at most ${MAX_EXPANDED_VALUES} values)`);
  }
  const lineAt = (offset: number | undefined) => (offset === undefined ? 1 : lineCounter.linePos(offset).line);
  const lineOf = (path: Path) => lineOfPath(doc, path, lineAt);
  const where = (path: Path) => `${fileLabel}:${lineOf(path)} ${formatPath(path)}`;
  return {
    fileLabel,
    value,
    lineOf,
    where,
    fail(path, message) {
      throw new InputError(`${where(path)}: ${message}`);
    },
  };
}

function firstAlias(doc: Document): Alias | undefined {
  let found: Alias | undefined;
  visit(doc, { Alias(_k, node) { found = node; return visit.BREAK; } });
  return found;
}

/**
 * Before any value is built: nesting depth, every alias has an anchor before
 * it and does not sit inside it, and the values the aliases expand to stay
 * bounded (an "alias bomb" nests aliases of aliases to expand exponentially).
 * `at(offset)` gives `FILE:LINE:COL`.
 */
function checkStructure(doc: Document, at: (offset: number | undefined) => string): void {
  const anchors = new Map<string, YamlNode>();
  const targetOf = new Map<Alias, YamlNode>();
  const sizeOf = new Map<YamlNode, number>();
  // Values a node stands for once aliases are followed; aliases inside it were visited (and resolved) before it is used.
  const expanded = (node: unknown): number => {
    if (isAlias(node)) {
      const t = targetOf.get(node);
      return t === undefined ? 1 : expanded(t);
    }
    if (!isCollection(node)) return 1;
    const memo = sizeOf.get(node);
    if (memo !== undefined) return memo;
    let n = 1;
    for (const item of node.items as unknown[]) {
      if (item && typeof item === 'object' && 'key' in item && 'value' in item) n += expanded((item as { key: unknown }).key) + expanded((item as { value: unknown }).value);
      else n += expanded(item);
    }
    sizeOf.set(node, n);
    return n;
  };
  let total = 0;
  visit(doc, {
    Node(_key, node, path) {
      const depth = path.filter((p) => isCollection(p)).length;
      if (depth > MAX_NESTING) throw new InputError(`${at(node.range?.[0])}: nested more than ${MAX_NESTING} levels deep (allowed: at most ${MAX_NESTING} levels of mappings and lists)`);
      if (isAlias(node)) {
        const target = anchors.get(node.source);
        if (target === undefined) {
          throw new InputError(`${at(node.range?.[0])}: YAML alias *${node.source} has no anchor &${node.source} before it (allowed: an alias after its anchor, or the value written out)`);
        }
        if (path.includes(target as never)) {
          throw new InputError(`${at(node.range?.[0])}: YAML alias *${node.source} sits inside the value it names, so it would never end (allowed: an alias outside its anchor's value)`);
        }
        targetOf.set(node, target);
        total += expanded(target);
      } else {
        total += 1;
        if (node.anchor) anchors.set(node.anchor, node);
      }
      if (total > MAX_EXPANDED_VALUES) {
        throw new InputError(`${at(node.range?.[0])}: YAML aliases expand the document to more than ${MAX_EXPANDED_VALUES} values, as an alias bomb does (allowed: aliases that expand to at most ${MAX_EXPANDED_VALUES} values; write repeated parts out or use fewer nested aliases)`);
      }
      return undefined;
    },
  });
}

function keyText(key: unknown): string {
  return isScalar(key) ? String(key.value) : String(key);
}

function lineOfPath(doc: Document, path: Path, lineAt: (offset: number | undefined) => number): number {
  let node: unknown = doc.contents;
  let line = lineAt((doc.contents as { range?: number[] } | null)?.range?.[0]);
  for (const k of path) {
    // An alias (*name) points into its anchor: positions inside it are the anchor's.
    if (isAlias(node)) node = node.resolve(doc);
    if (isMap(node)) {
      const pair = node.items.find((p) => keyText(p.key) === String(k));
      if (!pair) return line;
      // The key's line: a block value starts on the next line, the key is where the user looks.
      line = lineAt((pair.key as { range?: number[] } | null)?.range?.[0] ?? (pair.value as { range?: number[] } | null)?.range?.[0]);
      node = pair.value;
    } else if (isSeq(node) && typeof k === 'number') {
      const item = node.items[k] as { range?: number[] } | undefined;
      if (!item) return line;
      line = lineAt(item.range?.[0]);
      node = item;
    } else {
      return line;
    }
  }
  return line;
}

// ---------------------------------------------------------------- zod issues → one line

type Issue = z.core.$ZodIssue;

function getAt(value: unknown, path: Path): unknown {
  let v = value;
  for (const k of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PathKey, unknown>)[k];
  }
  return v;
}

function show(v: unknown): string {
  if (v === undefined) return 'nothing';
  if (typeof v === 'string') return JSON.stringify(v.length > 60 ? v.slice(0, 57) + '...' : v);
  if (typeof v === 'number' || typeof v === 'boolean' || v === null) return String(v);
  if (Array.isArray(v)) return `a list of ${v.length}`;
  return 'an object';
}

const TYPE_WORDS: Record<string, string> = { number: 'a number', string: 'a string', boolean: 'true or false', array: 'a list', object: 'a mapping', record: 'a mapping', tuple: 'a list' };

/** The branch of a failed union that got furthest: its issues sit deepest, or are not mere type mismatches at the top. */
function bestBranch(errors: Issue[][]): Issue[] | null {
  let best: Issue[] | null = null;
  let bestScore = -1;
  for (const branch of errors) {
    if (branch.length === 0) continue;
    const shallowType = branch.every((i) => i.path.length === 0 && (i.code === 'invalid_type' || i.code === 'invalid_value'));
    const score = shallowType ? 0 : 1 + Math.max(...branch.map((i) => i.path.length));
    if (score > bestScore) { best = branch; bestScore = score; }
  }
  return bestScore > 0 ? best : null;
}

function unionExpectations(errors: Issue[][]): string {
  const parts = errors.flatMap((b) => b.map((i) => {
    if (i.code === 'invalid_value') return i.values.map((x) => JSON.stringify(x)).join(' or ');
    if (i.code === 'invalid_type') return TYPE_WORDS[i.expected] ?? i.expected;
    return '';
  })).filter(Boolean);
  return [...new Set(parts)].join(' or ');
}

/** Turn one zod issue into `[path, message]`, descending into unions. */
export function describeIssue(issue: Issue, value: unknown, base: Path = []): [Path, string] {
  const path: Path = [...base, ...(issue.path as PathKey[])];
  const got = getAt(value, path);
  switch (issue.code) {
    case 'invalid_type':
      if (got === undefined) return [path, `missing (required: ${TYPE_WORDS[issue.expected] ?? issue.expected})`];
      return [path, `must be ${TYPE_WORDS[issue.expected] ?? issue.expected} (got ${show(got)})`];
    case 'too_small': {
      const m = issue.minimum;
      if (issue.origin === 'array') return [path, `must have at least ${m} item${m === 1 ? '' : 's'} (got ${Array.isArray(got) ? got.length : 0})`];
      if (issue.origin === 'string') return [path, `must not be empty`];
      return [path, `must be ${issue.inclusive ? '≥' : '>'} ${m} (got ${show(got)})`];
    }
    case 'too_big': {
      const m = issue.maximum;
      if (issue.origin === 'array') return [path, `must have at most ${m} items (got ${Array.isArray(got) ? got.length : 0})`];
      if (issue.origin === 'string') return [path, `must be at most ${m} characters`];
      return [path, `must be ${issue.inclusive ? '≤' : '<'} ${m} (got ${show(got)})`];
    }
    case 'invalid_value':
      return [path, `must be ${issue.values.length > 1 ? 'one of ' : ''}${issue.values.map((x) => String(x)).join(', ')} (got ${show(got)})`];
    case 'unrecognized_keys':
      // The message (set in schema.ts) lists the allowed keys; point at the first unknown key.
      return [[...path, issue.keys[0]], issue.message.startsWith('unknown') ? issue.message : `unknown key ${JSON.stringify(issue.keys[0])}`];
    case 'invalid_union': {
      if (issue.discriminator) {
        const opts = ((issue as { options?: unknown[] }).options ?? []).map((o) => String(o)).join(', ');
        // zod 4 already puts the discriminator key at the end of the path; older versions did not.
        const at = path[path.length - 1] === issue.discriminator ? path : [...path, issue.discriminator];
        return [at, `must be one of ${opts} (got ${show(getAt(value, at))})`];
      }
      const branch = bestBranch(issue.errors);
      if (branch) return describeIssue(branch[0], value, path);
      return [path, `must be ${unionExpectations(issue.errors)} (got ${show(got)})`];
    }
    case 'invalid_format':
      return [path, `${issue.message} (got ${show(got)})`];
    case 'not_multiple_of':
      return [path, `must be a multiple of ${issue.divisor} (got ${show(got)})`];
    case 'invalid_key':
      return [path, `bad key: ${issue.issues[0]?.message ?? issue.message}`];
    default:
      return [path, issue.message];
  }
}

/** Validate `source.value` with `schema`; on failure throw the earliest-in-file issue as one line. */
export function validateWith<T>(schema: z.ZodType<T>, source: ScenarioSource): T {
  const result = schema.safeParse(source.value);
  if (result.success) return result.data;
  let described = result.error.issues.map((i) => describeIssue(i, source.value));
  // A misspelt key (diameter_cm) also makes the right one (diameter_m) missing: report the misspelling.
  const unknownIn = new Set(result.error.issues.filter((i) => i.code === 'unrecognized_keys').map((i) => formatPath(i.path as PathKey[])));
  const filtered = described.filter(([p, m]) => !(m.startsWith('missing') && unknownIn.has(formatPath(p.slice(0, -1)))));
  if (filtered.length) described = filtered;
  described.sort((a, b) => source.lineOf(a[0]) - source.lineOf(b[0]));
  const [path, message] = described[0];
  return source.fail(path, message);
}
