/**
 * Deeper than loading: scenarios with one value replaced (extreme, tiny,
 * negative, non-finite, retyped; test/fuzz/mutate.ts) that the loader
 * accepts are run through the pipeline on a 3-hour window at 20 s steps.
 * Loading and running either succeed or end in one `InputError` line (exit 2
 * at the command line); a RangeError from a model, a NaN reaching a model or
 * anything else would be an internal error. Counts: test/fuzz/budget.ts.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../src/sweep/pipeline.js';
import { InputError } from '../../src/errors.js';
import { parseScenarioText } from '../../src/scenario/index.js';
import { COUNTS, SEED, TEST_TIMEOUT_MS } from './budget.js';
import { SCENARIO_BASES } from './docs.js';
import { applyEdits, oddValue, paths, serialise } from './mutate.js';

type Base = { window: Record<string, unknown> };
const BASES = SCENARIO_BASES.map((b) => ({ ...b, window: { ...(b as Base).window, duration: '3h', end: undefined, step_s: 20 } }));

/** Values near the edges of the schema's ranges, besides the odd ones. */
const valueArb = fc.oneof(
  fc.double({ min: -1e4, max: 1e4, noNaN: true }),
  fc.constantFrom(0, -0, 1e-300, 1e-9, 1e-3, 0.5, 1, 5, 30, 50, 89.999, 90, 100, 180, 359.9, 360, 1e3, 1e6, 1e9, 1e11),
  oddValue,
);

describe(`scenarios with one value replaced, loaded and run (${COUNTS.runDocs} documents, seed ${SEED + 3})`, () => {
  it('load and run, or one InputError; never another exception', async () => {
    const plans = fc.sample(fc.tuple(fc.nat({ max: BASES.length - 1 }), fc.nat(), valueArb), { seed: SEED + 3, numRuns: COUNTS.runDocs });
    const tally = { rejectedAtLoad: 0, ran: 0, rejectedInRun: 0 };
    for (const [b, at, value] of plans) {
      const base = JSON.parse(JSON.stringify(BASES[b]));
      const all = paths(base);
      const where = all[at % all.length];
      const text = serialise(applyEdits(base, [{ op: 'replace', at: at % all.length, value: value as never }]) as never, 'yaml');
      const label = `${JSON.stringify(where)} = ${String(JSON.stringify(value)).slice(0, 60)}`;
      let scenario;
      try {
        scenario = parseScenarioText(text, 'run.yaml', process.cwd());
      } catch (e) {
        expect(e, label).toBeInstanceOf(InputError);
        tally.rejectedAtLoad++;
        continue;
      }
      try {
        await runPipeline({ scenario });
        tally.ran++;
      } catch (e) {
        expect(e, `${label}: ${String(e)}`).toBeInstanceOf(InputError);
        tally.rejectedInRun++;
      }
    }
    console.log(`scenario run fuzz: ${plans.length} documents, ${tally.rejectedAtLoad} rejected at load, ${tally.ran} ran, ${tally.rejectedInRun} stopped with an InputError while running`);
    expect(tally.ran).toBeGreaterThan(plans.length / 10);
  }, TEST_TIMEOUT_MS);
});
