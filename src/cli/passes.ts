/**
 * `passbudget passes`: list passes of each satellite over each station.
 * Wiring only: every step is a library call; all input is checked before any
 * output is written.
 */
import { existsSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import type { Command } from 'commander';
import { IANAZone } from 'luxon';
import { InputError } from '../errors.js';
import { epochWarning, loadElementsFile } from '../elements/load.js';
import { selectNearestEpoch } from '../elements/select.js';
import { MASK_MAX_DEG, MASK_MIN_DEG } from '../geometry/mask.js';
import { parseStationSpec } from '../geometry/spec.js';
import { createPropagator } from '../orbit/propagator.js';
import { parseDuration, parseIsoUtc } from '../orbit/time.js';
import { createOrbit, findPasses } from '../passes/find.js';
import { passesCsv, passesJson, passesTable } from '../passes/table.js';
import type { Pass } from '../passes/types.js';
import { writeFileAtomic } from '../output/atomic.js';
import { examples } from './examples.js';
import { propagationProblem } from '../scenario/propagation.js';

interface PassesOptions {
  elements: string;
  station: string[];
  stationName: string[];
  start?: string;
  end?: string;
  duration?: string;
  mask: string;
  format: string;
  out?: string;
  tz?: string;
  exactOrbit?: boolean;
}

const collect = (v: string, acc: string[]) => [...acc, v];
const FORMATS = ['table', 'csv', 'json'];

export function register(program: Command): void {
  program
    .command('passes')
    .description('List passes (AOS, TCA, LOS, peak elevation) of each satellite over each station above a horizon mask')
    .requiredOption('--elements <file>', 'TLE/3LE, OMM JSON or OMM XML file')
    .option('--station <spec>', 'LAT,LON[,HEIGHT_M] or NAME=LAT,LON[,HEIGHT_M] (deg, m above WGS-84); repeatable', collect, [])
    .option('--station-name <name>', 'name for the --station of the same rank; repeatable', collect, [])
    .option('--start <iso>', 'window start, ISO-8601 (default: element epoch rounded down to the hour)')
    .option('--end <iso>', 'window end, ISO-8601')
    .option('--duration <d>', 'window length, e.g. 36h or 7d (default 48h)')
    .option('--mask <deg>', 'constant horizon mask elevation (deg)', '0')
    .option('--format <fmt>', 'table, csv or json', 'table')
    .option('--out <file>', 'write to this file (atomically) instead of stdout')
    .option('--tz <zone>', 'IANA time zone for the table times (default UTC)')
    .option('--exact-orbit', 'SGP4 at every instant instead of interpolating between SGP4 nodes (slower; a check)')
    .addHelpText('after', examples([
      ['passbudget passes --elements fixtures/demo/orbilux-3.tle --station Kaldfjell=68.40,17.25,120 --duration 48h --mask 5', 'two days of passes over one station, as a table'],
      ['passbudget passes --elements sat.omm.xml --station 42.14,-3.12,980 --start 2026-11-21T00:00:00Z --duration 7d --format csv --out passes.csv', 'a week from an OMM XML file, as CSV'],
    ]))
    .action((opts: PassesOptions) => runPasses(opts));
}

function runPasses(o: PassesOptions): void {
  if (!FORMATS.includes(o.format)) throw new InputError(`--format: unknown format ${JSON.stringify(o.format)} (allowed ${FORMATS.join(', ')})`);
  if (o.tz !== undefined && !IANAZone.isValidZone(o.tz)) throw new InputError(`--tz: unknown time zone ${JSON.stringify(o.tz)} (allowed an IANA zone such as Europe/Oslo or UTC)`);
  if (o.tz !== undefined && o.format !== 'table') throw new InputError(`--tz: only used by --format table (CSV and JSON times are UTC)`);
  const maskDeg = /^\s*[+-]?(\d+\.?\d*|\.\d+)\s*$/.test(o.mask) ? Number(o.mask) : NaN;
  if (!(maskDeg >= MASK_MIN_DEG && maskDeg <= MASK_MAX_DEG)) {
    throw new InputError(`--mask: ${JSON.stringify(o.mask)} is not a mask elevation (allowed ${MASK_MIN_DEG} to ${MASK_MAX_DEG} deg)`);
  }
  if (o.station.length === 0) throw new InputError('--station: at least one station is needed (allowed LAT,LON[,HEIGHT_M], repeatable)');
  if (o.stationName.length > o.station.length) {
    throw new InputError(`--station-name: ${o.stationName.length} names for ${o.station.length} stations (allowed at most one name per --station, in the same order)`);
  }
  const mask = { kind: 'constant' as const, elevationDeg: maskDeg };
  const stations = o.station.map((spec, i) => parseStationSpec(spec, `--station ${spec}`, o.stationName[i] ?? `station-${i + 1}`, mask));
  const all = loadElementsFile(o.elements);
  const startS = o.start !== undefined
    ? parseIsoUtc(o.start, '--start')
    : Math.floor(Math.max(...all.map((e) => e.epochUnixS)) / 3600) * 3600;
  if (o.end !== undefined && o.duration !== undefined) throw new InputError('--end: given together with --duration (allowed one of them)');
  const endS = o.end !== undefined ? parseIsoUtc(o.end, '--end') : startS + parseDuration(o.duration ?? '48h', '--duration');
  if (!(endS > startS)) throw new InputError(`--end: ${o.end} is not after the window start ${new Date(startS * 1000).toISOString()} (allowed a later instant)`);
  if (endS - startS > 366 * 86_400) throw new InputError('--duration: window longer than 366 days (allowed up to 366 d)');
  if (o.out !== undefined) {
    const dir = dirname(resolve(o.out));
    if (!existsSync(dir) || !statSync(dir).isDirectory()) throw new InputError(`--out: folder ${dir} does not exist (allowed a file in an existing folder)`);
  }
  const sets = selectNearestEpoch(all, startS);
  for (const e of sets) {
    const problem = propagationProblem(e, startS, endS);
    if (problem) throw new InputError(`${o.elements}:${e.source.line}: ${e.name} cannot be propagated over the window: ${problem} (allowed: an element set SGP4 carries across the window)`);
  }
  const propagators = sets.map(createPropagator);
  for (const e of sets) {
    const w = epochWarning(e, startS);
    if (w) process.stderr.write(`passbudget: ${w}\n`);
  }

  const passes: Pass[] = [];
  for (const propagator of propagators) {
    // One orbit per element set, shared by the stations (its SGP4 nodes computed once).
    const orbit = createOrbit(propagator, { startS, stepS: 1 }, o.exactOrbit === true);
    for (const station of stations) passes.push(...findPasses({ orbit, station, startS, endS }));
  }
  passes.sort((a, b) => a.aosS - b.aosS);
  const text = o.format === 'csv' ? passesCsv(passes) : o.format === 'json' ? passesJson(passes) : passesTable(passes, o.tz);
  if (o.out !== undefined) {
    writeFileAtomic(o.out, text);
    process.stderr.write(`passbudget: wrote ${passes.length} passes to ${o.out}\n`);
  } else {
    process.stdout.write(text);
  }
}
