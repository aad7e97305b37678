/**
 * The JSON Schema from `scenarioJsonSchema()` (zod 4 `z.toJSONSchema`, draft
 * 2020-12). No JSON-Schema validator is installed, so a small one below
 * implements the keywords the schema uses, following the JSON Schema 2020-12
 * Validation specification, and refuses any keyword it does not know (so no
 * constraint can be skipped silently).
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { main } from '../../src/cli/main.js';
import { scenarioJsonSchema } from '../../src/scenario/index.js';
import { PROJECT_ROOT, baseText } from './bad-cases.js';

type Schema = Record<string, unknown>;
const ANNOTATIONS = new Set(['$schema', 'title', 'description', 'default', '$id']);
const ASSERTIONS = new Set(['type', 'const', 'enum', 'properties', 'required', 'additionalProperties', 'propertyNames', 'items', 'prefixItems',
  'minItems', 'maxItems', 'minimum', 'maximum', 'exclusiveMinimum', 'exclusiveMaximum', 'minLength', 'pattern', 'anyOf', 'oneOf']);

function typeOk(t: string, v: unknown): boolean {
  switch (t) {
    case 'object': return v !== null && typeof v === 'object' && !Array.isArray(v);
    case 'array': return Array.isArray(v);
    case 'string': return typeof v === 'string';
    case 'number': return typeof v === 'number' && Number.isFinite(v);
    case 'integer': return Number.isInteger(v);
    case 'boolean': return typeof v === 'boolean';
    case 'null': return v === null;
    default: throw new Error(`unknown type ${t}`);
  }
}

/** Errors of `v` against `s` (empty = valid). */
function validate(s: Schema, v: unknown, at = '$'): string[] {
  for (const k of Object.keys(s)) if (!ANNOTATIONS.has(k) && !ASSERTIONS.has(k)) throw new Error(`validator: unsupported keyword ${k} at ${at}`);
  const errs: string[] = [];
  const fail = (m: string) => errs.push(`${at}: ${m}`);
  if (s.type !== undefined && !(Array.isArray(s.type) ? s.type : [s.type]).some((t) => typeOk(t as string, v))) return [`${at}: not ${String(s.type)}`];
  if ('const' in s && v !== s.const) fail(`not ${JSON.stringify(s.const)}`);
  if (s.enum && !(s.enum as unknown[]).includes(v)) fail(`not in enum`);
  if (typeof v === 'number') {
    if (s.minimum !== undefined && v < (s.minimum as number)) fail('below minimum');
    if (s.maximum !== undefined && v > (s.maximum as number)) fail('above maximum');
    if (s.exclusiveMinimum !== undefined && v <= (s.exclusiveMinimum as number)) fail('not above exclusiveMinimum');
    if (s.exclusiveMaximum !== undefined && v >= (s.exclusiveMaximum as number)) fail('not below exclusiveMaximum');
  }
  if (typeof v === 'string') {
    if (s.minLength !== undefined && [...v].length < (s.minLength as number)) fail('too short');
    if (s.pattern !== undefined && !new RegExp(s.pattern as string, 'u').test(v)) fail('pattern');
  }
  if (Array.isArray(v)) {
    if (s.minItems !== undefined && v.length < (s.minItems as number)) fail('too few items');
    if (s.maxItems !== undefined && v.length > (s.maxItems as number)) fail('too many items');
    const prefix = (s.prefixItems as Schema[] | undefined) ?? [];
    v.forEach((x, i) => {
      if (i < prefix.length) errs.push(...validate(prefix[i], x, `${at}[${i}]`));
      else if (s.items !== undefined) {
        if (s.items === false) fail(`item ${i} not allowed`);
        else errs.push(...validate(s.items as Schema, x, `${at}[${i}]`));
      }
    });
  }
  if (v !== null && typeof v === 'object' && !Array.isArray(v)) {
    const o = v as Record<string, unknown>;
    const props = (s.properties as Record<string, Schema> | undefined) ?? {};
    for (const r of (s.required as string[] | undefined) ?? []) if (!(r in o)) fail(`missing ${r}`);
    for (const [k, x] of Object.entries(o)) {
      if (s.propertyNames) errs.push(...validate(s.propertyNames as Schema, k, `${at}.<key ${k}>`));
      if (k in props) errs.push(...validate(props[k], x, `${at}.${k}`));
      else if (s.additionalProperties === false) fail(`unknown key ${k}`);
      else if (s.additionalProperties && typeof s.additionalProperties === 'object') errs.push(...validate(s.additionalProperties as Schema, x, `${at}.${k}`));
    }
  }
  if (s.anyOf && !(s.anyOf as Schema[]).some((b) => validate(b, v, at).length === 0)) fail('no anyOf branch matches');
  if (s.oneOf && (s.oneOf as Schema[]).filter((b) => validate(b, v, at).length === 0).length !== 1) fail('not exactly one oneOf branch');
  return errs;
}

const schema = scenarioJsonSchema();
const demo = parse(readFileSync(path.join(PROJECT_ROOT, 'fixtures/demo/scenario.yaml'), 'utf8')) as Record<string, unknown>;

describe('scenario JSON Schema', () => {
  it('is a 2020-12 object schema with every top-level key and the required ones', () => {
    expect(schema.$schema).toBe('https://json-schema.org/draft/2020-12/schema');
    expect(schema.type).toBe('object');
    expect(schema.additionalProperties).toBe(false);
    expect(Object.keys(schema.properties as object)).toEqual(['name', 'description', 'window', 'weather', 'satellites', 'stations', 'network', 'mask_finder', 'rate_finder', 'output', 'sun', 'exact_orbit', 'plan']);
    expect(schema.required).toEqual(['name', 'window', 'satellites', 'stations']);
    expect(JSON.parse(JSON.stringify(schema))).toEqual(schema);
  });

  it('describes fields with their units', () => {
    const st = (schema.properties as Record<string, Schema>).stations.items as Schema;
    const p = st.properties as Record<string, Schema>;
    expect(p.height_m.description).toContain('(m)');
    expect((p.climate.properties as Record<string, Schema>).rain_rate_001_mm_h.description).toContain('mm/h');
  });

  it('the demo scenario (as JSON) and the base fixture validate', () => {
    expect(validate(schema, JSON.parse(JSON.stringify(demo)))).toEqual([]);
    expect(validate(schema, JSON.parse(baseText('json')))).toEqual([]);
  });

  it('rejects what the loader rejects at the schema level', () => {
    const bad = (edit: (d: any) => void) => {
      const d = structuredClone(demo) as any;
      edit(d);
      return validate(schema, d);
    };
    expect(bad((d) => { d.stations[2].terminals['x-dish'].antenna.diameter_m = -3.7; })).toEqual(['$.stations[2].terminals.x-dish.antenna: not exactly one oneOf branch']);
    expect(bad((d) => { d.stations[0].terminals['x-dish'].antenna.diameter_cm = 370; })).not.toEqual([]);
    expect(bad((d) => { d.stations[2].latitude_deg = 91; })).not.toEqual([]);
    expect(bad((d) => { delete d.window; })).toEqual(['$: missing window']);
    expect(bad((d) => { d.weather = ['clear', 10]; })).not.toEqual([]);
    expect(bad((d) => { d.satellites[0].links[2].modcod.modes = 'dvb-s3'; })).not.toEqual([]);
  });
});

describe('passbudget schema', () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'passbudget-schema-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('--out writes the same schema', async () => {
    const out = path.join(dir, 'scenario.schema.json');
    expect(await main(['schema', '--out', out])).toBe(0);
    expect(JSON.parse(readFileSync(out, 'utf8'))).toEqual(schema);
  });

  it('prints the schema on stdout', async () => {
    const chunks: string[] = [];
    const orig = process.stdout.write.bind(process.stdout);
    (process.stdout as any).write = (c: string) => { chunks.push(String(c)); return true; };
    try {
      expect(await main(['schema'])).toBe(0);
    } finally {
      (process.stdout as any).write = orig;
    }
    expect(JSON.parse(chunks.join(''))).toEqual(schema);
  });
});
