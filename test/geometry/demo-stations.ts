/** The three invented demo stations (fixtures; not real sites of any operator). */
import type { Station } from '../../src/geometry/types.js';

export const KALDFJELL: Station = {
  name: 'Kaldfjell', latitudeDeg: 68.40, longitudeDeg: 17.25, heightM: 120,
  mask: { kind: 'constant', elevationDeg: 5 },
};
export const PICO_VERDE: Station = {
  name: 'Pico Verde', latitudeDeg: 42.14, longitudeDeg: -3.12, heightM: 980,
  mask: { kind: 'table', points: [[0, 4], [60, 9], [120, 12], [180, 6], [240, 3], [300, 7]] },
};
export const MARAKA: Station = {
  name: 'Maraka', latitudeDeg: 0.45, longitudeDeg: 36.95, heightM: 1850,
  mask: { kind: 'constant', elevationDeg: 5 },
};
export const DEMO_STATIONS = [KALDFJELL, PICO_VERDE, MARAKA];

export const ORBILUX_TLE = 'fixtures/demo/orbilux-3.tle';
