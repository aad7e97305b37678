/**
 * Validated scenario input → `ResolvedScenario`: references checked (stations,
 * terminals, element files), units resolved, defaults applied and recorded.
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import type { ElementSet } from '../elements/types.js';
import { loadElementsFile } from '../elements/index.js';
import type { LinkEnd, LinkSpec, ModCodSpec, WeatherCase } from '../budget/types.js';
import type { HorizonMask, Station } from '../geometry/types.js';
import { formatIsoUtc, parseDuration, parseIsoUtc } from '../orbit/time.js';
import { resolveClimate, type ResolveContext } from './climate.js';
import { propagationProblem } from './propagation.js';
import { resolvePlan } from './plan.js';
import {
  resolveAntenna, resolveGroundPointing, resolvePolarisation, resolveReceiver, resolveSpacecraftPointing, resolveTransmitter,
} from './ends.js';
import {
  CODING_PROFILES, DVBS2_MODES, MODULATION_BITS_PER_SYMBOL, P372_VALIDITY, P618_RAIN_VALIDITY, P618_SCINTILLATION_VALIDITY,
  P676_SLANT_VALIDITY, codingProfile, requiredEbN0DB, type Interval,
} from '../models/index.js';
import type { LinkInput, ScenarioInput, StationInput, TerminalInput } from './schema.js';
import { ELEMENT_ERROR_DEFAULTS } from './schema.js';
import { formatPath, type Path, type ScenarioSource } from './source.js';
import { stepsChoice, type AppliedDefault, type NetworkPolicy, type ResolvedScenario, type ScenarioSatellite, type ScenarioStation } from './types.js';

/** A window reaching further than this from an element epoch (days) is refused: SGP4 means nothing there. */
export const EPOCH_REFUSE_DAYS = 366;
/** ... and warned about past this many days. */
export const EPOCH_WARN_DAYS = 30;

/** How far the window reaches from the epoch (days), at its end (after the epoch) or its start (before it). */
export function epochReach(elements: ElementSet, startS: number, endS: number): { days: number; side: 'ends' | 'starts' } {
  const after = (endS - elements.epochUnixS) / 86_400;
  const before = (elements.epochUnixS - startS) / 86_400;
  return after >= before ? { days: after, side: 'ends' } : { days: before, side: 'starts' };
}

/** Lowest carrier frequency accepted (GHz): below ~30 MHz the ionosphere reflects (common practice, from memory). */
export const MIN_FREQUENCY_GHZ = 0.03;

interface Validity { rain: Interval; exceedance: Interval; scintillation: Interval; gas: Interval; externalNoiseMHz: readonly [number, number] }

/** Frequency and exceedance ranges of the models, as the models declare them. */
function frequencyValidity(): Validity {
  return {
    rain: P618_RAIN_VALIDITY.frequencyGHz,
    exceedance: P618_RAIN_VALIDITY.exceedancePercent,
    scintillation: P618_SCINTILLATION_VALIDITY.frequencyGHz,
    gas: P676_SLANT_VALIDITY.frequencyGHz,
    externalNoiseMHz: P372_VALIDITY.frequencyMHz,
  };
}

/** Most bit rates the rate finder tries from a range. */
export const MAX_RATE_CANDIDATES = 1000;

/** Rate-finder candidates when the scenario gives none (b/s): common telemetry and payload rates. */
export const DEFAULT_RATE_CANDIDATES_BPS = [1200, 2400, 4800, 9600, 19_200, 38_400, 57_600, 115_200, 250_000, 500_000, 1e6, 2e6, 5e6, 10e6, 20e6, 50e6, 100e6];

export interface ResolveOptions {
  /** Absolute path of the scenario file. */
  file: string;
  baseDir: string;
  /** Overrides `output.dir` (taken relative to the working directory). */
  outDir?: string;
}

export interface ResolvedWithInputs { scenario: ResolvedScenario; elementFiles: string[] }

function fmtNum(x: number): string {
  return String(Number(x.toPrecision(6)));
}

function duplicates(names: string[]): [string, number] | null {
  const seen = new Set<string>();
  for (let i = 0; i < names.length; i++) {
    if (seen.has(names[i])) return [names[i], i];
    seen.add(names[i]);
  }
  return null;
}

export function resolveScenarioInput(
  input: ScenarioInput, src: ScenarioSource, opts: ResolveOptions,
): ResolvedWithInputs {
  const defaultsApplied: AppliedDefault[] = [];
  const warnings: string[] = [];
  /** Warnings the CLI also prints on stderr at once (each is in `warnings` too). */
  const notices: string[] = [];
  const ctx: ResolveContext = {
    fail: (p, m) => src.fail(p, m),
    // A terminal used by several links records its defaults once.
    recordDefault: (d) => { if (!defaultsApplied.some((x) => x.path === d.path)) defaultsApplied.push(d); },
    warn: (m) => warnings.push(m),
    formatPath,
  };

  // ---------------------------------------------------------------- window
  const w = input.window;
  const startS = parseIsoUtc(w.start, src.where(['window', 'start']));
  let endS: number;
  if (w.end !== undefined && w.duration !== undefined) src.fail(['window', 'duration'], 'give either end or duration, not both');
  if (w.end !== undefined) endS = parseIsoUtc(w.end, src.where(['window', 'end']));
  else if (w.duration !== undefined) endS = startS + parseDuration(String(w.duration), src.where(['window', 'duration']));
  else return src.fail(['window'], 'missing end or duration (give one, e.g. duration: 7d)');
  if (!(endS > startS)) src.fail(['window', 'end'], `the window end ${w.end} is not after its start ${w.start} (end must be later than start)`);
  const stepS = w.step_s ?? 1;
  if (w.step_s === undefined) ctx.recordDefault({ path: 'window.step_s', value: '1', reason: 'one-second steps inside passes' });
  if (stepS > endS - startS) src.fail(['window', 'step_s'], `must not exceed the window length ${endS - startS} s (got ${stepS})`);

  // ---------------------------------------------------------------- weather
  const validity = frequencyValidity();
  let weatherInput = input.weather;
  if (weatherInput === undefined) {
    weatherInput = ['clear'];
    ctx.recordDefault({ path: 'weather', value: '[clear]', reason: 'clear sky only' });
  }
  const weatherCases: WeatherCase[] = [];
  weatherInput.forEach((c, i) => {
    if (c !== 'clear' && !(c >= validity.exceedance[0] && c <= validity.exceedance[1])) {
      src.fail(['weather', i], `exceedance ${c} % is outside the ITU-R P.618 range ${validity.exceedance[0]}–${validity.exceedance[1]} %`);
    }
    const wc: WeatherCase = c === 'clear' ? { name: 'clear', exceedancePercent: null } : { name: `${fmtNum(c)}%`, exceedancePercent: c };
    if (weatherCases.some((x) => x.name === wc.name)) src.fail(['weather', i], `duplicate weather case ${wc.name} (each case once)`);
    weatherCases.push(wc);
  });

  // ---------------------------------------------------------------- stations
  const dupStation = duplicates(input.stations.map((s) => s.name));
  if (dupStation) src.fail(['stations', dupStation[1], 'name'], `duplicate station name ${JSON.stringify(dupStation[0])} (names must be unique)`);
  const stations: ScenarioStation[] = input.stations.map((s, i) => resolveStation(s, i, ctx, src));
  const stationByName = new Map(input.stations.map((s, i) => [s.name, i]));

  // ---------------------------------------------------------------- satellites, element files, links
  const dupSat = duplicates(input.satellites.map((s) => s.name));
  if (dupSat) src.fail(['satellites', dupSat[1], 'name'], `duplicate satellite name ${JSON.stringify(dupSat[0])} (names must be unique)`);
  const satellites: ScenarioSatellite[] = [];
  const elementFiles: string[] = [];
  const links: LinkSpec[] = [];
  input.satellites.forEach((sat, si) => {
    const at: Path = ['satellites', si];
    const file = path.resolve(opts.baseDir, sat.elements);
    if (!existsSync(file)) {
      src.fail([...at, 'elements'], `element file not found: ${file} (allowed: a TLE/3LE or OMM JSON/XML file, path relative to the scenario file)`);
    }
    if (!statSync(file).isFile()) {
      src.fail([...at, 'elements'], `${file} is a ${statSync(file).isDirectory() ? 'folder' : 'special file'}, not an element file (allowed: a TLE/3LE or OMM JSON/XML file, path relative to the scenario file)`);
    }
    try {
      readFileSync(file);
    } catch (e) {
      src.fail([...at, 'elements'], `element file unreadable: ${file} (${(e as NodeJS.ErrnoException).code ?? 'read error'})`);
    }
    const sets: ElementSet[] = loadElementsFile(file);
    let chosen: ElementSet | undefined;
    if (sat.select !== undefined) {
      chosen = sets.find((e) => e.name.trim() === sat.select || e.catalogNumber.trim() === sat.select || String(e.catalogNumberValue) === sat.select);
      if (!chosen) src.fail([...at, 'select'], `no element set named or numbered ${JSON.stringify(sat.select)} in ${sat.elements} (allowed: ${sets.map((e) => e.name).join(', ')})`);
    } else if (sets.length > 1) {
      src.fail([...at, 'elements'], `${sat.elements} holds ${sets.length} element sets (add select: with one of ${sets.slice(0, 5).map((e) => e.name).join(', ')}${sets.length > 5 ? ', ...' : ''})`);
    } else chosen = sets[0];
    const elements = chosen as ElementSet;
    const ageDays = (startS - elements.epochUnixS) / 86_400;
    if (Math.abs(ageDays) > 7) warnings.push(`${formatPath([...at, 'elements'])}: the element epoch is ${ageDays.toFixed(1)} days from the window start; SGP4 errors grow with that`);
    const reach = epochReach(elements, startS, endS);
    if (reach.days > EPOCH_REFUSE_DAYS) {
      src.fail(['window'], `the window ${reach.side} ${reach.days.toFixed(1)} days ${reach.side === 'ends' ? 'after' : 'before'} the element epoch of ${sat.name} (${formatIsoUtc(elements.epochUnixS)}); SGP4 from one element set means nothing that far out (allowed: a window within ${EPOCH_REFUSE_DAYS} days of each satellite's element epoch; use newer elements or a shorter window)`);
    }
    if (reach.days > EPOCH_WARN_DAYS) {
      const msg = `window: ${reach.side} ${reach.days.toFixed(1)} days ${reach.side === 'ends' ? 'after' : 'before'} the element epoch of ${sat.name}; SGP4 positions from one element set drift by kilometres per day (from memory), so results past about ${EPOCH_WARN_DAYS} days are rough`;
      warnings.push(msg);
      notices.push(msg);
    }
    const problem = propagationProblem(elements, startS, endS);
    if (problem) src.fail([...at, 'elements'], `${sat.name} cannot be propagated over the window: ${problem} (allowed: an element set SGP4 carries across the window)`);
    const ee = sat.element_error ?? {};
    for (const k of ['at_epoch_km', 'along_track_km_per_day', 'cross_track_km_per_day'] as const) {
      if (ee[k] === undefined) {
        ctx.recordDefault({
          path: formatPath([...at, 'element_error', k]), value: String(ELEMENT_ERROR_DEFAULTS[k]),
          reason: 'SGP4 error of a general-perturbations element set: about 1 km at epoch, along-track growth 1–3 km/day in LEO, cross-track far slower (from memory), rough; set your own from orbit-determination comparisons)',
        });
      }
    }
    const elementError = {
      epochS: elements.epochUnixS,
      atEpochKm: ee.at_epoch_km ?? ELEMENT_ERROR_DEFAULTS.at_epoch_km,
      alongTrackKmPerDay: ee.along_track_km_per_day ?? ELEMENT_ERROR_DEFAULTS.along_track_km_per_day,
      crossTrackKmPerDay: ee.cross_track_km_per_day ?? ELEMENT_ERROR_DEFAULTS.cross_track_km_per_day,
    };
    satellites.push({ name: sat.name, elements, elementsFile: file, elementError });
    if (!elementFiles.includes(file)) elementFiles.push(file);

    const dupLink = duplicates(sat.links.map((l) => l.name));
    if (dupLink) src.fail([...at, 'links', dupLink[1], 'name'], `duplicate link name ${JSON.stringify(dupLink[0])} on satellite ${sat.name} (names must be unique per satellite)`);
    sat.links.forEach((link, li) => {
      links.push(...resolveLink(link, [...at, 'links', li], sat.name, input.stations, stationByName, ctx, src, validity));
    });
  });

  // ---------------------------------------------------------------- network, finders, output
  let network: NetworkPolicy;
  if (!input.network) {
    network = { kind: 'highest-rate' };
    ctx.recordDefault({ path: 'network.policy', value: 'highest-rate', reason: 'each satellite uses the station that delivers the highest information rate, then the best margin' });
  } else if (input.network.policy === 'highest-rate' || input.network.policy === 'best-margin') {
    if (input.network.policy === 'best-margin') {
      const msg = `${src.where(['network', 'policy'])}: best-margin is deprecated, renamed highest-rate (the rule is unchanged: highest information rate, then margin); write policy: highest-rate`;
      warnings.push(msg);
      notices.push(msg);
    }
    if (input.network.order) src.fail(['network', 'order'], 'only used with policy: priority');
    network = { kind: 'highest-rate' };
  } else {
    let order = input.network.order;
    if (order) {
      order.forEach((n, i) => {
        if (!stationByName.has(n)) src.fail(['network', 'order', i], `unknown station ${JSON.stringify(n)} (allowed: ${input.stations.map((s) => s.name).join(', ')})`);
      });
      const dup = duplicates(order);
      if (dup) src.fail(['network', 'order', dup[1]], `station ${JSON.stringify(dup[0])} listed twice`);
      const missing = stations.filter((s) => !order!.includes(s.station.name)).sort((a, b) => a.priority - b.priority).map((s) => s.station.name);
      if (missing.length) warnings.push(`network.order: stations not listed come last, by priority: ${missing.join(', ')}`);
      order = [...order, ...missing];
    } else {
      order = [...stations].sort((a, b) => a.priority - b.priority).map((s) => s.station.name);
      ctx.recordDefault({ path: 'network.order', value: order.join(', '), reason: 'from the station priorities' });
    }
    network = { kind: 'priority', order };
  }

  const maskFraction = input.mask_finder?.fraction ?? 1;
  if (input.mask_finder === undefined) ctx.recordDefault({ path: 'mask_finder.fraction', value: '1', reason: 'every in-view step must meet the margin' });

  let rateCandidatesBps: number[];
  const rf = input.rate_finder;
  if (rf?.bit_rates_bps && rf.range) src.fail(['rate_finder', 'range'], 'give either bit_rates_bps or range, not both');
  if (rf?.bit_rates_bps) {
    rateCandidatesBps = [...new Set(rf.bit_rates_bps)].sort((a, b) => a - b);
  } else if (rf?.range) {
    const { from_bps, to_bps } = rf.range;
    if (!(to_bps > from_bps)) src.fail(['rate_finder', 'range', 'to_bps'], `must be > from_bps ${from_bps} (got ${to_bps})`);
    const perDecade = rf.range.per_decade ?? 10;
    if (rf.range.per_decade === undefined) ctx.recordDefault({ path: 'rate_finder.range.per_decade', value: '10', reason: 'ten logarithmic steps per decade' });
    rateCandidatesBps = [];
    const n = Math.floor(perDecade * Math.log10(to_bps / from_bps) + 1e-9);
    // A range like 5e-324 to 1e308 b/s has an infinite ratio: without this the list would grow until memory runs out.
    if (!(n <= MAX_RATE_CANDIDATES)) {
      src.fail(['rate_finder', 'range'], `${from_bps} to ${to_bps} b/s at ${perDecade} per decade gives ${Number.isFinite(n) ? n + 1 : 'endless'} rates (allowed at most ${MAX_RATE_CANDIDATES})`);
    }
    for (let k = 0; k <= n; k++) rateCandidatesBps.push(Number((from_bps * 10 ** (k / perDecade)).toPrecision(6)));
    if (rateCandidatesBps[rateCandidatesBps.length - 1] < to_bps) rateCandidatesBps.push(to_bps);
  } else {
    rateCandidatesBps = [...DEFAULT_RATE_CANDIDATES_BPS];
    ctx.recordDefault({ path: 'rate_finder.bit_rates_bps', value: rateCandidatesBps.join(', '), reason: 'common telemetry and payload rates' });
  }

  let dir: string | null = null;
  if (opts.outDir !== undefined) dir = path.resolve(opts.outDir);
  else if (input.output?.dir !== undefined) dir = path.resolve(opts.baseDir, input.output.dir);
  else ctx.recordDefault({ path: 'output.dir', value: `out/${input.name}`, reason: 'out/<scenario name> under the working directory' });
  const steps = stepsChoice(input.output?.steps ?? 'none');
  if (input.output?.steps === undefined) ctx.recordDefault({ path: 'output.steps', value: 'none', reason: 'per-step table not written unless asked' });

  const exactOrbit = input.exact_orbit ?? false;
  if (input.exact_orbit === undefined) {
    ctx.recordDefault({ path: 'exact_orbit', value: 'false', reason: 'SGP4 at nodes about a minute apart, 8-point Lagrange interpolation between them (position within 1 m of SGP4)' });
  }

  const sunNoise = input.sun?.noise ?? true;
  if (input.sun?.noise === undefined) ctx.recordDefault({ path: 'sun.noise', value: 'true', reason: 'Sun noise added when the Sun is in a tracking ground antenna\'s beam on a downlink' });
  if (sunNoise && input.sun?.activity_factor === undefined) {
    ctx.recordDefault({ path: 'sun.activity_factor', value: '1', reason: 'quiet Sun; brightness against frequency (from memory), rough (raise it for an active Sun)' });
  }
  const sun = sunNoise ? { activityFactor: input.sun?.activity_factor ?? 1 } : null;

  return {
    scenario: {
      name: input.name,
      file: opts.file,
      inputsSha256: '',
      window: { startS, endS, stepS },
      satellites,
      stations,
      links,
      weatherCases,
      network,
      maskFraction,
      rateCandidatesBps,
      output: { dir, steps },
      exactOrbit,
      sun,
      plan: resolvePlan(input, weatherCases.map((c) => c.name), src),
      defaultsApplied,
      warnings,
      notices,
    },
    elementFiles,
  };
}

// ---------------------------------------------------------------- stations

function resolveStation(s: StationInput, i: number, ctx: ResolveContext, src: ScenarioSource): ScenarioStation {
  const at: Path = ['stations', i];
  let mask: HorizonMask;
  if (s.mask_deg !== undefined && s.mask_table !== undefined) src.fail([...at, 'mask_table'], 'give either mask_deg or mask_table, not both');
  if (s.mask_table !== undefined) {
    const t = s.mask_table;
    for (let k = 1; k < t.length; k++) {
      if (!(t[k][0] > t[k - 1][0])) {
        src.fail([...at, 'mask_table', k, 0], `azimuths must strictly increase, without repeats (got ${t[k][0]} after ${t[k - 1][0]})`);
      }
    }
    mask = { kind: 'table', points: t.map((p) => [p[0], p[1]] as const) };
  } else {
    if (s.mask_deg === undefined) ctx.recordDefault({ path: formatPath([...at, 'mask_deg']), value: '0', reason: 'no horizon mask given: geometric horizon' });
    mask = { kind: 'constant', elevationDeg: s.mask_deg ?? 0 };
  }
  if (s.mask_on === undefined) ctx.recordDefault({ path: formatPath([...at, 'mask_on']), value: 'geometric', reason: 'mask applied to geometric elevation' });
  const station: Station = { name: s.name, latitudeDeg: s.latitude_deg, longitudeDeg: s.longitude_deg, heightM: s.height_m, mask };
  if (s.mask_on === 'apparent') station.maskOnApparentElevation = true;
  const climate = resolveClimate(s.climate, { latitudeDeg: s.latitude_deg, heightM: s.height_m }, [...at, 'climate'], ctx);
  if (Object.keys(s.terminals).length === 0) src.fail([...at, 'terminals'], 'must name at least one ground terminal');
  if (s.priority === undefined) ctx.recordDefault({ path: formatPath([...at, 'priority']), value: String(i + 1), reason: 'order in the file' });
  return { station, climate, priority: s.priority ?? i + 1 };
}

// ---------------------------------------------------------------- links

function resolveLink(
  link: LinkInput, at: Path, satellite: string, stationsIn: StationInput[], stationByName: Map<string, number>,
  ctx: ResolveContext, src: ScenarioSource, validity: Validity,
): LinkSpec[] {
  const P = (...k: (string | number)[]) => formatPath([...at, ...k]);
  // Frequency.
  if (link.frequency_mhz !== undefined && link.frequency_ghz !== undefined) src.fail([...at, 'frequency_ghz'], 'give either frequency_mhz or frequency_ghz, not both');
  if (link.frequency_mhz === undefined && link.frequency_ghz === undefined) src.fail(at, 'missing frequency_mhz or frequency_ghz (give one)');
  const fKey = link.frequency_ghz !== undefined ? 'frequency_ghz' : 'frequency_mhz';
  const frequencyGHz = link.frequency_ghz ?? (link.frequency_mhz as number) / 1000;
  if (frequencyGHz < MIN_FREQUENCY_GHZ || frequencyGHz > validity.rain[1]) {
    src.fail([...at, fKey], `${fmtNum(frequencyGHz)} GHz is outside the models' range ${MIN_FREQUENCY_GHZ}–${validity.rain[1]} GHz (upper limit: ITU-R P.618 rain attenuation)`);
  }
  if (frequencyGHz * 1000 > validity.externalNoiseMHz[1] && frequencyGHz < 1) {
    ctx.warn(`${P(fKey)}: ${fmtNum(frequencyGHz * 1000)} MHz is above the ${validity.externalNoiseMHz[1]} MHz limit of the ITU-R P.372 external-noise curves; they are extrapolated`);
  }
  if (frequencyGHz < validity.rain[0]) {
    ctx.warn(`${P(fKey)}: ${fmtNum(frequencyGHz)} GHz is below the ${validity.rain[0]} GHz lower limit of ITU-R P.618/P.838 rain and P.676 gas models; the engine evaluates gas, rain and cloud at that limit instead (a small over-estimate)`);
  } else if (frequencyGHz < validity.scintillation[0]) {
    ctx.warn(`${P(fKey)}: ${fmtNum(frequencyGHz)} GHz is below the ${validity.scintillation[0]} GHz lower limit of the ITU-R P.618 scintillation model; the engine evaluates it there and scales it by the model's f^(7/12) law`);
  }

  // Stations and terminal.
  let stationIdx: number[];
  if (link.stations) {
    const dup = duplicates(link.stations);
    if (dup) src.fail([...at, 'stations', dup[1]], `station ${JSON.stringify(dup[0])} listed twice`);
    stationIdx = link.stations.map((n, k) => {
      const idx = stationByName.get(n);
      if (idx === undefined) src.fail([...at, 'stations', k], `unknown station ${JSON.stringify(n)} (allowed: ${stationsIn.map((s) => s.name).join(', ')})`);
      if (!(link.terminal in stationsIn[idx].terminals)) {
        src.fail([...at, 'terminal'], `unknown terminal ${JSON.stringify(link.terminal)} at station ${n} (allowed: ${Object.keys(stationsIn[idx].terminals).join(', ')})`);
      }
      return idx;
    });
  } else {
    stationIdx = stationsIn.flatMap((s, k) => (link.terminal in s.terminals ? [k] : []));
    if (stationIdx.length === 0) {
      const all = [...new Set(stationsIn.flatMap((s) => Object.keys(s.terminals)))];
      src.fail([...at, 'terminal'], `unknown terminal ${JSON.stringify(link.terminal)}: no station has it (allowed: ${all.join(', ')})`);
    }
    ctx.recordDefault({ path: P('stations'), value: stationIdx.map((k) => stationsIn[k].name).join(', '), reason: `every station with terminal ${link.terminal}` });
  }

  // Spacecraft end.
  const sc = link.spacecraft;
  const scAt: Path = [...at, 'spacecraft'];
  const down = link.direction === 'downlink';
  if (sc.attitude_error_deg === undefined) ctx.recordDefault({ path: P('spacecraft', 'attitude_error_deg'), value: '0', reason: 'no attitude error given' });
  const scEnd: LinkEnd = {
    antenna: resolveAntenna(sc.antenna, [...scAt, 'antenna'], ctx),
    polarisation: resolvePolarisation(sc.polarisation, [...scAt, 'polarisation'], ctx),
    lineLossDB: 0,
  };
  if (down) {
    if (!sc.transmitter) src.fail(scAt, 'missing transmitter (a downlink needs power_w or power_dbw on the spacecraft)');
    const tx = resolveTransmitter(sc.transmitter, [...scAt, 'transmitter'], ctx);
    scEnd.txPowerDBW = tx.txPowerDBW;
    scEnd.lineLossDB = tx.lineLossDB;
  } else {
    if (!sc.receiver) src.fail(scAt, 'missing receiver (an uplink needs a receiver on the spacecraft)');
    scEnd.receiver = resolveReceiver(sc.receiver, [...scAt, 'receiver'], ctx);
  }
  const scPointing = resolveSpacecraftPointing(sc.pointing, sc.attitude_error_deg ?? 0, [...scAt, 'pointing'], ctx);

  // Modulation and coding.
  const modcod = resolveModcod(link, at, ctx, src);
  if (link.implementation_loss_db === undefined) ctx.recordDefault({ path: P('implementation_loss_db'), value: '0', reason: 'no implementation loss given' });
  if (link.other_losses_db === undefined) ctx.recordDefault({ path: P('other_losses_db'), value: '0', reason: 'no other losses given' });
  if (link.required_margin_db === undefined) ctx.recordDefault({ path: P('required_margin_db'), value: '3', reason: 'a usual planning margin (common practice)' });

  // Ground end, per station (defaults of a terminal are recorded once, at its own path).
  return stationIdx.map((k) => {
    const st = stationsIn[k];
    const term: TerminalInput = st.terminals[link.terminal];
    const tAt: Path = ['stations', k, 'terminals', link.terminal];
    const once = ctx;
    const ground: LinkEnd = {
      antenna: resolveAntenna(term.antenna, [...tAt, 'antenna'], once),
      polarisation: resolvePolarisation(term.polarisation, [...tAt, 'polarisation'], once),
      lineLossDB: 0,
    };
    if (down) {
      if (!term.receiver) {
        src.fail(tAt, `missing receiver (link ${link.name} of ${satellite} is a downlink and receives on this terminal)`);
      }
      ground.receiver = resolveReceiver(term.receiver, [...tAt, 'receiver'], once);
    } else {
      if (!term.transmitter) src.fail(tAt, `missing transmitter (link ${link.name} of ${satellite} is an uplink from this terminal)`);
      const tx = resolveTransmitter(term.transmitter, [...tAt, 'transmitter'], once);
      ground.txPowerDBW = tx.txPowerDBW;
      ground.lineLossDB = tx.lineLossDB;
    }
    const pointing = resolveGroundPointing(term.pointing, [...tAt, 'pointing'], once);
    return {
      name: link.name,
      satellite,
      station: st.name,
      direction: link.direction,
      frequencyGHz,
      spacecraft: { ...scEnd, pointing: scPointing },
      ground: { ...ground, pointing },
      modcod,
      implementationLossDB: link.implementation_loss_db ?? 0,
      otherLossesDB: link.other_losses_db ?? 0,
      requiredMarginDB: link.required_margin_db ?? 3,
    };
  });
}

function resolveModcod(link: LinkInput, at: Path, ctx: ResolveContext, src: ScenarioSource): ModCodSpec {
  const m = link.modcod;
  const mAt: Path = [...at, 'modcod'];
  const P = (k: string) => formatPath([...mAt, k]);
  if (m.type === 'adaptive') {
    if (m.modes === 'dvb-s2') {
      return { kind: 'adaptive', symbolRateBaud: m.symbol_rate_baud, modes: DVBS2_MODES.map((x) => ({ ...x })) };
    }
    const dup = duplicates(m.modes.map((x) => x.name));
    if (dup) src.fail([...mAt, 'modes', dup[1], 'name'], `duplicate mode name ${JSON.stringify(dup[0])}`);
    return {
      kind: 'adaptive',
      symbolRateBaud: m.symbol_rate_baud,
      modes: m.modes.map((x) => ({ name: x.name, requiredEsN0DB: x.required_es_n0_db, efficiencyBitsPerSymbol: x.efficiency_bits_per_symbol })),
    };
  }
  const coding = m.coding ?? 'uncoded';
  if (m.coding === undefined) ctx.recordDefault({ path: P('coding'), value: 'uncoded', reason: 'no coding profile given' });
  if (!Object.prototype.hasOwnProperty.call(CODING_PROFILES, coding)) {
    src.fail([...mAt, 'coding'], `unknown coding profile ${JSON.stringify(coding)} (allowed: ${Object.keys(CODING_PROFILES).join(', ')})`);
  }
  const profile = coding === 'uncoded' ? null : codingProfile(coding);
  if (profile && m.modulation !== 'bpsk' && m.modulation !== 'qpsk' && m.required_eb_n0_db === undefined) {
    ctx.warn(`${P('coding')}: the profile ${coding} is stated for coherent BPSK/QPSK, not ${m.modulation}; give required_eb_n0_db for this modem`);
  }
  const codeRate = profile?.codeRate ?? 1;
  const ber = m.ber ?? 1e-5;
  let required: number;
  if (m.required_eb_n0_db !== undefined) {
    required = m.required_eb_n0_db;
  } else if (coding === 'uncoded') {
    if (m.ber === undefined) ctx.recordDefault({ path: P('ber'), value: '1e-5', reason: 'usual telemetry bit error rate target' });
    required = requiredEbN0DB({ modulation: m.modulation, bitErrorRate: ber });
    ctx.recordDefault({ path: P('required_eb_n0_db'), value: required.toFixed(2), reason: `uncoded ${m.modulation} at BER ${ber < 1e-3 ? ber.toExponential() : ber}, closed form (Sklar, Digital Communications)` });
  } else {
    required = (profile as NonNullable<typeof profile>).requiredEbN0DB;
    if (m.ber !== undefined && m.ber !== profile!.targetBitErrorRate) {
      ctx.warn(`${P('ber')}: ${m.ber} ignored; the coding profile ${coding} is stated at BER ${profile!.targetBitErrorRate} (${profile!.source})`);
    }
    ctx.recordDefault({ path: P('required_eb_n0_db'), value: required.toFixed(2), reason: `coding profile ${coding}: ${profile!.source}` });
  }
  return {
    kind: 'fixed',
    bitRateBps: m.bit_rate_bps,
    modulation: m.modulation,
    coding,
    requiredEbN0DB: required,
    bitsPerSymbol: MODULATION_BITS_PER_SYMBOL[m.modulation] * codeRate,
  };
}
