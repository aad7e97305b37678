import { describe, expect, it } from 'vitest';
import { DEFAULT_VERDICT_RULE, judgePass, checkVerdictRule } from '../../src/analysis/verdict.js';
import { InputError } from '../../src/errors.js';

// The verdict thresholds are a project choice (not from a published source): usable when
// usable time ≥ 60 s and ≥ 50 % of the time above the mask.
describe('judgePass at the thresholds', () => {
  const table: [usableS: number, aboveMaskS: number, anyUsable: boolean, verdict: string][] = [
    [60, 120, true, 'usable'], // both rules met exactly
    [59.999, 100, true, 'marginal'], // below 60 s
    [60, 120.002, true, 'marginal'], // below 50 %
    [300, 600, true, 'usable'],
    [299.9, 600, true, 'marginal'],
    [600, 600, true, 'usable'],
    [10, 15, true, 'marginal'], // 67 % but < 60 s
    [0, 600, false, 'unusable'],
    [0, 0, false, 'unusable'],
  ];
  it.each(table)('usable %s s of %s s (any usable: %s) → %s', (usableS, aboveMaskS, any, verdict) => {
    const r = judgePass(usableS, aboveMaskS, any);
    expect(r.verdict).toBe(verdict);
    expect(r.verdictRule.startsWith(`${verdict}:`)).toBe(true);
  });

  it('states the rule with its thresholds (one shared sentence per rule) and follows custom thresholds', () => {
    expect(judgePass(61, 100, true).verdictRule).toBe('usable: usable time ≥ 60 s and ≥ 50 % of the time above the mask');
    expect(judgePass(30, 100, true).verdictRule).toBe('marginal: some steps met the required margin, but not usable time ≥ 60 s and ≥ 50 % of the time above the mask');
    expect(judgePass(0, 100, false).verdictRule).toBe('unusable: no step met the required margin');
    expect(judgePass(61, 100, true).verdictRule).toBe(judgePass(400, 500, true).verdictRule); // shared, not per pass
    const strict = { minUsableFraction: 0.8, minUsableS: 30 };
    expect(judgePass(79, 100, true, strict).verdict).toBe('marginal');
    expect(judgePass(80, 100, true, strict).verdict).toBe('usable');
    expect(judgePass(80, 100, true, strict).verdictRule).toContain('≥ 80 %');
    expect(DEFAULT_VERDICT_RULE).toEqual({ minUsableFraction: 0.5, minUsableS: 60 });
  });

  it('rejects rules out of range with one line naming the field', () => {
    expect(() => checkVerdictRule({ minUsableFraction: -0.1, minUsableS: 60 }, 'analysis.verdict')).toThrow(
      new InputError('analysis.verdict.minUsableFraction: -0.1 is out of range (allowed 0 to 1)'));
    expect(() => checkVerdictRule({ minUsableFraction: 0.5, minUsableS: NaN })).toThrow(/minUsableS/);
  });
});
