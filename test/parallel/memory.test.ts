/**
 * Memory does not grow with the window: the pipeline keeps fixed-size
 * accumulators, never the steps. A light copy of the demo (one station, the
 * UHF link, clear sky) over 30 and 120 days, steps.csv off, no series: the
 * heap left after each run (after a full GC, the result still referenced)
 * may differ only by what legitimately grows with the window, the per-pass
 * summaries and the daily rows (a few hundred bytes each), bounded here at
 * 4 MB. Keeping as little as 30 bytes per step would add ~9 MB.
 */
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../src/sweep/pipeline.js';
import type { PipelineResult } from '../../src/sweep/types.js';
import { lightScenario } from './scenario.js';

setFlagsFromString('--expose-gc');
const gc = runInNewContext('gc') as () => void;

async function heapAfter(days: number): Promise<{ heap: number; result: PipelineResult }> {
  gc();
  const result = await runPipeline({ scenario: lightScenario(days) });
  gc(); gc();
  return { heap: process.memoryUsage().heapUsed, result };
}

describe('memory against window length', () => {
  it('30 vs 120 days: heap after the run within 4 MB, for 4× the steps', async () => {
    await heapAfter(2); // warm-up: code and caches
    const a = await heapAfter(30);
    const b = await heapAfter(120);
    const extraSteps = b.result.linkSteps - a.result.linkSteps;
    expect(extraSteps).toBeGreaterThan(250_000);
    const grew = b.heap - a.heap;
    expect(grew, `heap grew ${(grew / 1e6).toFixed(2)} MB for ${extraSteps} more steps`).toBeLessThan(4e6);
    // The things that do grow, grow by passes and days only.
    expect(b.result.passLinks.length).toBeGreaterThan(3 * a.result.passLinks.length);
    expect(b.result.daily.length).toBe(2 * 120);
  });
});
