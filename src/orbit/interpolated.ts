/**
 * SGP4 once, at nodes; everything in between by interpolation.
 *
 * The satellite's TEME position and velocity are computed by SGP4 at nodes
 * t_j = origin + j·H (j any integer) and interpolated between them with the
 * 8-point Lagrange polynomial through nodes j−3 … j+4 for t in [t_j, t_j+1):
 *   x(t) ≈ Σ_i w_i(u) x_(j+i),  u = (t − t_j)/H,  w_i(u) = Π_(m≠i) (u − m)/(i − m),  i, m ∈ −3…4
 * Position and velocity are each interpolated from SGP4's own values (the
 * velocity is not the derivative of the position interpolant), so each
 * inherits the interpolation error of a degree-7 polynomial:
 *   |e| ≲ C (ω H)^8 |x|, ω the fastest angular rate of the orbit (at perigee).
 * The node spacing is chosen from the orbit so that ω_p·H ≤ NODE_PHASE_RAD;
 * test/orbit/interpolated.test.ts measures the error against direct SGP4 over
 * a full day for altitudes 300–2000 km and eccentricities up to 0.1 (stated
 * bound: position within 1 m, velocity within 1 mm/s; measured far below).
 *
 * Grid alignment: the sweep's grid t_k = origin + k·Δt is tied to the nodes,
 * either H = m·Δt (node j = every m-th grid time, so a grid time sits at one
 * of m fixed offsets whose weights are tabulated once) or Δt = q·H (every grid
 * time is a node). A grid time therefore always gets the same weights, in
 * `stateTeme` or `fillGrid`, and a node time returns SGP4's value exactly.
 *
 * Nodes are computed on demand in blocks of NODE_BLOCK and kept in a small
 * cache (a few hours of orbit), so memory does not grow with the window; a
 * node's value does not depend on which block computed it, so any split of
 * the work (chunks, worker threads) sees the same orbit.
 */
import type { ElementSet } from '../elements/types.js';
import type { Propagator } from './propagator.js';

/** Largest phase step ω_p·H between nodes (rad): 60 s at a 500 km circular orbit. */
export const NODE_PHASE_RAD = 0.066;
/** Node spacing bounds (s). */
export const MIN_NODE_SPACING_S = 1;
export const MAX_NODE_SPACING_S = 300;
/** Nodes per cached block, and blocks kept. */
export const NODE_BLOCK = 64;
const CACHED_BLOCKS = 24;
const STENCIL = 8;
const LEFT = 3; // nodes j−3 … j+4

const MU_KM3_S2 = 398_600.8; // WGS-72, as SGP4

/** Angular rate at perigee (rad/s) of the mean elements: n (1+e)² / (1−e²)^(3/2). */
export function perigeeRateRadS(elements: ElementSet): number {
  const n = (elements.meanMotionRevPerDay * 2 * Math.PI) / 86_400;
  const e = elements.eccentricity;
  return (n * (1 + e) ** 2) / (1 - e * e) ** 1.5;
}

/** The node spacing target (s) for an orbit: NODE_PHASE_RAD / ω_p within the bounds. */
export function nodeSpacingTargetS(elements: ElementSet): number {
  return Math.min(MAX_NODE_SPACING_S, Math.max(MIN_NODE_SPACING_S, NODE_PHASE_RAD / perigeeRateRadS(elements)));
}

/** Columns of TEME states (km, km/s), one entry per grid time. */
export interface StateColumns {
  rx: Float64Array; ry: Float64Array; rz: Float64Array;
  vx: Float64Array; vy: Float64Array; vz: Float64Array;
}

export function createStateColumns(n: number): StateColumns {
  return {
    rx: new Float64Array(n), ry: new Float64Array(n), rz: new Float64Array(n),
    vx: new Float64Array(n), vy: new Float64Array(n), vz: new Float64Array(n),
  };
}

/**
 * Where the satellite is: TEME states at any time and, in bulk, on the run's
 * grid. Either SGP4 directly (`exactOrbit`) or interpolated between nodes.
 */
export interface OrbitSource {
  readonly elements: ElementSet;
  /** TEME position (km) and velocity (km/s) at Unix time `timeS`; throws PropagationError. */
  stateTeme(timeS: number, posOut: Float64Array, velOut: Float64Array): void;
  /** Grid origin (s) and step (s): grid time k is originS + k·stepS. */
  readonly originS: number;
  readonly stepS: number;
  /** States at grid times k0 … k0+n−1 into entries 0 … n−1 of `out`. */
  fillGrid(k0: number, n: number, out: StateColumns): void;
  /** Node spacing (s), or NaN for direct SGP4. */
  readonly nodeSpacingS: number;
  /** SGP4 evaluations so far (nodes, or every call when exact). */
  readonly sgp4Calls: number;
  /** One line for provenance, e.g. "SGP4 at nodes every 60 s, 8-point Lagrange". */
  readonly description: string;
}

/** Barycentric constants of the nodes −3…4: 1 / Π_(m≠i) (x_i − x_m). */
const BARY = Float64Array.from({ length: STENCIL }, (_, i) => {
  let d = 1;
  for (let m = 0; m < STENCIL; m++) if (m !== i) d *= (i - LEFT) - (m - LEFT);
  return 1 / d;
});

/**
 * Lagrange weights of the 8 nodes −3…4 at fractional position u (in node
 * spacings from node 0): w_i = ℓ(u) b_i / (u − x_i), ℓ(u) = Π (u − x_m), the
 * first barycentric form (the same polynomial, a few times cheaper than the
 * product per weight); at a node the weights are exactly 0 and 1.
 */
export function lagrangeWeights(u: number, out: Float64Array): Float64Array {
  let l = 1;
  for (let m = 0; m < STENCIL; m++) {
    const d = u - (m - LEFT);
    if (d === 0) { out.fill(0); out[m] = 1; return out; }
    l *= d;
  }
  for (let i = 0; i < STENCIL; i++) out[i] = (l * BARY[i]) / (u - (i - LEFT));
  return out;
}

/** Direct SGP4 at every call: the `exactOrbit` path, and the reference the interpolation is tested against. */
export function exactOrbit(propagator: Propagator, originS: number, stepS: number): OrbitSource {
  let calls = 0;
  const r = new Float64Array(3);
  const v = new Float64Array(3);
  return {
    elements: propagator.elements,
    originS, stepS, nodeSpacingS: NaN,
    get sgp4Calls() { return calls; },
    description: 'SGP4 at every instant (exact orbit)',
    stateTeme(t, p, q) { calls++; propagator.stateTeme(t, p, q); },
    fillGrid(k0, n, out) {
      for (let i = 0; i < n; i++) {
        calls++;
        propagator.stateTeme(originS + (k0 + i) * stepS, r, v);
        out.rx[i] = r[0]; out.ry[i] = r[1]; out.rz[i] = r[2];
        out.vx[i] = v[0]; out.vy[i] = v[1]; out.vz[i] = v[2];
      }
    },
  };
}

export interface InterpolatedOrbitOptions {
  originS: number;
  stepS: number;
  /** Node spacing target (s); default from the orbit (nodeSpacingTargetS). */
  nodeSpacingTargetS?: number;
}

/**
 * The interpolated orbit of one element set on the grid (originS, stepS);
 * see the file comment for the scheme and its accuracy.
 */
export function interpolatedOrbit(propagator: Propagator, options: InterpolatedOrbitOptions): OrbitSource {
  const { originS, stepS } = options;
  if (!(stepS > 0) || !Number.isFinite(originS)) throw new RangeError(`interpolatedOrbit: grid step ${stepS} s / origin ${originS} s must be finite, step > 0`);
  const target = options.nodeSpacingTargetS ?? nodeSpacingTargetS(propagator.elements);
  // Tie the nodes to the grid: H = m·Δt, or Δt = q·H.
  const m = stepS <= target ? Math.max(1, Math.floor(target / stepS + 1e-9)) : 1;
  const q = stepS <= target ? 1 : Math.ceil(stepS / target - 1e-9);
  const H = stepS <= target ? m * stepS : stepS / q;
  // Weights of the m grid offsets within a node interval (offset 0 is node j itself: exact).
  const gridWeights: Float64Array[] = [];
  for (let o = 0; o < m; o++) gridWeights.push(lagrangeWeights(o / m, new Float64Array(STENCIL)));

  let calls = 0;
  const blocks = new Map<number, Float64Array>();
  let lastBlockIndex = NaN;
  let lastBlock: Float64Array = new Float64Array(0);
  const r = new Float64Array(3);
  const v = new Float64Array(3);

  function block(b: number): Float64Array {
    if (b === lastBlockIndex) return lastBlock;
    let blk = blocks.get(b);
    if (!blk) {
      blk = new Float64Array(NODE_BLOCK * 6);
      const j0 = b * NODE_BLOCK;
      for (let i = 0; i < NODE_BLOCK; i++) {
        calls++;
        propagator.stateTeme(originS + (j0 + i) * H, r, v);
        const o = i * 6;
        blk[o] = r[0]; blk[o + 1] = r[1]; blk[o + 2] = r[2];
        blk[o + 3] = v[0]; blk[o + 4] = v[1]; blk[o + 5] = v[2];
      }
      if (blocks.size >= CACHED_BLOCKS) blocks.delete(blocks.keys().next().value as number);
      blocks.set(b, blk);
    }
    lastBlockIndex = b;
    lastBlock = blk;
    return blk;
  }

  /** The 8 nodes j−3 … j+4 into `st` (48 numbers, node-major). */
  const stencil = new Float64Array(STENCIL * 6);
  let stencilJ = NaN;
  function loadStencil(j: number): void {
    if (j === stencilJ) return;
    for (let i = 0; i < STENCIL; i++) {
      const n = j - LEFT + i;
      const b = Math.floor(n / NODE_BLOCK);
      const blk = block(b);
      const o = (n - b * NODE_BLOCK) * 6;
      const d = i * 6;
      for (let c = 0; c < 6; c++) stencil[d + c] = blk[o + c];
    }
    stencilJ = j;
  }

  function node(j: number, p: Float64Array, w: Float64Array): void {
    const b = Math.floor(j / NODE_BLOCK);
    const blk = block(b);
    const o = (j - b * NODE_BLOCK) * 6;
    p[0] = blk[o]; p[1] = blk[o + 1]; p[2] = blk[o + 2];
    w[0] = blk[o + 3]; w[1] = blk[o + 4]; w[2] = blk[o + 5];
  }

  const wArb = new Float64Array(STENCIL);
  function combine(w: Float64Array, c: number): number {
    const s = stencil;
    return w[0] * s[c] + w[1] * s[6 + c] + w[2] * s[12 + c] + w[3] * s[18 + c]
      + w[4] * s[24 + c] + w[5] * s[30 + c] + w[6] * s[36 + c] + w[7] * s[42 + c];
  }

  function stateTeme(t: number, p: Float64Array, w: Float64Array): void {
    const x = (t - originS) / H;
    let j = Math.floor(x);
    let u = x - j;
    // A grid time gets its tabulated weights (the same numbers as fillGrid), a node time the node itself.
    const om = u * m;
    const o = Math.round(om);
    if (Math.abs(om - o) < 1e-9) {
      if (o === m) { j++; u = 0; }
      if (o === 0 || o === m) { node(j, p, w); return; }
      loadStencil(j);
      const gw = gridWeights[o];
      p[0] = combine(gw, 0); p[1] = combine(gw, 1); p[2] = combine(gw, 2);
      w[0] = combine(gw, 3); w[1] = combine(gw, 4); w[2] = combine(gw, 5);
      return;
    }
    loadStencil(j);
    lagrangeWeights(u, wArb);
    p[0] = combine(wArb, 0); p[1] = combine(wArb, 1); p[2] = combine(wArb, 2);
    w[0] = combine(wArb, 3); w[1] = combine(wArb, 4); w[2] = combine(wArb, 5);
  }

  function fillGrid(k0: number, n: number, out: StateColumns): void {
    const { rx, ry, rz, vx, vy, vz } = out;
    for (let i = 0; i < n; i++) {
      const k = k0 + i;
      let j: number, o: number;
      if (q > 1) { j = k * q; o = 0; } else { j = Math.floor(k / m); o = k - j * m; }
      if (o === 0) {
        const b = Math.floor(j / NODE_BLOCK);
        const blk = block(b);
        const a = (j - b * NODE_BLOCK) * 6;
        rx[i] = blk[a]; ry[i] = blk[a + 1]; rz[i] = blk[a + 2];
        vx[i] = blk[a + 3]; vy[i] = blk[a + 4]; vz[i] = blk[a + 5];
        continue;
      }
      loadStencil(j);
      // The six weighted sums written out (a call per component would box each result).
      const w = gridWeights[o], s = stencil;
      const w0 = w[0], w1 = w[1], w2 = w[2], w3 = w[3], w4 = w[4], w5 = w[5], w6 = w[6], w7 = w[7];
      rx[i] = w0 * s[0] + w1 * s[6] + w2 * s[12] + w3 * s[18] + w4 * s[24] + w5 * s[30] + w6 * s[36] + w7 * s[42];
      ry[i] = w0 * s[1] + w1 * s[7] + w2 * s[13] + w3 * s[19] + w4 * s[25] + w5 * s[31] + w6 * s[37] + w7 * s[43];
      rz[i] = w0 * s[2] + w1 * s[8] + w2 * s[14] + w3 * s[20] + w4 * s[26] + w5 * s[32] + w6 * s[38] + w7 * s[44];
      vx[i] = w0 * s[3] + w1 * s[9] + w2 * s[15] + w3 * s[21] + w4 * s[27] + w5 * s[33] + w6 * s[39] + w7 * s[45];
      vy[i] = w0 * s[4] + w1 * s[10] + w2 * s[16] + w3 * s[22] + w4 * s[28] + w5 * s[34] + w6 * s[40] + w7 * s[46];
      vz[i] = w0 * s[5] + w1 * s[11] + w2 * s[17] + w3 * s[23] + w4 * s[29] + w5 * s[35] + w6 * s[41] + w7 * s[47];
    }
  }

  return {
    elements: propagator.elements,
    originS, stepS, nodeSpacingS: H,
    get sgp4Calls() { return calls; },
    description: `SGP4 at nodes every ${+H.toFixed(6)} s, 8-point Lagrange interpolation of position and velocity between them`,
    stateTeme,
    fillGrid,
  };
}
