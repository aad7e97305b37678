/**
 * The fast steps.csv formatter (src/output/stepsCsv.ts) against the
 * general path it replaces, as the reference: `fmt` (Number.prototype.toFixed,
 * ECMA-262 §21.1.3.3), `formatIsoUtc` (Date.prototype.toISOString) and
 * csv-stringify 6.9 with the options CsvStreamWriter uses (RFC 4180 quoting).
 * Equality is exact (byte for byte): the formatter claims to be a faster way
 * of writing the same bytes, nothing looser.
 */
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../src/sweep/pipeline.js';
import type { StepEvent } from '../../src/sweep/types.js';
import type { StepPart } from '../../src/sweep/window.js';
import { createStepBudget } from '../../src/budget/engine.js';
import { createLinkColumns, readStep } from '../../src/budget/linkColumns.js';
import { createStationColumns } from '../../src/geometry/columns.js';
import { stepColumns, stepRow } from '../../src/jobs/outputs.js';
import { createStepsCsvFormatter, csvField, fixedDecimal, isoUtcMillis, putFixed, putIso } from '../../src/output/stepsCsv.js';
import { formatIsoUtc } from '../../src/orbit/time.js';
import { csvText, fmt, type CsvCell } from '../../src/output/csv.js';
import { smallScenario } from './scenario.js';
import { rng } from '../rng.js';


describe('fixedDecimal equals fmt (toFixed)', () => {
  it('on decimal ties, signed zeros, non-finite values and the 1e9 switch-over', () => {
    const edge = [0, -0, 0.5, 1.5, 2.5, -2.5, 1.0005, 1.0015, 2.675, 0.0005, -0.0005, -0.0004, 0.00049999, 1.005, 8.345,
      123.4565, 999.9995, 999999.9995, 1e6 - 0.0005, 999_999.9994, 1e9, 1e9 - 0.5, 4.35, 0.045, -1e-12, 1e21, -1e21,
      NaN, Infinity, -Infinity, Number.MAX_VALUE, Number.MIN_VALUE, 2 ** 53, -(2 ** 31)];
    for (const v of [...edge, 0.9999995, 0.0000005, 0.99999, 1e-7, 999.9999995]) for (const d of [0, 1, 2, 3, 4, 5, 6]) expect(fixedDecimal(v, d), `${v} to ${d}`).toBe(fmt(v, d));
    // The byte writer (putFixed) writes the same characters.
    const b = new Uint8Array(64);
    for (const v of edge) for (const d of [0, 1, 2, 3, 4, 5, 6]) expect(Buffer.from(b.subarray(0, putFixed(b, 0, v, d))).toString('latin1'), `${v} to ${d}`).toBe(fmt(v, d));
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
      // 6 decimals (closing probabilities, Mb/s): ties on a 1e-7 grid.
      const grid7 = Math.round(v * 1e7) / 1e7;
      for (const d of [4, 5, 6]) {
        if (fixedDecimal(v, d) !== fmt(v, d)) mismatches++;
        if (fixedDecimal(grid7, d) !== fmt(grid7, d)) mismatches++;
        if (Buffer.from(buf.subarray(0, putFixed(buf, 0, grid7, d))).toString('latin1') !== fmt(grid7, d)) mismatches++;
      }
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

/** A copy of entry i of a window part as a one-entry part (the sweep reuses its columns). */
function copyPart(p: StepPart, i: number): StepPart {
  const stn = createStationColumns(1);
  for (const k of Object.keys(stn) as (keyof typeof stn)[]) {
    const v = stn[k];
    if (v instanceof Float64Array) v[0] = (p.stn[k] as Float64Array)[i];
  }
  const cols = createLinkColumns(1, p.cols.cases.length);
  cols.n = 1; cols.polarisationLossDB = p.cols.polarisationLossDB; cols.otherLossesDB = p.cols.otherLossesDB;
  const copy = (dst: Record<string, unknown>, src: Record<string, unknown>) => {
    for (const k of Object.keys(dst)) {
      const d = dst[k];
      if (ArrayBuffer.isView(d)) (d as unknown as number[])[0] = (src[k] as unknown as number[])[i];
    }
  };
  copy(cols as unknown as Record<string, unknown>, p.cols as unknown as Record<string, unknown>);
  cols.cases.forEach((c, j) => copy(c as unknown as Record<string, unknown>, p.cols.cases[j] as unknown as Record<string, unknown>));
  return { ...p, k0: 0, n: 1, stn, cols };
}

describe('steps.csv rows', () => {
  it('equal stepRow + csv-stringify on the first 4000 steps of a real run, and with hostile names', async () => {
    const scenario = smallScenario(1);
    const fmtr = createStepsCsvFormatter(scenario.weatherCases);
    const cols = stepColumns(scenario.weatherCases);
    const rows: { part: StepPart; timeS: number }[] = [];
    await runPipeline({
      scenario,
      onWindow: (w) => {
        for (let k = w.k0; k < w.k1; k++) {
          for (const p of w.parts) {
            const i = k - p.k0;
            if (i >= 0 && i < p.n && rows.length < 4000) rows.push({ part: copyPart(p, i), timeS: w.startS + k * w.stepS });
          }
        }
      },
    });
    expect(rows.length).toBe(4000);
    // Names the demo does not have: a comma, a quote, a newline, non-ASCII; a mode with a comma.
    const hostile = rows.slice(0, 50).map((r, i) => ({
      timeS: r.timeS,
      part: {
        ...r.part, passId: 'SAT,1/"Hill"\nTop/3', station: 'Hügel "Nord", Süd', satellite: 'ÄSAT-1',
        modeNames: i % 2 ? r.part.modeNames.map(() => 'QPSK 1/2, "short"') : r.part.modeNames,
      },
    }));
    const all = [...rows, ...hostile];
    // The general path: each row read back as a StepBudget record, then stepRow + csv-stringify.
    const events: StepEvent[] = all.map(({ part: p, timeS }) => ({
      passId: p.passId, satellite: p.satellite, station: p.station, link: p.link, timeS,
      step: readStep(p.stn, p.cols, 0, timeS, p.modeNames, createStepBudget(scenario.weatherCases)),
    }));
    expect(events.some((e) => e.step.cases.some((c) => c.mode !== ''))).toBe(true);
    const reference = await csvText(cols, events.map((e) => stepRow(e, []) as CsvCell[]));
    const ours = fmtr.header + all.map((r) => fmtr.row(r.part, 0, r.timeS)).join('');
    expect(ours.length).toBe(reference.length);
    expect(ours).toBe(reference);
    // The byte path (rowInto, what the run writes): the same UTF-8 bytes, each row within its bound.
    const buf = Buffer.alloc(Buffer.byteLength(reference) + 1024);
    let off = buf.write(fmtr.header, 0, 'utf8');
    for (const r of all) {
      const before = off;
      off = fmtr.rowInto(r.part, 0, r.timeS, buf, off);
      expect(off - before).toBeLessThanOrEqual(fmtr.rowBytesBound(r.part));
    }
    expect(off).toBe(Buffer.byteLength(reference));
    expect(buf.subarray(0, off).equals(Buffer.from(reference, 'utf8'))).toBe(true);
  });
});
