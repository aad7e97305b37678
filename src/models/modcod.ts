/** Coding profiles and adaptive (DVB-S2) mode tables. */
import type { AdaptiveMode } from '../budget/types.js';
import { requiredEbN0DB } from './ber.js';

export interface CodingProfile {
  name: string;
  /** Information bits per coded bit. */
  codeRate: number;
  /** Required Eb/N0 (dB, information bit) at targetBitErrorRate with BPSK/QPSK. */
  requiredEbN0DB: number;
  targetBitErrorRate: number;
  source: string;
}

/**
 * Default coding profiles at BER 1e-5 with coherent BPSK/QPSK. The coded figures
 * are typical values from memory; a user should override them with the modem's own.
 */
export const CODING_PROFILES: Readonly<Record<string, CodingProfile>> = Object.freeze({
  uncoded: {
    name: 'uncoded', codeRate: 1, targetBitErrorRate: 1e-5,
    requiredEbN0DB: requiredEbN0DB({ modulation: 'bpsk', bitErrorRate: 1e-5 }),
    source: 'coherent BPSK/QPSK in AWGN, ½ erfc(√(Eb/N0)) solved for 1e-5',
  },
  'conv-r1/2-k7': {
    name: 'conv-r1/2-k7', codeRate: 1 / 2, targetBitErrorRate: 1e-5, requiredEbN0DB: 4.4,
    source: 'convolutional r = 1/2, K = 7, soft-decision Viterbi, typical figure (from memory)',
  },
  'rs-conv': {
    name: 'rs-conv', codeRate: (1 / 2) * (223 / 255), targetBitErrorRate: 1e-5, requiredEbN0DB: 2.5,
    source: 'Reed–Solomon (255,223) concatenated with convolutional r = 1/2, K = 7, typical figure (from memory)',
  },
});

/** Profile by name from `table` (default CODING_PROFILES; pass your own to override). Unknown name: RangeError. */
export function codingProfile(name: string, table: Readonly<Record<string, CodingProfile>> = CODING_PROFILES): CodingProfile {
  const p = Object.prototype.hasOwnProperty.call(table, name) ? table[name] : undefined;
  if (!p) throw new RangeError(`codingProfile: name = ${JSON.stringify(name)} is outside ${Object.keys(table).join(', ')}`);
  return p;
}

/**
 * DVB-S2 MODCODs, normal frames, no pilots: ideal Es/N0 for quasi-error-free
 * operation in AWGN and spectral efficiency — ETSI EN 302 307-1, Table 13
 * (from memory), sorted by required Es/N0.
 */
export const DVBS2_MODES: readonly AdaptiveMode[] = Object.freeze(([
  ['QPSK 1/4', -2.35, 0.490243], ['QPSK 1/3', -1.24, 0.656448], ['QPSK 2/5', -0.3, 0.789412],
  ['QPSK 1/2', 1.0, 0.988858], ['QPSK 3/5', 2.23, 1.188304], ['QPSK 2/3', 3.1, 1.322253],
  ['QPSK 3/4', 4.03, 1.487473], ['QPSK 4/5', 4.68, 1.587196], ['QPSK 5/6', 5.18, 1.654663],
  ['8PSK 3/5', 5.5, 1.779991], ['QPSK 8/9', 6.2, 1.766451], ['QPSK 9/10', 6.42, 1.788612],
  ['8PSK 2/3', 6.62, 1.980636], ['8PSK 3/4', 7.91, 2.228124], ['16APSK 2/3', 8.97, 2.637201],
  ['8PSK 5/6', 9.35, 2.478562], ['16APSK 3/4', 10.21, 2.966728], ['8PSK 8/9', 10.69, 2.646012],
  ['8PSK 9/10', 10.98, 2.679207], ['16APSK 4/5', 11.03, 3.165623], ['16APSK 5/6', 11.61, 3.300184],
  ['32APSK 3/4', 12.73, 3.703295], ['16APSK 8/9', 12.89, 3.523143], ['16APSK 9/10', 13.13, 3.567342],
  ['32APSK 4/5', 13.64, 3.951571], ['32APSK 5/6', 14.28, 4.11954], ['32APSK 8/9', 15.69, 4.397854],
  ['32APSK 9/10', 16.05, 4.453027],
] as const).map(([name, requiredEsN0DB, efficiencyBitsPerSymbol]) => Object.freeze({ name, requiredEsN0DB, efficiencyBitsPerSymbol })));

/**
 * Index of the most efficient mode with requiredEsN0DB + requiredMarginDB ≤ esN0DB
 * (ties: the lower requirement), or −1 when none fits (or Es/N0 is NaN). Modes need not be sorted. No allocation.
 */
export function selectAdaptiveMode(modes: readonly AdaptiveMode[], esN0DB: number, requiredMarginDB: number): number {
  let best = -1;
  for (let i = 0; i < modes.length; i++) {
    const m = modes[i];
    // Written so that a NaN Es/N0 fits no mode (a '>' test would let NaN fit every one).
    if (!(m.requiredEsN0DB + requiredMarginDB <= esN0DB)) continue;
    if (best < 0 || m.efficiencyBitsPerSymbol > modes[best].efficiencyBitsPerSymbol
      || (m.efficiencyBitsPerSymbol === modes[best].efficiencyBitsPerSymbol && m.requiredEsN0DB < modes[best].requiredEsN0DB)) {
      best = i;
    }
  }
  return best;
}

/**
 * selectAdaptiveMode as a table: the chosen mode is a step function of the
 * Es/N0 (the set of modes that fit only grows with it), so the breakpoints
 * (each distinct requiredEsN0DB + requiredMarginDB, ascending) and the mode
 * chosen from each one on are computed once with the same rule and tie-breaks;
 * choosing is then a search among the breakpoints. `choose(x)` equals
 * `selectAdaptiveMode(modes, x, requiredMarginDB)` for every x (NaN: −1).
 */
export interface AdaptiveModeTable {
  /** Ascending distinct thresholds (dB). */
  thresholdsDB: Float64Array;
  /** Mode index chosen for Es/N0 in [thresholdsDB[j], thresholdsDB[j+1]). */
  modeFrom: Int32Array;
  choose(esN0DB: number): number;
  /** `choose` of x[0 … n−1] into out (hunting from the previous entry's breakpoint: Es/N0 moves slowly along a pass). */
  chooseColumn(x: Float64Array, n: number, out: Int16Array): void;
}

export function adaptiveModeTable(modes: readonly AdaptiveMode[], requiredMarginDB: number): AdaptiveModeTable {
  const th = modes.map((m) => m.requiredEsN0DB + requiredMarginDB);
  const distinct = [...new Set(th)].filter((x) => !Number.isNaN(x)).sort((a, b) => a - b);
  const thresholdsDB = Float64Array.from(distinct);
  const modeFrom = Int32Array.from(distinct, (x) => selectAdaptiveMode(modes, x, requiredMarginDB));
  const n = thresholdsDB.length;
  return {
    thresholdsDB,
    modeFrom,
    choose(x) {
      // Largest j with thresholdsDB[j] ≤ x (none for x below all, or NaN).
      if (!(x >= thresholdsDB[0])) return -1;
      let lo = 0, hi = n;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (thresholdsDB[mid] <= x) lo = mid; else hi = mid;
      }
      return modeFrom[lo];
    },
    chooseColumn(x, count, out) {
      let j = 0;
      for (let i = 0; i < count; i++) {
        const v = x[i];
        while (j > 0 && !(thresholdsDB[j] <= v)) j--;
        while (j + 1 < n && thresholdsDB[j + 1] <= v) j++;
        out[i] = n > 0 && thresholdsDB[j] <= v ? modeFrom[j] : -1;
      }
    },
  };
}
