/**
 * The scenario file: schema (zod 4), YAML/JSON parsing with line numbers,
 * validation, defaults and resolution into the plain objects the engine uses.
 */
import { createHash } from 'node:crypto';
import { readFileSync, statSync } from 'node:fs';
import { READ_FAILURES } from '../elements/load.js';
import path from 'node:path';
import { InputError } from '../errors.js';
import { resolveScenarioInput } from './resolve.js';
import { scenarioSchema } from './schema.js';
import { parseScenarioSource, validateWith } from './source.js';
import type { ResolvedScenario } from './types.js';

export * from './types.js';
export { scenarioSchema, scenarioJsonSchema, RAIN_ZONES, MODULATIONS, NOISE_ENVIRONMENTS } from './schema.js';
export type { ScenarioInput } from './schema.js';
export { referenceAtmosphere } from './climate.js';
export { DEFAULT_RATE_CANDIDATES_BPS, MIN_FREQUENCY_GHZ } from './resolve.js';
export { formatPath } from './source.js';

/**
 * Parse, validate and resolve scenario text. `fileLabel` names the file in
 * messages; element paths are resolved against `baseDir`. The inputs hash is
 * SHA-256 over the scenario bytes followed by each element file's bytes (in
 * satellite order, each file once).
 */
export function parseScenarioText(text: string, fileLabel: string, baseDir: string, opts: { outDir?: string } = {}): ResolvedScenario {
  return resolveText(text, Buffer.from(text, 'utf8'), fileLabel, path.resolve(baseDir), path.resolve(baseDir, fileLabel), opts);
}

/** Read a scenario file (YAML or JSON) and resolve it; every problem is one `InputError` line. */
export function loadScenario(file: string, opts: { outDir?: string } = {}): ResolvedScenario {
  let bytes: Buffer;
  try {
    if (statSync(file).isDirectory()) throw Object.assign(new Error('folder'), { code: 'EISDIR' });
    bytes = readFileSync(file);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code ?? 'read error';
    throw new InputError(`${file}: cannot read the scenario file: ${READ_FAILURES[code] ?? code} (allowed a readable YAML or JSON file)`);
  }
  const abs = path.resolve(file);
  return resolveText(bytes.toString('utf8'), bytes, file, path.dirname(abs), abs, opts);
}

function resolveText(text: string, bytes: Uint8Array, fileLabel: string, baseDir: string, absFile: string, opts: { outDir?: string }): ResolvedScenario {
  const src = parseScenarioSource(text, fileLabel);
  const input = validateWith(scenarioSchema, src);
  const { scenario, elementFiles } = resolveScenarioInput(input, src, { file: absFile, baseDir, outDir: opts.outDir });
  const hash = createHash('sha256').update(bytes);
  for (const f of elementFiles) hash.update(readFileSync(f));
  scenario.inputsSha256 = hash.digest('hex');
  return scenario;
}
