import type { ElementSet } from './types.js';

/**
 * One element set per object (catalogue number), the one whose epoch is
 * nearest to `timeS`: SGP4 errors grow with distance from the epoch in
 * either direction. Objects keep their order of first appearance.
 */
export function selectNearestEpoch(sets: readonly ElementSet[], timeS: number): ElementSet[] {
  const best = new Map<number, ElementSet>();
  for (const s of sets) {
    const cur = best.get(s.catalogNumberValue);
    if (!cur || Math.abs(s.epochUnixS - timeS) < Math.abs(cur.epochUnixS - timeS)) best.set(s.catalogNumberValue, s);
  }
  return [...best.values()];
}
