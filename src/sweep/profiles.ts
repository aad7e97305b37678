/**
 * Cumulative volume of each pass-link on a coarse time grid, for contact
 * planning (kept only when the scenario asks: `volumeProfileGridS`, set by
 * the plan job). For a pass-link and weather case, C(g) is the volume (bits)
 * of its steps before the grid time startS + g·G: Σ rate × Δt over steps at
 * t < startS + g·G (a step at t stands for [t, t + Δt), its rate the
 * information rate when usable, else 0; PHYSICS.md §12). The volume inside
 * [a, b] is C(b) − C(a), exact when a and b are grid times and the step
 * divides G; between grid times C is taken linearly.
 *
 * Compact: one Float64 per grid time and case (a 10-minute pass on a 10 s
 * grid: 61 values per case), in one growing column; text as string indices.
 */
import type { LinkColumns } from '../budget/linkColumns.js';

/** Plain data (structured-clonable, buffers transferable). */
export interface VolumeProfileState {
  gridS: number;
  nCases: number;
  strings: string[];
  n: number;
  /** Per row: pass id and link (string indices), first grid index g0, grid times, offset into `values`. */
  rows: Int32Array;
  values: Float64Array;
}

const ROW = 5;

/** One pass-link being swept: steps in, cumulative volumes at grid times out. */
export class ProfileBuilder {
  private g0 = -1;
  private g = -1;
  private sums: Float64Array;
  private out: number[] = [];
  constructor(private readonly startS: number, private readonly gridS: number, private readonly nCases: number) {
    this.sums = new Float64Array(nCases);
  }

  reset(): void { this.g0 = -1; this.g = -1; this.sums.fill(0); this.out.length = 0; }

  /** Entries [0, n) of a link's columns, entry i at grid index k0 + i of the step grid. */
  add(cols: LinkColumns, n: number, k0: number, stepS: number): void {
    const per = stepS / this.gridS;
    for (let i = 0; i < n; i++) {
      // Grid cell of this step (a hair of slack so a step exactly on a grid time lands in its own cell).
      const gi = Math.floor((k0 + i) * per + 1e-9);
      if (this.g0 < 0) { this.g0 = gi; this.g = gi; this.snap(); }
      while (this.g < gi) { this.g++; this.snap(); }
      for (let c = 0; c < this.nCases; c++) this.sums[c] += cols.cases[c].informationRateBps[i] * stepS;
    }
  }

  private snap(): void { for (let c = 0; c < this.nCases; c++) this.out.push(this.sums[c]); }

  /** The cumulative values at grid times g0 … g0 + count − 1 (the last holds the total); count 0 when no step came. */
  finish(): { g0: number; count: number; values: number[] } {
    if (this.g0 < 0) return { g0: 0, count: 0, values: [] };
    this.snap();
    return { g0: this.g0, count: this.g - this.g0 + 2, values: this.out };
  }
}

export class VolumeProfiles {
  private strings: string[] = [];
  private index = new Map<string, number>();
  private n = 0;
  private rows = new Int32Array(0);
  private values = new Float64Array(0);
  private used = 0;
  private byKey: Map<string, number> | null = null;

  constructor(readonly gridS: number, readonly nCases: number) {}

  get length(): number { return this.n; }

  private str(s: string): number {
    let i = this.index.get(s);
    if (i === undefined) { i = this.strings.length; this.strings.push(s); this.index.set(s, i); }
    return i;
  }

  private grow(rows: number, values: number): void {
    if (rows * ROW > this.rows.length) { const r = new Int32Array(Math.max(rows * ROW, 64 * ROW, Math.ceil(this.rows.length * 1.5))); r.set(this.rows); this.rows = r; }
    if (values > this.values.length) { const v = new Float64Array(Math.max(values, 4096, Math.ceil(this.values.length * 1.5))); v.set(this.values); this.values = v; }
  }

  push(passId: string, link: string, p: { g0: number; count: number; values: ArrayLike<number> }): void {
    this.grow(this.n + 1, this.used + p.values.length);
    const o = this.n * ROW;
    this.rows[o] = this.str(passId); this.rows[o + 1] = this.str(link); this.rows[o + 2] = p.g0; this.rows[o + 3] = p.count; this.rows[o + 4] = this.used;
    for (let i = 0; i < p.values.length; i++) this.values[this.used + i] = p.values[i];
    this.used += p.values.length;
    this.n++;
    this.byKey = null;
  }

  exportState(): VolumeProfileState {
    return { gridS: this.gridS, nCases: this.nCases, strings: [...this.strings], n: this.n, rows: this.rows.slice(0, this.n * ROW), values: this.values.slice(0, this.used) };
  }

  append(st: VolumeProfileState): void {
    for (let r = 0; r < st.n; r++) {
      const o = r * ROW, off = st.rows[o + 4], count = st.rows[o + 3];
      this.push(st.strings[st.rows[o]], st.strings[st.rows[o + 1]], { g0: st.rows[o + 2], count, values: st.values.subarray(off, off + count * st.nCases) });
    }
  }

  private row(passId: string, link: string): number {
    if (!this.byKey) {
      this.byKey = new Map();
      for (let r = 0; r < this.n; r++) this.byKey.set(`${this.strings[this.rows[r * ROW]]}\u0000${this.strings[this.rows[r * ROW + 1]]}`, r);
    }
    return this.byKey.get(`${passId}\u0000${link}`) ?? -1;
  }

  has(passId: string, link: string): boolean { return this.row(passId, link) >= 0; }

  /** Total volume of a pass-link in case c (bits); 0 when it has no profile. */
  total(passId: string, link: string, c: number): number {
    const r = this.row(passId, link);
    if (r < 0) return 0;
    const o = r * ROW, count = this.rows[o + 3];
    return count === 0 ? 0 : this.values[this.rows[o + 4] + (count - 1) * this.nCases + c];
  }

  /**
   * Cumulative volume (bits) of a pass-link in case c before time t, with
   * `startS` the window start: 0 before the profile, the total after it,
   * linear between grid times.
   */
  cumulative(passId: string, link: string, c: number, t: number, startS: number): number {
    const r = this.row(passId, link);
    if (r < 0) return 0;
    const o = r * ROW, g0 = this.rows[o + 2], count = this.rows[o + 3], off = this.rows[o + 4], nc = this.nCases;
    if (count === 0) return 0;
    const x = (t - startS) / this.gridS - g0;
    if (x <= 0) return 0;
    if (x >= count - 1) return this.values[off + (count - 1) * nc + c];
    const k = Math.floor(x + 1e-9), f = x - k;
    const lo = this.values[off + k * nc + c];
    if (f <= 1e-9) return lo;
    return lo + (this.values[off + (k + 1) * nc + c] - lo) * f;
  }

  /** Volume (bits) of a pass-link in case c inside [a, b]. */
  volume(passId: string, link: string, c: number, a: number, b: number, startS: number): number {
    return b <= a ? 0 : this.cumulative(passId, link, c, b, startS) - this.cumulative(passId, link, c, a, startS);
  }
}
