/**
 * Fuzz sizes and seeds. CI runs a part sized to stay under 60 s in all;
 * PASSBUDGET_FUZZ_FULL=1 runs the full counts (at least 10 000 element and
 * 10 000 scenario documents in-process). Seeds are fixed, so every run sees
 * the same documents; PASSBUDGET_FUZZ_SEED=N changes them for exploring.
 */
export const FULL = process.env.PASSBUDGET_FUZZ_FULL === '1';
export const SEED = Number(process.env.PASSBUDGET_FUZZ_SEED ?? 20261121);

export const COUNTS = FULL
  ? { elements: 10_000, scenarios: 10_000, cliElements: 150, cliScenarios: 150, runDocs: 3_000 }
  : { elements: 1_500, scenarios: 1_500, cliElements: 12, cliScenarios: 24, runDocs: 150 };

/** No document may take longer than this to accept or reject (ms). */
export const MAX_MS = 2_000;

/** Per-test time limit: the full counts take minutes. */
export const TEST_TIMEOUT_MS = FULL ? 1_800_000 : 60_000;
