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
  'passId' | 'satellite' | 'station' | 'aosS' | 'tcaS' | 'losS' | 'maxElevationDeg' | 'durationS' | 'clippedStart' | 'clippedEnd'>;

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
}

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
  const { link, pass } = options;
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
    fit: createModeFit(thresholds),
  }));
  let steps = 0;
  let lastTimeS = -Infinity;
  let finished = false;

  /** One step of one case: the whole per-step rule. */
  function step1(s: CaseState, timeS: number, dtS: number, m: number, usable: boolean, rateBps: number, es: number): void {
    if (!Number.isNaN(m)) {
      if (m < s.minMarginDB) s.minMarginDB = m;
      if (m > s.maxMarginDB) s.maxMarginDB = m;
      s.marginTimeSum += m * dtS;
      s.marginTimeS += dtS;
      s.marginSum += m;
      s.marginSteps++;
    }
    if (usable) {
      if (s.usableStartS === null) s.usableStartS = timeS;
      s.usableEndS = timeS;
      s.usableS += dtS;
      if (adaptive) s.adaptiveBits += rateBps * dtS;
    }
    if (adaptive) s.fit.add(es, dtS);
  }

  function checkTime(timeS: number): void {
    if (finished) throw new Error(`pass accumulator ${pass.passId}: add() after finish()`);
    if (timeS < lastTimeS) throw new Error(`pass accumulator ${pass.passId}: step at ${timeS} s is before ${lastTimeS} s`);
  }

  return {
    add(timeS, dtS, _elevationDeg, step) {
      checkTime(timeS);
      lastTimeS = timeS;
      steps++;
      for (const s of states) {
        const c = findCase(step, s);
        step1(s, timeS, dtS, c.margin_db, c.usable, c.information_rate_bps, c.es_over_n0_db);
      }
    },
    addColumns(cols, from, to, originS, k0, dtS) {
      if (to <= from) return;
      checkTime(originS + (k0 + from) * dtS);
      if (cols.cases.length !== states.length) throw new Error(`pass accumulator ${pass.passId}: columns have ${cols.cases.length} weather cases, expected ${states.length}`);
      for (let k = 0; k < states.length; k++) {
        const s = states[k];
        const c = cols.cases[k];
        const margin = c.marginDB, usable = c.usable, rate = c.informationRateBps, es = c.esN0DB;
        for (let i = from; i < to; i++) step1(s, originS + (k0 + i) * dtS, dtS, margin[i], usable[i] === 1, rate[i], es[i]);
      }
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
        };
      });
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
        cases,
      };
    },
  };
}
