/**
 * The series palette stays apart in lightness and under simulated
 * deuteranopia. Colour science: sRGB linearisation per IEC 61966-2-1,
 * CIE 1976 L*a*b* with the D65 white, ΔE*ab (CIE76). Deuteranopia by the
 * severity-1.0 matrix of Machado, Oliveira & Fernandes, "A physiologically-based
 * model for simulation of color vision deficiency", IEEE TVCG 15(6), 2009
 * (matrix values from memory).
 */
import { describe, expect, it } from 'vitest';
import { SERIES_COLOURS, SERIES_TEXT_COLOURS } from '../../src/output/report/palette.js';

const toLinear = (c: number) => { const v = c / 255; return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4; };
const toGamma = (v: number) => { const c = Math.min(1, Math.max(0, v)); return 255 * (c <= 0.0031308 ? 12.92 * c : 1.055 * c ** (1 / 2.4) - 0.055); };
const hex = (h: string) => [1, 3, 5].map((i) => parseInt(h.slice(i, i + 2), 16));

function lab(rgb: number[]): [number, number, number] {
  const [r, g, b] = rgb.map(toLinear);
  const X = 0.4124 * r + 0.3576 * g + 0.1805 * b;
  const Y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const Z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
  const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : (24389 / 27 * t + 16) / 116);
  const fx = f(X / 0.95047); const fy = f(Y); const fz = f(Z / 1.08883);
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

// Machado et al. 2009, deuteranopia, severity 1.0 (from memory), applied to linear RGB.
const DEUTAN = [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.01182, 0.04294, 0.968881]];
const deutan = (rgb: number[]) => { const l = rgb.map(toLinear); return DEUTAN.map((row) => toGamma(row[0] * l[0] + row[1] * l[1] + row[2] * l[2])); };
const dE = (a: number[], b: number[]) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

/** WCAG 2.x relative luminance contrast ratio against white. */
const contrastOnWhite = (h: string) => { const [r, g, b] = hex(h).map(toLinear); return 1.05 / (0.2126 * r + 0.7152 * g + 0.0722 * b + 0.05); };

describe('colour science helpers', () => {
  it('reproduce known L* values', () => {
    expect(lab([255, 255, 255])[0]).toBeCloseTo(100, 2);
    expect(lab([0, 0, 0])[0]).toBeCloseTo(0, 6);
    // sRGB grey 119 has L* ≈ 50.0 (from memory; follows from the sRGB curve: 0.1845^(1/3)·116 − 16).
    expect(lab([119, 119, 119])[0]).toBeCloseTo(50.0, 0);
  });
  it('leave greys unchanged under the deuteranopia matrix (its rows sum to 1)', () => {
    for (const row of DEUTAN) expect(row[0] + row[1] + row[2]).toBeCloseTo(1, 5);
    const g = deutan([128, 128, 128]);
    for (const c of g) expect(c).toBeCloseTo(128, 0);
  });
});

describe('series palette', () => {
  const L = SERIES_COLOURS.map((c) => lab(hex(c))[0]);

  it('is ordered by lightness with at least 15 L* between neighbours', () => {
    for (let i = 1; i < L.length; i++) expect(L[i] - L[i - 1]).toBeGreaterThanOrEqual(15);
  });

  it('stays distinguishable under simulated deuteranopia (ΔE*ab ≥ 30 for every pair)', () => {
    const sim = SERIES_COLOURS.map((c) => lab(deutan(hex(c))));
    for (let i = 0; i < sim.length; i++) for (let j = i + 1; j < sim.length; j++) expect(dE(sim[i], sim[j])).toBeGreaterThanOrEqual(30);
  });

  it('has label colours readable as small text on white (contrast ≥ 4.5, WCAG 2.x)', () => {
    for (const c of SERIES_TEXT_COLOURS) expect(contrastOnWhite(c)).toBeGreaterThanOrEqual(4.5);
  });
});
