/**
 * Fuzzing the scenario loader with mutations of the fixtures (base.yaml, the
 * e2e pair and the demo, in YAML and JSON): deleted, duplicated, retyped,
 * extreme and non-finite values, wrong units, unicode, very long strings and
 * textual edits (test/fuzz/mutate.ts). Each document is resolved, or rejected
 * with one `InputError` line starting `FILE:LINE`; never another exception,
 * never longer than 2 s. An accepted one also gets its run-size estimate,
 * which must be finite. Counts and seed: test/fuzz/budget.ts.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { COUNTS, SEED, TEST_TIMEOUT_MS } from './budget.js';
import { checkScenarioDoc, scenarioDocArb, type ScenarioOutcome } from './docs.js';

describe(`scenario loader, ${COUNTS.scenarios} mutated documents (seed ${SEED})`, () => {
  it('resolve, or reject with one FILE:LINE line; never another exception; never over 2 s', () => {
    const outcomes: ScenarioOutcome[] = [];
    fc.assert(fc.property(scenarioDocArb, (d) => { outcomes.push(checkScenarioDoc(d)); }), { seed: SEED, numRuns: COUNTS.scenarios });
    const accepted = outcomes.filter((o) => o.accepted).length;
    const kinds = new Map<string, number>();
    for (const o of outcomes) {
      if (!o.message) continue;
      const k = /^[^:]+:\d+(?::\d+)?:? ?(?:[^:]*: )?(.{0,28})/.exec(o.message)?.[1] ?? '?';
      kinds.set(k, (kinds.get(k) ?? 0) + 1);
    }
    const top = [...kinds].sort((a, b) => b[1] - a[1]).slice(0, 6).map(([k, n]) => `${n}× "${k}"`).join(', ');
    console.log(`scenario fuzz: ${outcomes.length} documents, seed ${SEED}, ${accepted} resolved, slowest ${Math.max(...outcomes.map((o) => o.ms)).toFixed(0)} ms; most common rejections: ${top}`);
    expect(outcomes.length).toBe(COUNTS.scenarios);
    expect(accepted).toBeGreaterThan(0);
    expect(accepted).toBeLessThan(outcomes.length);
  }, TEST_TIMEOUT_MS);
});
