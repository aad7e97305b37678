/**
 * Element age and the Sun through a whole run (the demo cut to one day;
 * invented satellite and stations): AOS/LOS uncertainty against an
 * independent ground-track speed, age 0 with no error against a run
 * without the term, the element-age curve's shape.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { eciToGeodetic, gstime, propagate, twoline2satrec } from 'satellite.js';
import { loadScenario } from '../../src/scenario/index.js';
import { runPipeline } from '../../src/sweep/pipeline.js';
import { elementAges, withElementAge } from '../../src/jobs/age.js';
import { sunWarning } from '../../src/jobs/run.js';
import type { ResolvedScenario } from '../../src/scenario/types.js';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { removeTempDirs, runCli, tempDir, writeDemoCopy } from './helpers.js';

afterAll(removeTempDirs);
const scenario = loadScenario(writeDemoCopy(tempDir('effects'), '1d'));

/** WGS-84 surface point (km) below a geodetic latitude/longitude (rad). */
function surface(lat: number, lon: number): number[] {
  const a = 6378.137, e2 = 6.69437999014e-3;
  const n = a / Math.sqrt(1 - e2 * Math.sin(lat) ** 2);
  return [n * Math.cos(lat) * Math.cos(lon), n * Math.cos(lat) * Math.sin(lon), n * (1 - e2) * Math.sin(lat)];
}

describe('element-set error through a run', () => {
  it('AOS/LOS uncertainty = along-track error / ground-track speed within 1 % (speed from sub-satellite points 1 s apart, satellite.js)', async () => {
    const p = await runPipeline({ scenario });
    const el = scenario.satellites[0].elements;
    const rec = twoline2satrec(el.tleLines![0], el.tleLines![1]);
    const rows = p.passLinks.toArray().filter((r) => r.link === 'x-band');
    expect(rows.length).toBeGreaterThan(5);
    for (const r of rows) {
      const sub = (t: number) => {
        const d = new Date(t * 1000);
        const pv = propagate(rec, d);
        const g = eciToGeodetic(pv!.position as { x: number; y: number; z: number }, gstime(d));
        return surface(g.latitude, g.longitude);
      };
      const a = sub(r.tcaS - 0.5), b = sub(r.tcaS + 0.5);
      const speed = Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
      const ee = scenario.satellites[0].elementError!;
      const along = ee.atEpochKm + ee.alongTrackKmPerDay * Math.abs((r.tcaS - ee.epochS) / 86_400);
      expect(Math.abs(r.timingUncertaintyS / (along / speed) - 1), r.passId).toBeLessThan(0.01);
    }
  });

  it('element age 0 with no error at epoch, and no Sun, gives the results of a run without either, exactly', async () => {
    const none: ResolvedScenario = { ...scenario, sun: null, satellites: scenario.satellites.map((s) => ({ ...s, elementError: undefined })) };
    const zero: ResolvedScenario = {
      ...scenario, sun: null,
      satellites: scenario.satellites.map((s) => ({ ...s, elementError: { ...s.elementError!, atEpochKm: 0, ageDays: 0 } })),
    };
    const [a, b] = await Promise.all([runPipeline({ scenario: none }), runPipeline({ scenario: zero })]);
    const ra = a.passLinks.toArray(), rb = b.passLinks.toArray();
    expect(rb.length).toBe(ra.length);
    ra.forEach((x, i) => {
      expect(rb[i].timingUncertaintyS).toBe(0);
      expect({ ...rb[i], timingUncertaintyS: NaN }).toEqual(x);
    });
    expect(b.daily).toEqual(a.daily);
  });

  it('older elements never deliver more on the X-band dish; the S-band and UHF links barely notice', async () => {
    const vol = async (age: number, link: string) => {
      const p = await runPipeline({ scenario: withElementAge(scenario, age) });
      return p.daily.filter((d) => d.station === '(network)' && d.link === link && d.weather === 'clear')
        .reduce((t, d) => t + (d.adaptiveVolumeBits ?? d.fixedVolumeBits), 0);
    };
    const x = [];
    for (const age of [0, 4, 10]) x.push(await vol(age, 'x-band'));
    expect(x[1]).toBeLessThan(x[0]);
    expect(x[2]).toBeLessThan(x[1]);
    // A 3 m S-band dish (beamwidth ~3°) loses almost nothing at 10 days (≈ 21 km at ≥ 600 km range: < 2°, a few dB at most at low elevation).
    const s0 = await vol(0, 's-band'), s10 = await vol(10, 's-band');
    expect(s10).toBeLessThanOrEqual(s0);
    expect(s10 / s0).toBeGreaterThan(0.9);
    expect(elementAges()).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14]);
    expect(elementAges(2, 0.5)).toEqual([0, 0.5, 1, 1.5, 2]);
    expect(() => elementAges(100)).toThrow(/max-days/);
  });
});

describe('the Sun warning line', () => {
  it('is there when a pass-link was Sun-affected, absent otherwise', async () => {
    const p = await runPipeline({ scenario });
    const rows = p.passLinks.toArray();
    const line = sunWarning(rows);
    if (rows.some((r) => r.sunAffected)) expect(line).toMatch(/^Sun in the beam: \d+ pass-link/);
    else expect(line).toBeNull();
    expect(sunWarning(rows.map((r) => ({ ...r, sunAffected: false })))).toBeNull();
    const fake = { ...rows[0], sunAffected: true, maxSunLossDB: 4.2, minSunSeparationDeg: 0.1, cases: rows[0].cases.map((c) => ({ ...c, sunLostS: 12 })) };
    expect(sunWarning([fake])).toContain('worst 4.2 dB');
    expect(sunWarning([fake])).toContain('12 s unusable');
  });
});

describe('passbudget age, bad input', () => {
  it('stops with one line and exit code 2 before any file is written', async () => {
    const dir = tempDir('age-bad');
    const file = writeDemoCopy(dir, '1d');
    for (const args of [['--max-days', 'abc'], ['--max-days', '100'], ['--step-days', '0']]) {
      const r = await runCli(['age', file, '--out', path.join(dir, 'out'), ...args]);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(/--(max|step)-days/);
    }
    expect(existsSync(path.join(dir, 'out'))).toBe(false);
  });
});
