/**
 * Network arbitration: at each step, which one station of the network carries
 * the satellite, so network volume counts every step once.
 *   - `highest-rate` (default): the usable candidate that delivers the highest
 *     information rate, and among equal rates the largest margin; ties go to
 *     the higher priority (lower number), then to the first listed. Rate comes
 *     first because an adaptive link's margin is measured against each
 *     station's own chosen mode, so margins of two stations on different modes
 *     do not compare; for a fixed-rate link every usable rate is the same and
 *     the margin decides.
 *   - `priority`: the first usable candidate in `policy.order`; stations not in
 *     the order come after it, ranked by their `priority` number.
 */
import type { NetworkPolicy } from '../scenario/types.js';

export interface NetworkCandidate {
  station: string;
  marginDB: number;
  usable: boolean;
  rateBps: number;
  /** 1 = highest. */
  priority: number;
}

/**
 * A station's place in the policy's order, as two keys compared in turn
 * (lower first): `priority` — [0, index in policy.order] for listed stations,
 * [1, priority] for the others; `best-margin` — [priority, 0] (the tie-break
 * after rate and margin).
 */
export function stationRank(policy: NetworkPolicy, station: string, priority: number): [number, number] {
  if (policy.kind === 'priority') {
    const i = policy.order.indexOf(station);
    return i >= 0 ? [0, i] : [1, priority];
  }
  return [priority, 0];
}

/** Can this step carry the network at all: usable (and, for best-margin, a margin to compare). */
export function networkEligible(policy: NetworkPolicy, usable: boolean, marginDB: number): boolean {
  return usable && (policy.kind === 'priority' || !Number.isNaN(marginDB));
}

/**
 * Does candidate a beat the best so far, b (both eligible)? best-margin:
 * higher rate, then larger margin, then lower rank; priority: lower rank. Strict,
 * so among equals the first candidate stays.
 */
export function networkOutranks(
  policy: NetworkPolicy,
  aRateBps: number, aMarginDB: number, aRank0: number, aRank1: number,
  bRateBps: number, bMarginDB: number, bRank0: number, bRank1: number,
): boolean {
  if (policy.kind === 'priority') return aRank0 < bRank0 || (aRank0 === bRank0 && aRank1 < bRank1);
  return aRateBps > bRateBps || (aRateBps === bRateBps && (aMarginDB > bMarginDB || (aMarginDB === bMarginDB && aRank0 < bRank0)));
}

/** Index of the chosen candidate, or −1 when none is usable. */
export function chooseNetworkStation(
  candidates: readonly NetworkCandidate[],
  policy: NetworkPolicy = { kind: 'highest-rate' },
): number {
  let best = -1;
  let br0 = 0, br1 = 0;
  for (let i = 0; i < candidates.length; i++) {
    const c = candidates[i];
    if (!networkEligible(policy, c.usable, c.marginDB)) continue;
    const [r0, r1] = stationRank(policy, c.station, c.priority);
    if (best < 0) { best = i; br0 = r0; br1 = r1; continue; }
    const b = candidates[best];
    if (networkOutranks(policy, c.rateBps, c.marginDB, r0, r1, b.rateBps, b.marginDB, br0, br1)) { best = i; br0 = r0; br1 = r1; }
  }
  return best;
}
