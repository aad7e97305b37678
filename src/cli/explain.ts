/**
 * `passbudget explain`: the full budget of one link at one instant, one line
 * per term with its value, unit and source. Wiring only: the scenario loader,
 * `budgetAtInstant` and the table layout are library calls.
 */
import type { Command } from 'commander';
import { InputError } from '../errors.js';
import { budgetAtInstant, type InstantSpec } from '../budget/instant.js';
import { explainRecord, formatExplainTable } from '../budget/explain.js';
import { formatIsoUtc, parseIsoUtc } from '../orbit/time.js';
import { loadScenario } from '../scenario/index.js';
import { explainPassJson, explainTermsJson } from '../output/json.js';
import { examples } from './examples.js';
import { printNotices } from './notices.js';

interface ExplainOptions {
  scenario: string;
  satellite: string;
  station: string;
  link: string;
  at?: string;
  pass?: string;
  atTca?: boolean;
  atElevation?: string;
  format: string;
}

const FORMATS = ['table', 'json'];

export function register(program: Command): void {
  program
    .command('explain')
    .description('Show every term of one link budget at one instant: geometry, transmit, path, receive, result')
    .requiredOption('--scenario <file>', 'scenario file (YAML or JSON)')
    .requiredOption('--satellite <name>', 'satellite name in the scenario')
    .requiredOption('--station <name>', 'station name in the scenario')
    .requiredOption('--link <name>', 'link name of that satellite')
    .option('--at <iso>', 'the instant, ISO-8601 (UTC when no offset)')
    .option('--pass <n>', 'pass number of that satellite over that station in the scenario window (1-based)')
    .option('--at-tca', 'with --pass: at the time of closest approach')
    .option('--at-elevation <deg>', 'with --pass: when the pass first reaches this elevation (rising side)')
    .option('--format <fmt>', 'table or json', 'table')
    .addHelpText('after', examples([
      ['passbudget explain --scenario fixtures/demo/scenario.yaml --satellite ORBILUX-3 --station Kaldfjell --link x-band --pass 2 --at-tca', 'every term of the X-band budget at the closest approach of pass 2'],
      ['passbudget explain --scenario my.yaml --satellite SAT --station GS --link s-band --at 2026-11-21T10:15:00Z --format json', 'one instant, as a JSON record'],
    ]))
    .action((opts: ExplainOptions) => runExplain(opts));
}

function instantFrom(o: ExplainOptions): InstantSpec {
  if (o.at !== undefined) {
    if (o.pass !== undefined || o.atTca || o.atElevation !== undefined) {
      throw new InputError('--at: given together with --pass/--at-tca/--at-elevation (allowed --at ISO, or --pass N with --at-tca or --at-elevation DEG)');
    }
    return { kind: 'at', timeS: parseIsoUtc(o.at, '--at') };
  }
  if (o.pass === undefined) {
    throw new InputError('--at: no instant given (allowed --at ISO, or --pass N with --at-tca or --at-elevation DEG)');
  }
  const n = /^\s*\d+\s*$/.test(o.pass) ? Number(o.pass) : NaN;
  if (!(n >= 1)) throw new InputError(`--pass: ${JSON.stringify(o.pass)} is not a pass number (allowed an integer ≥ 1)`);
  if (o.atTca && o.atElevation !== undefined) throw new InputError('--at-tca: given together with --at-elevation (allowed one of them)');
  if (o.atTca) return { kind: 'tca', pass: n };
  if (o.atElevation === undefined) throw new InputError('--pass: needs --at-tca or --at-elevation DEG (allowed one of them)');
  const el = /^\s*[+-]?(\d+\.?\d*|\.\d+)\s*$/.test(o.atElevation) ? Number(o.atElevation) : NaN;
  if (!(el >= -5 && el <= 90)) throw new InputError(`--at-elevation: ${JSON.stringify(o.atElevation)} is not an elevation (allowed -5 to 90 deg)`);
  return { kind: 'elevation', pass: n, elevationDeg: el };
}

function runExplain(o: ExplainOptions): void {
  if (!FORMATS.includes(o.format)) throw new InputError(`--format: unknown format ${JSON.stringify(o.format)} (allowed ${FORMATS.join(', ')})`);
  const instant = instantFrom(o);
  const scenario = loadScenario(o.scenario);
  printNotices(scenario);
  const r = budgetAtInstant(scenario, { satellite: o.satellite, station: o.station, link: o.link }, instant);
  for (const w of r.warnings) process.stderr.write(`passbudget: ${w}\n`);
  const l = r.engine.link;
  if (o.format === 'json') {
    const rec = { ...explainRecord(r.engine, r.step), pass: explainPassJson(r.pass), terms: explainTermsJson(r.lines) };
    process.stdout.write(`${JSON.stringify(rec, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v), 2)}\n`);
    return;
  }
  const passText = r.pass ? `, pass ${r.pass.index} (AOS ${formatIsoUtc(r.pass.aosS)}, peak ${r.pass.maxElevationDeg.toFixed(1)}°)` : '';
  const title = `Link ${l.name} (${l.direction}, ${l.frequencyGHz} GHz): ${l.satellite} ↔ ${l.station} at ${formatIsoUtc(r.step.time_s)}${passText}`;
  process.stdout.write(formatExplainTable(r.lines, {
    title, weatherNames: r.engine.weatherCases.map((w) => w.name), notes: r.engine.notes,
  }));
}
