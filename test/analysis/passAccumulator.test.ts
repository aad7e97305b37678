import { describe, expect, it } from 'vitest';
import { createPassAccumulator } from '../../src/analysis/passAccumulator.js';
import { InputError } from '../../src/errors.js';
import { adaptiveCase, adaptiveLink, DVBS2_SUBSET, fixedCase, fixedLink, makeStep, passInfo } from './synthetic.js';

const T0 = 1_780_000_000; // 2026-05-28T20:26:40Z, an arbitrary instant

describe('createPassAccumulator, fixed-rate link', () => {
  // Margins per step for two cases; Δt uneven (10 s, last step 4 s, as a clipped LOS would give).
  const link = fixedLink(9600);
  const clear = [0.2, 1.0, 3.5, 6.0, 4.0, 0.9, 1.5];
  const rain = [-2, -1, 0.5, 2.0, 0.0, -3, -4];
  const dts = [10, 10, 10, 10, 10, 10, 4];

  function run() {
    const acc = createPassAccumulator({ link, pass: passInfo(T0, T0 + 64), weatherCases: ['clear', { name: 'rain-0.1', exceedancePercent: 0.1 }] });
    let t = T0;
    clear.forEach((m, i) => {
      acc.add(t, dts[i], 10 + i, makeStep(t, 10 + i, [fixedCase(link, 'clear', m), fixedCase(link, 'rain-0.1', rain[i])]));
      t += dts[i];
    });
    return acc.finish();
  }

  it('usable window, duration and volume equal Σ R_b Δt over usable steps', () => {
    const s = run();
    expect(s.steps).toBe(7);
    expect(s.passId).toBe('TERN-3/Gorsemoor/1');
    expect(s.link).toBe('tlm');
    const c = s.cases[0];
    // Usable (margin ≥ 1 dB): steps 1, 2, 3, 4, 6 → 10+10+10+10+4 = 44 s.
    expect(c.usableStartS).toBe(T0 + 10);
    expect(c.usableEndS).toBe(T0 + 60);
    expect(c.usableDurationS).toBe(44);
    expect(c.fixedVolumeBits).toBe(9600 * 44);
    expect(c.adaptiveVolumeBits).toBeNull();
    // Rain case: only step 3 (2.0 dB) → 10 s.
    const r = s.cases[1];
    expect(r.weather).toBe('rain-0.1');
    expect(r.usableDurationS).toBe(10);
    expect(r.usableStartS).toBe(T0 + 30);
    expect(r.usableEndS).toBe(T0 + 30);
    expect(r.fixedVolumeBits).toBe(96_000);
  });

  it('margin min, time-weighted mean and max', () => {
    const c = run().cases[0];
    expect(c.minMarginDB).toBe(0.2);
    expect(c.maxMarginDB).toBe(6.0);
    // (0.2+1+3.5+6+4+0.9)·10 + 1.5·4 = 162, over 64 s.
    expect(c.meanMarginDB).toBeCloseTo(162 / 64, 12);
  });

  it('verdicts: 44 s of 64 s is ≥ 50 % but < 60 s → marginal; rain 10 s → marginal', () => {
    const s = run();
    expect(s.cases[0].verdict).toBe('marginal');
    expect(s.cases[0].verdictRule).toContain('60 s');
    expect(s.cases[0].verdictRule).toContain('50 %');
    expect(s.cases[1].verdict).toBe('marginal');
  });

  it('a pass with no usable step is unusable; one with no steps has NaN margins', () => {
    const acc = createPassAccumulator({ link, pass: passInfo(T0, T0 + 20), weatherCases: ['clear'] });
    acc.add(T0, 10, 5, makeStep(T0, 5, [fixedCase(link, 'clear', -1)]));
    acc.add(T0 + 10, 10, 6, makeStep(T0 + 10, 6, [fixedCase(link, 'clear', 0.99)]));
    const c = acc.finish().cases[0];
    expect(c.verdict).toBe('unusable');
    expect(c.usableStartS).toBeNull();
    expect(c.fixedVolumeBits).toBe(0);
    const empty = createPassAccumulator({ link, pass: passInfo(T0, T0 + 20), weatherCases: ['clear'] }).finish();
    expect(empty.steps).toBe(0);
    expect(empty.cases[0].meanMarginDB).toBeNaN();
    expect(empty.cases[0].verdict).toBe('unusable');
  });

  it('finds cases by name whatever their order in the step, and rejects a missing case', () => {
    const acc = createPassAccumulator({ link, pass: passInfo(T0, T0 + 10), weatherCases: ['rain-0.1', 'clear'] });
    acc.add(T0, 10, 5, makeStep(T0, 5, [fixedCase(link, 'clear', 5), fixedCase(link, 'rain-0.1', -5)]));
    const s = acc.finish();
    expect(s.cases.map((c) => [c.weather, c.usableDurationS])).toEqual([['rain-0.1', 0], ['clear', 10]]);
    const bad = createPassAccumulator({ link, pass: passInfo(T0, T0 + 10), weatherCases: ['fog'] });
    expect(() => bad.add(T0, 10, 5, makeStep(T0, 5, [fixedCase(link, 'clear', 5)]))).toThrow(/fog/);
  });

  it('rejects steps out of time order and a bad verdict rule', () => {
    const acc = createPassAccumulator({ link, pass: passInfo(T0, T0 + 20), weatherCases: ['clear'] });
    acc.add(T0 + 10, 10, 5, makeStep(T0 + 10, 5, [fixedCase(link, 'clear', 5)]));
    expect(() => acc.add(T0, 10, 5, makeStep(T0, 5, [fixedCase(link, 'clear', 5)]))).toThrow(/before/);
    expect(() => createPassAccumulator({ link, pass: passInfo(T0, T0 + 20), weatherCases: ['clear'], verdictRule: { minUsableFraction: 1.5, minUsableS: 60 } }))
      .toThrow(InputError);
  });
});

describe('createPassAccumulator, adaptive link (DVB-S2 subset, PHYSICS.md §12, from memory)', () => {
  // R_s = 1 MBd, implementation loss 0.5 dB, required margin 1 dB: fit thresholds in Es/N0 are
  // QPSK 1/2 2.50 dB, 16APSK 3/4 11.71 dB, 8PSK 8/9 12.19 dB.
  const link = adaptiveLink(1e6);
  const es = [3, 3, 12, 12, 12.5, 12.5, 3, 3, 2, 2];

  function run() {
    const acc = createPassAccumulator({ link, pass: passInfo(T0, T0 + 100), weatherCases: ['clear'] });
    es.forEach((e, i) => {
      const t = T0 + 10 * i;
      acc.add(t, 10, 20, makeStep(t, 20, [adaptiveCase(link, 'clear', e)]));
    });
    return acc.finish().cases[0];
  }

  it('fixed volume is the best single mode over the pass, tracking every mode', () => {
    // Hand count: QPSK 1/2 fits 8 steps → 0.988858e6 × 80 = 79.10864e6 bits;
    // 16APSK 3/4 fits 4 steps → 2.966728e6 × 40 = 118.66912e6 bits (best);
    // 8PSK 8/9 fits 2 steps → 2.646012e6 × 20 = 52.92024e6 bits.
    expect(run().fixedVolumeBits).toBeCloseTo(118.66912e6, 3);
  });

  it('adaptive volume is Σ R_s η Δt of the mode used at each step', () => {
    // 4 steps QPSK 1/2 + 4 steps 16APSK 3/4 (more efficient than 8PSK 8/9 even where both fit).
    expect(run().adaptiveVolumeBits).toBeCloseTo((4 * 0.988858e6 + 4 * 2.966728e6) * 10, 3);
  });

  it('usable time counts steps where some mode fits; 80 s of 100 s → usable', () => {
    const c = run();
    expect(c.usableDurationS).toBe(80);
    expect(c.verdict).toBe('usable');
  });

  it('agrees with a brute-force best mode on random Es/N0 samples', () => {
    let seed = 7;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    const acc = createPassAccumulator({ link, pass: passInfo(T0, T0 + 3000), weatherCases: ['clear'] });
    const samples: { es: number; dt: number }[] = [];
    for (let i = 0; i < 300; i++) {
      const e = -1 + 16 * rnd();
      const dt = 5 + 10 * rnd();
      samples.push({ es: e, dt });
      acc.add(T0 + 10 * i, dt, 30, makeStep(T0 + 10 * i, 30, [adaptiveCase(link, 'clear', e)]));
    }
    const brute = Math.max(...DVBS2_SUBSET.map((m) => 1e6 * m.efficiencyBitsPerSymbol *
      samples.filter((s) => s.es - 0.5 >= m.requiredEsN0DB + 1).reduce((a, s) => a + s.dt, 0)));
    expect(acc.finish().cases[0].fixedVolumeBits).toBeCloseTo(brute, 0);
  });
});
