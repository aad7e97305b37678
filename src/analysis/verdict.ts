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

/**
 * The three rule sentences of a rule, built once per rule and shared by every
 * pass: a year of passes keeps one copy of each sentence, not one per pass
 * (the pass's own numbers are in its usable_duration_s and duration_s columns).
 */
const sentences = new Map<string, Record<Verdict, string>>();

let lastRule: VerdictRule | null = null;
let lastSentences: Record<Verdict, string> | null = null;

export function verdictSentences(rule: VerdictRule = DEFAULT_VERDICT_RULE): Readonly<Record<Verdict, string>> {
  // The same frozen rule again (the default, every pass of a run): its sentences without building the key.
  if (rule === lastRule && lastSentences && Object.isFrozen(rule)) return lastSentences;
  const key = `${rule.minUsableS}|${rule.minUsableFraction}`;
  let t = sentences.get(key);
  if (!t) {
    const need = `usable time ≥ ${fmt(rule.minUsableS)} s and ≥ ${fmt(rule.minUsableFraction * 100)} % of the time above the mask`;
    t = {
      usable: `usable: ${need}`,
      marginal: `marginal: some steps met the required margin, but not ${need}`,
      unusable: 'unusable: no step met the required margin',
    };
    sentences.set(key, t);
  }
  lastRule = rule; lastSentences = t;
  return t;
}

/** The shared copy of a rule sentence equal to `text` (or `text` itself when no rule made it). */
export function internVerdictSentence(text: string): string {
  for (const t of sentences.values()) {
    if (t.usable === text) return t.usable;
    if (t.marginal === text) return t.marginal;
    if (t.unusable === text) return t.unusable;
  }
  return text;
}

/** Verdict and the (shared) sentence of the rule that produced it. */
export function judgePass(
  usableS: number,
  aboveMaskS: number,
  anyUsable: boolean,
  rule: VerdictRule = DEFAULT_VERDICT_RULE,
): { verdict: Verdict; verdictRule: string } {
  const t = verdictSentences(rule);
  if (!anyUsable) return { verdict: 'unusable', verdictRule: t.unusable };
  const ok = usableS >= rule.minUsableS && usableS >= rule.minUsableFraction * aboveMaskS;
  return ok ? { verdict: 'usable', verdictRule: t.usable } : { verdict: 'marginal', verdictRule: t.marginal };
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
