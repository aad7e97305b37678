/**
 * The budget of one instant as readable lines: one per term, with its value(s),
 * unit, how it enters the carrier-to-noise sum and the model or formula that
 * produced it. Our own layout: sections Geometry / Transmit / Path / Receive / Result.
 * Sign convention: powers and gains are added ("+"), losses are positive dB and
 * subtracted ("−"); a blank sign is information only.
 */
import { BOLTZMANN_DBW_PER_K_HZ } from '../models/index.js';
import { formatIsoUtc } from '../orbit/time.js';
import type { GeometrySample } from '../geometry/types.js';
import { copyStepBudget } from './columns.js';
import type { LinkEngine, StepDetail } from './engine.js';
import type { StepBudget } from './types.js';

export type ExplainSection = 'Geometry' | 'Transmit' | 'Path' | 'Receive' | 'Result';
export type ExplainValue = number | string | boolean;

export interface ExplainLine {
  section: ExplainSection;
  term: string;
  /** One value, or one per weather case when `perCase`. */
  values: ExplainValue[];
  perCase: boolean;
  unit: string;
  /** How the term enters C/N0: '+', '−', or '' (information). */
  sign: '+' | '−' | '';
  /** Decimal places for display. */
  digits: number;
  source: string;
}

export interface ExplainInput {
  engine: LinkEngine;
  sample: GeometrySample;
  step: StepBudget;
  detail: StepDetail;
}

const pointingSource: Record<string, string> = {
  nadir: 'nadir-pointing body frame (+Z nadir, +X along velocity ⊥ nadir); pattern at the off-boresight angle',
  tracking: 'ideal station tracking: 0° off boresight',
  inertial: 'boresight fixed in TEME; pattern at the off-boresight angle',
  track: 'program track (mount lag when rate-limited)',
  fixed: 'fixed boresight (azimuth, elevation); pattern at the off-boresight angle',
};

export function explainStep(input: ExplainInput): ExplainLine[] {
  const { engine, sample: s, step, detail: d } = input;
  const link = engine.link;
  const downlink = link.direction === 'downlink';
  const txName = downlink ? 'spacecraft' : 'ground';
  const rxName = downlink ? 'ground' : 'spacecraft';
  const txAnt = downlink ? engine.spacecraftAntenna : engine.groundAntenna;
  const rxAnt = downlink ? engine.groundAntenna : engine.spacecraftAntenna;
  const txPointing = downlink ? link.spacecraft.pointing.kind : link.ground.pointing.kind;
  const rxPointing = downlink ? link.ground.pointing.kind : link.spacecraft.pointing.kind;
  const pc = (f: (c: StepBudget['cases'][number]) => ExplainValue) => step.cases.map(f);
  const lines: ExplainLine[] = [];
  const add = (section: ExplainSection, term: string, value: ExplainValue | ExplainValue[], unit: string,
    sign: ExplainLine['sign'], digits: number, source: string) => {
    const perCase = Array.isArray(value);
    lines.push({ section, term, values: perCase ? value : [value], perCase, unit, sign, digits, source });
  };

  add('Geometry', 'time', formatIsoUtc(s.timeS), 'UTC', '', 0, 'sample instant');
  add('Geometry', 'slant range', step.range_km, 'km', '', 3, 'station → spacecraft, ECEF');
  add('Geometry', 'elevation (geometric)', step.elevation_deg, 'deg', '', 3, 'WGS-84 station frame');
  add('Geometry', 'elevation (apparent)', s.apparentElevationDeg, 'deg', '', 3, 'ITU-R P.834 refraction (from memory); used for the atmosphere');
  add('Geometry', 'azimuth', step.azimuth_deg, 'deg', '', 3, 'from north, eastward');
  add('Geometry', 'altitude', s.altitudeKm, 'km', '', 3, 'above WGS-84');
  add('Geometry', 'spacecraft off-nadir angle', s.offNadirDeg, 'deg', '', 3, 'nadir to station, at the spacecraft');
  add('Geometry', 'range rate', s.rangeRateKmS, 'km/s', '', 4, 'd(range)/dt, positive receding');
  add('Geometry', 'Doppler shift', step.doppler_hz, 'Hz', '', 1, '−f ṙ/c at the carrier');
  add('Geometry', 'Doppler rate', step.doppler_rate_hz_s, 'Hz/s', '', 2, '−f r̈/c');

  add('Transmit', `${txName} transmitter power`, d.txPowerDBW, 'dBW', '+', 2, 'link description');
  add('Transmit', `${txName} line loss`, d.txLineLossDB, 'dB', '−', 2, 'link description');
  add('Transmit', `${txName} off-boresight angle`, step.tx_off_boresight_deg, 'deg', '', 3, pointingSource[txPointing]);
  add('Transmit', `${txName} antenna gain`, d.txGainDBi, 'dBi', '+', 2, txAnt.source);
  add('Transmit', 'EIRP', step.eirp_dbw, 'dBW', '', 2, 'P_tx − L_line + G_tx(θ)');
  add('Transmit', `${txName} pointing loss`, step.tx_pointing_loss_db, 'dB', '−', 3, 'G(θ) − G(θ + error), error as a worst-case extra angle');

  add('Path', 'free-space loss', step.free_space_loss_db, 'dB', '−', 2, `ITU-R P.525: 20 log10(4π d f / c), f = ${link.frequencyGHz} GHz`);
  add('Path', 'gas attenuation', pc((c) => c.gas_loss_db), 'dB', '', 3, 'ITU-R P.676-12 Annex 2 (equivalent heights)');
  add('Path', 'rain attenuation', pc((c) => c.rain_loss_db), 'dB', '', 3, 'ITU-R P.618-13 §2.2.1.1 with P.838-3');
  add('Path', 'cloud attenuation', pc((c) => c.cloud_loss_db), 'dB', '', 3, 'ITU-R P.840');
  add('Path', 'scintillation fade', pc((c) => c.scintillation_db), 'dB', '', 3, 'ITU-R P.618-13 §2.4.1');
  add('Path', 'total atmospheric', pc((c) => c.atmospheric_loss_db), 'dB', '−', 3, 'ITU-R P.618-13 §2.5: A_G + sqrt((A_R + A_C)² + A_S²)');
  add('Path', 'polarisation mismatch', step.polarisation_loss_db, 'dB', '−', 3, 'polarisation loss factor from axial ratios and tilt difference');
  add('Path', 'other losses', step.other_losses_db, 'dB', '−', 2, 'link description');

  if (Number.isFinite(step.element_age_days)) {
    add('Receive', 'element-set age', step.element_age_days, 'days', '', 3, 't − element epoch (or the fixed what-if age)');
    add('Receive', 'element pointing error', step.element_pointing_error_deg, 'deg', '', 4,
      'atan(e⊥ / range), e⊥ the along/cross-track error across the line of sight; root sum of squares with the program track\'s own error');
  }
  if (Number.isFinite(step.sun_separation_deg)) {
    add('Receive', 'Sun from the ground boresight', step.sun_separation_deg, 'deg', '', 3, 'Astronomical Almanac low-precision Sun (from memory), geocentric');
    add('Receive', 'Sun noise (antenna temperature)', step.sun_noise_temperature_k, 'K', '', 1,
      'quiet-Sun brightness (from memory, rough) × activity, 0.533° disc weighted by the ground pattern; in the antenna temperature below');
    add('Receive', 'C/N0 lost to the Sun', pc((c) => c.sun_loss_db), 'dB', '', 3, '10 log10(1 + ΔT_sys / T_sys), in G/T below');
  }
  add('Receive', `${rxName} off-boresight angle`, step.rx_off_boresight_deg, 'deg', '', 3, pointingSource[rxPointing]);
  if (!downlink || link.ground.pointing.kind === 'track') {
    add('Receive', 'mount lag', step.mount_lag_deg, 'deg', '', 3, 'rate-limited az–el mount, pre-positioned at AOS');
    add('Receive', 'mount rate-limited', step.mount_limited, '', '', 0, 'a rate limit bound this step');
  }
  add('Receive', `${rxName} antenna gain`, d.rxGainDBi, 'dBi', '', 2, rxAnt.source);
  add('Receive', `${rxName} feed loss`, d.rxFeedLossDB, 'dB', '', 2, 'antenna to LNA, at 290 K');
  add('Receive', 'antenna temperature', pc((c) => c.antenna_temperature_k), 'K', '', 1,
    downlink ? 'sky (ITU-R P.618-13 §3) + spill-over + external (P.372, from memory)' : 'Earth-filled beam 290 K (from memory) + spill-over');
  add('Receive', 'system temperature', pc((c) => c.system_temperature_k), 'K', '', 1, 'Friis at the LNA input: T_A·a + T0(1 − a) + T_rx');
  add('Receive', 'G/T', pc((c) => c.g_over_t_dbk), 'dB/K', '+', 2, 'G_rx − L_feed − 10 log10 T_sys');
  add('Receive', `${rxName} pointing loss`, step.rx_pointing_loss_db, 'dB', '−', 3, 'G(θ) − G(θ + error + lag)');
  add('Receive', 'Boltzmann constant k', BOLTZMANN_DBW_PER_K_HZ, 'dBW/K/Hz', '−', 2, '10 log10(1.380649e-23 J/K), 2019 SI');

  add('Result', 'C/N0', pc((c) => c.c_over_n0_dbhz), 'dBHz', '', 2, 'sum of the signed terms above');
  if (link.modcod.kind === 'fixed') {
    add('Result', 'bit rate', engine.bitRateBps, 'b/s', '', 0, `${link.modcod.modulation}, ${link.modcod.coding}`);
  }
  add('Result', 'symbol rate', engine.symbolRateBaud, 'baud', '', 0, link.modcod.kind === 'fixed' ? 'bit rate / bits per symbol' : 'adaptive link');
  add('Result', 'Es/N0', pc((c) => c.es_over_n0_db), 'dB', '', 2, 'C/N0 − 10 log10 R_s');
  add('Result', 'Eb/N0', pc((c) => c.eb_over_n0_db), 'dB', '', 2,
    link.modcod.kind === 'fixed' ? 'C/N0 − 10 log10 R_b' : 'Es/N0 − 10 log10 η of the mode');
  add('Result', 'required Eb/N0', pc((c) => c.required_eb_over_n0_db), 'dB', '', 2,
    link.modcod.kind === 'fixed' ? 'link description (resolved from modulation, coding and BER)' : 'mode required Es/N0 − 10 log10 η');
  add('Result', 'implementation loss', link.implementationLossDB, 'dB', '', 2, 'link description');
  if (link.modcod.kind === 'adaptive') add('Result', 'mode', pc((c) => c.mode || '(none fits)'), '', '', 0, 'most efficient mode with required Es/N0 + margin ≤ Es/N0 − impl');
  add('Result', 'margin', pc((c) => c.margin_db), 'dB', '', 2,
    link.modcod.kind === 'fixed' ? 'Eb/N0 − required Eb/N0 − implementation loss' : '(Es/N0 − impl) − mode required Es/N0');
  add('Result', 'required margin', link.requiredMarginDB, 'dB', '', 2, 'link description');
  add('Result', 'usable', pc((c) => c.usable), '', '', 0, 'margin ≥ required margin');
  add('Result', 'information rate', pc((c) => c.information_rate_bps), 'b/s', '', 0, 'when usable');
  return lines;
}

function formatValue(v: ExplainValue, digits: number): string {
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) return String(v);
    return v.toFixed(digits);
  }
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  return v;
}

export interface ExplainHeader { title: string; weatherNames: string[]; notes?: string[] }

/** Plain-text table: one line per term; per-case values in one column per weather case. */
export function formatExplainTable(lines: ExplainLine[], header: ExplainHeader): string {
  const nCases = header.weatherNames.length;
  const termW = Math.max(24, ...lines.map((l) => l.term.length)) + 2;
  // Column width from the per-case values and numbers; long single texts (the time) simply span the case columns.
  const cellW = Math.max(10, ...header.weatherNames.map((n) => n.length + 2),
    ...lines.flatMap((l) => (l.perCase || typeof l.values[0] === 'number' ? l.values.map((v) => formatValue(v, l.digits).length + 2) : [])));
  const unitW = Math.max(6, ...lines.map((l) => l.unit.length + 2));
  const out: string[] = [header.title,
    'Sign: "+" adds to C/N0, "−" subtracts (losses are positive dB); blank = information.', ''];
  let section = '';
  for (const l of lines) {
    if (l.section !== section) {
      section = l.section;
      const head = l.section.padEnd(termW + 2) + header.weatherNames.map((n) => n.padStart(cellW)).join('');
      out.push(section === 'Geometry' ? l.section : head);
    }
    const cells = l.perCase
      ? l.values.map((v) => formatValue(v, l.digits).padStart(cellW)).join('')
      : formatValue(l.values[0], l.digits).padStart(cellW).padEnd(cellW * Math.max(1, nCases));
    out.push(`${l.sign || ' '} ${l.term.padEnd(termW)}${cells}  ${l.unit.padEnd(unitW)}${l.source}`);
  }
  if (header.notes?.length) {
    out.push('', 'Notes:');
    for (const n of header.notes) out.push(`  - ${n}`);
  }
  return out.join('\n') + '\n';
}

/** The JSON form of one explained instant: the per-step record (all cases) plus context. */
export function explainRecord(engine: LinkEngine, step: StepBudget): Record<string, unknown> {
  const l = engine.link;
  return {
    link: l.name, satellite: l.satellite, station: l.station, direction: l.direction, frequency_ghz: l.frequencyGHz,
    time_utc: formatIsoUtc(step.time_s),
    step: copyStepBudget(step),
    notes: engine.notes,
  };
}
