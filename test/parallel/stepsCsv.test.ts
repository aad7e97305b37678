/**
 * The fast steps.csv formatter (src/jobs/workerStepsCsv.ts) against the
 * general path it replaces, as the reference: `fmt` (Number.prototype.toFixed,
 * ECMA-262 §21.1.3.3), `formatIsoUtc` (Date.prototype.toISOString) and
 * csv-stringify 6.9 with the options CsvStreamWriter uses (RFC 4180 quoting).
 * Equality is exact (byte for byte): the formatter claims to be a faster way
 * of writing the same bytes, nothing looser.
 */
import { describe, expect, it } from 'vitest';
import { runPipeline, type StepEvent } from '../../src/analysis/pipeline.js';
import { copyStepBudget } from '../../src/budget/columns.js';
import { stepColumns, stepRow } from '../../src/jobs/outputs.js';
import { createStepsCsvFormatter, csvField, fixedDecimal, isoUtcMillis, putFixed, putIso } from '../../src/jobs/workerStepsCsv.js';
import { formatIsoUtc } from '../../src/orbit/time.js';
import { csvText, fmt, type CsvCell } from '../../src/output/csv.js';
import { smallScenario } from './scenario.js';

/** Deterministic pseudo-random numbers (mulberry32), so a failure reproduces. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe('fixedDecimal equals fmt (toFixed)', () => {
  it('on decimal ties, signed zeros, non-finite values and the 1e9 switch-over', () => {
    const edge = [0, -0, 0.5, 1.5, 2.5, -2.5, 1.0005, 1.0015, 2.675, 0.0005, -0.0005, -0.0004, 0.00049999, 1.005, 8.345,
      123.4565, 999.9995, 999999.9995, 1e6 - 0.0005, 999_999.9994, 1e9, 1e9 - 0.5, 4.35, 0.045, -1e-12, 1e21, -1e21,
      NaN, Infinity, -Infinity, Number.MAX_VALUE, Number.MIN_VALUE, 2 ** 53, -(2 ** 31)];
    for (const v of edge) for (const d of [0, 1, 2, 3]) expect(fixedDecimal(v, d), `${v} to ${d}`).toBe(fmt(v, d));
    // The byte writer (putFixed) writes the same characters.
    const b = new Uint8Array(64);
    for (const v of edge) for (const d of [0, 1, 2, 3]) expect(Buffer.from(b.subarray(0, putFixed(b, 0, v, d))).toString('latin1'), `${v} to ${d}`).toBe(fmt(v, d));
  });
  it('on 400 000 random values over the ranges steps.csv holds', () => {
    const r = rng(20261121);
    const buf = new Uint8Array(64);
    let mismatches = 0;
    for (let i = 0; i < 100_000; i++) {
      const mag = 10 ** (r() * 12 - 4); // 1e-4 .. 1e8
      const v = (r() < 0.3 ? -1 : 1) * mag;
      // Values on a decimal grid hit toFixed's tie rule hardest.
      const grid = Math.round(v * 1e4) / 1e4;
      for (const d of [0, 1, 2, 3]) {
        if (fixedDecimal(v, d) !== fmt(v, d)) mismatches++;
        if (fixedDecimal(grid, d) !== fmt(grid, d)) mismatches++;
        if (Buffer.from(buf.subarray(0, putFixed(buf, 0, grid, d))).toString('latin1') !== fmt(grid, d)) mismatches++;
      }
    }
    expect(mismatches).toBe(0);
  });
});

describe('isoUtcMillis equals formatIsoUtc (Date.toISOString)', () => {
  it('on rounding to the next second, minute, day and year, and on random instants', () => {
    const edge = [0, 59.9996, 59.9994, 86_399.9995, 86_399.9994, 1_798_761_599.9996, 1_795_305_600, -0.0004, -86_400.5, 951_782_400.25];
    const b = new Uint8Array(32);
    for (const t of edge) {
      expect(isoUtcMillis(t), String(t)).toBe(formatIsoUtc(t));
      expect(Buffer.from(b.subarray(0, putIso(b, 0, t))).toString('latin1'), String(t)).toBe(formatIsoUtc(t));
    }
    const r = rng(7);
    for (let i = 0; i < 50_000; i++) {
      const t = 1.6e9 + r() * 4e8 + (r() < 0.5 ? Math.round(r() * 1000) / 1000 : r());
      const a = isoUtcMillis(t);
      if (a !== formatIsoUtc(t)) expect(a, String(t)).toBe(formatIsoUtc(t));
      const bytes = Buffer.from(b.subarray(0, putIso(b, 0, t))).toString('latin1');
      if (bytes !== a) expect(bytes, String(t)).toBe(a);
    }
  });
});

describe('csvField quotes as csv-stringify does', () => {
  it('for delimiters, quotes, CR, LF, non-ASCII and plain text', async () => {
    const cells = ['plain', 'a,b', 'say "hi"', 'line\nbreak', 'cr\rhere', '', 'Ünïcødé-站', '"', ',', ' spaced ', "it's", 'tab\there'];
    const ours = `${cells.map(csvField).join(',')}\n`;
    expect(ours).toBe(await csvText(cells.map((_, i) => `c${i}`), [cells]).then((t) => t.slice(t.indexOf('\n') + 1)));
  });
});

describe('steps.csv rows', () => {
  it('equal stepRow + csv-stringify on the first 4000 steps of a real run, and with hostile names', async () => {
    const scenario = smallScenario(1);
    const fmtr = createStepsCsvFormatter(scenario.weatherCases);
    const cols = stepColumns(scenario.weatherCases);
    const events: StepEvent[] = [];
    await runPipeline({
      scenario,
      onStep: (e) => { if (events.length < 4000) events.push({ ...e, step: copyStepBudget(e.step) }); },
    });
    expect(events.length).toBe(4000);
    // Names the demo does not have: a comma, a quote, a newline, non-ASCII; a mode with a comma.
    const hostile = events.slice(0, 50).map((e, i) => {
      const step = copyStepBudget(e.step);
      step.cases[0].mode = i % 2 ? 'QPSK 1/2, "short"' : step.cases[0].mode;
      return { ...e, passId: 'SAT,1/"Hill"\nTop/3', station: 'Hügel "Nord", Süd', satellite: 'ÄSAT-1', step };
    });
    const all = [...events, ...hostile];
    const reference = await csvText(cols, all.map((e) => stepRow(e, []) as CsvCell[]));
    const ours = fmtr.header + all.map((e) => fmtr.row(e)).join('');
    expect(ours.length).toBe(reference.length);
    expect(ours).toBe(reference);
    // The byte path (rowInto, what the run writes): the same UTF-8 bytes, each row within its bound.
    const buf = Buffer.alloc(Buffer.byteLength(reference) + 1024);
    let off = buf.write(fmtr.header, 0, 'utf8');
    for (const e of all) {
      const before = off;
      off = fmtr.rowInto(e, buf, off);
      expect(off - before).toBeLessThanOrEqual(fmtr.rowBytesBound(e));
    }
    expect(off).toBe(Buffer.byteLength(reference));
    expect(buf.subarray(0, off).equals(Buffer.from(reference, 'utf8'))).toBe(true);
  });
});
