/**
 * The per-step link budget engine: one GeometrySample in, every term of the
 * budget out, for each weather case. Built once per (satellite, station, link);
 * everything constant per link is precomputed, the elevation-dependent terms are
 * tabulated (atmosphere.ts), and `evaluate` reuses its output object: no
 * allocation per step.
 *
 * Budget (PHYSICS.md §10; losses positive dB and subtracted):
 *   EIRP = P_tx − L_line,tx + G_tx(θ_tx)
 *   C/N0 = EIRP − L_fs − A_T − L_pol − L_point,tx − L_point,rx − L_other + G/T − k,  k = −228.60 dBW/K/Hz
 *   Eb/N0 = C/N0 − 10 log10 R_b;  Es/N0 = C/N0 − 10 log10 R_s
 *
 * Pointing convention (our choice, documented):
 * - An antenna whose boresight is steered at the other end (spacecraft
 *   'tracking', ground 'track') has geometric off-boresight 0° (plus the mount
 *   lag on the ground); its gain term is G(off), and its pointing loss is
 *   G(off) − G(off + error), the error (attitude or pointing) added as a
 *   worst-case extra angle.
 * - A fixed-boresight antenna (spacecraft 'nadir' / 'inertial', ground 'fixed')
 *   has its geometric off-boresight angle in the gain term and the attitude error
 *   likewise as a worst-case extra angle in the pointing loss.
 * - The mount lag is included in the reported off-boresight angle and therefore
 *   in the pointing loss: gain uses G(0) for a tracking ground antenna, the loss
 *   G(0) − G(lag + error).
 * All pointing losses are clamped at ≥ 0 dB (a pattern that rises off boresight
 * gives no pointing gain). Atmospheric terms use the apparent elevation
 * (P.834 refraction, from the sample), clamped to 0–90°.
 */
import {
  BOLTZMANN_DBW_PER_K_HZ, checkAxialRatio, freeSpaceLossDB, MAX_POLARISATION_LOSS_DB, polarisationLossDB,
  selectAdaptiveMode,
} from '../models/index.js';
import { InputError } from '../errors.js';
import { dopplerRateHzS, dopplerShiftHz } from '../geometry/doppler.js';
import type { GeometrySample } from '../geometry/types.js';
import { antennaPattern, type AntennaPattern } from './antenna.js';
import {
  atmosphereAt, buildElevationTable, createAtmosphereContext, interpolateTable, TERM, TERM_COUNT,
  type AtmosphereContext, type ElevationTable,
} from './atmosphere.js';
import { azElSeparationDeg, spacecraftOffBoresightDeg, unitVector } from './attitude.js';
import { explainStep, type ExplainLine } from './explain.js';
import { createMountState, resetMount, stepMount, type MountState } from './mount.js';
import type { AdaptiveMode, CaseBudget, Climate, LinkSpec, StepBudget, WeatherCase } from './types.js';

export interface LinkEngineOptions {
  link: LinkSpec;
  climate: Climate;
  weatherCases: WeatherCase[];
  /** Refinement tolerance of the elevation table (dB); default 0.0002. */
  tableToleranceDB?: number;
  /**
   * A prebuilt elevation table for this same link, climate and weather cases
   * (e.g. built in another thread and structured-cloned); skips building one.
   */
  table?: ElevationTable;
}

/** Intermediate values of the last evaluated step (for explain; overwritten each step). */
export interface StepDetail {
  atmosphericElevationDeg: number;
  txPowerDBW: number;
  txLineLossDB: number;
  txGainDBi: number;
  rxGainDBi: number;
  rxFeedLossDB: number;
  spacecraftOffBoresightDeg: number;
  groundOffBoresightDeg: number;
}

export interface LinkEngine {
  link: LinkSpec;
  climate: Climate;
  weatherCases: WeatherCase[];
  /** Spacecraft and ground antenna patterns at the link frequency. */
  spacecraftAntenna: AntennaPattern;
  groundAntenna: AntennaPattern;
  /** Constant per link: polarisation mismatch loss (dB). */
  polarisationLossDB: number;
  /** Approximations applied (frequency clamps of models, etc.), for provenance. */
  notes: string[];
  table: ElevationTable;
  /** Reset the per-pass state (mount). Call before the first step of each pass. */
  beginPass(): void;
  /** Evaluate one step (steps of a pass in time order). Returns `out` (or an internal reused record). */
  evaluate(sample: GeometrySample, out?: StepBudget): StepBudget;
  /**
   * Evaluate one step (as `evaluate`, advancing the mount) and describe every term
   * (allocates; not for the hot path). The step record goes into `out` when given.
   */
  explain(sample: GeometrySample, out?: StepBudget): ExplainLine[];
  /** Symbol rate (baud) and, for fixed links, bit rate (b/s; NaN when adaptive). */
  symbolRateBaud: number;
  bitRateBps: number;
  /** Direct (untabulated) evaluation of the elevation terms, for checks. */
  atmosphereDirect(elevationDeg: number, out?: Float64Array): Float64Array;
  /** Detail of the last evaluated step. */
  detail: StepDetail;
}

export function createCaseBudget(weather: string): CaseBudget {
  return {
    weather, gas_loss_db: NaN, rain_loss_db: NaN, cloud_loss_db: NaN, scintillation_db: NaN, atmospheric_loss_db: NaN,
    antenna_temperature_k: NaN, system_temperature_k: NaN, g_over_t_dbk: NaN, c_over_n0_dbhz: NaN, eb_over_n0_db: NaN,
    es_over_n0_db: NaN, required_eb_over_n0_db: NaN, margin_db: NaN, usable: false, mode: '', information_rate_bps: 0,
  };
}

/** A fresh step record with one case object per weather case (reuse it across steps). */
export function createStepBudget(weatherCases: readonly WeatherCase[]): StepBudget {
  return {
    time_s: NaN, range_km: NaN, elevation_deg: NaN, azimuth_deg: NaN, tx_off_boresight_deg: NaN, rx_off_boresight_deg: NaN,
    eirp_dbw: NaN, free_space_loss_db: NaN, polarisation_loss_db: NaN, tx_pointing_loss_db: NaN, rx_pointing_loss_db: NaN,
    other_losses_db: NaN, mount_lag_deg: 0, mount_limited: false, doppler_hz: NaN, doppler_rate_hz_s: NaN,
    cases: weatherCases.map((w) => createCaseBudget(w.name)),
  };
}

function finite(where: string, v: unknown, allowed: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) throw new InputError(`${where}: ${String(v)} is not a finite number (${allowed})`);
  return v;
}

function validate(link: LinkSpec, weatherCases: WeatherCase[]): void {
  const w = `link ${link.name}`;
  finite(`${w}: frequencyGHz`, link.frequencyGHz, 'a frequency in GHz > 0');
  if (!(link.frequencyGHz > 0)) throw new InputError(`${w}: frequencyGHz = ${link.frequencyGHz} must be > 0 (a frequency in GHz)`);
  const tx = link.direction === 'downlink' ? link.spacecraft : link.ground;
  const txName = link.direction === 'downlink' ? 'spacecraft' : 'ground';
  if (tx.txPowerDBW === undefined) throw new InputError(`${w}: ${txName}.txPowerDBW is missing (the transmitting end needs a power in dBW)`);
  finite(`${w}: ${txName}.txPowerDBW`, tx.txPowerDBW, 'a power in dBW');
  if (link.modcod.kind === 'fixed') {
    if (!(link.modcod.bitRateBps > 0)) throw new InputError(`${w}: modcod.bitRateBps = ${link.modcod.bitRateBps} must be > 0 (b/s)`);
    if (!(link.modcod.bitsPerSymbol > 0)) throw new InputError(`${w}: modcod.bitsPerSymbol = ${link.modcod.bitsPerSymbol} must be > 0`);
    finite(`${w}: modcod.requiredEbN0DB`, link.modcod.requiredEbN0DB, 'dB');
  } else {
    if (!(link.modcod.symbolRateBaud > 0)) throw new InputError(`${w}: modcod.symbolRateBaud = ${link.modcod.symbolRateBaud} must be > 0 (baud)`);
    if (link.modcod.modes.length === 0) throw new InputError(`${w}: modcod.modes is empty (at least one adaptive mode)`);
  }
  if (weatherCases.length === 0) throw new InputError('weatherCases: empty (at least one weather case, e.g. clear sky)');
}

export function createLinkEngine(options: LinkEngineOptions): LinkEngine {
  const { link, climate, weatherCases } = options;
  validate(link, weatherCases);
  const f = link.frequencyGHz;
  const downlink = link.direction === 'downlink';
  const scAnt = antennaPattern(link.spacecraft.antenna, f, `link ${link.name}: spacecraft.antenna`);
  const gndAnt = antennaPattern(link.ground.antenna, f, `link ${link.name}: ground.antenna`);
  const txEnd = downlink ? link.spacecraft : link.ground;
  const rxAnt = downlink ? gndAnt : scAnt;
  const txAnt = downlink ? scAnt : gndAnt;

  const ctx: AtmosphereContext = createAtmosphereContext(link, climate, weatherCases, gndAnt, rxAnt);
  if (options.table && options.table.caseCount !== weatherCases.length) {
    throw new Error(`link ${link.name}: prebuilt elevation table has ${options.table.caseCount} weather cases, expected ${weatherCases.length}`);
  }
  const table = options.table ?? buildElevationTable(ctx, options.tableToleranceDB);
  const nTerms = weatherCases.length * TERM_COUNT;
  const terms = new Float64Array(nTerms);

  // Constant per link.
  const txPowerDBW = txEnd.txPowerDBW as number;
  const txLineLossDB = txEnd.lineLossDB;
  const [polTx, polRx] = downlink
    ? [link.spacecraft.polarisation, link.ground.polarisation]
    : [link.ground.polarisation, link.spacecraft.polarisation];
  // Constant tilt difference between the two ends (no geometric rotation or Faraday rotation modelled).
  let polLoss: number;
  try {
    checkAxialRatio('axialRatioTx', polTx.axialRatio);
    checkAxialRatio('axialRatioRx', polRx.axialRatio);
    polLoss = polarisationLossDB({
      axialRatioTx: polTx.axialRatio, axialRatioRx: polRx.axialRatio, tiltDifferenceDeg: polTx.tiltDeg - polRx.tiltDeg,
    });
  } catch (err) {
    if (err instanceof RangeError) throw new InputError(`link ${link.name}: polarisation: ${err.message}`);
    throw err;
  }
  const notes = [...ctx.notes];
  if (polLoss >= MAX_POLARISATION_LOSS_DB) {
    notes.push(`polarisations are (nearly) orthogonal: mismatch loss clamped at ${MAX_POLARISATION_LOSS_DB} dB`);
  }
  const k = BOLTZMANN_DBW_PER_K_HZ;
  const fHz = f * 1e9;
  const fslArgs = { distanceKm: 0, frequencyGHz: f };
  const dopArgs = { frequencyHz: fHz, rangeRateKmS: 0 };
  const rateArgs = { frequencyHz: fHz, rangeAccelKmS2: 0 };

  const scPointing = link.spacecraft.pointing;
  const scBoresight: number[] = scPointing.kind === 'nadir' ? unitVector(scPointing.boresightBody)
    : scPointing.kind === 'inertial' ? unitVector(scPointing.boresightTeme) : [0, 0, 1];
  if (!scBoresight.every(Number.isFinite)) throw new InputError(`link ${link.name}: spacecraft.pointing boresight is the zero vector (a non-zero direction)`);
  const scErrDeg = scPointing.attitudeErrorDeg;
  const gp = link.ground.pointing;
  const gndErrDeg = gp.kind === 'track' ? gp.pointingErrorDeg : 0;
  const maxAzRate = gp.kind === 'track' ? gp.maxAzimuthRateDegS ?? Infinity : Infinity;
  const maxElRate = gp.kind === 'track' ? gp.maxElevationRateDegS ?? Infinity : Infinity;
  const rateLimited = gp.kind === 'track' && (Number.isFinite(maxAzRate) || Number.isFinite(maxElRate));
  const mount: MountState = createMountState();

  // Modulation and coding constants.
  const mc = link.modcod;
  const impl = link.implementationLossDB;
  const reqMargin = link.requiredMarginDB;
  let symbolRate: number, bitRate: number, rsDB: number, rbDB: number;
  let modes: AdaptiveMode[] = [];
  let lowestIndex = 0;
  let modeEffDB: number[] = [];
  if (mc.kind === 'fixed') {
    bitRate = mc.bitRateBps;
    symbolRate = mc.bitRateBps / mc.bitsPerSymbol;
    rbDB = 10 * Math.log10(bitRate);
    rsDB = 10 * Math.log10(symbolRate);
  } else {
    symbolRate = mc.symbolRateBaud;
    bitRate = NaN;
    rsDB = 10 * Math.log10(symbolRate);
    rbDB = NaN;
    modes = mc.modes;
    modes.forEach((m, i) => {
      if (!(m.efficiencyBitsPerSymbol > 0) || !Number.isFinite(m.requiredEsN0DB)) {
        throw new InputError(`link ${link.name}: modcod.modes[${i}] (${m.name}) needs efficiencyBitsPerSymbol > 0 and a finite requiredEsN0DB`);
      }
      if (m.requiredEsN0DB < modes[lowestIndex].requiredEsN0DB) lowestIndex = i;
    });
    modeEffDB = modes.map((m) => 10 * Math.log10(m.efficiencyBitsPerSymbol));
  }

  const own = createStepBudget(weatherCases);
  const detail: StepDetail = {
    atmosphericElevationDeg: NaN, txPowerDBW, txLineLossDB, txGainDBi: NaN, rxGainDBi: NaN, rxFeedLossDB: ctx.rxFeedLossDB,
    spacecraftOffBoresightDeg: NaN, groundOffBoresightDeg: NaN,
  };

  function pointingLoss(p: AntennaPattern, offDeg: number, errDeg: number, gainAtOff: number): number {
    if (!(errDeg > 0)) return 0;
    const l = gainAtOff - p.gainAtDBi(offDeg + errDeg);
    return l > 0 ? l : 0;
  }

  function evaluate(s: GeometrySample, out: StepBudget = own): StepBudget {
    out.time_s = s.timeS;
    out.range_km = s.rangeKm;
    out.elevation_deg = s.elevationDeg;
    out.azimuth_deg = s.azimuthDeg;

    // Spacecraft end.
    const scOff = spacecraftOffBoresightDeg(scPointing, scBoresight, s);
    const scGain = scAnt.gainAtDBi(scOff);
    const scLoss = pointingLoss(scAnt, scOff, scErrDeg, scGain);

    // Ground end: fixed boresight, or program track with optional rate-limited mount.
    const appEl = s.apparentElevationDeg;
    let gndOff: number;
    let gndLoss: number;
    let gndGain: number;
    if (gp.kind === 'fixed') {
      gndOff = azElSeparationDeg(gp.azimuthDeg, gp.elevationDeg, s.azimuthDeg, appEl);
      gndGain = gndAnt.gainAtDBi(gndOff);
      gndLoss = 0;
      out.mount_lag_deg = 0;
      out.mount_limited = false;
    } else {
      let lag = 0;
      if (rateLimited) {
        stepMount(mount, s.timeS, s.azimuthDeg, appEl, maxAzRate, maxElRate);
        lag = mount.lagDeg;
        out.mount_limited = mount.limited;
      } else {
        out.mount_limited = false;
      }
      out.mount_lag_deg = lag;
      gndOff = lag;
      gndGain = gndAnt.peakGainDBi;
      const total = lag + gndErrDeg;
      gndLoss = total > 0 ? Math.max(0, gndGain - gndAnt.gainAtDBi(total)) : 0;
    }

    let txGain: number, rxGain: number;
    if (downlink) {
      out.tx_off_boresight_deg = scOff; out.rx_off_boresight_deg = gndOff;
      out.tx_pointing_loss_db = scLoss; out.rx_pointing_loss_db = gndLoss;
      txGain = scGain; rxGain = gndGain;
    } else {
      out.tx_off_boresight_deg = gndOff; out.rx_off_boresight_deg = scOff;
      out.tx_pointing_loss_db = gndLoss; out.rx_pointing_loss_db = scLoss;
      txGain = gndGain; rxGain = scGain;
    }
    const eirp = txPowerDBW - txLineLossDB + txGain;
    out.eirp_dbw = eirp;
    fslArgs.distanceKm = s.rangeKm;
    const fsl = freeSpaceLossDB(fslArgs);
    out.free_space_loss_db = fsl;
    out.polarisation_loss_db = polLoss;
    out.other_losses_db = link.otherLossesDB;
    // Doppler at the carrier: f_r − f_t = −f ṙ/c, rate −f r̈/c (PHYSICS.md §11). The one-way
    // shift is the same to first order whichever end transmits (downlink: as received on the
    // ground; uplink: as the spacecraft sees it).
    dopArgs.rangeRateKmS = s.rangeRateKmS;
    out.doppler_hz = dopplerShiftHz(dopArgs);
    rateArgs.rangeAccelKmS2 = s.rangeAccelKmS2;
    out.doppler_rate_hz_s = dopplerRateHzS(rateArgs);

    const atmEl = appEl > 90 ? 90 : appEl > 0 ? appEl : 0;
    interpolateTable(table, atmEl, terms);
    // Received gain relative to boresight enters G/T (the table holds G/T at boresight).
    const rxGainOffset = rxGain - rxAnt.peakGainDBi;
    const fixedLossesDB = fsl + polLoss + out.tx_pointing_loss_db + out.rx_pointing_loss_db + link.otherLossesDB;

    const cases = out.cases;
    for (let i = 0; i < cases.length; i++) {
      const c = cases[i];
      const o = i * TERM_COUNT;
      c.gas_loss_db = terms[o + TERM.gas];
      c.rain_loss_db = terms[o + TERM.rain];
      c.cloud_loss_db = terms[o + TERM.cloud];
      c.scintillation_db = terms[o + TERM.scintillation];
      const atm = terms[o + TERM.total];
      c.atmospheric_loss_db = atm;
      c.antenna_temperature_k = terms[o + TERM.antennaTemperatureK];
      c.system_temperature_k = terms[o + TERM.systemTemperatureK];
      const gt = terms[o + TERM.gOverTBoresightDBK] + rxGainOffset;
      c.g_over_t_dbk = gt;
      const cn0 = eirp - fixedLossesDB - atm + gt - k;
      c.c_over_n0_dbhz = cn0;
      const esn0 = cn0 - rsDB;
      c.es_over_n0_db = esn0;
      if (mc.kind === 'fixed') {
        const ebn0 = cn0 - rbDB;
        c.eb_over_n0_db = ebn0;
        c.required_eb_over_n0_db = mc.requiredEbN0DB;
        const margin = ebn0 - mc.requiredEbN0DB - impl;
        c.margin_db = margin;
        c.usable = margin >= reqMargin;
        c.mode = '';
        c.information_rate_bps = c.usable ? bitRate : 0;
      } else {
        const effective = esn0 - impl;
        const chosen = selectAdaptiveMode(modes, effective, reqMargin);
        const mi = chosen >= 0 ? chosen : lowestIndex;
        const m = modes[mi];
        const effDB = modeEffDB[mi];
        c.margin_db = effective - m.requiredEsN0DB;
        // Eb/N0 = Es/N0 − 10 log10(information bits per symbol) of the mode in use.
        c.eb_over_n0_db = esn0 - effDB;
        c.required_eb_over_n0_db = m.requiredEsN0DB - effDB;
        c.usable = chosen >= 0;
        c.mode = c.usable ? m.name : '';
        c.information_rate_bps = c.usable ? symbolRate * m.efficiencyBitsPerSymbol : 0;
      }
    }

    detail.atmosphericElevationDeg = atmEl;
    detail.txGainDBi = txGain;
    detail.rxGainDBi = rxGain;
    detail.spacecraftOffBoresightDeg = scOff;
    detail.groundOffBoresightDeg = gndOff;
    return out;
  }

  const engine: LinkEngine = {
    link, climate, weatherCases,
    spacecraftAntenna: scAnt, groundAntenna: gndAnt,
    polarisationLossDB: polLoss, notes, table, detail,
    beginPass() { resetMount(mount); },
    evaluate,
    symbolRateBaud: symbolRate,
    bitRateBps: bitRate,
    explain(sample, out) {
      const step = evaluate(sample, out ?? createStepBudget(weatherCases));
      return explainStep({ engine, sample, step, detail: { ...detail } });
    },
    atmosphereDirect(el, out = new Float64Array(nTerms)) { return atmosphereAt(ctx, el, out); },
  };
  return engine;
}
