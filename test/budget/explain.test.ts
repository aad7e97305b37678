/**
 * Explain lines: every signed term adds up to the engine's C/N0 (the budget
 * equation of PHYSICS.md §10, k = −228.60 dBW/K/Hz), per weather case; the
 * table and the flat records carry the same numbers.
 */
import { describe, expect, it } from 'vitest';
import { createLinkEngine, createStepBudget } from '../../src/budget/engine.js';
import { formatExplainTable } from '../../src/budget/explain.js';
import { CASE_COLUMNS, STEP_COLUMNS, stepRecordForCase } from '../../src/budget/columns.js';
import { baseClimate, baseLink, CASES, sampleAtElevation } from './fixtures.js';

describe('explain lines', () => {
  const link = baseLink();
  link.spacecraft.antenna = { kind: 'cosine-power', peakGainDBi: 6, beamwidthDeg: 80 };
  link.spacecraft.pointing = { kind: 'nadir', boresightBody: [0, 0, 1], attitudeErrorDeg: 4 };
  link.ground.pointing = { kind: 'track', pointingErrorDeg: 0.2 };
  delete link.ground.receiver!.antennaTemperatureK;
  const engine = createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES });
  const s = sampleAtElevation(12, 550);
  const step = createStepBudget(CASES);
  const lines = engine.explain(s, step);

  it('the signed terms sum to C/N0 in every weather case', () => {
    for (let i = 0; i < CASES.length; i++) {
      let sum = 0;
      for (const l of lines) {
        if (!l.sign) continue;
        const v = Number(l.perCase ? l.values[i] : l.values[0]);
        sum += l.sign === '+' ? v : -v;
      }
      expect(sum).toBeCloseTo(step.cases[i].c_over_n0_dbhz, 9);
    }
    // Non-trivial pointing losses on both ends in this case.
    expect(step.tx_pointing_loss_db).toBeGreaterThan(0.05);
    expect(step.rx_pointing_loss_db).toBeGreaterThan(0.5);
  });
  it('has the five sections in order and names a source on every line', () => {
    const sections = [...new Set(lines.map((l) => l.section))];
    expect(sections).toEqual(['Geometry', 'Transmit', 'Path', 'Receive', 'Result']);
    expect(lines.every((l) => l.source.length > 5)).toBe(true);
    const text = formatExplainTable(lines, { title: 'T', weatherNames: CASES.map((c) => c.name) });
    for (const sec of sections) expect(text).toMatch(new RegExp(`^${sec}`, 'm'));
    expect(text).toMatch(/ITU-R P\.525/);
    expect(text).toContain(step.cases[2].c_over_n0_dbhz.toFixed(2));
  });
  it('stepRecordForCase flattens one case in column order, as a copy', () => {
    const rec = stepRecordForCase(step, 1);
    expect(Object.keys(rec)).toEqual([...STEP_COLUMNS, ...CASE_COLUMNS]);
    expect(rec.weather).toBe('p1');
    expect(rec.margin_db).toBe(step.cases[1].margin_db);
    expect(rec.range_km).toBe(step.range_km);
    expect(() => stepRecordForCase(step, 3)).toThrow(RangeError);
  });
});
