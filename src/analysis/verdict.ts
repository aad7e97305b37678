/**
 * Per-pass verdict. The thresholds are a project choice (not from a published
 * source) and are parameters: a pass is
 *   - `usable` when its usable time is at least `minUsableS` and at least
 *     `minUsableFraction` of its time above the mask;
 *   - `marginal` when some step met the required margin but that rule fails;
 *   - `unusable` when no step met it.
 */
import { InputError } from '../errors.js';
import type { Verdict } from './types.js';

export interface VerdictRule {
  /** Minimum usable time as a fraction of the time above the mask (0–1). */
  minUsableFraction: number;
  /** Minimum usable time (s). */
  minUsableS: number;
}

export const DEFAULT_VERDICT_RULE: Readonly<VerdictRule> = Object.freeze({ minUsableFraction: 0.5, minUsableS: 60 });

function fmt(x: number): string {
  return Number.isInteger(x) ? String(x) : x.toFixed(1);
}

/** Verdict and the sentence that explains it, with the numbers used. */
export function judgePass(
  usableS: number,
  aboveMaskS: number,
  anyUsable: boolean,
  rule: VerdictRule = DEFAULT_VERDICT_RULE,
): { verdict: Verdict; verdictRule: string } {
  const pct = fmt(rule.minUsableFraction * 100);
  const need = `needs ≥ ${fmt(rule.minUsableS)} s and ≥ ${pct} % of the ${fmt(aboveMaskS)} s above the mask`;
  if (!anyUsable) {
    return { verdict: 'unusable', verdictRule: `unusable: no step met the required margin (usable ${need})` };
  }
  const ok = usableS >= rule.minUsableS && usableS >= rule.minUsableFraction * aboveMaskS;
  if (ok) {
    return { verdict: 'usable', verdictRule: `usable: ${fmt(usableS)} s met the required margin; usable ${need}` };
  }
  return { verdict: 'marginal', verdictRule: `marginal: only ${fmt(usableS)} s met the required margin; usable ${need}` };
}

/** Check a user-given rule; `where` names its origin (a scenario path or a flag). */
export function checkVerdictRule(rule: VerdictRule, where = 'verdict rule'): VerdictRule {
  if (!(rule.minUsableFraction >= 0 && rule.minUsableFraction <= 1)) {
    throw new InputError(`${where}.minUsableFraction: ${rule.minUsableFraction} is out of range (allowed 0 to 1)`);
  }
  if (!(rule.minUsableS >= 0 && Number.isFinite(rule.minUsableS))) {
    throw new InputError(`${where}.minUsableS: ${rule.minUsableS} is out of range (allowed a finite number ≥ 0 s)`);
  }
  return rule;
}
