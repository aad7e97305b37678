/**
 * Before a run: can SGP4 carry this element set across the window? Sampled at
 * 65 instants from start to end; an SGP4 error, a non-finite state or a
 * position further than 10^7 km from the Earth's centre (far beyond any orbit
 * SGP4 models; drag terms out of range produce such states without an error)
 * is reported as one phrase, so the loader can refuse with its location
 * before any output is touched.
 */
import type { ElementSet } from '../elements/types.js';
import { formatIsoUtc } from '../orbit/time.js';
import { createPropagator } from '../orbit/propagator.js';
import { InputError } from '../errors.js';

export const MAX_RADIUS_KM = 1e7;
const SAMPLES = 64;

/** null when SGP4 propagates `elements` over [startS, endS], else what went wrong. */
export function propagationProblem(elements: ElementSet, startS: number, endS: number): string | null {
  const r = new Float64Array(3);
  const v = new Float64Array(3);
  let p;
  try {
    p = createPropagator(elements);
  } catch (e) {
    if (e instanceof InputError) return e.message;
    throw e;
  }
  for (let k = 0; k <= SAMPLES; k++) {
    const t = startS + ((endS - startS) * k) / SAMPLES;
    try {
      p.stateTeme(t, r, v);
    } catch (e) {
      if (e instanceof InputError) return e.message;
      throw e;
    }
    const radius = Math.hypot(r[0], r[1], r[2]);
    if (![r[0], r[1], r[2], v[0], v[1], v[2]].every(Number.isFinite)) return `SGP4 gives no finite position at ${formatIsoUtc(t)}`;
    if (radius > MAX_RADIUS_KM) return `SGP4 puts it ${radius.toExponential(2)} km from the Earth at ${formatIsoUtc(t)} (beyond ${MAX_RADIUS_KM.toExponential(0)} km: the elements or drag terms are out of range)`;
  }
  return null;
}
