/**
 * The adaptive mode choice as a breakpoint table (adaptiveModeTable) equals
 * selectAdaptiveMode, the rule it tabulates, for every Es/N0: on the DVB-S2
 * table (EN 302 307-1 Table 13, from memory, as in modcod.ts, where efficiency
 * is not monotone in the requirement), with ties, at the breakpoints and
 * either side of them, for NaN and ±∞, in scalar and column form.
 */
import { describe, expect, it } from 'vitest';
import { adaptiveModeTable, DVBS2_MODES, selectAdaptiveMode, type AdaptiveMode } from '../../src/models/index.js';

const tables: [string, readonly AdaptiveMode[]][] = [
  ['DVB-S2', DVBS2_MODES],
  ['ties', [
    { name: 'a', requiredEsN0DB: 2, efficiencyBitsPerSymbol: 1 },
    { name: 'b', requiredEsN0DB: 2, efficiencyBitsPerSymbol: 1 },
    { name: 'c', requiredEsN0DB: 1, efficiencyBitsPerSymbol: 1 },
    { name: 'd', requiredEsN0DB: 5, efficiencyBitsPerSymbol: 0.5 },
    { name: 'e', requiredEsN0DB: 7, efficiencyBitsPerSymbol: 3 },
  ]],
];

describe('adaptiveModeTable equals selectAdaptiveMode', () => {
  for (const [name, modes] of tables) {
    it(`${name}: at breakpoints, beside them, random values and non-finite ones`, () => {
      for (const margin of [0, 3, -1.5]) {
        const t = adaptiveModeTable(modes, margin);
        const xs: number[] = [NaN, Infinity, -Infinity, -100, 100];
        for (const m of modes) { const b = m.requiredEsN0DB + margin; xs.push(b, b - 1e-12, b + 1e-12, b - 0.3); }
        let s = 12345;
        for (let i = 0; i < 2000; i++) { s = (Math.imul(s, 1103515245) + 12345) >>> 0; xs.push(-5 + (25 * s) / 2 ** 32); }
        for (const x of xs) expect(t.choose(x), `${x}`).toBe(selectAdaptiveMode(modes, x, margin));
        const col = Float64Array.from(xs), out = new Int16Array(xs.length);
        t.chooseColumn(col, col.length, out);
        xs.forEach((x, i) => expect(out[i], `${x}`).toBe(selectAdaptiveMode(modes, x, margin)));
        // Sorted input, as along a pass (the column form hunts from the last breakpoint).
        const sorted = Float64Array.from(xs.filter(Number.isFinite).sort((a, b) => a - b));
        const out2 = new Int16Array(sorted.length);
        t.chooseColumn(sorted, sorted.length, out2);
        sorted.forEach((x, i) => expect(out2[i]).toBe(selectAdaptiveMode(modes, x, margin)));
      }
    });
  }
});
