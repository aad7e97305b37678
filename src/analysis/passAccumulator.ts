/**
 * Streaming per-pass summary of one link over one pass, for every weather
 * case. Fed one step at a time in time order; keeps only fixed-size state
 * (sums, extremes, one fit-time counter per adaptive mode), never the steps.
 *
 * A step at time t with interval Δt stands for [t, t + Δt). Volumes:
 *   - fixed-rate link: R_b × usable time;
 *   - adaptive link, `fixedVolumeBits`: the best single mode held for the whole
 *     pass, max_i R_s η_i × (time mode i fits) (fit rule in modes.ts);
 *   - adaptive link, `adaptiveVolumeBits`: Σ (engine's R_s η at the step) × Δt
 *     over usable steps (PHYSICS.md §12).
 */
import type { CaseBudget, LinkSpec, StepBudget, WeatherCase } from '../budget/types.js';
import type { PassCaseSummary, PassLinkSummary } from './types.js';
import type { LinkColumns } from '../budget/linkColumns.js';
import { bestConstantMode, createModeFit, modeRatesBps, modeThresholdsDB, type ModeFit } from './modes.js';
import { checkVerdictRule, DEFAULT_VERDICT_RULE, judgePass, type VerdictRule } from './verdict.js';

/** The pass a summary is about: the pass fields of PassLinkSummary (durationS, time above the mask, is the verdict's reference). */
export type PassInfo = Pick<PassLinkSummary,
  'passId' | 'satellite' | 'station' | 'aosS' | 'tcaS' | 'losS' | 'maxElevationDeg' | 'durationS' | 'clippedStart' | 'clippedEnd'>
  & Partial<Pick<PassLinkSummary, 'timingUncertaintyS'>>;

/** C/N0 the Sun must take at some step (dB) for a pass to count as Sun-affected (our choice: a tenth of a dB shows in a budget). */
export const SUN_AFFECTED_DB = 0.1;

export interface PassAccumulatorOptions {
  link: LinkSpec;
  pass: PassInfo;
  /** Weather cases to summarise, by name; each step must carry a CaseBudget of that name. */
  weatherCases: readonly (WeatherCase | string)[];
  verdictRule?: VerdictRule;
}

export interface PassAccumulator {
  add(timeS: number, dtS: number, elevationDeg: number, step: StepBudget): void;
  /**
   * Entries [from, to) of a link's columns, entry i at time originS + (k0 + i)·dtS
   * (a grid's times; case columns in the accumulator's weather-case order).
   * The same per-step rule as `add`.
   */
  addColumns(cols: LinkColumns, from: number, to: number, originS: number, k0: number, dtS: number): void;
  finish(): PassLinkSummary;
  /** Start over for another pass of the same link and weather cases (an accumulator reused pass after pass). */
  reset(pass: PassInfo): void;
}

/** The case columns the summary reads. */
type OneCase = Pick<LinkColumns['cases'][number], 'marginDB' | 'usable' | 'informationRateBps' | 'esN0DB' | 'sunLossDB'>;

interface CaseState {
  weather: string;
  /** Index of this case in the last step's `cases`, to avoid a search per step. */
  hint: number;
  usableStartS: number | null;
  usableEndS: number | null;
  usableS: number;
  minMarginDB: number;
  maxMarginDB: number;
  marginTimeSum: number;
  marginSum: number;
  marginSteps: number;
  marginTimeS: number;
  adaptiveBits: number;
  sunLostS: number;
  maxSunLossDB: number;
  /** Time per rank (number of mode thresholds ≤ Es/N0), see ModeFit. */
  fit: ModeFit;
}

function findCase(step: StepBudget, state: CaseState): CaseBudget {
  const hinted = step.cases[state.hint];
  if (hinted && hinted.weather === state.weather) return hinted;
  const i = step.cases.findIndex((c) => c.weather === state.weather);
  if (i < 0) throw new Error(`pass accumulator: step at ${step.time_s} s has no weather case "${state.weather}"`);
  state.hint = i;
  return step.cases[i];
}

export function createPassAccumulator(options: PassAccumulatorOptions): PassAccumulator {
  const { link } = options;
  let pass = options.pass;
  const rule = checkVerdictRule(options.verdictRule ?? DEFAULT_VERDICT_RULE);
  const adaptive = link.modcod.kind === 'adaptive';
  const thresholds = modeThresholdsDB(link);
  const rates = modeRatesBps(link);
  const states: CaseState[] = options.weatherCases.map((w, hint) => ({
    weather: typeof w === 'string' ? w : w.name,
    hint,
    usableStartS: null,
    usableEndS: null,
    usableS: 0,
    minMarginDB: Infinity,
    maxMarginDB: -Infinity,
    marginTimeSum: 0,
    marginSum: 0,
    marginSteps: 0,
    marginTimeS: 0,
    adaptiveBits: 0,
    sunLostS: 0,
    maxSunLossDB: 0,
    fit: createModeFit(thresholds),
  }));
  const requiredMarginDB = link.requiredMarginDB;
  let minSunSepDeg = NaN;
  let steps = 0;
  let lastTimeS = -Infinity;
  // Weather as a probability: expected bits, expected usable time, swept time, least probability of the clear-sky-closing steps.
  let wBits = 0, wUsableS = 0, wSweptS = 0, wMinProb = Infinity;
  const one: OneCase = { marginDB: new Float64Array(1), usable: new Uint8Array(1), informationRateBps: new Float64Array(1), esN0DB: new Float64Array(1), sunLossDB: new Float64Array(1) };
  let finished = false;

  /**
   * The per-step rule over entries [from, to) of one case's columns (the
   * state in locals); `add` runs it on one-entry columns.
   */
  function caseColumns(s: CaseState, c: OneCase,  from: number, to: number, originS: number, k0: number, dtS: number): void {
    const margin = c.marginDB, usable = c.usable, rate = c.informationRateBps, es = c.esN0DB;
    // × 1: plain float64 locals (a field read as is would make the loop box every update).
    let min = s.minMarginDB * 1, max = s.maxMarginDB * 1, mts = s.marginTimeSum * 1, mt = s.marginTimeS * 1, ms = s.marginSum * 1, mn = s.marginSteps;
    let us = s.usableS * 1, bits = s.adaptiveBits * 1;
    dtS *= 1;
    for (let i = from; i < to; i++) {
      const m = margin[i];
      if (m === m) {
        if (m < min) min = m;
        if (m > max) max = m;
        mts += m * dtS;
        mt += dtS;
        ms += m;
        mn++;
      }
      if (usable[i] === 1) {
        const t = originS + (k0 + i) * dtS;
        if (s.usableStartS === null) s.usableStartS = t;
        s.usableEndS = t;
        us += dtS;
        if (adaptive) bits += rate[i] * dtS;
      }
    }
    s.minMarginDB = min; s.maxMarginDB = max; s.marginTimeSum = mts; s.marginTimeS = mt; s.marginSum = ms; s.marginSteps = mn;
    s.usableS = us; s.adaptiveBits = bits;
    if (adaptive) for (let i = from; i < to; i++) s.fit.add(es[i], dtS);
    const sun = c.sunLossDB;
    let lost = 0, maxLoss = s.maxSunLossDB * 1;
    for (let i = from; i < to; i++) {
      const l = sun[i];
      if (l === 0) continue;
      if (l > maxLoss) maxLoss = l;
      if (usable[i] === 0 && margin[i] + l >= requiredMarginDB) lost += dtS;
    }
    s.sunLostS += lost; s.maxSunLossDB = maxLoss;
  }

  function sunSeparation(sep: ArrayLike<number>, from: number, to: number): void {
    let m = minSunSepDeg;
    for (let i = from; i < to; i++) { const x = sep[i]; if (x < m || (m !== m && x === x)) m = x; }
    minSunSepDeg = m;
  }

  /** The weather-probability sums over entries [from, to) (probability; expected rate in Mb/s). */
  function weatherSums(prob: Float64Array, rateMbps: Float64Array, from: number, to: number, dtS: number): void {
    let bits = wBits * 1, us = wUsableS * 1, minP = wMinProb * 1;
    dtS *= 1;
    for (let i = from; i < to; i++) {
      const q = prob[i];
      bits += rateMbps[i] * 1e6 * dtS;
      us += q * dtS;
      if (q > 0 && q < minP) minP = q;
    }
    wBits = bits; wUsableS = us; wMinProb = minP; wSweptS += (to - from) * dtS;
  }
  const oneProb = new Float64Array(1), oneRate = new Float64Array(1);

  function checkTime(timeS: number): void {
    if (finished) throw new Error(`pass accumulator ${pass.passId}: add() after finish()`);
    if (timeS < lastTimeS) throw new Error(`pass accumulator ${pass.passId}: step at ${timeS} s is before ${lastTimeS} s`);
  }

  return {
    reset(next) {
      pass = next;
      for (const s of states) {
        s.usableStartS = null; s.usableEndS = null; s.usableS = 0; s.minMarginDB = Infinity; s.maxMarginDB = -Infinity;
        s.marginTimeSum = 0; s.marginSum = 0; s.marginSteps = 0; s.marginTimeS = 0; s.adaptiveBits = 0; s.sunLostS = 0; s.maxSunLossDB = 0;
        s.fit.clear();
      }
      steps = 0;
      lastTimeS = -Infinity;
      finished = false;
      wBits = 0; wUsableS = 0; wSweptS = 0; wMinProb = Infinity;
      minSunSepDeg = NaN;
    },
    add(timeS, dtS, _elevationDeg, step) {
      checkTime(timeS);
      lastTimeS = timeS;
      steps++;
      sunSeparation([step.sun_separation_deg ?? NaN], 0, 1);
      for (const s of states) {
        const c = findCase(step, s);
        one.marginDB[0] = c.margin_db; one.usable[0] = c.usable ? 1 : 0; one.informationRateBps[0] = c.information_rate_bps; one.esN0DB[0] = c.es_over_n0_db; one.sunLossDB[0] = c.sun_loss_db ?? 0;
        caseColumns(s, one, 0, 1, timeS, 0, dtS);
      }
      oneProb[0] = step.closing_probability; oneRate[0] = step.expected_information_rate_mbps;
      weatherSums(oneProb, oneRate, 0, 1, dtS);
    },
    addColumns(cols, from, to, originS, k0, dtS) {
      if (to <= from) return;
      checkTime(originS + (k0 + from) * dtS);
      if (cols.cases.length !== states.length) throw new Error(`pass accumulator ${pass.passId}: columns have ${cols.cases.length} weather cases, expected ${states.length}`);
      for (let k = 0; k < states.length; k++) caseColumns(states[k], cols.cases[k], from, to, originS, k0, dtS);
      // Columns without the weather probability (the report's what-if recomputation carries none) skip its sums.
      if (cols.closingProbability) weatherSums(cols.closingProbability, cols.expectedInformationRateMbps, from, to, dtS);
      sunSeparation(cols.sunSeparationDeg, from, to);
      steps += to - from;
      lastTimeS = originS + (k0 + to - 1) * dtS;
    },
    finish() {
      finished = true;
      const cases: PassCaseSummary[] = states.map((s) => {
        let fixedVolumeBits: number;
        if (link.modcod.kind === 'fixed') {
          fixedVolumeBits = link.modcod.bitRateBps * s.usableS;
        } else {
          const fitS = s.fit.fitTimeS();
          const best = bestConstantMode(rates, fitS);
          fixedVolumeBits = best < 0 ? 0 : rates[best] * fitS[best];
        }
        const { verdict, verdictRule } = judgePass(s.usableS, pass.durationS, s.usableStartS !== null, rule);
        // Time-weighted mean; falls back to the plain mean if every Δt was 0, NaN without steps.
        const meanMarginDB = s.marginTimeS > 0 ? s.marginTimeSum / s.marginTimeS : s.marginSteps > 0 ? s.marginSum / s.marginSteps : NaN;
        return {
          weather: s.weather,
          usableStartS: s.usableStartS,
          usableEndS: s.usableEndS,
          usableDurationS: s.usableS,
          minMarginDB: s.marginSteps > 0 ? s.minMarginDB : NaN,
          meanMarginDB,
          maxMarginDB: s.marginSteps > 0 ? s.maxMarginDB : NaN,
          fixedVolumeBits,
          adaptiveVolumeBits: adaptive ? s.adaptiveBits : null,
          verdict,
          verdictRule,
          sunLostS: s.sunLostS,
        };
      });
      const maxSunLossDB = Math.max(0, ...states.map((s) => s.maxSunLossDB));
      return {
        passId: pass.passId,
        satellite: pass.satellite,
        station: pass.station,
        link: link.name,
        direction: link.direction,
        aosS: pass.aosS,
        tcaS: pass.tcaS,
        losS: pass.losS,
        maxElevationDeg: pass.maxElevationDeg,
        durationS: pass.durationS,
        clippedStart: pass.clippedStart,
        clippedEnd: pass.clippedEnd,
        steps,
        expectedVolumeBits: wBits,
        expectedUsableS: wUsableS,
        sweptS: wSweptS,
        closesThroughoutProbability: Number.isNaN(wBits) ? NaN : wMinProb === Infinity ? 0 : wMinProb,
        timingUncertaintyS: pass.timingUncertaintyS ?? NaN,
        minSunSeparationDeg: minSunSepDeg,
        maxSunLossDB,
        sunAffected: maxSunLossDB >= SUN_AFFECTED_DB,
        cases,
      };
    },
  };
}
