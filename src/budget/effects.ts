/**
 * Per-step terms outside the elevation tables, in columns: the element set's
 * age and the pointing error it implies at the station
 * (models/elementError.ts), the angle between the Sun and the ground
 * antenna's boresight and the antenna temperature the Sun adds
 * (models/sun.ts, models/sunNoise.ts). Built once per link; `fill` writes a
 * run of steps, `sunCase` folds the Sun's noise into one weather case.
 *
 * Choices (stated in the docs):
 * - The Sun's direction is geocentric: the topocentric shift (parallax,
 *   8.8″ = 0.0024°) is below the formula's 0.01° and is left out. It is
 *   computed at nodes at most 600 s apart over each run of steps and
 *   interpolated linearly: the Sun moves 0.0069° in 600 s, so the chord
 *   differs from the arc by < 1e-7°.
 * - The boresight of a tracking ground antenna points at the satellite (the
 *   mount lag, a fraction of a degree at most, is not added to the
 *   separation); a fixed ground antenna's Sun separation is not modelled
 *   (NaN, no noise).
 * - A Sun below the station's horizon (geocentric, within 0.2° of the
 *   geodetic one) adds nothing: the Earth hides it from a broad beam.
 * - Only downlinks get Sun noise: on an uplink the spacecraft's receiver
 *   looks at the station with the Earth behind it.
 * - The disc (0.533°) is weighted by the ground pattern above its floor: Sun
 *   seen through the pattern's floor (its sidelobe envelope) is left out, a
 *   few kelvin at most for a dish, of the order of the spill-over figure.
 * - The Sun's noise is added above the atmosphere, unattenuated: on the
 *   paths where the Sun is in the beam this overstates it by the path's
 *   attenuation (a fraction of a dB in clear sky at X-band): a worst case.
 */
import { discPatternFraction, elementPointingErrorColumnDeg, quietSunBrightnessTemperatureK, SUN_DISC_DIAMETER_DEG, sunDirection } from '../models/index.js';
import type { SatelliteColumns, StationColumns } from '../geometry/columns.js';
import type { AntennaPattern } from './antenna.js';
import type { CaseColumns, LinkColumns } from './linkColumns.js';
import type { ElementErrorSpec, LinkSpec, SunNoiseSpec } from './types.js';

const DEG = Math.PI / 180;
/** Longest interval between exact solar positions within a run of steps (s). */
export const SUN_NODE_SPACING_S = 600;
/** Samples of the disc-weighted pattern over separation. */
const SUN_TABLE_POINTS = 512;

export interface Effects {
  /** An element error is given and a program-tracking antenna uses it. */
  elementErrorActive: boolean;
  /** The last run's element pointing error (deg): the columns' own array. */
  pointingDeg: Float64Array;
  /** Some step of the last run has a non-zero element pointing error. */
  pointingAny: boolean;
  /** Some step of the last run has Sun noise. */
  sunInRun: boolean;
  /** Quiet-Sun brightness × activity at the link frequency (K), NaN when the Sun is not modelled. */
  sunBrightnessK: number;
  /** Separation (deg) beyond which the Sun adds nothing (the pattern's main lobe plus the disc radius). */
  sunReachDeg: number;
  notes: string[];
  fill(sat: SatelliteColumns, satFrom: number, stn: StationColumns, n: number, out: LinkColumns): void;
  /** Forget the shared columns (the next fill computes them): for callers that refill the same columns with other geometry at the same times. */
  invalidate(): void;
  /** Add the Sun's noise to one weather case (its T_A and T_sys columns hold the table's values): G/T and the C/N0 lost. */
  sunCase(c: CaseColumns, n: number): void;
}

export interface EffectsOptions {
  link: LinkSpec;
  groundAntenna: AntennaPattern;
  elementError?: ElementErrorSpec;
  sun?: SunNoiseSpec;
  /** Feed loss between the antenna and the LNA (dB): the share 10^(−L/10) of the antenna's noise that reaches T_sys. */
  rxFeedLossDB: number;
  /**
   * Shared by the engines of one satellite (same element error and Sun
   * settings): the link-independent columns are computed once per station
   * and run of steps, the other links of the station copy them.
   */
  share?: EffectsShare;
}

/** The link-independent columns of the last run of steps, and what they were computed for. */
export interface EffectsShare {
  stn: StationColumns | null;
  originS: number; k: number; stepS: number; n: number;
  age: Float64Array; err: Float64Array; sep: Float64Array;
  /** 1 where the Sun is below the station's (geocentric) horizon: the Earth hides it. */
  sunHidden: Uint8Array;
  along: Float64Array; cross: Float64Array; nodes: Float64Array;
}

export function createEffectsShare(): EffectsShare {
  const z = () => new Float64Array(0);
  return { stn: null, originS: NaN, k: NaN, stepS: NaN, n: 0, age: z(), err: z(), sep: z(), sunHidden: new Uint8Array(0), along: z(), cross: z(), nodes: z() };
}

/**
 * Element age and pointing error (with `ee`) and the Sun's separation from a
 * boresight on the satellite (with `sun`) over a run of steps, into the
 * share, unless it already holds them for these station columns and times.
 */
function sharedColumns(sh: EffectsShare, sat: SatelliteColumns, satFrom: number, stn: StationColumns, n: number, ee: ElementErrorSpec | undefined, sun: boolean): void {
  const k = sat.k0 + satFrom;
  if (sh.stn === stn && sh.originS === sat.originS && sh.k === k && sh.stepS === sat.stepS && sh.n === n) return;
  sh.stn = stn; sh.originS = sat.originS; sh.k = k; sh.stepS = sat.stepS; sh.n = n;
  if (sh.age.length < n) {
    const c = Math.max(n, 2 * sh.age.length);
    sh.age = new Float64Array(c); sh.err = new Float64Array(c); sh.sep = new Float64Array(c); sh.along = new Float64Array(c); sh.cross = new Float64Array(c);
    sh.sunHidden = new Uint8Array(c);
  }
  const t0 = sat.originS + k * sat.stepS, dt = sat.stepS;
  const { age, err, sep, along, cross } = sh;
  if (ee) {
    const fixed = ee.ageDays;
    const e0 = ee.atEpochKm, ra = ee.alongTrackKmPerDay, rc = ee.crossTrackKmPerDay;
    for (let i = 0; i < n; i++) {
      const g = fixed ?? (t0 + i * dt - ee.epochS) / 86_400;
      age[i] = g;
      const a = Math.abs(g);
      along[i] = e0 + ra * a; cross[i] = e0 + rc * a;
    }
    const s = sat.teme;
    elementPointingErrorColumnDeg(s.rx, s.ry, s.rz, s.vx, s.vy, s.vz, satFrom, stn.losX, stn.losY, stn.losZ, stn.rangeKm, along, cross, n, err);
  }
  if (!sun) return;
  const span = (n - 1) * dt;
  const m = span > 0 ? Math.ceil(span / SUN_NODE_SPACING_S) : 0;
  if (sh.nodes.length < 3 * (m + 1)) sh.nodes = new Float64Array(3 * (m + 1));
  const nd = sh.nodes;
  for (let q = 0; q <= m; q++) sunDirection(m === 0 ? t0 : t0 + (q * span) / m, nd, 3 * q);
  const lx = stn.losX, ly = stn.losY, lz = stn.losZ, range = stn.rangeKm, hidden = sh.sunHidden;
  const rx = sat.teme.rx, ry = sat.teme.ry, rz = sat.teme.rz;
  for (let i = 0; i < n; i++) {
    let sx: number, sy: number, sz: number;
    if (m === 0) { sx = nd[0]; sy = nd[1]; sz = nd[2]; } else {
      const u = ((i * dt) / span) * m;
      const q = u >= m ? m - 1 : Math.floor(u);
      const w = u - q, a = 3 * q;
      sx = nd[a] + w * (nd[a + 3] - nd[a]); sy = nd[a + 1] + w * (nd[a + 4] - nd[a + 1]); sz = nd[a + 2] + w * (nd[a + 5] - nd[a + 2]);
      const norm = Math.sqrt(sx * sx + sy * sy + sz * sz);
      sx /= norm; sy /= norm; sz /= norm;
    }
    // Boresight = station → satellite = −(spacecraft → station).
    let c = -(lx[i] * sx + ly[i] * sy + lz[i] * sz);
    if (c > 1) c = 1; else if (c < -1) c = -1;
    sep[i] = Math.acos(c) / DEG;
    // Station = satellite + range × (spacecraft → station); its geocentric up against the Sun (≤ 0.2° from the geodetic one).
    const j = satFrom + i, d = range[i];
    const px = rx[j] + d * lx[i], py = ry[j] + d * ly[i], pz = rz[j] + d * lz[i];
    hidden[i] = px * sx + py * sy + pz * sz < 0 ? 1 : 0;
  }
}

/**
 * Disc-weighted pattern (1/4π)∫disc (G − G_floor) dΩ against separation, on a uniform grid up to the reach.
 * The reach (main lobe plus the disc's radius) is found at once; the values, an integral per grid point,
 * only when a step first comes within it (most links never meet the Sun: they never pay for the table).
 */
function sunTable(ant: AntennaPattern): { reachDeg: number; stepDeg: number; values: () => Float64Array } {
  let floorDBi = Infinity;
  for (let th = 0; th <= 180; th += 0.25) floorDBi = Math.min(floorDBi, ant.gainAtDBi(th));
  const floor = 10 ** (floorDBi / 10);
  const gainLinear = (off: number) => { const g = 10 ** (ant.gainAtDBi(off) / 10) - floor; return g > 0 ? g : 0; };
  const h = Number.isFinite(ant.beamwidthDeg) ? Math.min(0.05, ant.beamwidthDeg / 200) : 0.05;
  let lobe = 0;
  while (lobe < 180 && gainLinear(lobe) > 0) lobe += h;
  const radius = SUN_DISC_DIAMETER_DEG / 2;
  const reachDeg = lobe === 0 ? 0 : Math.min(180, lobe + radius);
  const stepDeg = reachDeg / (SUN_TABLE_POINTS - 1);
  let values: Float64Array | null = null;
  return {
    reachDeg, stepDeg,
    values() {
      if (values) return values;
      values = new Float64Array(SUN_TABLE_POINTS);
      if (reachDeg > 0) {
        for (let j = 0; j < SUN_TABLE_POINTS; j++) {
          values[j] = discPatternFraction({ separationDeg: Math.min(180, j * stepDeg), discDiameterDeg: SUN_DISC_DIAMETER_DEG, gainLinear });
        }
        values[SUN_TABLE_POINTS - 1] = 0;
      }
      return values;
    },
  };
}

export function createEffects(o: EffectsOptions): Effects {
  const { link } = o;
  const gp = link.ground.pointing;
  const tracking = gp.kind === 'track';
  const ee = o.elementError;
  const active = ee !== undefined && (tracking || link.spacecraft.pointing.kind === 'tracking');
  const sunModelled = o.sun !== undefined && tracking;
  const sunNoise = sunModelled && link.direction === 'downlink';
  const notes: string[] = [];
  let brightness = NaN;
  let table: { reachDeg: number; stepDeg: number; values: () => Float64Array } = { reachDeg: 0, stepDeg: 1, values: () => new Float64Array(0) };
  if (sunNoise) {
    const f = Math.min(100, Math.max(0.1, link.frequencyGHz));
    if (f !== link.frequencyGHz) notes.push(`quiet-Sun brightness taken at ${f} GHz (its table covers 0.1–100 GHz)`);
    brightness = quietSunBrightnessTemperatureK({ frequencyGHz: f }) * o.sun!.activityFactor;
    table = sunTable(o.groundAntenna);
  }
  const feed = 10 ** (-o.rxFeedLossDB / 10);
  let noiseCol: Float64Array = new Float64Array(0);
  const own = createEffectsShare();
  const share = o.share ?? own;
  const self: Effects = {
    elementErrorActive: active, pointingDeg: new Float64Array(0), pointingAny: false, sunInRun: false,
    sunBrightnessK: brightness, sunReachDeg: table.reachDeg, notes,
    fill(sat, satFrom, stn, n, out) {
      const age = out.elementAgeDays, err = out.elementPointingErrorDeg, sep = out.sunSeparationDeg, noise = out.sunNoiseK;
      self.pointingDeg = err;
      noiseCol = noise;
      // The link-independent part (age, element pointing error, Sun separation), once per station and run of steps.
      sharedColumns(share, sat, satFrom, stn, n, ee, o.sun !== undefined);
      if (ee) age.set(share.age.subarray(0, n)); else age.fill(NaN, 0, n);
      self.pointingAny = false;
      if (active) {
        err.set(share.err.subarray(0, n));
        for (let i = 0; i < n; i++) if (err[i] !== 0) { self.pointingAny = true; break; }
      } else err.fill(0, 0, n);
      self.sunInRun = false;
      if (!sunModelled) { sep.fill(NaN, 0, n); noise.fill(0, 0, n); return; }
      sep.set(share.sep.subarray(0, n));
      if (!sunNoise) { noise.fill(0, 0, n); return; }
      const reach = table.reachDeg, tstep = table.stepDeg, tb = brightness * 1, hidden = share.sunHidden;
      let vals: Float64Array | null = null;
      for (let i = 0; i < n; i++) {
        const d = sep[i];
        let add = 0;
        if (d < reach && hidden[i] === 0) {
          vals ??= table.values();
          const u = d / tstep;
          const j = Math.floor(u);
          add = tb * (vals[j] + (u - j) * (vals[j + 1] - vals[j]));
          if (add > 0) self.sunInRun = true;
        }
        noise[i] = add;
      }
    },
    invalidate() { share.stn = null; },
    sunCase(c, n) {
      const loss = c.sunLossDB;
      if (!self.sunInRun) { loss.fill(0, 0, n); return; }
      const noise = noiseCol;
      const ta = c.antennaTemperatureK, ts = c.systemTemperatureK, gt = c.gOverTDBK;
      for (let i = 0; i < n; i++) {
        const add = noise[i];
        if (add === 0) { loss[i] = 0; continue; }
        const dSys = add * feed;
        const l = 10 * Math.log10(1 + dSys / ts[i]);
        loss[i] = l;
        gt[i] -= l;
        ta[i] += add;
        ts[i] += dSys;
      }
    },
  };
  return self;
}
