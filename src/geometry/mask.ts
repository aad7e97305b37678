/**
 * Horizon masks: a constant elevation, or (azimuth, elevation) points joined
 * by straight lines in azimuth and wrapping at 360°.
 */
import { InputError } from '../errors.js';
import type { HorizonMask } from './types.js';

export const MASK_MIN_DEG = -5;
export const MASK_MAX_DEG = 89;

/** Mask elevation (deg) at `azimuthDeg` (any real; reduced to [0, 360)). */
export function maskElevationDeg(mask: HorizonMask, azimuthDeg: number): number {
  if (mask.kind === 'constant') return mask.elevationDeg;
  const pts = mask.points;
  const n = pts.length;
  if (n === 1) return pts[0][1];
  const az = ((azimuthDeg % 360) + 360) % 360;
  // Points are sorted by azimuth (validateMask): i = last point at or before az.
  let i = -1;
  for (let k = 0; k < n && pts[k][0] <= az; k++) i = k;
  const a = i === -1 ? pts[n - 1] : pts[i];
  const b = i === -1 || i === n - 1 ? pts[0] : pts[i + 1];
  // Outside [first, last] the segment joins the last point to the first across 360°.
  const a0 = i === -1 ? a[0] - 360 : a[0];
  const b0 = i === n - 1 ? b[0] + 360 : b[0];
  const w = (az - a0) / (b0 - a0);
  return a[1] + w * (b[1] - a[1]);
}

/** Highest elevation anywhere on the mask (deg). */
export function maskMaximumDeg(mask: HorizonMask): number {
  return mask.kind === 'constant' ? mask.elevationDeg : Math.max(...mask.points.map((p) => p[1]));
}

/** Steepest slope of the mask (deg of elevation per deg of azimuth), 0 for a constant mask. */
export function maskSlopeDegPerDeg(mask: HorizonMask): number {
  if (mask.kind === 'constant' || mask.points.length < 2) return 0;
  const p = mask.points;
  let s = 0;
  for (let i = 0; i < p.length; i++) {
    const a = p[i], b = p[(i + 1) % p.length];
    const da = i + 1 < p.length ? b[0] - a[0] : b[0] + 360 - a[0];
    if (da > 0) s = Math.max(s, Math.abs(b[1] - a[1]) / da);
  }
  return s;
}

/** Lowest elevation anywhere on the mask (deg). */
export function maskMinimumDeg(mask: HorizonMask): number {
  return mask.kind === 'constant' ? mask.elevationDeg : Math.min(...mask.points.map((p) => p[1]));
}

/** Check a mask and return it with table points sorted by azimuth. `where` names the source. */
export function validateMask(mask: HorizonMask, where: string): HorizonMask {
  const okEl = (e: number) => Number.isFinite(e) && e >= MASK_MIN_DEG && e <= MASK_MAX_DEG;
  const allowed = `allowed ${MASK_MIN_DEG} to ${MASK_MAX_DEG} deg`;
  if (mask.kind === 'constant') {
    if (!okEl(mask.elevationDeg)) throw new InputError(`${where}: mask elevation ${mask.elevationDeg} out of range (${allowed})`);
    return mask;
  }
  if (!Array.isArray(mask.points) || mask.points.length === 0) {
    throw new InputError(`${where}: mask table has no points (allowed one or more [azimuth_deg, elevation_deg] pairs)`);
  }
  const pts = mask.points.map((p, k) => {
    if (!Array.isArray(p) || p.length !== 2 || !Number.isFinite(p[0]) || !Number.isFinite(p[1])) {
      throw new InputError(`${where}[${k}]: mask point is not a pair of numbers (allowed [azimuth_deg, elevation_deg])`);
    }
    if (p[0] < 0 || p[0] >= 360) throw new InputError(`${where}[${k}]: mask azimuth ${p[0]} out of range (allowed 0 <= azimuth < 360 deg)`);
    if (!okEl(p[1])) throw new InputError(`${where}[${k}]: mask elevation ${p[1]} out of range (${allowed})`);
    return [p[0], p[1]] as const;
  }).sort((u, v) => u[0] - v[0]);
  for (let k = 1; k < pts.length; k++) {
    if (pts[k][0] === pts[k - 1][0]) throw new InputError(`${where}: mask azimuth ${pts[k][0]} given twice (allowed each azimuth once)`);
  }
  return { kind: 'table', points: pts };
}
