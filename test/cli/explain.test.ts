/**
 * `passbudget explain` on the invented demo scenario (ORBILUX-3 over Kaldfjell):
 * the table, the JSON record, and one-line InputErrors with exit code 2.
 * The numbers are the engine's (tested in test/budget); here we check the wiring
 * and that the JSON record and the table agree with each other.
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { main } from '../../src/cli/main.js';

const SCEN = 'fixtures/demo/scenario.yaml';
const base = ['explain', '--scenario', SCEN, '--satellite', 'ORBILUX-3', '--station', 'Kaldfjell'];

async function run(args: string[]) {
  let out = '', err = '';
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((s) => { out += String(s); return true; });
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((s) => { err += String(s); return true; });
  try {
    const code = await main(args);
    return { code, out, err };
  } finally {
    o.mockRestore(); e.mockRestore();
  }
}

afterEach(() => vi.restoreAllMocks());

describe('passbudget explain', () => {
  it('table at the TCA of pass 1', async () => {
    const r = await run([...base, '--link', 's-band', '--pass', '1', '--at-tca']);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    for (const sec of ['Geometry', 'Transmit', 'Path', 'Receive', 'Result']) expect(r.out).toMatch(new RegExp(`^${sec}`, 'm'));
    expect(r.out).toMatch(/free-space loss/);
    expect(r.out).toMatch(/pass 1 \(AOS/);
  });
  it('json at 20° on the rising side of pass 2 carries the per-step record', async () => {
    const r = await run([...base, '--link', 'x-band', '--pass', '2', '--at-elevation', '20', '--format', 'json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.link).toBe('x-band');
    expect(j.step.elevation_deg).toBeCloseTo(20, 2);
    expect(j.step.cases).toHaveLength(3);
    expect(j.step.cases[0].weather).toBe('clear');
    expect(j.pass.pass_number).toBe(2);
    // Rising side: before TCA.
    expect(j.step.time_s).toBeLessThan(Date.parse(j.pass.tca_utc) / 1000);
    expect(j.terms[0]).toHaveProperty('per_case', false);
    const cn0 = j.terms.find((t: { term: string }) => t.term === 'C/N0');
    expect(cn0.values[1]).toBe(j.step.cases[1].c_over_n0_dbhz);
  });
  it('--at an instant inside a pass finds the pass (same numbers as --pass … --at-tca)', async () => {
    const a = JSON.parse((await run([...base, '--link', 'uhf-tm', '--pass', '1', '--at-tca', '--format', 'json'])).out);
    const iso = new Date(a.step.time_s * 1000).toISOString();
    const b = JSON.parse((await run([...base, '--link', 'uhf-tm', '--at', iso, '--format', 'json'])).out);
    expect(b.pass.pass_number).toBe(1);
    expect(b.step.range_km).toBeCloseTo(a.step.range_km, 1);
    expect(b.step.cases[0].margin_db).toBeCloseTo(a.step.cases[0].margin_db, 2);
  });
  const bad: Array<[string, string[], RegExp]> = [
    ['unknown link', ['--link', 'ka-band', '--pass', '1', '--at-tca'], /^passbudget: --link: no link "ka-band" .*allowed "uhf-tm", "s-band", "x-band"/],
    ['no instant', ['--link', 'x-band'], /^passbudget: --at: no instant given/],
    ['pass out of range', ['--link', 'x-band', '--pass', '999', '--at-tca'], /^passbudget: --pass: 999 is not a pass .*allowed 1–\d+/],
    ['bad elevation', ['--link', 'x-band', '--pass', '1', '--at-elevation', 'high'], /^passbudget: --at-elevation: "high" is not an elevation/],
    ['bad format', ['--link', 'x-band', '--at', '2026-11-21T01:00:00Z', '--format', 'xml'], /^passbudget: --format: unknown format "xml"/],
    ['bad instant', ['--link', 'x-band', '--at', 'yesterday'], /^passbudget: --at: not an ISO-8601 date-time/],
  ];
  for (const [what, args, re] of bad) {
    it(`bad input: ${what} → exit 2, one line`, async () => {
      const r = await run([...base, ...args]);
      expect(r.code).toBe(2);
      expect(r.out).toBe('');
      expect(r.err).toMatch(re);
      expect(r.err.trim().split('\n')).toHaveLength(1);
    });
  }
});
