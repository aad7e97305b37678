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

/** Index of the chosen candidate, or −1 when none is usable. */
export function chooseNetworkStation(
  candidates: readonly NetworkCandidate[],
  policy: NetworkPolicy = { kind: 'highest-rate' },
): number {
  let best = -1;
  if (policy.kind === 'priority') {
    const rank = (c: NetworkCandidate) => {
      const i = policy.order.indexOf(c.station);
      return i >= 0 ? [0, i] : [1, c.priority];
    };
    let bestRank: number[] = [];
    candidates.forEach((c, i) => {
      if (!c.usable) return;
      const r = rank(c);
      if (best < 0 || r[0] < bestRank[0] || (r[0] === bestRank[0] && r[1] < bestRank[1])) {
        best = i;
        bestRank = r;
      }
    });
    return best;
  }
  candidates.forEach((c, i) => {
    if (!c.usable || Number.isNaN(c.marginDB)) return;
    const b = candidates[best];
    if (
      best < 0 || c.rateBps > b.rateBps
      || (c.rateBps === b.rateBps && (c.marginDB > b.marginDB || (c.marginDB === b.marginDB && c.priority < b.priority)))
    ) best = i;
  });
  return best;
}
