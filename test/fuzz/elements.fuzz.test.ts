/**
 * Fuzzing the element loaders (TLE/3LE, OMM JSON, OMM XML) with generated and
 * mutated documents (test/fuzz/mutate.ts): each is accepted, or rejected with
 * one `InputError` line that starts with the file's name; never another
 * exception, never longer than 2 s. An accepted set is also propagated an hour
 * and a day past its epoch: a finite state or a PropagationError (an
 * InputError), never NaN or a crash. Counts and seed: test/fuzz/budget.ts.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { COUNTS, SEED, TEST_TIMEOUT_MS } from './budget.js';
import { checkElementsDoc, elementsDocArb, type Outcome } from './docs.js';

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
  }, TEST_TIMEOUT_MS);
});
