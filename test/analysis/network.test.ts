import { describe, expect, it } from 'vitest';
import { chooseNetworkStation, type NetworkCandidate } from '../../src/analysis/network.js';

const c = (station: string, marginDB: number, usable: boolean, priority: number): NetworkCandidate =>
  ({ station, marginDB, usable, rateBps: 9600, priority });

describe('chooseNetworkStation', () => {
  const set = [c('Gorsemoor', 2, true, 2), c('Lintel Point', 5, false, 1), c('Skerrow', 4, true, 3), c('Vaddle', 1, true, 4)];

  it('best margin among usable candidates (an unusable larger margin is ignored)', () => {
    expect(chooseNetworkStation(set)).toBe(2);
    expect(chooseNetworkStation(set, { kind: 'highest-rate' })).toBe(2);
  });

  it('ties in margin go to the higher priority, then to the first listed', () => {
    expect(chooseNetworkStation([c('A', 3, true, 5), c('B', 3, true, 2), c('C', 3, true, 2)])).toBe(1);
  });

  it('−1 when none is usable or the list is empty; NaN margins are skipped', () => {
    expect(chooseNetworkStation([c('A', 3, false, 1), c('B', 9, false, 2)])).toBe(-1);
    expect(chooseNetworkStation([])).toBe(-1);
    expect(chooseNetworkStation([c('A', NaN, true, 1), c('B', -2, true, 2)])).toBe(1);
  });

  it('adaptive links: the higher information rate wins over a larger margin on a slower mode', () => {
    // Station A closes QPSK 1/4 with 4 dB to spare; B closes 32APSK 5/6 with 0.5 dB: B carries 8x the bits.
    const a: NetworkCandidate = { station: 'A', marginDB: 4, usable: true, rateBps: 2.45e6, priority: 1 };
    const b: NetworkCandidate = { station: 'B', marginDB: 0.5, usable: true, rateBps: 20.6e6, priority: 2 };
    expect(chooseNetworkStation([a, b])).toBe(1);
    expect(chooseNetworkStation([b, a])).toBe(0);
  });

  it('fixed priority order: first usable in the order, others after by priority number', () => {
    const order = { kind: 'priority' as const, order: ['Vaddle', 'Lintel Point', 'Gorsemoor'] };
    expect(chooseNetworkStation(set, order)).toBe(3);
    const noVaddle = set.map((x) => (x.station === 'Vaddle' ? { ...x, usable: false } : x));
    expect(chooseNetworkStation(noVaddle, order)).toBe(0); // Lintel Point unusable → Gorsemoor
    const onlyUnlisted = set.map((x) => (x.station === 'Skerrow' ? x : { ...x, usable: false }));
    expect(chooseNetworkStation(onlyUnlisted, order)).toBe(2);
    expect(chooseNetworkStation([c('X', 1, true, 3), c('Y', 9, true, 2)], { kind: 'priority', order: [] })).toBe(1);
  });
});
