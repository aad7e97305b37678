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
  BOLTZMANN_DBW_PER_K_HZ, checkAxialRatio, freeSpaceLossColumnDB, MAX_POLARISATION_LOSS_DB, polarisationLossDB,
} from '../models/index.js';
import { InputError } from '../errors.js';
import { dopplerColumns } from '../geometry/doppler.js';
import {
  createSatelliteColumns, createStationColumns, type SatelliteColumns, type StationColumns,
} from '../geometry/columns.js';
import type { GeometrySample } from '../geometry/types.js';
import { antennaPattern, type AntennaPattern } from './antenna.js';
import {
  atmosphereAt, buildElevationTable, createAtmosphereContext, tableIntervals, tableTermPairColumn, TERM, TERM_COUNT,
  type AtmosphereContext, type ElevationTable,
} from './atmosphere.js';
import { azElSeparationDeg, lineOfSightTeme, spacecraftOffBoresightColumn, unitVector } from './attitude.js';
import { createLinkColumns, readStep, type CaseColumns, type LinkColumns } from './linkColumns.js';
import { explainStep, type ExplainLine } from './explain.js';
import { createMountState, resetMount, stepMountColumn, type MountState } from './mount.js';
import { applyCaseRule, createCaseRule } from './caseRule.js';
import { buildWeatherTable, weatherColumns, weatherLevels } from './weather.js';
import type { AdaptiveMode, CaseBudget, Climate, ElementErrorSpec, LinkSpec, StepBudget, SunNoiseSpec, WeatherCase } from './types.js';
import { createEffects, type EffectsShare } from './effects.js';

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
  /** Weather as a probability (weather.ts; default true): false leaves its step columns NaN and builds no table. */
  weatherProbability?: boolean;
  /** The satellite's element-set error (pointing error of program tracks; none when absent). */
  elementError?: ElementErrorSpec;
  /** Noise from the Sun in the ground antenna's beam (none when absent). */
  sun?: SunNoiseSpec;
  /** Shared by the engines of one satellite: the link-independent effect columns computed once per station and run of steps. */
  effectsShare?: EffectsShare;
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
   * Evaluate a run of steps of one pass, in time order: satellite entries
   * satFrom … satFrom+n−1 (see SatelliteColumns for their times) and station entries
   * 0 … n−1, into `out`. With `full` false only what the summaries need is
   * filled per case (total attenuation, C/N0, Es/N0, Eb/N0, margin, usable,
   * mode, rate); the individual atmospheric and noise terms, the required
   * Eb/N0 of a fixed link and G/T are not (G/T holds its boresight value).
   */
  evaluateColumns(sat: SatelliteColumns, satFrom: number, stn: StationColumns, n: number, out: LinkColumns, full?: boolean, spacecraftOffBoresightDeg?: Float64Array): LinkColumns;
  /**
   * Links whose spacecraft antennas point alike (same pointing mode and
   * boresight) share this key: their spacecraft off-boresight angles are equal
   * and can be computed once (spacecraftOffBoresightColumn) and passed in.
   */
  spacecraftPointingKey: string;
  /** This link's spacecraft off-boresight angle over a run of steps (deg), into out[0 … n−1]. */
  spacecraftOffBoresight(sat: SatelliteColumns, satFrom: number, stn: StationColumns, n: number, out: Float64Array): void;
  /** Adaptive mode names by index (empty for a fixed-rate link). */
  modeNames: readonly string[];
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
    es_over_n0_db: NaN, required_eb_over_n0_db: NaN, margin_db: NaN, usable: false, mode: '', information_rate_bps: 0, sun_loss_db: 0,
  };
}

/** A fresh step record with one case object per weather case (reuse it across steps). */
export function createStepBudget(weatherCases: readonly WeatherCase[]): StepBudget {
  return {
    time_s: NaN, range_km: NaN, elevation_deg: NaN, azimuth_deg: NaN, tx_off_boresight_deg: NaN, rx_off_boresight_deg: NaN,
    eirp_dbw: NaN, free_space_loss_db: NaN, polarisation_loss_db: NaN, tx_pointing_loss_db: NaN, rx_pointing_loss_db: NaN,
    other_losses_db: NaN, mount_lag_deg: 0, mount_limited: false, doppler_hz: NaN, doppler_rate_hz_s: NaN,
    closing_probability: NaN, expected_information_rate_mbps: NaN, closing_probability_clamped: false,
    element_age_days: NaN, element_pointing_error_deg: 0, sun_separation_deg: NaN, sun_noise_temperature_k: 0,
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
  // Weather as a probability: its table on the elevation table's nodes, built once with it (and shipped with it).
  const wantWeather = options.weatherProbability !== false && weatherCases.length > 0;
  if (wantWeather) table.weather ??= buildWeatherTable(ctx, table);
  const weather = wantWeather ? table.weather ?? null : null;

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

  // Modulation and coding constants (the per-step rule itself is caseRule.ts).
  const mc = link.modcod;
  let symbolRate: number, bitRate: number;
  let modes: AdaptiveMode[] = [];
  if (mc.kind === 'fixed') {
    bitRate = mc.bitRateBps;
    symbolRate = mc.bitRateBps / mc.bitsPerSymbol;
  } else {
    symbolRate = mc.symbolRateBaud;
    bitRate = NaN;
    modes = mc.modes;
    modes.forEach((m, i) => {
      if (!(m.efficiencyBitsPerSymbol > 0) || !Number.isFinite(m.requiredEsN0DB)) {
        throw new InputError(`link ${link.name}: modcod.modes[${i}] (${m.name}) needs efficiencyBitsPerSymbol > 0 and a finite requiredEsN0DB`);
      }
    });
  }

  const own = createStepBudget(weatherCases);
  const detail: StepDetail = {
    atmosphericElevationDeg: NaN, txPowerDBW, txLineLossDB, txGainDBi: NaN, rxGainDBi: NaN, rxFeedLossDB: ctx.rxFeedLossDB,
    spacecraftOffBoresightDeg: NaN, groundOffBoresightDeg: NaN,
  };
  const caseRule = createCaseRule(link);
  const modeTable = caseRule.modeTable;
  const reqMargin = caseRule.requiredMarginDB, impl = caseRule.implementationLossDB;
  // Closing levels for the weather probability: the required margin on the margin column (fixed), or each
  // distinct mode threshold on the effective Es/N0 (adaptive), worth the rate it adds (Mb/s).
  const levels = modeTable
    ? weatherLevels(modeTable.thresholdsDB, Array.from(modeTable.modeFrom, (m) => (symbolRate * modes[m].efficiencyBitsPerSymbol) / 1e6))
    : weatherLevels([reqMargin], [bitRate / 1e6]);
  const modeRates = modes.map((m) => symbolRate * m.efficiencyBitsPerSymbol);
  const modeNames = modes.map((m) => m.name);
  // Element age and its pointing error, the Sun's separation and noise (effects.ts), per step into their columns.
  const effects = createEffects({
    link, groundAntenna: gndAnt, elementError: options.elementError, sun: options.sun, rxFeedLossDB: ctx.rxFeedLossDB, share: options.effectsShare,
  });
  const scTracksElements = effects.elementErrorActive && scPointing.kind === 'tracking';
  notes.push(...effects.notes);
  // Ground pointing loss of a program track when the mount does not lag (lag 0: the error alone).
  const gndLossNoLag = gndErrDeg > 0 ? Math.max(0, gndAnt.peakGainDBi - gndAnt.gainAtDBi(gndErrDeg)) : 0;

  // Scratch columns, grown on demand (held in one object so the loops below take them as locals).
  const sc = { cap: 0, lo: new Int32Array(0), hiOff: new Int32Array(0), frac: new Float64Array(0), base: new Float64Array(0), x: new Float64Array(0), tmp: new Float64Array(0) };
  function scratch(n: number): void {
    if (n <= sc.cap) return;
    const cap = Math.max(n, 2 * sc.cap);
    sc.cap = cap;
    sc.lo = new Int32Array(cap); sc.hiOff = new Int32Array(cap); sc.frac = new Float64Array(cap); sc.base = new Float64Array(cap); sc.x = new Float64Array(cap); sc.tmp = new Float64Array(cap);
  }

  /** Spacecraft antenna gain at the off-boresight angle and the pointing loss of the attitude error (≥ 0). */
  function spacecraftGains(off: Float64Array, n: number, gain: Float64Array, loss: Float64Array): void {
    if (scTracksElements && effects.pointingAny) {
      // A tracking spacecraft points with the elements too: its error is the attitude error and the element error, root sum of squares.
      const e = effects.pointingDeg, t = sc.tmp, a2 = scErrDeg * scErrDeg;
      for (let i = 0; i < n; i++) t[i] = off[i] + (e[i] === 0 ? scErrDeg : Math.sqrt(a2 + e[i] * e[i]));
      scAnt.gainColumnDBi(off, 0, n, gain);
      scAnt.gainColumnDBi(t, 0, n, loss);
      for (let i = 0; i < n; i++) { const l = gain[i] - loss[i]; loss[i] = l > 0 ? l : 0; }
      return;
    }
    if (!(scErrDeg > 0)) { scAnt.gainColumnDBi(off, 0, n, gain); loss.fill(0, 0, n); return; }
    scAnt.gainPairColumnDBi(off, scErrDeg, n, gain, loss);
    for (let i = 0; i < n; i++) {
      const l = gain[i] - loss[i];
      loss[i] = l > 0 ? l : 0;
    }
  }

  /** Ground antenna: off-boresight angle, gain and pointing loss; the mount lag and flag. */
  function groundTerms(sat: SatelliteColumns, satFrom: number, stn: StationColumns, n: number, out: LinkColumns,
    gOffA: Float64Array, gGainA: Float64Array, gLossA: Float64Array): void {
    const az = stn.azimuthDeg, appEl = stn.apparentElevationDeg;
    const lagCol = out.mountLagDeg, limCol = out.mountLimited;
    if (gp.kind === 'fixed') {
      for (let i = 0; i < n; i++) {
        const off = azElSeparationDeg(gp.azimuthDeg, gp.elevationDeg, az[i], appEl[i]);
        gOffA[i] = off; gGainA[i] = gndAnt.gainAtDBi(off); gLossA[i] = 0;
        lagCol[i] = 0; limCol[i] = 0;
      }
      return;
    }
    const peak = gndAnt.peakGainDBi * 1;
    const lossNoLag = gndLossNoLag * 1, errDeg = gndErrDeg * 1;
    if (effects.elementErrorActive) {
      // Program track on the elements: the mount's own error and the element error, root sum of squares (independent errors).
      const e = effects.pointingDeg, t = sc.tmp, e2 = errDeg * errDeg;
      if (rateLimited) stepMountColumn(mount, sat.originS, sat.k0 + satFrom, sat.stepS, az, appEl, n, maxAzRate, maxElRate, lagCol, limCol);
      else { lagCol.fill(0, 0, n); limCol.fill(0, 0, n); }
      for (let i = 0; i < n; i++) t[i] = lagCol[i] + (e[i] === 0 ? errDeg : Math.sqrt(e2 + e[i] * e[i]));
      gndAnt.gainColumnDBi(t, 0, n, gLossA);
      for (let i = 0; i < n; i++) {
        gOffA[i] = lagCol[i];
        gGainA[i] = peak;
        const l = t[i] > 0 ? peak - gLossA[i] : 0;
        gLossA[i] = l > 0 ? l : 0;
      }
      return;
    }
    if (!rateLimited) {
      gOffA.fill(0, 0, n); gGainA.fill(peak, 0, n); gLossA.fill(gndLossNoLag, 0, n);
      lagCol.fill(0, 0, n); limCol.fill(0, 0, n);
      return;
    }
    stepMountColumn(mount, sat.originS, sat.k0 + satFrom, sat.stepS, az, appEl, n, maxAzRate, maxElRate, lagCol, limCol);
    for (let i = 0; i < n; i++) {
      const lag = lagCol[i];
      gOffA[i] = lag;
      gGainA[i] = peak;
      const total = lag + errDeg;
      gLossA[i] = lag === 0 ? lossNoLag : total > 0 ? Math.max(0, peak - gndAnt.gainAtDBi(total)) : 0;
    }
  }

  /**
   * EIRP, free-space loss, Doppler, the atmospheric elevation, and the part of
   * C/N0 that no weather case changes: EIRP − (free-space, polarisation,
   * pointing and other losses) + (received gain − its boresight value) − k, into `base`.
   */
  function pathTerms(stn: StationColumns, n: number, out: LinkColumns, txGain: Float64Array, txLoss: Float64Array, rxLoss: Float64Array, rxGain: Float64Array, base: Float64Array): void {
    const range = stn.rangeKm, rdot = stn.rangeRateKmS, rddot = stn.rangeAccelKmS2, appEl = stn.apparentElevationDeg;
    const atmEl = out.atmosphericElevationDeg, eirpCol = out.eirpDBW, fslCol = out.freeSpaceLossDB;
    const other = link.otherLossesDB * 1, pol = polLoss * 1;
    const txConst = (txPowerDBW - txLineLossDB) * 1;
    const rxPeak = rxAnt.peakGainDBi * 1, kB = k * 1;
    freeSpaceLossColumnDB(range, f, n, fslCol);
    // Doppler at the carrier: f_r − f_t = −f ṙ/c, rate −f r̈/c (PHYSICS.md §11). The one-way
    // shift is the same to first order whichever end transmits (downlink: as received on the
    // ground; uplink: as the spacecraft sees it).
    dopplerColumns(fHz, rdot, rddot, n, out.dopplerHz, out.dopplerRateHzS);
    for (let i = 0; i < n; i++) {
      const eirp = txConst + txGain[i];
      eirpCol[i] = eirp;
      const e = appEl[i];
      atmEl[i] = e > 90 ? 90 : e > 0 ? e : 0;
      base[i] = eirp - (fslCol[i] + pol + txLoss[i] + rxLoss[i] + other) + (rxGain[i] - rxPeak) - kB;
    }
  }

  /**
   * One weather case: C/N0 = base − atmospheric attenuation + G/T at boresight,
   * Es/N0, Eb/N0, margin, usable, mode and rate; with `full` also the G/T with
   * the received gain off boresight and the required Eb/N0 columns.
   */
  function caseTerms(c: CaseColumns, n: number, base: Float64Array, rxGainCol: Float64Array, full: boolean): void {
    const rxPeak = rxAnt.peakGainDBi * 1;
    const atm = c.atmosphericDB, gt = c.gOverTDBK, cn0Col = c.cOverN0DBHz;
    for (let i = 0; i < n; i++) cn0Col[i] = base[i] - atm[i] + gt[i];
    if (full) for (let i = 0; i < n; i++) gt[i] += rxGainCol[i] - rxPeak;
    applyCaseRule(caseRule, c, n, full);
  }

  function evaluateColumns(
    sat: SatelliteColumns, satFrom: number, stn: StationColumns, n: number, out: LinkColumns, full = true, scOffIn?: Float64Array,
  ): LinkColumns {
    if (n > out.capacity) throw new Error(`link ${link.name}: ${n} steps do not fit columns of ${out.capacity}`);
    scratch(n);
    effects.fill(sat, satFrom, stn, n, out);
    out.n = n;
    out.polarisationLossDB = polLoss;
    out.otherLossesDB = link.otherLossesDB;
    // Spacecraft end (the off-boresight angle may come shared from another link with the same pointing).
    // Each end's terms go straight into the tx or rx columns it feeds.
    const scOffCol = downlink ? out.txOffBoresightDeg : out.rxOffBoresightDeg, gOffCol = downlink ? out.rxOffBoresightDeg : out.txOffBoresightDeg;
    const scGainCol = downlink ? out.txGainDBi : out.rxGainDBi, gGainCol = downlink ? out.rxGainDBi : out.txGainDBi;
    const scLossCol = downlink ? out.txPointingLossDB : out.rxPointingLossDB, gLossCol = downlink ? out.rxPointingLossDB : out.txPointingLossDB;
    if (scOffIn) { if (full) for (let i = 0; i < n; i++) scOffCol[i] = scOffIn[i]; } else spacecraftOffBoresightColumn(scPointing, scBoresight, sat, satFrom, stn, n, scOffCol);
    spacecraftGains(scOffIn ?? scOffCol, n, scGainCol, scLossCol);
    groundTerms(sat, satFrom, stn, n, out, gOffCol, gGainCol, gLossCol);
    pathTerms(stn, n, out, out.txGainDBi, out.txPointingLossDB, out.rxPointingLossDB, out.rxGainDBi, sc.base);
    const { lo, hiOff, frac } = sc;
    tableIntervals(table, out.atmosphericElevationDeg, n, lo, hiOff, frac);
    for (let ci = 0; ci < out.cases.length; ci++) {
      const c = out.cases[ci];
      const o = ci * TERM_COUNT;
      // G/T at boresight from the table (plus the received gain relative to boresight, in caseTerms).
      tableTermPairColumn(table, o + TERM.total, o + TERM.gOverTBoresightDBK, n, lo, hiOff, frac, c.atmosphericDB, c.gOverTDBK);
      if (full) {
        tableTermPairColumn(table, o + TERM.gas, o + TERM.rain, n, lo, hiOff, frac, c.gasDB, c.rainDB);
        tableTermPairColumn(table, o + TERM.cloud, o + TERM.scintillation, n, lo, hiOff, frac, c.cloudDB, c.scintillationDB);
      }
      if (full || effects.sunInRun) {
        tableTermPairColumn(table, o + TERM.antennaTemperatureK, o + TERM.systemTemperatureK, n, lo, hiOff, frac, c.antennaTemperatureK, c.systemTemperatureK);
      }
      effects.sunCase(c, n);
      caseTerms(c, n, sc.base, out.rxGainDBi, full);
    }
    if (weather) {
      const c0 = out.cases[0];
      let x = c0.marginDB;
      if (modeTable) {
        x = sc.x;
        const es = c0.esN0DB, im = impl * 1;
        for (let i = 0; i < n; i++) x[i] = es[i] - im;
      }
      weatherColumns(weather, levels, n, lo, hiOff, frac, x, out.closingProbability, out.expectedInformationRateMbps, out.closingClamped);
    } else {
      out.closingProbability.fill(NaN, 0, n); out.expectedInformationRateMbps.fill(NaN, 0, n); out.closingClamped.fill(0, 0, n);
    }
    return out;
  }

  // One step from a GeometrySample: the same column code on columns of length one.
  const sat1 = createSatelliteColumns(1);
  const stn1 = createStationColumns(1);
  const cols1 = createLinkColumns(1, weatherCases.length);
  function evaluate(s: GeometrySample, out: StepBudget = own): StepBudget {
    const t = sat1.teme;
    const r = s.satPositionTemeKm, v = s.satVelocityTemeKmS;
    t.rx[0] = r[0]; t.ry[0] = r[1]; t.rz[0] = r[2]; t.vx[0] = v[0]; t.vy[0] = v[1]; t.vz[0] = v[2];
    sat1.n = 1; sat1.originS = s.timeS; sat1.k0 = 0; sat1.stepS = 0;
    stn1.azimuthDeg[0] = s.azimuthDeg; stn1.elevationDeg[0] = s.elevationDeg; stn1.apparentElevationDeg[0] = s.apparentElevationDeg;
    stn1.rangeKm[0] = s.rangeKm; stn1.rangeRateKmS[0] = s.rangeRateKmS; stn1.rangeAccelKmS2[0] = s.rangeAccelKmS2;
    const u = lineOfSightTeme(s);
    stn1.losX[0] = u[0]; stn1.losY[0] = u[1]; stn1.losZ[0] = u[2];
    effects.invalidate(); // one-entry columns refilled each call: never reuse the shared effect columns
    evaluateColumns(sat1, 0, stn1, 1, cols1, true);
    readStep(stn1, cols1, 0, s.timeS, modeNames, out);
    detail.atmosphericElevationDeg = cols1.atmosphericElevationDeg[0];
    detail.txGainDBi = cols1.txGainDBi[0];
    detail.rxGainDBi = cols1.rxGainDBi[0];
    detail.spacecraftOffBoresightDeg = downlink ? cols1.txOffBoresightDeg[0] : cols1.rxOffBoresightDeg[0];
    detail.groundOffBoresightDeg = downlink ? cols1.rxOffBoresightDeg[0] : cols1.txOffBoresightDeg[0];
    return out;
  }

  const engine: LinkEngine = {
    link, climate, weatherCases,
    spacecraftAntenna: scAnt, groundAntenna: gndAnt,
    polarisationLossDB: polLoss, notes, table, detail,
    beginPass() { resetMount(mount); },
    evaluate,
    evaluateColumns,
    modeNames,
    spacecraftPointingKey: `${scPointing.kind}|${scPointing.kind === 'tracking' ? '' : scBoresight.join(',')}`,
    spacecraftOffBoresight(sat, satFrom, stn, n, out) { spacecraftOffBoresightColumn(scPointing, scBoresight, sat, satFrom, stn, n, out); },
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
