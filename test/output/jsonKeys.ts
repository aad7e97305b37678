/**
 * The naming rule of every JSON output (the CSV columns' rule): keys are
 * snake_case, and a key that names a quantity ends in its unit. Maps keyed
 * by user names (links, stations) are skipped by the caller.
 */
export const SNAKE = /^[a-z][a-z0-9]*(_[a-z0-9%.]+)*$/;

/** Every key path in `value` whose key is not snake_case; `skip` lists keys whose values are maps of user names. */
export function badKeys(value: unknown, skip: readonly string[] = [], at = ''): string[] {
  if (Array.isArray(value)) return value.flatMap((v, i) => badKeys(v, skip, `${at}[${i}]`));
  if (value === null || typeof value !== 'object') return [];
  const out: string[] = [];
  for (const [k, v] of Object.entries(value)) {
    if (!SNAKE.test(k)) out.push(`${at}.${k}`);
    if (!skip.includes(k)) out.push(...badKeys(v, skip, `${at}.${k}`));
  }
  return out;
}

/** Every key anywhere in `value` (not descending into `skip`ped maps). */
export function allKeys(value: unknown, skip: readonly string[] = []): Set<string> {
  const keys = new Set<string>();
  const walk = (v: unknown) => {
    if (Array.isArray(v)) { v.forEach(walk); return; }
    if (v === null || typeof v !== 'object') return;
    for (const [k, x] of Object.entries(v)) { keys.add(k); if (!skip.includes(k)) walk(x); }
  };
  walk(value);
  return keys;
}
