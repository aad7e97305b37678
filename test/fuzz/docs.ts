/**
 * The fuzz documents and the check each must pass, shared by the in-process
 * fuzz tests and the CLI one: element files (mutated TLE/3LE, OMM JSON, OMM
 * XML, random text) and scenarios (mutated fixtures, YAML and JSON).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { parse } from 'yaml';
import { InputError } from '../../src/errors.js';
import { parseElementsText } from '../../src/elements/load.js';
import { createPropagator } from '../../src/orbit/propagator.js';
import { MAX_MS } from './budget.js';
import { buildDoc, docPlanArb, mutateTle, mutateXml, textEditArb, applyTextEdits, tleEditArb, xmlEditArb } from './mutate.js';
import { estimateRunSize } from '../../src/jobs/runSize.js';
import { parseScenarioText } from '../../src/scenario/index.js';

const TLES = ['fixtures/demo/orbilux-3.tle', 'fixtures/tle/orbilux-3-two-sets.tle', 'fixtures/tle/ccsds-omm-example-goes9.tle'].map((f) => readFileSync(f, 'utf8'));
const OMM_JSON = JSON.parse(readFileSync('fixtures/tle/orbilux-3.omm.json', 'utf8'));
const OMM_XML = ['fixtures/tle/orbilux-3.omm.xml', 'fixtures/tle/ccsds-omm-example-goes9.omm.xml'].map((f) => readFileSync(f, 'utf8'));

export interface ElementsDoc { label: string; text: string; kind: string }

export const elementsDocArb: fc.Arbitrary<ElementsDoc> = fc.oneof(
  { weight: 4, arbitrary: fc.tuple(fc.nat({ max: TLES.length - 1 }), fc.array(tleEditArb, { minLength: 1, maxLength: 4 }), fc.boolean())
    .map(([b, edits, fix]) => ({ label: 'fuzz.tle', text: mutateTle(TLES[b], edits, fix), kind: 'tle' })) },
  { weight: 3, arbitrary: docPlanArb.map((plan) => ({ label: 'fuzz.json', text: buildDoc(OMM_JSON, { ...plan, format: 'json' }), kind: 'omm-json' })) },
  { weight: 3, arbitrary: fc.tuple(fc.nat({ max: OMM_XML.length - 1 }), fc.array(xmlEditArb, { minLength: 1, maxLength: 4 }), fc.array(textEditArb, { maxLength: 2 }))
    .map(([b, edits, text]) => ({ label: 'fuzz.xml', text: applyTextEdits(mutateXml(OMM_XML[b], edits), text), kind: 'omm-xml' })) },
  { weight: 1, arbitrary: fc.tuple(fc.constantFrom('fuzz.txt', 'fuzz.xml', 'fuzz.json'), fc.string({ unit: 'binary', maxLength: 300 }))
    .map(([label, text]) => ({ label, text, kind: 'random' })) },
);

export interface Outcome { kind: string; accepted: boolean; message?: string; ms: number }

/** Load one document as the library does; throw (failing the property) on anything but acceptance or one InputError line. */
export function checkElementsDoc(d: ElementsDoc): Outcome {
  const t0 = performance.now();
  let accepted = true;
  let message: string | undefined;
  try {
    const sets = parseElementsText(d.text, d.label);
    const r = new Float64Array(3);
    const v = new Float64Array(3);
    for (const e of sets.slice(0, 3)) {
      try {
        const p = createPropagator(e);
        for (const dt of [3600, 86_400]) {
          p.stateTeme(e.epochUnixS + dt, r, v);
          if (![...r, ...v].every(Number.isFinite)) throw new Error(`non-finite state for ${e.name} at epoch + ${dt} s: ${[...r]}`);
        }
      } catch (err) {
        if (!(err instanceof InputError)) throw err;
      }
    }
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    accepted = false;
    message = err.message;
    if (message.includes('\n')) throw new Error(`two lines: ${message}`);
    if (!message.startsWith(`${d.label}:`)) throw new Error(`not located at the file: ${message}`);
  }
  const ms = performance.now() - t0;
  if (ms > MAX_MS) throw new Error(`${ms.toFixed(0)} ms for one document`);
  return { kind: d.kind, accepted, message, ms };
}



const ROOT = process.cwd();
/** The fixtures as values, element paths made absolute so a document resolves from anywhere. */
export const SCENARIO_BASES = ['fixtures/scenarios/base.yaml', 'fixtures/scenarios/e2e/pair.yaml', 'fixtures/demo/scenario.yaml'].map((f) => {
  const v = parse(readFileSync(f, 'utf8')) as { satellites: { elements: string }[]; output?: { dir?: string } };
  for (const s of v.satellites) s.elements = path.resolve(ROOT, path.dirname(f), s.elements);
  if (v.output) delete v.output.dir;
  return v;
});

export interface ScenarioDoc { label: string; text: string; base: number }

export const scenarioDocArb: fc.Arbitrary<ScenarioDoc> = fc.tuple(fc.nat({ max: SCENARIO_BASES.length - 1 }), docPlanArb)
  .map(([b, plan]) => ({ label: `fuzz.${plan.format}`, text: buildDoc(SCENARIO_BASES[b] as never, plan), base: b }));

export interface ScenarioOutcome { accepted: boolean; message?: string; ms: number; linkSteps?: number }

export function checkScenarioDoc(d: ScenarioDoc): ScenarioOutcome {
  const t0 = performance.now();
  let accepted = true;
  let message: string | undefined;
  let linkSteps: number | undefined;
  try {
    const s = parseScenarioText(d.text, d.label, ROOT);
    const size = estimateRunSize(s);
    if (![size.gridSteps, size.linkSteps, size.stepsCsvBytes].every(Number.isFinite)) throw new Error(`run size not finite: ${JSON.stringify(size)}`);
    linkSteps = size.linkSteps;
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    accepted = false;
    message = err.message;
    if (message.includes('\n')) throw new Error(`two lines: ${message}`);
    if (!new RegExp(`^${d.label.replace('.', '\\.')}:\\d+[: ]`).test(message)) throw new Error(`not located at FILE:LINE: ${message}`);
  }
  const ms = performance.now() - t0;
  if (ms > MAX_MS) throw new Error(`${ms.toFixed(0)} ms for one document`);
  return { accepted, message, ms, linkSteps };
}

