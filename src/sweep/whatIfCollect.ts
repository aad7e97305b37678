/**
 * What the report's what-if panel needs per step, collected in the sweep's
 * window loop as typed-array column copies (quantised to integers): per pass
 * part in a window, the elevation the station's mask is tested on (0.01°)
 * and, per link of the station and weather case, C/N0 (0.001 dB-Hz). The
 * page reapplies the run's rules to these (analysis/whatIf.ts).
 */
import type { LinkColumns } from '../budget/linkColumns.js';
import type { StationColumns } from '../geometry/columns.js';

/** Elevation quantum (deg) and C/N0 quantum (dB) of the collected columns. */
export const WHATIF_ELEVATION_QUANTUM_DEG = 0.01;
export const WHATIF_CN0_QUANTUM_DB = 0.001;
/** A non-finite value in an integer column. */
export const WHATIF_MISSING = -2147483648;

/** One chunk's collected columns (plain typed arrays: crosses a worker boundary). */
export interface WhatIfChunkData {
  /** Per part: layout station index, index of the pass in the chunk's `passes`, first grid index, step count. */
  parts: Int32Array;
  /** Per part step: mask elevation in WHATIF_ELEVATION_QUANTUM_DEG units. */
  elevation: Int32Array;
  /** Per part: per link of the station, per case, per step: C/N0 in WHATIF_CN0_QUANTUM_DB units. */
  cn0: Int32Array;
  /** Pass ids of the chunk's `passes`, in order. */
  passIds: string[];
}

class Grow {
  a: Int32Array;
  n = 0;
  constructor(cap: number) { this.a = new Int32Array(cap); }
  reserve(m: number): Int32Array {
    if (this.n + m > this.a.length) {
      const b = new Int32Array(Math.max(this.n + m, 2 * this.a.length));
      b.set(this.a.subarray(0, this.n));
      this.a = b;
    }
    return this.a;
  }
  take(): Int32Array { const out = this.a.slice(0, this.n); this.n = 0; return out; }
}

export interface WhatIfCollector {
  /** Steps [0, n) of a pass part: station columns (apparent or geometric elevation per `apparent`) and the station's link columns. */
  add(station: number, passNo: number, k0: number, n: number, stn: StationColumns, apparent: boolean, cols: readonly LinkColumns[], nLinks: number): void;
  /** A pass begun (its id, in the order of the chunk's `passes`). */
  pass(passId: string): void;
  take(): WhatIfChunkData;
}

export function createWhatIfCollector(): WhatIfCollector {
  const parts = new Grow(256), el = new Grow(1 << 14), cn0 = new Grow(1 << 16);
  let passIds: string[] = [];
  const qEl = 1 / WHATIF_ELEVATION_QUANTUM_DEG, qC = 1 / WHATIF_CN0_QUANTUM_DB;
  const copy = (g: Grow, src: Float64Array, n: number, scale: number) => {
    const a = g.reserve(n);
    let o = g.n;
    for (let i = 0; i < n; i++, o++) {
      const v = src[i] * scale;
      a[o] = v === v && Math.abs(v) < 2e9 ? Math.round(v) : WHATIF_MISSING;
    }
    g.n = o;
  };
  return {
    add(station, passNo, k0, n, stn, apparent, cols, nLinks) {
      const p = parts.reserve(4);
      p[parts.n] = station; p[parts.n + 1] = passNo; p[parts.n + 2] = k0; p[parts.n + 3] = n;
      parts.n += 4;
      copy(el, apparent ? stn.apparentElevationDeg : stn.elevationDeg, n, qEl);
      for (let l = 0; l < nLinks; l++) for (const c of cols[l].cases) copy(cn0, c.cOverN0DBHz, n, qC);
    },
    pass(passId) { passIds.push(passId); },
    take() { const ids = passIds; passIds = []; return { parts: parts.take(), elevation: el.take(), cn0: cn0.take(), passIds: ids }; },
  };
}
