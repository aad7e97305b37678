/**
 * Catalogue of bad scenarios, each made from `fixtures/scenarios/base.yaml` by
 * replacing one line (or from its JSON form). Every case must be rejected with
 * one `InputError` line `FILE:LINE path: ...`; the expected line is where the
 * bad text sits in the written file (found by searching the text, not by the
 * loader). Exported for reuse by the CLI-level test (exit 2, no output dir).
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { parse } from 'yaml';

export const PROJECT_ROOT = path.resolve(import.meta.dirname, '../..');
export const BASE_SCENARIO = path.join(PROJECT_ROOT, 'fixtures/scenarios/base.yaml');
const ELEMENTS = path.join(PROJECT_ROOT, 'fixtures/demo/orbilux-3.tle');

export interface BadCase {
  name: string;
  /** Replace the first line equal (after trimming) to `from` by `to` (same indentation); `to: null` deletes it. */
  edits: { from: string; to: string | null }[];
  format?: 'yaml' | 'json';
  /** Text whose first occurrence (after the edits) is the line the error must name. */
  lineOf: string;
  /** Scenario path the error must name, or null for a syntax error (then FILE:LINE:COL). */
  path: string | null;
  /** Words the message must contain. */
  contains: string[];
}

export const BAD_CASES: BadCase[] = [
  { name: 'missing-field', edits: [{ from: 'latitude_deg: 10.5', to: null }], lineOf: '- name: Alpha', path: 'stations[0].latitude_deg', contains: ['missing', 'number'] },
  { name: 'wrong-unit', edits: [{ from: 'diameter_m: 2.4', to: 'diameter_cm: 240' }], lineOf: 'diameter_cm: 240', path: 'stations[0].terminals.dish.antenna.diameter_cm', contains: ['unknown key "diameter_cm"', 'allowed: type, diameter_m, efficiency'] },
  { name: 'negative-diameter', edits: [{ from: 'diameter_m: 2.4', to: 'diameter_m: -3.7' }], lineOf: 'diameter_m: -3.7', path: 'stations[0].terminals.dish.antenna.diameter_m', contains: ['must be > 0 (got -3.7)'] },
  { name: 'unknown-station', edits: [{ from: 'stations: [Alpha]', to: 'stations: [Gamma]' }], lineOf: 'stations: [Gamma]', path: 'satellites[0].links[0].stations[0]', contains: ['unknown station "Gamma"', 'Alpha, Beta'] },
  { name: 'uplink-without-transmitter', edits: [{ from: 'stations: [Beta]', to: 'stations: [Alpha]' }], lineOf: '      dish:', path: 'stations[0].terminals.dish', contains: ['missing transmitter', 's-ul'] },
  { name: 'unknown-terminal-name', edits: [{ from: 'terminal: dish', to: 'terminal: dsh' }], lineOf: 'terminal: dsh', path: 'satellites[0].links[0].terminal', contains: ['unknown terminal "dsh"', 'allowed: dish'] },
  { name: 'frequency-above-models', edits: [{ from: 'frequency_ghz: 8.2', to: 'frequency_ghz: 75' }], lineOf: 'frequency_ghz: 75', path: 'satellites[0].links[0].frequency_ghz', contains: ['75 GHz', 'P.618'] },
  { name: 'frequency-below-ionosphere', edits: [{ from: 'frequency_mhz: 2250', to: 'frequency_mhz: 12' }], lineOf: 'frequency_mhz: 12', path: 'satellites[0].links[1].frequency_mhz', contains: ['0.012 GHz', 'outside'] },
  { name: 'element-file-not-found', edits: [{ from: 'elements: ELEMENTS', to: 'elements: no-such-file.tle' }], lineOf: 'elements: no-such-file.tle', path: 'satellites[0].elements', contains: ['element file not found', 'no-such-file.tle'] },
  { name: 'duplicate-station', edits: [{ from: '- name: Beta', to: '- name: Alpha' }], lineOf: '- name: Alpha\n', path: 'stations[1].name', contains: ['duplicate station name "Alpha"'] },
  { name: 'duplicate-link', edits: [{ from: '- name: s-ul', to: '- name: s-dl' }], lineOf: '- name: s-dl\n', path: 'satellites[0].links[2].name', contains: ['duplicate link name "s-dl"'] },
  { name: 'end-before-start', edits: [{ from: 'duration: 2d', to: 'end: 2026-11-20T00:00:00Z' }], lineOf: 'end: 2026-11-20', path: 'window.end', contains: ['not after its start'] },
  { name: 'zero-step', edits: [{ from: 'step_s: 10', to: 'step_s: 0' }], lineOf: 'step_s: 0', path: 'window.step_s', contains: ['must be ≥ 0.01 (got 0)'] },
  { name: 'step-below-10-ms', edits: [{ from: 'step_s: 10', to: 'step_s: 0.000001' }], lineOf: 'step_s: 0.000001', path: 'window.step_s', contains: ['must be ≥ 0.01 (got 0.000001)'] },
  { name: 'rate-range-endless', edits: [{ from: 'from_bps: 1000', to: 'from_bps: 5e-324' }], lineOf: '  range:', path: 'rate_finder.range', contains: ['endless rates', 'at most 1000'] },
  { name: 'water-vapour-content-near-zero', edits: [{ from: 'water_vapour_density_g_m3: 9', to: 'water_vapour_content_kg_m2: 0.000000001' }], lineOf: 'water_vapour_content_kg_m2', path: 'stations[1].climate.water_vapour_content_kg_m2', contains: ['must be ≥ 0.1'] },
  { name: 'bad-iso-date', edits: [{ from: 'start: 2026-11-21T00:00:00Z', to: 'start: 2026-13-45T00:00:00Z' }], lineOf: 'start: 2026-13-45', path: 'window.start', contains: ['not an ISO-8601 date-time'] },
  { name: 'bad-duration', edits: [{ from: 'duration: 2d', to: 'duration: 2 days' }], lineOf: 'duration: 2 days', path: 'window.duration', contains: ['not a duration'] },
  { name: 'bad-zone-letter', edits: [{ from: 'rain_zone: K', to: 'rain_zone: I' }], lineOf: 'rain_zone: I', path: 'stations[1].climate.rain_zone', contains: ['must be one of A, B', '(got "I")'] },
  { name: 'efficiency-above-1', edits: [{ from: 'efficiency: 0.6', to: 'efficiency: 1.2' }], lineOf: 'efficiency: 1.2', path: 'stations[0].terminals.dish.antenna.efficiency', contains: ['must be ≤ 1 (got 1.2)'] },
  { name: 'latitude-91', edits: [{ from: 'latitude_deg: 10.5', to: 'latitude_deg: 91' }], lineOf: 'latitude_deg: 91', path: 'stations[0].latitude_deg', contains: ['must be ≤ 90 (got 91)'] },
  { name: 'mask-not-sorted', edits: [{ from: 'mask_table: [[0, 3], [90, 5], [180, 4], [270, 6]]', to: 'mask_table: [[0, 3], [180, 5], [90, 4]]' }], lineOf: 'mask_table:', path: 'stations[1].mask_table[2][0]', contains: ['strictly increase', 'got 90 after 180'] },
  { name: 'mask-duplicate-azimuth', edits: [{ from: 'mask_table: [[0, 3], [90, 5], [180, 4], [270, 6]]', to: 'mask_table: [[0, 3], [90, 5], [90, 4]]' }], lineOf: 'mask_table:', path: 'stations[1].mask_table[2][0]', contains: ['without repeats'] },
  { name: 'unknown-modulation', edits: [{ from: 'modulation: bpsk', to: 'modulation: 8fsk' }], lineOf: 'modulation: 8fsk', path: 'satellites[0].links[1].modcod.modulation', contains: ['must be one of bpsk, qpsk', '(got "8fsk")'] },
  { name: 'unknown-coding', edits: [{ from: 'coding: conv-r1/2-k7', to: 'coding: turbo-r1/3' }], lineOf: 'coding: turbo-r1/3', path: 'satellites[0].links[1].modcod.coding', contains: ['unknown coding profile "turbo-r1/3"', 'conv-r1/2-k7'] },
  { name: 'fraction-above-1', edits: [{ from: 'fraction: 0.9', to: 'fraction: 1.5' }], lineOf: 'fraction: 1.5', path: 'mask_finder.fraction', contains: ['must be ≤ 1 (got 1.5)'] },
  { name: 'fraction-zero', edits: [{ from: 'fraction: 0.9', to: 'fraction: 0' }], lineOf: 'fraction: 0', path: 'mask_finder.fraction', contains: ['must be > 0 (got 0)'] },
  { name: 'yaml-syntax-error', edits: [{ from: '  step_s: 10\n', to: ' step_s: 10\n' }], lineOf: ' step_s: 10', path: null, contains: ['YAML/JSON syntax error', 'same column'] },
  { name: 'yaml-duplicate-key', edits: [{ from: 'step_s: 10', to: 'step_s: 10\n  step_s: 20' }], lineOf: 'step_s: 20', path: null, contains: ['syntax error', 'unique'] },
  { name: 'json-bad-value', format: 'json', edits: [{ from: '"diameter_m": 2.4', to: '"diameter_m": -1' }], lineOf: '"diameter_m": -1', path: 'stations[0].terminals.dish.antenna.diameter_m', contains: ['must be > 0 (got -1)'] },
  { name: 'json-wrong-type', format: 'json', edits: [{ from: '"height_m": 300', to: '"height_m": "high"' }], lineOf: '"height_m": "high"', path: 'stations[0].height_m', contains: ['must be a number (got "high")'] },
  { name: 'unknown-top-level-key', edits: [{ from: 'weather: [clear, 1]', to: 'wether: [clear, 1]' }], lineOf: 'wether:', path: 'wether', contains: ['unknown key "wether"', 'allowed: name, description, window, weather'] },
  { name: 'weather-percent-out-of-range', edits: [{ from: 'weather: [clear, 1]', to: 'weather: [clear, 10]' }], lineOf: 'weather:', path: 'weather[1]', contains: ['must be ≤ 5 (got 10)'] },
  { name: 'both-power-units', edits: [{ from: 'power_dbw: 3', to: 'power_dbw: 3\n            power_w: 2' }], lineOf: 'power_dbw: 3', path: 'satellites[0].links[0].spacecraft.transmitter.power_dbw', contains: ['either power_w or power_dbw'] },
  { name: 'both-masks', edits: [{ from: 'mask_deg: 5', to: 'mask_deg: 5\n    mask_table: [[0, 1], [180, 2]]' }], lineOf: 'mask_table: [[0, 1]', path: 'stations[0].mask_table', contains: ['either mask_deg or mask_table'] },
  { name: 'unknown-antenna-type', edits: [{ from: 'type: parabolic', to: 'type: helix' }], lineOf: 'type: helix', path: 'stations[0].terminals.dish.antenna.type', contains: ['must be one of isotropic, parabolic, cosine-power, table', '(got "helix")'] },
  { name: 'downlink-without-receiver', edits: [{ from: '        receiver:\n          noise_figure_db: 1.2\n', to: '' }], lineOf: '      dish:', path: 'stations[0].terminals.dish', contains: ['missing receiver', 'x-dl'] },
  { name: 'receiver-without-noise', edits: [{ from: 'noise_figure_db: 1.2', to: 'feed_loss_db: 0.3' }], lineOf: '        receiver:\n          feed_loss_db', path: 'stations[0].terminals.dish.receiver', contains: ['missing noise_figure_db or noise_temperature_k'] },
  { name: 'network-order-unknown-station', edits: [{ from: 'order: [Beta, Alpha]', to: 'order: [Beta, Omega]' }], lineOf: 'order:', path: 'network.order[1]', contains: ['unknown station "Omega"'] },
  { name: 'pattern-not-from-zero', edits: [{ from: 'pattern: [[0, 30], [5, 20], [20, 0], [180, -10]]', to: 'pattern: [[2, 30], [5, 20], [20, 0], [180, -10]]' }], lineOf: 'pattern:', path: 'stations[1].terminals.dish.antenna.pattern[0][0]', contains: ['start at off-boresight 0'] },
  { name: 'steps-format-unknown', edits: [{ from: '  steps: true', to: '  steps: xlsx' }], lineOf: '  steps: xlsx', path: 'output.steps', contains: ['must be "csv" or "parquet" or "none" or true or false (got "xlsx")'] },
  { name: 'ber-out-of-range', edits: [{ from: 'modulation: bpsk', to: 'modulation: bpsk\n          ber: 0.7' }], lineOf: 'ber: 0.7', path: 'satellites[0].links[1].modcod.ber', contains: ['must be ≤ 0.4 (got 0.7)'] },
];

function applyEdits(text: string, edits: BadCase['edits']): string {
  let out = text;
  for (const { from, to } of edits) {
    const lines = out.split('\n');
    const i = from.includes('\n') ? -1 : lines.findIndex((l) => l.trim() === from.trim());
    if (i < 0) {
      // multi-line "from" or JSON fragments: plain substring replace
      if (!out.includes(from)) throw new Error(`bad-cases: ${JSON.stringify(from)} not found in the base scenario`);
      out = out.replace(from, to ?? '');
      continue;
    }
    const indent = /^\s*/.exec(lines[i])![0];
    if (to === null) lines.splice(i, 1);
    else lines[i] = to.split('\n').map((t, k) => (k === 0 ? indent + t.trimStart() : t)).join('\n');
    out = lines.join('\n');
  }
  return out;
}

/** The base scenario text with the element path made absolute, in YAML or JSON. */
export function baseText(format: 'yaml' | 'json' = 'yaml'): string {
  const yamlText = readFileSync(BASE_SCENARIO, 'utf8').replace('elements: ../demo/orbilux-3.tle', `elements: ${ELEMENTS}`);
  return format === 'yaml' ? yamlText : `${JSON.stringify(parse(yamlText), null, 2)}\n`;
}

export interface WrittenBadCase extends BadCase { file: string; line: number }

/** Write every case into `dir` (as NN-name.yaml / .json) and return where each error must point. */
export function writeBadCases(dir: string): WrittenBadCase[] {
  mkdirSync(dir, { recursive: true });
  return BAD_CASES.map((c, i) => {
    const format = c.format ?? 'yaml';
    const edits = c.edits.map((e) => ({ ...e, from: e.from.replace('ELEMENTS', ELEMENTS) }));
    const text = applyEdits(baseText(format), edits);
    const at = text.indexOf(c.lineOf);
    if (at < 0) throw new Error(`bad-cases ${c.name}: ${JSON.stringify(c.lineOf)} not in the edited text`);
    // For a repeated text (duplicate names) the error names the second occurrence.
    const second = c.name.startsWith('duplicate-') ? text.indexOf(c.lineOf, at + 1) : -1;
    const offset = second >= 0 ? second : at;
    const line = text.slice(0, offset).split('\n').length;
    const file = path.join(dir, `${String(i + 1).padStart(2, '0')}-${c.name}.${format}`);
    writeFileSync(file, text);
    return { ...c, file, line };
  });
}
