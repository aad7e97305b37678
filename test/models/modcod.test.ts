import { describe, expect, it } from 'vitest';
import { requiredEbN0DB } from '../../src/models/ber.js';
import { CODING_PROFILES, codingProfile, DVBS2_MODES, selectAdaptiveMode } from '../../src/models/modcod.js';

describe('coding profiles (coded figures from memory, overridable)', () => {
  it('has uncoded = BPSK at 1e-5 and the typical coded figures', () => {
    expect(codingProfile('uncoded').requiredEbN0DB).toBe(requiredEbN0DB({ modulation: 'bpsk', bitErrorRate: 1e-5 }));
    expect(codingProfile('conv-r1/2-k7')).toMatchObject({ codeRate: 0.5, requiredEbN0DB: 4.4, targetBitErrorRate: 1e-5 });
    expect(codingProfile('rs-conv').codeRate).toBeCloseTo(0.5 * 223 / 255, 12);
    expect(codingProfile('rs-conv').requiredEbN0DB).toBe(2.5);
    for (const p of Object.values(CODING_PROFILES)) expect(p.source.length).toBeGreaterThan(10);
  });
  it('takes a user table and rejects unknown names listing the known ones', () => {
    const mine = { 'turbo-1/3': { name: 'turbo-1/3', codeRate: 1 / 3, requiredEbN0DB: 1.0, targetBitErrorRate: 1e-5, source: 'modem datasheet' } };
    expect(codingProfile('turbo-1/3', mine).requiredEbN0DB).toBe(1.0);
    expect(() => codingProfile('ldpc')).toThrow(/name = "ldpc" is outside uncoded, conv-r1\/2-k7, rs-conv/);
  });
});

describe('DVB-S2 modes (ETSI EN 302 307-1 Table 13, from memory)', () => {
  it('has 28 modes sorted by required Es/N0', () => {
    expect(DVBS2_MODES).toHaveLength(28);
    for (let i = 1; i < DVBS2_MODES.length; i++) expect(DVBS2_MODES[i].requiredEsN0DB).toBeGreaterThan(DVBS2_MODES[i - 1].requiredEsN0DB);
  });
  it('efficiencies equal (K_bch − 80) / (64800 / log2 M + 90) for normal frames without pilots', () => {
    // K_bch per code rate for normal frames: EN 302 307-1 Table 5a (from memory); 80-bit BBHEADER, 90-symbol PLHEADER.
    const kbch: Record<string, number> = {
      '1/4': 16008, '1/3': 21408, '2/5': 25728, '1/2': 32208, '3/5': 38688, '2/3': 43040,
      '3/4': 48408, '4/5': 51648, '5/6': 53840, '8/9': 57472, '9/10': 58192,
    };
    const bits: Record<string, number> = { QPSK: 2, '8PSK': 3, '16APSK': 4, '32APSK': 5 };
    for (const m of DVBS2_MODES) {
      const [mod, rate] = m.name.split(' ');
      const eta = (kbch[rate] - 80) / (64800 / bits[mod] + 90);
      expect(Math.abs(eta - m.efficiencyBitsPerSymbol), m.name).toBeLessThan(1e-6);
    }
  });
});

describe('selectAdaptiveMode', () => {
  it('picks the most efficient mode that fits with the margin, or −1', () => {
    const m = DVBS2_MODES;
    const name = (es: number, margin: number) => { const i = selectAdaptiveMode(m, es, margin); return i < 0 ? null : m[i].name; };
    expect(name(-5, 0)).toBeNull();
    expect(name(-2.35, 0)).toBe('QPSK 1/4');
    expect(name(-2.35, 0.01)).toBeNull();
    // At 6.3 dB both QPSK 8/9 (6.20 dB, η 1.766) and 8PSK 3/5 (5.50 dB, η 1.780) fit: the more efficient 8PSK 3/5 wins.
    expect(name(6.3, 0)).toBe('8PSK 3/5');
    expect(name(6.5, 0)).toBe('QPSK 9/10'); // η 1.789 > 1.780
    expect(name(6.3, 1)).toBe('QPSK 5/6');
    expect(name(20, 3)).toBe('32APSK 9/10');
  });
  it('does not rely on order and prefers the lower requirement on equal efficiency', () => {
    const modes = [
      { name: 'b', requiredEsN0DB: 3, efficiencyBitsPerSymbol: 1 },
      { name: 'a', requiredEsN0DB: 1, efficiencyBitsPerSymbol: 1 },
      { name: 'c', requiredEsN0DB: 8, efficiencyBitsPerSymbol: 2 },
    ];
    expect(selectAdaptiveMode(modes, 5, 0)).toBe(1);
    expect(selectAdaptiveMode(modes, 9, 0)).toBe(2);
    expect(selectAdaptiveMode([], 9, 0)).toBe(-1);
  });
});
