/**
 * Pass-link summaries held compactly: numbers in typed-array columns, text
 * (pass id, names, direction, verdict rule) as indices into shared string
 * tables. A year over ten stations has tens of thousands of pass-links × weather
 * cases; as objects they cost hundreds of bytes each, here a few dozen, and
 * they cross a worker boundary as a handful of transferable buffers.
 * Records (PassLinkSummary) are built only when asked for (`get`, iteration),
 * i.e. when the outputs are written.
 */
import type { PassCaseSummary, PassLinkSummary, Verdict } from './types.js';
import { SUN_AFFECTED_DB } from './passAccumulator.js';

const VERDICTS: readonly Verdict[] = ['usable', 'marginal', 'unusable'];

/** Plain data of a table (typed arrays and string lists): structured-clonable, buffers transferable. */
export interface PassTableState {
  weather: string[];
  strings: string[];
  n: number;
  /** Per row: string indices of pass id, satellite, station, link, direction. */
  text: Int32Array;
  /** Per row: aos, tca, los, max elevation, duration (s, deg), timing uncertainty (s), min Sun separation (deg), max Sun loss (dB). */
  times: Float64Array;
  /** Per row: steps, clipped start (0/1), clipped end (0/1), adaptive (0/1). */
  ints: Int32Array;
  /** Per row and case: usable start, usable end (NaN: none), usable duration, min, mean, max margin, fixed bits, adaptive bits, seconds lost to the Sun. */
  caseNums: Float64Array;
  /** Per row and case: verdict (0 usable, 1 marginal, 2 unusable), verdict-rule string index. */
  caseInts: Int32Array;
  /** Per row: expected volume (bits), expected usable time, swept time (s), probability of closing throughout. */
  weatherNums: Float64Array;
}

const TEXT = 5, TIMES = 8, INTS = 4, CASE_NUMS = 9, CASE_INTS = 2, WEATHER_NUMS = 4;

export class PassLinkTable implements Iterable<PassLinkSummary> {
  readonly weather: string[];
  private strings: string[] = [];
  private index = new Map<string, number>();
  private n = 0;
  private cap = 0;
  private text = new Int32Array(0);
  private times = new Float64Array(0);
  private ints = new Int32Array(0);
  private caseNums = new Float64Array(0);
  private caseInts = new Int32Array(0);
  private weatherNums = new Float64Array(0);

  constructor(weather: readonly string[]) {
    this.weather = [...weather];
  }

  get length(): number { return this.n; }

  private str(s: string): number {
    let i = this.index.get(s);
    if (i === undefined) { i = this.strings.length; this.strings.push(s); this.index.set(s, i); }
    return i;
  }

  private grow(need: number): void {
    if (need <= this.cap) return;
    const cap = Math.max(need, 64, Math.ceil(1.5 * this.cap));
    const nc = this.weather.length;
    const g = <T extends Float64Array | Int32Array>(a: T, per: number, make: (n: number) => T): T => { const b = make(cap * per); b.set(a); return b; };
    this.text = g(this.text, TEXT, (k) => new Int32Array(k));
    this.times = g(this.times, TIMES, (k) => new Float64Array(k));
    this.ints = g(this.ints, INTS, (k) => new Int32Array(k));
    this.caseNums = g(this.caseNums, CASE_NUMS * nc, (k) => new Float64Array(k));
    this.caseInts = g(this.caseInts, CASE_INTS * nc, (k) => new Int32Array(k));
    this.weatherNums = g(this.weatherNums, WEATHER_NUMS, (k) => new Float64Array(k));
    this.cap = cap;
  }

  push(p: PassLinkSummary): void {
    const nc = this.weather.length;
    if (p.cases.length !== nc) throw new Error(`pass table: ${p.passId} ${p.link} has ${p.cases.length} weather cases, expected ${nc}`);
    this.grow(this.n + 1);
    const r = this.n++;
    const t = r * TEXT;
    this.text[t] = this.str(p.passId); this.text[t + 1] = this.str(p.satellite); this.text[t + 2] = this.str(p.station);
    this.text[t + 3] = this.str(p.link); this.text[t + 4] = this.str(p.direction);
    const m = r * TIMES;
    this.times[m] = p.aosS; this.times[m + 1] = p.tcaS; this.times[m + 2] = p.losS; this.times[m + 3] = p.maxElevationDeg; this.times[m + 4] = p.durationS;
    this.times[m + 5] = p.timingUncertaintyS; this.times[m + 6] = p.minSunSeparationDeg; this.times[m + 7] = p.maxSunLossDB;
    const k = r * INTS;
    this.ints[k] = p.steps; this.ints[k + 1] = p.clippedStart ? 1 : 0; this.ints[k + 2] = p.clippedEnd ? 1 : 0;
    this.ints[k + 3] = p.cases.some((c) => c.adaptiveVolumeBits !== null) ? 1 : 0;
    const wn = r * WEATHER_NUMS;
    this.weatherNums[wn] = p.expectedVolumeBits; this.weatherNums[wn + 1] = p.expectedUsableS;
    this.weatherNums[wn + 2] = p.sweptS; this.weatherNums[wn + 3] = p.closesThroughoutProbability;
    p.cases.forEach((c, j) => {
      if (c.weather !== this.weather[j]) throw new Error(`pass table: case ${j} of ${p.passId} is ${c.weather}, expected ${this.weather[j]}`);
      const o = (r * nc + j) * CASE_NUMS;
      const x = this.caseNums;
      x[o] = c.usableStartS ?? NaN; x[o + 1] = c.usableEndS ?? NaN; x[o + 2] = c.usableDurationS;
      x[o + 3] = c.minMarginDB; x[o + 4] = c.meanMarginDB; x[o + 5] = c.maxMarginDB;
      x[o + 6] = c.fixedVolumeBits; x[o + 7] = c.adaptiveVolumeBits ?? NaN; x[o + 8] = c.sunLostS;
      const q = (r * nc + j) * CASE_INTS;
      this.caseInts[q] = VERDICTS.indexOf(c.verdict); this.caseInts[q + 1] = this.str(c.verdictRule);
    });
  }

  /** AOS (s) of row i, without building the record. */
  aosS(i: number): number { return this.times[i * TIMES]; }

  get(i: number): PassLinkSummary {
    if (!(i >= 0 && i < this.n)) throw new RangeError(`pass table: row ${i} outside 0–${this.n - 1}`);
    const s = this.strings;
    const t = i * TEXT, m = i * TIMES, k = i * INTS, wn = i * WEATHER_NUMS, w = this.weatherNums;
    const nc = this.weather.length;
    const adaptive = this.ints[k + 3] === 1;
    const cases: PassCaseSummary[] = this.weather.map((w, j) => {
      const o = (i * nc + j) * CASE_NUMS, q = (i * nc + j) * CASE_INTS, x = this.caseNums;
      return {
        weather: w,
        usableStartS: Number.isNaN(x[o]) ? null : x[o],
        usableEndS: Number.isNaN(x[o + 1]) ? null : x[o + 1],
        usableDurationS: x[o + 2], minMarginDB: x[o + 3], meanMarginDB: x[o + 4], maxMarginDB: x[o + 5],
        fixedVolumeBits: x[o + 6], adaptiveVolumeBits: adaptive ? x[o + 7] : null,
        verdict: VERDICTS[this.caseInts[q]], verdictRule: s[this.caseInts[q + 1]], sunLostS: x[o + 8],
      };
    });
    return {
      passId: s[this.text[t]], satellite: s[this.text[t + 1]], station: s[this.text[t + 2]], link: s[this.text[t + 3]],
      direction: s[this.text[t + 4]] as PassLinkSummary['direction'],
      aosS: this.times[m], tcaS: this.times[m + 1], losS: this.times[m + 2], maxElevationDeg: this.times[m + 3], durationS: this.times[m + 4],
      clippedStart: this.ints[k + 1] === 1, clippedEnd: this.ints[k + 2] === 1, steps: this.ints[k],
      expectedVolumeBits: w[wn], expectedUsableS: w[wn + 1], sweptS: w[wn + 2], closesThroughoutProbability: w[wn + 3],
      timingUncertaintyS: this.times[m + 5], minSunSeparationDeg: this.times[m + 6], maxSunLossDB: this.times[m + 7],
      sunAffected: this.times[m + 7] >= SUN_AFFECTED_DB, cases,
    };
  }

  *[Symbol.iterator](): Iterator<PassLinkSummary> {
    for (let i = 0; i < this.n; i++) yield this.get(i);
  }

  toArray(): PassLinkSummary[] {
    return Array.from({ length: this.n }, (_, i) => this.get(i));
  }

  /** Reorder the rows: AOS, then station name, then link name (the order of every pass output). */
  sort(): void {
    const s = this.strings;
    const order = Int32Array.from({ length: this.n }, (_, i) => i).sort((a, b) =>
      this.times[a * TIMES] - this.times[b * TIMES]
      || s[this.text[a * TEXT + 2]].localeCompare(s[this.text[b * TEXT + 2]])
      || s[this.text[a * TEXT + 3]].localeCompare(s[this.text[b * TEXT + 3]]));
    const nc = this.weather.length;
    // The sorted columns sized to the rows (no spare capacity left after the run).
    this.cap = this.n;
    const permute = <T extends Float64Array | Int32Array>(a: T, per: number, make: (k: number) => T): T => {
      const out = make(this.cap * per);
      for (let r = 0; r < this.n; r++) out.set(a.subarray(order[r] * per, order[r] * per + per), r * per);
      return out;
    };
    this.text = permute(this.text, TEXT, (k) => new Int32Array(k));
    this.times = permute(this.times, TIMES, (k) => new Float64Array(k));
    this.ints = permute(this.ints, INTS, (k) => new Int32Array(k));
    this.caseNums = permute(this.caseNums, CASE_NUMS * nc, (k) => new Float64Array(k));
    this.caseInts = permute(this.caseInts, CASE_INTS * nc, (k) => new Int32Array(k));
    this.weatherNums = permute(this.weatherNums, WEATHER_NUMS, (k) => new Float64Array(k));
  }

  /** The table as plain data (copies trimmed to its length), for a worker to post. */
  exportState(): PassTableState {
    const nc = this.weather.length;
    return {
      weather: [...this.weather], strings: [...this.strings], n: this.n,
      text: this.text.slice(0, this.n * TEXT), times: this.times.slice(0, this.n * TIMES), ints: this.ints.slice(0, this.n * INTS),
      caseNums: this.caseNums.slice(0, this.n * nc * CASE_NUMS), caseInts: this.caseInts.slice(0, this.n * nc * CASE_INTS),
      weatherNums: this.weatherNums.slice(0, this.n * WEATHER_NUMS),
    };
  }

  /** Append another table's rows (as exportState gives them), their strings re-interned here. */
  append(st: PassTableState): void {
    const nc = this.weather.length;
    if (st.weather.length !== nc || st.weather.some((w, j) => w !== this.weather[j])) throw new Error('pass table: appending rows of other weather cases');
    const map = Int32Array.from(st.strings, (x) => this.str(x));
    this.grow(this.n + st.n);
    const r0 = this.n;
    for (let i = 0; i < st.n * TEXT; i++) this.text[r0 * TEXT + i] = map[st.text[i]];
    this.times.set(st.times, r0 * TIMES);
    this.ints.set(st.ints, r0 * INTS);
    this.caseNums.set(st.caseNums, r0 * nc * CASE_NUMS);
    this.weatherNums.set(st.weatherNums, r0 * WEATHER_NUMS);
    for (let i = 0; i < st.n * nc * CASE_INTS; i += CASE_INTS) {
      this.caseInts[r0 * nc * CASE_INTS + i] = st.caseInts[i];
      this.caseInts[r0 * nc * CASE_INTS + i + 1] = map[st.caseInts[i + 1]];
    }
    this.n += st.n;
  }
}
