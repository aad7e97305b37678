/**
 * Antenna patterns as the engine uses them: one precomputed evaluator per
 * antenna (gain against off-boresight angle), built once per link. Every gain
 * comes from a model in src/models (antenna.ts); nothing is re-derived here.
 * The evaluators reuse one argument object each, so a call does not allocate.
 */
import {
  cosinePowerExponent, cosinePowerGainColumnDBi, cosinePowerGainDBi, cosinePowerGainPairColumnDBi, parabolicBeamwidthDeg, parabolicGainAtDBi, parabolicGainColumnDBi,
  parabolicGainDBi, tabulatedGainDBi, validateGainTable,
} from '../models/index.js';
import { InputError } from '../errors.js';
import type { AntennaSpec } from './types.js';

/** Efficiency assumed for an equivalent aperture of a non-dish antenna (our choice, stated in the docs). */
export const EQUIVALENT_APERTURE_EFFICIENCY = 0.5;

const C_M_S = 299_792_458;

export interface AntennaPattern {
  kind: AntennaSpec['kind'];
  /** Boresight (peak) gain, dBi. */
  peakGainDBi: number;
  /** Half-power beamwidth (deg), NaN for isotropic. */
  beamwidthDeg: number;
  /** Gain at an off-boresight angle (deg), dBi. */
  gainAtDBi(offBoresightDeg: number): number;
  /**
   * gainAtDBi(off[i] + addDeg) for i < n into out: the loop inside each
   * pattern, so each calls its model directly (a per-step call through
   * `gainAtDBi` costs a dynamic dispatch and a boxed result).
   */
  gainColumnDBi(off: Float64Array, addDeg: number, n: number, out: Float64Array): void;
  /** gainColumnDBi(off, 0, …) into gain and gainColumnDBi(off, addDeg, …) into gainPlus, in one pass where the pattern allows. */
  gainPairColumnDBi(off: Float64Array, addDeg: number, n: number, gain: Float64Array, gainPlus: Float64Array): void;
  /** Model name for explain/provenance. */
  source: string;
  /**
   * Aperture diameter (m) and efficiency for aperture averaging of scintillation:
   * the dish's own for a parabolic antenna, otherwise the equivalent aperture
   * D = (λ/π)·sqrt(G/η) with η = 0.5 (from G = η (π D/λ)²).
   */
  apertureDiameterM: number;
  apertureEfficiency: number;
}

/**
 * Build the evaluator for one antenna at the link frequency. Model range errors
 * (a zero diameter, a malformed table) become an InputError naming `where`.
 */
export function antennaPattern(spec: AntennaSpec, frequencyGHz: number, where = 'antenna'): AntennaPattern {
  try {
    const p = buildPattern(spec, frequencyGHz);
    return p.gainPairColumnDBi ? p as AntennaPattern : {
      ...p,
      gainPairColumnDBi: (off, add, n, gain, plus) => { p.gainColumnDBi(off, 0, n, gain); p.gainColumnDBi(off, add, n, plus); },
    };
  } catch (err) {
    if (err instanceof RangeError) throw new InputError(`${where}: ${err.message}`);
    throw err;
  }
}

function buildPattern(spec: AntennaSpec, frequencyGHz: number): Omit<AntennaPattern, 'gainPairColumnDBi'> & Partial<Pick<AntennaPattern, 'gainPairColumnDBi'>> {
  const lambdaM = C_M_S / (frequencyGHz * 1e9);
  const equivalent = (peakDBi: number) => ({
    apertureDiameterM: (lambdaM / Math.PI) * Math.sqrt(10 ** (peakDBi / 10) / EQUIVALENT_APERTURE_EFFICIENCY),
    apertureEfficiency: EQUIVALENT_APERTURE_EFFICIENCY,
  });
  switch (spec.kind) {
    case 'isotropic': {
      const g = spec.gainDBi ?? 0;
      return {
        kind: spec.kind, peakGainDBi: g, beamwidthDeg: NaN, gainAtDBi: () => g,
        gainColumnDBi: (_off, _add, n, out) => { out.fill(g, 0, n); },
        source: 'isotropic (constant gain)', ...equivalent(g),
      };
    }
    case 'parabolic': {
      const peak = parabolicGainDBi({ diameterM: spec.diameterM, frequencyGHz, efficiency: spec.efficiency });
      const bw = parabolicBeamwidthDeg({ diameterM: spec.diameterM, frequencyGHz });
      const args = { diameterM: spec.diameterM, frequencyGHz, efficiency: spec.efficiency, offBoresightDeg: 0 };
      return {
        kind: spec.kind, peakGainDBi: peak, beamwidthDeg: bw,
        gainAtDBi: (off) => { args.offBoresightDeg = off; return parabolicGainAtDBi(args); },
        gainColumnDBi: (off, add, n, out) => parabolicGainColumnDBi(args, off, add, n, out),
        source: 'dish G = η(πD/λ)², θ3dB ≈ 70λ/D, main lobe 12(θ/θ3dB)²',
        apertureDiameterM: spec.diameterM, apertureEfficiency: spec.efficiency,
      };
    }
    case 'cosine-power': {
      const n = cosinePowerExponent({ beamwidthDeg: spec.beamwidthDeg });
      const args = { peakGainDBi: spec.peakGainDBi, exponent: n, offBoresightDeg: 0, floorGainDBi: spec.floorGainDBi };
      return {
        kind: spec.kind, peakGainDBi: spec.peakGainDBi, beamwidthDeg: spec.beamwidthDeg,
        gainAtDBi: (off) => { args.offBoresightDeg = off; return cosinePowerGainDBi(args); },
        gainColumnDBi: (off, add, n, out) => cosinePowerGainColumnDBi(args, off, add, n, out),
        gainPairColumnDBi: (off, add, n, gain, plus) => cosinePowerGainPairColumnDBi(args, off, add, n, gain, plus),
        source: `G0 + 10 log10(cos^n θ), n = ${n.toFixed(3)} from θ3dB`, ...equivalent(spec.peakGainDBi),
      };
    }
    case 'table': {
      const t = { offBoresightDeg: spec.offBoresightDeg, gainDBi: spec.gainDBi };
      validateGainTable(t);
      // Boresight gain is the table at 0° (pointing losses are measured from it).
      const peak = tabulatedGainDBi(t, 0);
      return {
        kind: spec.kind, peakGainDBi: peak, beamwidthDeg: NaN,
        gainAtDBi: (off) => tabulatedGainDBi(t, off),
        gainColumnDBi: (off, add, n, out) => { for (let i = 0; i < n; i++) out[i] = tabulatedGainDBi(t, off[i] + add); },
        source: 'tabulated pattern, linear in dB', ...equivalent(peak),
      };
    }
  }
}
