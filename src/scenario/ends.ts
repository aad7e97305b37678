/**
 * Radio ends of a link: antenna, polarisation, receiver, transmitter,
 * pointing — from the scenario's keys to the engine's `LinkSpec` pieces.
 */
import type {
  AntennaSpec, GroundPointing, PolarisationSpec, ReceiverSpec, SpacecraftPointing,
} from '../budget/types.js';
import type { ResolveContext } from './climate.js';
import type { AntennaInput, PolarisationInput, ReceiverInput, TransmitterInput } from './schema.js';
import type { Path } from './source.js';
import type { z } from 'zod';
import type { groundPointingSchema, spacecraftPointingSchema } from './schema.js';

/** Aperture efficiency used when a dish gives none: mid of the 0.5–0.7 typical range (common practice). */
export const DEFAULT_DISH_EFFICIENCY = 0.55;

export function resolveAntenna(a: AntennaInput, at: Path, ctx: ResolveContext): AntennaSpec {
  const P = (k: string) => ctx.formatPath([...at, k]);
  switch (a.type) {
    case 'isotropic':
      if (a.gain_dbi === undefined) ctx.recordDefault({ path: P('gain_dbi'), value: '0', reason: 'isotropic antenna' });
      return { kind: 'isotropic', gainDBi: a.gain_dbi ?? 0 };
    case 'parabolic':
      if (a.efficiency === undefined) {
        ctx.recordDefault({ path: P('efficiency'), value: String(DEFAULT_DISH_EFFICIENCY), reason: 'typical aperture efficiency 0.5–0.7 (common practice)' });
      }
      return { kind: 'parabolic', diameterM: a.diameter_m, efficiency: a.efficiency ?? DEFAULT_DISH_EFFICIENCY };
    case 'cosine-power': {
      const spec: AntennaSpec = { kind: 'cosine-power', peakGainDBi: a.gain_dbi, beamwidthDeg: a.beamwidth_deg };
      if (a.floor_gain_dbi !== undefined) spec.floorGainDBi = a.floor_gain_dbi;
      return spec;
    }
    case 'table': {
      const off = a.pattern.map((p) => p[0]);
      if (off[0] !== 0) ctx.fail([...at, 'pattern', 0, 0], `the pattern must start at off-boresight 0° (got ${off[0]})`);
      for (let i = 1; i < off.length; i++) {
        if (!(off[i] > off[i - 1])) {
          ctx.fail([...at, 'pattern', i, 0], `off-boresight angles must strictly increase (got ${off[i]} after ${off[i - 1]})`);
        }
      }
      return { kind: 'table', offBoresightDeg: off, gainDBi: a.pattern.map((p) => p[1]) };
    }
  }
}

/**
 * Signed voltage axial ratio (+ right-hand, − left-hand, ±Infinity linear), from an
 * axial ratio in dB: r = 10^(AR_dB / 20).
 */
export function resolvePolarisation(p: PolarisationInput, at: Path, ctx: ResolveContext): PolarisationSpec {
  const o = typeof p === 'string' ? { type: p } : p;
  const tiltDeg = o.tilt_deg ?? 0;
  if (o.type === 'linear') {
    if (o.axial_ratio_db !== undefined) ctx.fail([...at, 'axial_ratio_db'], 'not used for a linear polarisation (allowed: tilt_deg)');
    return { axialRatio: Infinity, tiltDeg };
  }
  const r = 10 ** ((o.axial_ratio_db ?? 0) / 20);
  return { axialRatio: o.type === 'rhcp' ? r : -r, tiltDeg };
}

export function resolveReceiver(r: ReceiverInput, at: Path, ctx: ResolveContext): ReceiverSpec {
  const P = (k: string) => ctx.formatPath([...at, k]);
  if (r.noise_figure_db !== undefined && r.noise_temperature_k !== undefined) {
    ctx.fail([...at, 'noise_temperature_k'], 'give either noise_figure_db or noise_temperature_k, not both');
  }
  if (r.noise_figure_db === undefined && r.noise_temperature_k === undefined) {
    ctx.fail(at, 'missing noise_figure_db or noise_temperature_k (give one)');
  }
  const spec: ReceiverSpec = {
    feedLossDB: r.feed_loss_db ?? 0,
    spilloverK: r.spillover_k ?? 0,
    environment: r.noise_environment ?? 'rural',
  };
  if (r.noise_figure_db !== undefined) spec.noiseFigureDB = r.noise_figure_db;
  if (r.noise_temperature_k !== undefined) spec.noiseTemperatureK = r.noise_temperature_k;
  if (r.antenna_temperature_k !== undefined) spec.antennaTemperatureK = r.antenna_temperature_k;
  if (r.feed_loss_db === undefined) ctx.recordDefault({ path: P('feed_loss_db'), value: '0', reason: 'no loss between antenna and LNA given' });
  if (r.spillover_k === undefined) ctx.recordDefault({ path: P('spillover_k'), value: '0', reason: 'no ground spill-over noise given' });
  if (r.noise_environment === undefined) {
    ctx.recordDefault({ path: P('noise_environment'), value: 'rural', reason: 'ITU-R P.372 rural man-made noise (from memory); matters at VHF/UHF only' });
  }
  return spec;
}

/** Transmitter power in dBW (W → dBW: 10 log10 P) and its line loss. */
export function resolveTransmitter(t: TransmitterInput, at: Path, ctx: ResolveContext): { txPowerDBW: number; lineLossDB: number } {
  if (t.power_w !== undefined && t.power_dbw !== undefined) ctx.fail([...at, 'power_dbw'], 'give either power_w or power_dbw, not both');
  if (t.power_w === undefined && t.power_dbw === undefined) ctx.fail(at, 'missing power_w or power_dbw (give one)');
  if (t.line_loss_db === undefined) ctx.recordDefault({ path: ctx.formatPath([...at, 'line_loss_db']), value: '0', reason: 'no transmit line loss given' });
  return { txPowerDBW: t.power_dbw ?? 10 * Math.log10(t.power_w as number), lineLossDB: t.line_loss_db ?? 0 };
}

export function resolveGroundPointing(p: z.infer<typeof groundPointingSchema> | undefined, at: Path, ctx: ResolveContext): GroundPointing {
  if (p === undefined) {
    ctx.recordDefault({ path: ctx.formatPath(at), value: 'track, pointing_error_deg 0, no rate limits', reason: 'program track assumed' });
    return { kind: 'track', pointingErrorDeg: 0 };
  }
  if (p.mode === 'fixed') return { kind: 'fixed', azimuthDeg: p.azimuth_deg, elevationDeg: p.elevation_deg };
  if (p.pointing_error_deg === undefined) ctx.recordDefault({ path: ctx.formatPath([...at, 'pointing_error_deg']), value: '0', reason: 'no pointing error given' });
  const g: GroundPointing = { kind: 'track', pointingErrorDeg: p.pointing_error_deg ?? 0 };
  if (p.max_azimuth_rate_deg_s !== undefined) g.maxAzimuthRateDegS = p.max_azimuth_rate_deg_s;
  if (p.max_elevation_rate_deg_s !== undefined) g.maxElevationRateDegS = p.max_elevation_rate_deg_s;
  return g;
}

function unit(v: readonly [number, number, number], at: Path, ctx: ResolveContext): [number, number, number] {
  const n = Math.hypot(v[0], v[1], v[2]);
  if (!(n > 0)) ctx.fail(at, 'must be a non-zero vector [x, y, z]');
  return [v[0] / n, v[1] / n, v[2] / n];
}

export function resolveSpacecraftPointing(
  p: z.infer<typeof spacecraftPointingSchema>, attitudeErrorDeg: number, at: Path, ctx: ResolveContext,
): SpacecraftPointing {
  switch (p.mode) {
    case 'nadir':
      if (p.boresight_body === undefined) ctx.recordDefault({ path: ctx.formatPath([...at, 'boresight_body']), value: '[0, 0, 1]', reason: 'antenna boresight along the nadir (+Z body) axis' });
      return { kind: 'nadir', boresightBody: unit(p.boresight_body ?? [0, 0, 1], [...at, 'boresight_body'], ctx), attitudeErrorDeg };
    case 'tracking':
      return { kind: 'tracking', attitudeErrorDeg };
    case 'inertial':
      return { kind: 'inertial', boresightTeme: unit(p.boresight_teme, [...at, 'boresight_teme'], ctx), attitudeErrorDeg };
  }
}
