/**
 * Uncoded bit error rates in AWGN (e.g. Sklar, Digital Communications, ch. 4):
 * coherent BPSK/QPSK ½ erfc(√(Eb/N0)); DBPSK ½ e^(−Eb/N0);
 * coherent BFSK ½ erfc(√(Eb/2N0)); non-coherent BFSK ½ e^(−Eb/2N0).
 */
import type { Modulation } from '../budget/types.js';
import { erfc } from './erfc.js';
import { checkRange, type Interval } from './range.js';

const MODULATIONS: readonly Modulation[] = ['bpsk', 'qpsk', 'dbpsk', 'bfsk-coherent', 'bfsk-noncoherent'];
/** Bits per channel symbol of each modulation. */
export const MODULATION_BITS_PER_SYMBOL: Readonly<Record<Modulation, number>> = {
  bpsk: 1, qpsk: 2, dbpsk: 1, 'bfsk-coherent': 1, 'bfsk-noncoherent': 1,
};
export const BER_VALIDITY = { bitErrorRate: [1e-15, 0.4] as Interval, ebN0DB: [-60, 60] as Interval };

function checkModulation(fn: string, m: string): asserts m is Modulation {
  if (!(MODULATIONS as readonly string[]).includes(m)) {
    throw new RangeError(`${fn}: modulation = ${JSON.stringify(m)} is outside ${MODULATIONS.join(', ')}`);
  }
}

function ber(m: Modulation, g: number): number {
  switch (m) {
    case 'bpsk':
    case 'qpsk': return 0.5 * erfc(Math.sqrt(g));
    case 'dbpsk': return 0.5 * Math.exp(-g);
    case 'bfsk-coherent': return 0.5 * erfc(Math.sqrt(g / 2));
    case 'bfsk-noncoherent': return 0.5 * Math.exp(-g / 2);
  }
}

/** Bit error probability at Eb/N0 (dB) for the modulation (formulas above). */
export function bitErrorRate(a: { modulation: Modulation; ebN0DB: number }): number {
  checkModulation('bitErrorRate', a.modulation);
  checkRange('bitErrorRate', 'ebN0DB', a.ebN0DB, BER_VALIDITY.ebN0DB, 'dB');
  return ber(a.modulation, 10 ** (a.ebN0DB / 10));
}

/** Eb/N0 (dB) giving the target bit error rate: bisection on log BER to < 1e-6 dB. */
export function requiredEbN0DB(a: { modulation: Modulation; bitErrorRate: number }): number {
  checkModulation('requiredEbN0DB', a.modulation);
  checkRange('requiredEbN0DB', 'bitErrorRate', a.bitErrorRate, BER_VALIDITY.bitErrorRate);
  const target = Math.log(a.bitErrorRate);
  let lo = BER_VALIDITY.ebN0DB[0], hi = BER_VALIDITY.ebN0DB[1];
  while (hi - lo > 1e-7) {
    const mid = (lo + hi) / 2;
    if (Math.log(ber(a.modulation, 10 ** (mid / 10))) > target) lo = mid; else hi = mid;
  }
  return (lo + hi) / 2;
}
