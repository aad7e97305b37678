/** Warnings a person must see before a command runs, on stderr (even with --quiet). */
import type { ResolvedScenario } from '../scenario/types.js';

export function printNotices(scenario: ResolvedScenario): void {
  for (const n of scenario.notices ?? []) process.stderr.write(`passbudget: warning: ${n}\n`);
}
