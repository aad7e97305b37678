/**
 * Noise from the Sun in a receiving antenna's beam (PHYSICS.md §13): the
 * quiet Sun's brightness temperature against frequency, and the antenna
 * temperature a uniformly bright disc adds, weighted by the antenna pattern:
 *   ΔT_A = (1 / 4π) ∫_disc T_b G(θ) dΩ   (antenna temperature of a source
 * filling part of the pattern; common practice, e.g. Kraus, Radio Astronomy).
 * For a disc small against the beam this is T_b G(θ_sep) Ω_sun / 4π.
 */
import { checkAtLeast, checkRange } from './range.js';

const DEG = Math.PI / 180;

/**
 * Quiet-Sun brightness temperature (K) at frequency (GHz), from memory, rough
 * (no table at hand): about 10^6 K at 100 MHz (corona), some 4·10^4 K at
 * 2.8 GHz (a solar-minimum 10.7 cm flux of about 67 solar flux units over the
 * 0.53° disc), about 10^4 K at X-band, falling toward 6500 K (the
 * photosphere) at 100 GHz. Log-log interpolation between the points.
 */
export const QUIET_SUN_BRIGHTNESS_K: readonly (readonly [number, number])[] = [
  [0.1, 1.0e6], [0.3, 5.0e5], [0.5, 3.0e5], [1, 1.6e5], [1.4, 1.2e5], [2, 7.0e4], [2.8, 4.0e4], [4, 2.6e4],
  [6, 1.8e4], [10, 1.15e4], [15, 9.5e3], [20, 8.5e3], [30, 7.5e3], [50, 7.0e3], [100, 6.5e3],
];

export const QUIET_SUN_FREQUENCY_GHZ_VALIDITY = [0.1, 100] as const;

/** Quiet-Sun brightness temperature (K), log-log in QUIET_SUN_BRIGHTNESS_K (from memory, rough). */
export function quietSunBrightnessTemperatureK(a: { frequencyGHz: number }): number {
  checkRange('quietSunBrightnessTemperatureK', 'frequencyGHz', a.frequencyGHz, QUIET_SUN_FREQUENCY_GHZ_VALIDITY, 'GHz');
  const t = QUIET_SUN_BRIGHTNESS_K;
  let j = 1;
  while (j < t.length - 1 && t[j][0] < a.frequencyGHz) j++;
  const [f0, b0] = t[j - 1], [f1, b1] = t[j];
  const u = Math.log(a.frequencyGHz / f0) / Math.log(f1 / f0);
  return Math.exp(Math.log(b0) + u * Math.log(b1 / b0));
}

/** Gauss–Legendre nodes and weights on [0, 1], 8 points (Abramowitz & Stegun Table 25.4). */
const GL_X = [-0.9602898564975363, -0.7966664774136267, -0.5255324099163290, -0.1834346424956498,
  0.1834346424956498, 0.5255324099163290, 0.7966664774136267, 0.9602898564975363].map((x) => (x + 1) / 2);
const GL_W = [0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.3626837833783620,
  0.3626837833783620, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763].map((w) => w / 2);
/** Azimuth samples around the disc centre over [0, π] (the pattern is symmetric about the boresight–Sun plane). */
const AZ = 24;

/**
 * (1 / 4π) ∫ G dΩ over a disc of diameter `discDiameterDeg` whose centre is
 * `separationDeg` from boresight, with G the linear gain (not dB) of a
 * pattern symmetric about boresight, `gainLinear(offBoresightDeg)`: the
 * fraction of the disc's brightness temperature that reaches the antenna
 * temperature. Exact spherical offsets; 8-point Gauss–Legendre in the disc
 * radius (weight sin ρ) × 24 midpoints in azimuth over a half-disc.
 */
export function discPatternFraction(a: { separationDeg: number; discDiameterDeg: number; gainLinear: (offBoresightDeg: number) => number }): number {
  checkRange('discPatternFraction', 'separationDeg', a.separationDeg, [0, 180], 'deg');
  checkAtLeast('discPatternFraction', 'discDiameterDeg', a.discDiameterDeg, 0, 'deg', true);
  const s = a.separationDeg * DEG, r = (a.discDiameterDeg / 2) * DEG;
  const cs = Math.cos(s), ss = Math.sin(s);
  let sum = 0;
  for (let q = 0; q < GL_X.length; q++) {
    const rho = GL_X[q] * r;
    const cr = Math.cos(rho), sr = Math.sin(rho);
    let ring = 0;
    for (let k = 0; k < AZ; k++) {
      const phi = ((k + 0.5) / AZ) * Math.PI;
      const c = cs * cr + ss * sr * Math.cos(phi);
      ring += a.gainLinear(Math.acos(c > 1 ? 1 : c < -1 ? -1 : c) / DEG);
    }
    // ∫0^2π dφ over the ring = 2 × (π / AZ) Σ over the half.
    sum += GL_W[q] * r * sr * ring * ((2 * Math.PI) / AZ);
  }
  return sum / (4 * Math.PI);
}
