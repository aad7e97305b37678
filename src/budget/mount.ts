/**
 * Rate-limited az–el mount following a program track.
 *
 * Our model (no published source; plain kinematics): the mount is pre-positioned
 * on the target at the first step of a pass (AOS). Between two steps the target
 * direction is interpolated linearly (azimuth the short way round) in sub-steps
 * of at most SUBSTEP_S; at each sub-step each axis moves toward the target by at
 * most its maximum rate × sub-step, azimuth the short way round. The lag is the
 * angle between the mount boresight and the target at the step instant. A mount
 * that is never rate-bound follows the interpolated track exactly (lag 0).
 * State is carried across the steps of one pass; steps come in time order.
 */
import { azElSeparationDeg } from './attitude.js';

export const MOUNT_SUBSTEP_S = 0.5;
/** A gap longer than this between steps re-primes the mount (a new pass). */
const MAX_GAP_S = 3600;
const MAX_SUBSTEPS = 4000;

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
 * Advance the mount to time `timeS` with the target at (azDeg, elDeg).
 * Rates ≤ 0 or non-finite mean "unlimited" on that axis. Writes lagDeg/limited into the state.
 */
export function stepMount(
  s: MountState, timeS: number, azDeg: number, elDeg: number,
  maxAzRateDegS: number, maxElRateDegS: number,
): MountState {
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
    return s;
  }
  const azLimit = maxAzRateDegS > 0 && Number.isFinite(maxAzRateDegS) ? maxAzRateDegS : Infinity;
  const elLimit = maxElRateDegS > 0 && Number.isFinite(maxElRateDegS) ? maxElRateDegS : Infinity;
  const n = Math.min(MAX_SUBSTEPS, Math.max(1, Math.ceil(dt / MOUNT_SUBSTEP_S)));
  const h = dt / n;
  const az0 = s.targetAzDeg, el0 = s.targetElDeg;
  const dAzTarget = azimuthDeltaDeg(az0, azDeg), dElTarget = elDeg - el0;
  let limited = false;
  let maz = s.azDeg, mel = s.elDeg;
  for (let i = 1; i <= n; i++) {
    const f = i / n;
    const taz = az0 + f * dAzTarget, tel = el0 + f * dElTarget;
    const da = azimuthDeltaDeg(maz, taz);
    const de = tel - mel;
    const stepAz = azLimit * h, stepEl = elLimit * h;
    if (Math.abs(da) > stepAz) { maz += Math.sign(da) * stepAz; limited = true; } else maz += da;
    if (Math.abs(de) > stepEl) { mel += Math.sign(de) * stepEl; limited = true; } else mel += de;
  }
  s.azDeg = wrap360(maz); s.elDeg = mel;
  s.timeS = timeS;
  s.targetAzDeg = wrap360(azDeg); s.targetElDeg = elDeg;
  s.lagDeg = limited ? azElSeparationDeg(s.azDeg, s.elDeg, azDeg, elDeg) : 0;
  // A mount that just caught up ends on target; report that as no lag but still rate-bound.
  s.limited = limited;
  return s;
}
