/**
 * Fuzzing the element loaders (TLE/3LE, OMM JSON, OMM XML) with generated and
 * mutated documents (test/fuzz/mutate.ts): each is accepted, or rejected with
 * one `InputError` line that starts with the file's name; never another
 * exception, never longer than 2 s. An accepted set is also propagated an hour
 * and a day past its epoch: a finite state or a PropagationError (an
 * InputError), never NaN or a crash. Counts and seed: test/fuzz/budget.ts.
 */
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { parseElementsText } from '../../src/elements/load.js';
import { createPropagator } from '../../src/orbit/propagator.js';
import { COUNTS, MAX_MS, SEED } from './budget.js';
import { buildDoc, docPlanArb, mutateTle, mutateXml, textEditArb, applyTextEdits, tleEditArb, xmlEditArb } from './mutate.js';

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

describe(`element loaders, ${COUNTS.elements} generated and mutated documents (seed ${SEED})`, () => {
  it('accept, or reject with one located line; never another exception; never over 2 s', () => {
    const outcomes: Outcome[] = [];
    fc.assert(fc.property(elementsDocArb, (d) => { outcomes.push(checkElementsDoc(d)); }), { seed: SEED, numRuns: COUNTS.elements });
    const byKind = new Map<string, { n: number; accepted: number }>();
    for (const o of outcomes) {
      const k = byKind.get(o.kind) ?? { n: 0, accepted: 0 };
      k.n++; if (o.accepted) k.accepted++;
      byKind.set(o.kind, k);
    }
    const slowest = Math.max(...outcomes.map((o) => o.ms));
    console.log(`element fuzz: ${outcomes.length} documents, seed ${SEED}, slowest ${slowest.toFixed(0)} ms; ${[...byKind].map(([k, v]) => `${k} ${v.n} (${v.accepted} accepted)`).join(', ')}`);
    expect(outcomes.length).toBe(COUNTS.elements);
    // The mutations reach both sides: some documents survive, most do not.
    for (const [k, v] of byKind) if (k !== 'random') expect(v.accepted, k).toBeGreaterThan(0);
    expect(outcomes.filter((o) => !o.accepted).length).toBeGreaterThan(outcomes.length / 2);
  });
});
