/**
 * Rate-limited az–el mount following a program track.
 *
 * Our model (no published source; plain kinematics): the mount is pre-positioned
 * on the target at the first step of a pass (AOS). Between two steps the target
 * moves linearly in azimuth (the short way round) and in elevation; each axis
 * moves toward the target at its maximum rate while it lags, and follows the
 * target exactly once on it, as long as the target's rate on that axis is within
 * the limit. That motion is solved exactly per axis (`followAxis`: the lag is
 * piecewise linear in time, with breaks where it closes or, in azimuth, where
 * the short way round flips at 180°), so the result does not depend on any
 * sub-step. The lag is the angle between the mount boresight and the target at
 * the step instant. State is carried across the steps of one pass; steps come
 * in time order.
 */
import { azElSeparationDeg } from './attitude.js';

/** A gap longer than this between steps re-primes the mount (a new pass). */
const MAX_GAP_S = 3600;

export interface MountState {
  primed: boolean;
  timeS: number;
  /** Mount boresight. */
  azDeg: number;
  elDeg: number;
  /** Target at the previous step. */
  targetAzDeg: number;
  targetElDeg: number;
  /** Results of the last step. */
  lagDeg: number;
  limited: boolean;
}

export function createMountState(): MountState {
  return { primed: false, timeS: NaN, azDeg: NaN, elDeg: NaN, targetAzDeg: NaN, targetElDeg: NaN, lagDeg: 0, limited: false };
}

export function resetMount(s: MountState): void {
  s.primed = false;
  s.lagDeg = 0;
  s.limited = false;
}

/** Signed shortest azimuth difference b − a in (−180, 180]. */
export function azimuthDeltaDeg(aDeg: number, bDeg: number): number {
  let d = (bDeg - aDeg) % 360;
  if (d > 180) d -= 360;
  else if (d <= -180) d += 360;
  return d;
}

function wrap360(a: number): number {
  const w = a % 360;
  return w < 0 ? w + 360 : w;
}

/**
 * Lag d = target − mount (deg) of one axis after `h` seconds, starting from
 * `d0`, with the target moving at `v` deg/s and the mount at most `limit` deg/s
 * (Infinity: unlimited). While |d| > 0 the mount runs at its limit toward the
 * target, so d changes at v − limit·sign(d); at d = 0 it follows when |v| ≤
 * limit. `wrap` (azimuth): d is the short way round, so where |d| reaches 180°
 * the mount turns to the other way. `out[0]` = lag, `out[1]` = 1 when the axis
 * was rate-bound at any time in the interval.
 */
export function followAxis(d0: number, v: number, limit: number, h: number, wrap: boolean, out: Float64Array): Float64Array {
  if (!(limit < Infinity)) { out[0] = 0; out[1] = 0; return out; }
  let d = d0;
  let rem = h;
  let limited = false;
  for (let it = 0; it < 16 && rem > 0; it++) {
    if (d === 0) {
      if (Math.abs(v) <= limit) break;
      limited = true;
      const s = v > 0 ? 1 : -1;
      const rate = v - limit * s;
      if (wrap && 180 / Math.abs(rate) < rem) { rem -= 180 / Math.abs(rate); d = -s * 180; continue; }
      d = rate * rem;
      rem = 0;
      break;
    }
    limited = true;
    const s = d > 0 ? 1 : -1;
    const rate = v - limit * s;
    if (rate * s < 0) {
      const tc = Math.abs(d) / Math.abs(rate);
      if (tc >= rem) { d += rate * rem; rem = 0; break; }
      d = 0;
      rem -= tc;
      continue;
    }
    if (wrap && rate * s > 0) {
      const tw = (180 - Math.abs(d)) / Math.abs(rate);
      if (tw < rem) { rem -= tw; d = -s * 180; continue; }
    }
    d += rate * rem;
    rem = 0;
  }
  out[0] = d;
  out[1] = limited ? 1 : 0;
  return out;
}

const axis = new Float64Array(2);
const one = { t: new Float64Array(1), az: new Float64Array(1), el: new Float64Array(1), lag: new Float64Array(1), lim: new Uint8Array(1) };

/**
 * Advance the mount to time `timeS` with the target at (azDeg, elDeg).
 * Rates ≤ 0 or non-finite mean "unlimited" on that axis. Writes lagDeg/limited into the state.
 */
export function stepMount(
  s: MountState, timeS: number, azDeg: number, elDeg: number,
  maxAzRateDegS: number, maxElRateDegS: number,
): MountState {
  one.az[0] = azDeg; one.el[0] = elDeg;
  stepMountColumn(s, timeS, 0, 0, one.az, one.el, 1, maxAzRateDegS, maxElRateDegS, one.lag, one.lim);
  return s;
}

/**
 * stepMount over a run of steps, entry i at time originS + (k0 + i)·stepS with
 * the target at (az[i], el[i]); the lag (deg) and the rate-bound flag (1/0)
 * of each step into lagOut and limitedOut (the state's lagDeg/limited are the
 * last step's). The loop holds the mount in locals: no call per step unless
 * an axis is rate-bound.
 */
export function stepMountColumn(
  s: MountState, originS: number, k0: number, stepS: number, az: Float64Array, el: Float64Array, n: number,
  maxAzRateDegS: number, maxElRateDegS: number, lagOut: Float64Array, limitedOut: Uint8Array,
): void {
  const azLimit = maxAzRateDegS > 0 && Number.isFinite(maxAzRateDegS) ? maxAzRateDegS : Infinity;
  const elLimit = maxElRateDegS > 0 && Number.isFinite(maxElRateDegS) ? maxElRateDegS : Infinity;
  for (let i = 0; i < n; i++) {
    const timeS = originS + (k0 + i) * stepS;
    const azDeg = az[i], elDeg = el[i];
    const dt = timeS - s.timeS;
    if (!s.primed || !(dt >= 0) || dt > MAX_GAP_S) {
      if (s.primed && dt < 0) {
        throw new Error(`mount: steps must be in time order within a pass (got ${timeS} after ${s.timeS}; call beginPass() first)`);
      }
      s.primed = true;
      s.timeS = timeS;
      s.azDeg = wrap360(azDeg); s.elDeg = elDeg;
      s.targetAzDeg = s.azDeg; s.targetElDeg = elDeg;
      s.lagDeg = 0; s.limited = false;
      lagOut[i] = 0; limitedOut[i] = 0;
      continue;
    }
    // Shortest azimuth difference target(prev) → target, in (−180, 180].
    let dAzTarget = (azDeg - s.targetAzDeg) % 360;
    if (dAzTarget > 180) dAzTarget -= 360; else if (dAzTarget <= -180) dAzTarget += 360;
    const dElTarget = elDeg - s.targetElDeg;
    if (dt > 0 && s.azDeg === s.targetAzDeg && s.elDeg === s.targetElDeg
      && (dAzTarget < 0 ? -dAzTarget : dAzTarget) <= azLimit * dt && (dElTarget < 0 ? -dElTarget : dElTarget) <= elLimit * dt) {
      // On target, and the target within both rates: the mount follows it exactly (followAxis with d0 = 0 and |v| ≤ limit).
      let w = azDeg % 360;
      if (w < 0) w += 360;
      s.azDeg = w; s.elDeg = elDeg;
      s.timeS = timeS;
      s.targetAzDeg = w; s.targetElDeg = elDeg;
      s.lagDeg = 0; s.limited = false;
      lagOut[i] = 0; limitedOut[i] = 0;
      continue;
    }
    let limited = false;
    let dAz = 0, dEl = 0;
    if (dt > 0) {
      followAxis(azimuthDeltaDeg(s.azDeg, s.targetAzDeg), dAzTarget / dt, azLimit, dt, true, axis);
      dAz = axis[0]; limited = axis[1] === 1;
      followAxis(s.targetElDeg - s.elDeg, dElTarget / dt, elLimit, dt, false, axis);
      dEl = axis[0]; limited = limited || axis[1] === 1;
    } else {
      dAz = azimuthDeltaDeg(s.azDeg, azDeg); dEl = elDeg - s.elDeg;
      limited = dAz !== 0 || dEl !== 0;
    }
    s.azDeg = wrap360(azDeg - dAz); s.elDeg = elDeg - dEl;
    s.timeS = timeS;
    s.targetAzDeg = wrap360(azDeg); s.targetElDeg = elDeg;
    s.lagDeg = limited && (dAz !== 0 || dEl !== 0) ? azElSeparationDeg(s.azDeg, s.elDeg, azDeg, elDeg) : 0;
    // A mount that just caught up ends on target: no lag, but it was rate-bound in the interval.
    s.limited = limited;
    lagOut[i] = s.lagDeg; limitedOut[i] = limited ? 1 : 0;
  }
}
