/** Cost per step of the engine (1 link × 3 weather cases), and of building an engine. Run: npx vitest bench --run test/budget/engine.bench.ts */
import { bench, describe } from 'vitest';
import { createLinkEngine, createStepBudget } from '../../src/budget/engine.js';
import { baseClimate, baseLink, CASES, syntheticPass } from './fixtures.js';

const link = baseLink();
link.spacecraft.antenna = { kind: 'cosine-power', peakGainDBi: 6, beamwidthDeg: 80 };
link.spacecraft.pointing = { kind: 'nadir', boresightBody: [0, 0, 1], attitudeErrorDeg: 3 };
link.ground.pointing = { kind: 'track', pointingErrorDeg: 0.1, maxAzimuthRateDegS: 5, maxElevationRateDegS: 3 };
delete link.ground.receiver!.antennaTemperatureK;
const engine = createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES });
const pass = syntheticPass(2);
const out = createStepBudget(CASES);

describe('engine', () => {
  bench(`evaluate ${pass.length} steps of a pass (per-step cost = time / ${pass.length})`, () => {
    engine.beginPass();
    for (const s of pass) engine.evaluate(s, out);
  });
  bench('createLinkEngine (elevation table build)', () => {
    createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES });
  }, { iterations: 5, time: 0 });
});
