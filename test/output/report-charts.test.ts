/** Chart builders: scales map data to the plot area, the sky projection's orientation, envelopes, label spreading. */
import { scaleLinear, scaleLog } from 'd3-scale';
import { describe, expect, it } from 'vitest';
import { axisBottom, axisLeft } from '../../src/output/report/axis.js';
import { barGroups, barScales, BAR_FRAME } from '../../src/output/report/barChart.js';
import { decimateSeries } from '../../src/output/report/decimate.js';
import { envelopesForLink, impliedMaskDeg, marginEnvelope } from '../../src/output/report/envelope.js';
import { escapeHtml } from '../../src/output/report/escape.js';
import { formatBits } from '../../src/output/report/format.js';
import { skyPlot, skyProjection, SKY_FRAME } from '../../src/output/report/skyPlot.js';
import { plotArea, spreadLabels } from '../../src/output/report/svg.js';
import { TIME_FRAME, timeChart, timeScales } from '../../src/output/report/timeChart.js';
import type { PassSeries } from '../../src/output/report/types.js';
import { syntheticScenario } from '../browser/synthetic.js';

const labels = (svg: string) => [...svg.matchAll(/class="tick">([^<]*)</g)].map((m) => m[1]);

describe('timeScales', () => {
  it('maps AOS to the left edge and LOS to the right edge of the plot area', () => {
    const area = plotArea(TIME_FRAME); // 420×250 with margins 22/60/44/54 → x 54..360, y 22..206
    expect(area).toEqual({ x0: 54, x1: 360, y0: 22, y1: 206 });
    const { x, y } = timeScales(1000, 1600, [-2, 8, 5], 3);
    expect(x(0)).toBe(area.x0);
    expect(x(10)).toBe(area.x1);
    expect(x(5)).toBeCloseTo(207, 12);
    // [-2, 8] is already nice: -2 dB at the bottom, 8 dB at the top, 3 dB halfway.
    expect(y(-2)).toBe(206);
    expect(y(8)).toBe(22);
    expect(y(3)).toBeCloseTo(114, 12);
  });

  it('keeps the required-margin line inside the y range even when every value is above it', () => {
    const { y } = timeScales(0, 600, [5.3, 9.7], 3);
    expect(y.domain()[0]).toBeLessThanOrEqual(3);
    expect(y.domain()[1]).toBeGreaterThanOrEqual(9.7);
  });

  it('draws the required line at the scale position of the required margin', () => {
    const input = syntheticScenario();
    const p = input.passes[0];
    const s = input.series.find((x) => x.passId === p.passId && x.link === p.link) as PassSeries;
    const svg = timeChart(s, p, 'margin', 3, 't');
    const { y } = timeScales(p.aosS, p.losS, s.cases.flatMap((c) => c.marginDB), 3);
    const m = /<line class="required" x1="[\d.]+" x2="[\d.]+" y1="([\d.]+)"/.exec(svg);
    expect(Number(m?.[1])).toBeCloseTo(y(3), 1);
    expect((svg.match(/class="series"/g) ?? []).length).toBe(3);
    expect(svg).toContain('>required 3 dB<');
  });
});

describe('skyProjection', () => {
  const p = skyProjection(SKY_FRAME); // 250×250, margins 24 → centre (125,125), radius 101

  it('puts elevation 90° at the centre and 0° on the rim', () => {
    expect(p.cx).toBe(125);
    expect(p.cy).toBe(125);
    expect(p.radius).toBe(101);
    for (const az of [0, 77, 200]) {
      const [x, y] = p.xy(az, 90);
      expect(x).toBeCloseTo(125, 12);
      expect(y).toBeCloseTo(125, 12);
    }
    expect(p.r(0)).toBe(101);
    expect(p.r(45)).toBeCloseTo(50.5, 12);
  });

  it('puts north at the top, east (azimuth 90°) to the right, south at the bottom, west to the left', () => {
    const close = (a: [number, number], b: [number, number]) => { expect(a[0]).toBeCloseTo(b[0], 9); expect(a[1]).toBeCloseTo(b[1], 9); };
    close(p.xy(0, 0), [125, 24]);
    close(p.xy(90, 0), [226, 125]);
    close(p.xy(180, 45), [125, 175.5]);
    close(p.xy(270, 30), [125 - 101 * (60 / 90), 125]);
    // 45° azimuth at 0° elevation: up and to the right on the diagonal.
    close(p.xy(45, 0), [125 + 101 * Math.SQRT1_2, 125 - 101 * Math.SQRT1_2]);
  });

  it('clamps negative elevations to the rim', () => {
    expect(p.r(-5)).toBe(101);
  });

  it('draws the mask, the track with AOS/LOS marks and escapes the title', () => {
    const svg = skyPlot('<b>sky</b>', { azimuthDeg: [90, 120, 180], elevationDeg: [0, 45, 10] }, [[0, 5], [360, 5]]);
    expect(svg).toContain('class="mask-ground"');
    expect(svg).toContain('>AOS<');
    expect(svg).toContain('<title>&lt;b&gt;sky&lt;/b&gt;</title>');
    // The track path starts at the AOS point (east rim).
    expect(svg).toMatch(/<path d="M226,125L/);
  });
});

describe('axes come from the scale ticks and tick formats', () => {
  const area = { x0: 0, x1: 100, y0: 0, y1: 100 };
  it('labels a linear axis with scale.ticks()', () => {
    const s = scaleLinear().domain([0, 10]).range([0, 100]);
    expect(labels(axisBottom(s, area, { label: 'x (km)' }))).toEqual(s.ticks(6).map(s.tickFormat(6)));
    expect(labels(axisBottom(s, area, { label: 'x (km)' }))).toEqual(['0', '2', '4', '6', '8', '10']);
  });
  it('uses SI prefixes for volumes (d3 tickFormat keeps one prefix across the axis)', () => {
    const s = scaleLinear().domain([0, 3e9]).range([100, 0]);
    expect(labels(axisLeft(s, area, { label: 'volume (bit)', specifier: '~s' }))).toEqual(['0G', '0.5G', '1G', '1.5G', '2G', '2.5G', '3G']);
  });
  it('labels a log axis for bit rates', () => {
    const s = scaleLog().domain([1200, 76800]).range([0, 100]);
    const l = labels(axisBottom(s, area, { label: 'bit rate (bit/s)', specifier: '~s', ticks: 5 }));
    expect(l).toContain('2k');
    expect(l).toContain('10k');
  });
});

describe('bar chart scales', () => {
  it('puts zero volume on the bottom of the plot and the days left to right', () => {
    const input = syntheticScenario();
    const keys = ['Kaldfjell', 'Pico Verde', 'Maraka', '(network)'];
    const groups = barGroups(input.daily.filter((r) => r.link === 's-band' && r.weather === 'clear'), keys);
    expect(groups.map((g) => g.day)).toEqual(['2031-06-01', '2031-06-02']);
    const net = groups[0].values[3].bits;
    expect(net).toBeCloseTo(groups[0].values.slice(0, 3).reduce((a, v) => a + v.bits, 0), 0);
    const { x, y, inner } = barScales(groups, keys);
    const area = plotArea(BAR_FRAME);
    expect(y(0)).toBe(area.y1);
    expect(y.domain()[1]).toBeGreaterThanOrEqual(net);
    expect((x('2031-06-01') as number) < (x('2031-06-02') as number)).toBe(true);
    expect((inner('Kaldfjell') as number) < (inner('(network)') as number)).toBe(true);
  });
});

describe('margin envelope', () => {
  it('takes the lowest and highest margin per 2° bin', () => {
    const env = marginEnvelope([1, 1.5, 3, 3.9, 10.2, 89.9], [-1, 2, 4, 3, 8, 12]);
    expect(env).toEqual([
      { elevationDeg: 1, minDB: -1, maxDB: 2 },
      { elevationDeg: 3, minDB: 3, maxDB: 4 },
      { elevationDeg: 11, minDB: 8, maxDB: 8 },
      { elevationDeg: 89, minDB: 12, maxDB: 12 },
    ]);
  });
  it('ignores NaN samples', () => {
    expect(marginEnvelope([5, NaN, 5], [1, 2, NaN])).toEqual([{ elevationDeg: 5, minDB: 1, maxDB: 1 }]);
  });
  it('reads the implied mask: lowest bin start above which every bin meets the requirement', () => {
    const env = marginEnvelope([1, 3, 5, 7, 9], [0, 4, 2.5, 3.5, 6]);
    expect(impliedMaskDeg(env, 3)).toBe(6);
    expect(impliedMaskDeg(env, 0)).toBe(0);
    expect(impliedMaskDeg(env, 7)).toBeNull();
  });
  it('pools every pass of a link per case: the lowest margin grows with elevation in the synthetic scenario', () => {
    const input = syntheticScenario();
    const envs = envelopesForLink(input.series.filter((s) => s.link === 'x-band'), ['clear', 'p0.1']);
    const clear = envs[0].bins;
    expect(clear[0].minDB).toBeLessThan(clear[clear.length - 1].minDB);
    // Rain only lowers the margin: p0.1 never above clear in the same bin.
    for (const b of envs[1].bins) {
      const c = clear.find((k) => k.elevationDeg === b.elevationDeg);
      if (c) expect(b.minDB).toBeLessThanOrEqual(c.minDB);
    }
  });
});

describe('small helpers', () => {
  it('spreads labels at least `gap` apart inside the bounds, keeping order', () => {
    const y = spreadLabels([100, 101, 99, 300], 11, 0, 200);
    const sorted = [y[2], y[0], y[1]];
    expect(sorted[1] - sorted[0]).toBeGreaterThanOrEqual(11);
    expect(sorted[2] - sorted[1]).toBeGreaterThanOrEqual(11);
    expect(y[3]).toBe(200);
    expect(spreadLabels([50], 11, 0, 200)).toEqual([50]);
  });
  it('decimates a long series to the limit, keeping the first and last sample', () => {
    const n = 1000;
    const a = Array.from({ length: n }, (_, i) => i);
    const s: PassSeries = { passId: 'p', link: 'l', timeS: a, azimuthDeg: a, elevationDeg: a, cases: [{ weather: 'clear', marginDB: a, ebN0DB: a }] };
    const d = decimateSeries(s, 300);
    expect(d.timeS.length).toBe(300);
    expect(d.timeS[0]).toBe(0);
    expect(d.timeS[299]).toBe(999);
    expect(d.cases[0].marginDB).toEqual(d.timeS);
    expect(decimateSeries(s, 2000)).toBe(s);
  });
  it('escapes the five XML-significant characters', () => {
    expect(escapeHtml(`<script>alert(1)</script> & "quotes" 'x'`)).toBe('&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;quotes&quot; &#39;x&#39;');
  });
  it('formats volumes with SI prefixes', () => {
    expect(formatBits(1.234e9)).toBe('1.23 Gbit');
    expect(formatBits(4.5e5)).toBe('450 kbit');
    expect(formatBits(0)).toBe('0 bit');
    expect(formatBits(null)).toBe('–');
  });
});
