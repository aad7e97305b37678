/**
 * Below the lower frequency limit of ITU-R P.618-13 §2.4.1 (4 GHz, from memory)
 * the engine evaluates scintillation at 4 GHz and carries it down with the
 * model's own σ ∝ f^(7/12) law (P.618-13 §2.4.1, step for σ), instead of
 * holding the 4 GHz fade, which would over-state UHF fades by about 3.6×.
 */
import { describe, expect, it } from 'vitest';
import { createLinkEngine } from '../../src/budget/engine.js';
import { TERM } from '../../src/budget/atmosphere.js';
import { scintillationFade } from '../../src/models/index.js';
import { baseClimate, baseLink, CASES } from './fixtures.js';

describe('scintillation below 4 GHz', () => {
  it('is the 4 GHz P.618 fade scaled by (f / 4 GHz)^(7/12)', () => {
    const f = 0.4372;
    const link = baseLink({ frequencyGHz: f, ground: { ...baseLink().ground, antenna: { kind: 'cosine-power', peakGainDBi: 14, beamwidthDeg: 30 } } });
    const engine = createLinkEngine({ link, climate: baseClimate(), weatherCases: CASES });
    const el = 9;
    const ci = CASES.findIndex((c) => c.exceedancePercent !== null);
    const p = CASES[ci].exceedancePercent!;
    const d = engine.atmosphereDirect(el);
    // Equivalent aperture of a 14 dBi antenna at the 4 GHz evaluation point is the engine's choice; take it from its pattern.
    const at4 = scintillationFade({
      frequencyGHz: 4, elevationDeg: el, exceedancePercent: p,
      antennaDiameterM: engine.groundAntenna.apertureDiameterM, antennaEfficiency: engine.groundAntenna.apertureEfficiency, nWet: baseClimate().nWet,
    });
    const perCase = d.length / CASES.length;
    expect(d[ci * perCase + TERM.scintillation]).toBeCloseTo(at4 * (f / 4) ** (7 / 12), 9);
    expect(d[ci * perCase + TERM.scintillation]).toBeLessThan(0.3 * at4);
  });
});
