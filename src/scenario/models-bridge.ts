/**
 * The few model functions and tables the scenario resolver needs, taken from
 * `src/models/index.ts`. The models are written concurrently by another
 * helper; until a name lands there, a local stand-in is used.
 * TODO(scenario): drop each stand-in once `src/models/index.ts` exports the name.
 */
import * as models from '../models/index.js';
import type { AdaptiveMode, Modulation } from '../budget/types.js';

type Interval = readonly [number, number];

export interface CodingProfile { name: string; codeRate: number; requiredEbN0DB: number; source: string }

interface ModelsApi {
  rainRateForZone(zone: string): number;
  defaultIsothermHeightKm(a: { latitudeDeg: number }): number;
  rainHeightKm(a: { isothermHeightKm: number }): number;
  wetRefractivity(a: { temperatureC: number; relativeHumidityPercent: number }): number;
  requiredEbN0DB(a: { modulation: Modulation; bitErrorRate: number }): number;
  codingProfile(name: string): CodingProfile;
  CODING_PROFILES: ReadonlyArray<CodingProfile> | Readonly<Record<string, CodingProfile>>;
  DVBS2_MODES: ReadonlyArray<AdaptiveMode>;
  P618_RAIN_VALIDITY: { frequencyGHz: Interval; exceedancePercent: Interval };
  P618_SCINTILLATION_VALIDITY: { frequencyGHz: Interval };
  P676_SLANT_VALIDITY: { frequencyGHz: Interval };
  P838_VALIDITY: { frequencyGHz: Interval };
  P840_VALIDITY: { frequencyGHz: Interval };
}

const M = models as unknown as Partial<ModelsApi>;

// ---------------------------------------------------------------- local stand-ins (TODO: remove)

/** ITU-R P.837-1 rain-climate zones, R0.01 in mm/h (from memory). */
const LOCAL_ZONE_R001: Record<string, number> = { A: 8, B: 12, C: 15, D: 19, E: 22, F: 28, G: 30, H: 32, J: 35, K: 42, L: 60, M: 63, N: 95, P: 145, Q: 115 };

/** Older ITU-R P.839 latitude rule for the 0 °C isotherm height (km) (from memory, rough). */
function localIsotherm({ latitudeDeg: lat }: { latitudeDeg: number }): number {
  if (lat >= 0) return lat <= 23 ? 5 : 5 - 0.075 * (lat - 23);
  return lat >= -21 ? 5 : 5 + 0.1 * (lat + 21);
}

/** ITU-R P.453: e_s = 6.1121 exp(17.502 t / (t + 240.97)) hPa over water, t in °C. */
export function saturationVapourPressureHPa(temperatureC: number): number {
  return 6.1121 * Math.exp((17.502 * temperatureC) / (temperatureC + 240.97));
}

/** ITU-R P.453: N_wet = 3.732e5 e / T², e = H e_s / 100. */
function localWetRefractivity(a: { temperatureC: number; relativeHumidityPercent: number }): number {
  const e = (a.relativeHumidityPercent * saturationVapourPressureHPa(a.temperatureC)) / 100;
  const T = a.temperatureC + 273.15;
  return (3.732e5 * e) / (T * T);
}

/** Uncoded BER closed forms (Sklar, Digital Communications), solved for Eb/N0 by bisection. */
function localRequiredEbN0DB({ modulation, bitErrorRate }: { modulation: Modulation; bitErrorRate: number }): number {
  const erfc = (x: number) => {
    // Abramowitz & Stegun 7.1.26, |error| < 1.5e-7: enough to place a threshold to 0.01 dB.
    const t = 1 / (1 + 0.3275911 * x);
    return t * (0.254829592 + t * (-0.284496736 + t * (1.421413741 + t * (-1.453152027 + t * 1.061405429)))) * Math.exp(-x * x);
  };
  const ber = (g: number): number => {
    switch (modulation) {
      case 'bpsk': case 'qpsk': return 0.5 * erfc(Math.sqrt(g));
      case 'dbpsk': return 0.5 * Math.exp(-g);
      case 'bfsk-coherent': return 0.5 * erfc(Math.sqrt(g / 2));
      case 'bfsk-noncoherent': return 0.5 * Math.exp(-g / 2);
    }
  };
  let lo = -10, hi = 40;
  for (let i = 0; i < 80; i++) {
    const mid = (lo + hi) / 2;
    if (ber(10 ** (mid / 10)) > bitErrorRate) lo = mid; else hi = mid;
  }
  return (lo + hi) / 2;
}

/** Coding gains at BER 1e-5 (from memory, approximate; replace with the modem's figures). */
const LOCAL_CODING: CodingProfile[] = [
  { name: 'uncoded', codeRate: 1, requiredEbN0DB: NaN, source: 'uncoded closed form' },
  { name: 'conv-r1/2-k7', codeRate: 0.5, requiredEbN0DB: 4.4, source: 'convolutional r=1/2 K=7 soft Viterbi, BER 1e-5 (from memory)' },
  { name: 'rs-conv', codeRate: (223 / 255) * 0.5, requiredEbN0DB: 2.5, source: 'RS(255,223) + conv r=1/2 K=7, BER 1e-5 (from memory)' },
];

/** ETSI EN 302 307-1 Table 13 (from memory), as listed in PHYSICS.md §12. */
const LOCAL_DVBS2: AdaptiveMode[] = ([
  ['QPSK 1/4', -2.35, 0.490243], ['QPSK 1/3', -1.24, 0.656448], ['QPSK 2/5', -0.3, 0.789412], ['QPSK 1/2', 1.0, 0.988858],
  ['QPSK 3/5', 2.23, 1.188304], ['QPSK 2/3', 3.1, 1.322253], ['QPSK 3/4', 4.03, 1.487473], ['QPSK 4/5', 4.68, 1.587196],
  ['QPSK 5/6', 5.18, 1.654663], ['QPSK 8/9', 6.2, 1.766451], ['QPSK 9/10', 6.42, 1.788612], ['8PSK 3/5', 5.5, 1.779991],
  ['8PSK 2/3', 6.62, 1.980636], ['8PSK 3/4', 7.91, 2.228124], ['8PSK 5/6', 9.35, 2.478562], ['8PSK 8/9', 10.69, 2.646012],
  ['8PSK 9/10', 10.98, 2.679207], ['16APSK 2/3', 8.97, 2.637201], ['16APSK 3/4', 10.21, 2.966728], ['16APSK 4/5', 11.03, 3.165623],
  ['16APSK 5/6', 11.61, 3.300184], ['16APSK 8/9', 12.89, 3.523143], ['16APSK 9/10', 13.13, 3.567342], ['32APSK 3/4', 12.73, 3.703295],
  ['32APSK 4/5', 13.64, 3.951571], ['32APSK 5/6', 14.28, 4.11954], ['32APSK 8/9', 15.69, 4.397854], ['32APSK 9/10', 16.05, 4.453027],
] as const).map(([name, es, eta]) => ({ name, requiredEsN0DB: es, efficiencyBitsPerSymbol: eta }));

// ---------------------------------------------------------------- what the resolver uses

export const rainRateForZone = (zone: string): number => (M.rainRateForZone ? M.rainRateForZone(zone) : LOCAL_ZONE_R001[zone]);
export const defaultIsothermHeightKm = (a: { latitudeDeg: number }): number => (M.defaultIsothermHeightKm ?? localIsotherm)(a);
/** ITU-R P.839: h_R = h_0 + 0.36 km. */
export const rainHeightKm = (a: { isothermHeightKm: number }): number => (M.rainHeightKm ? M.rainHeightKm(a) : a.isothermHeightKm + 0.36);
export const wetRefractivity = (a: { temperatureC: number; relativeHumidityPercent: number }): number => (M.wetRefractivity ?? localWetRefractivity)(a);
export const requiredEbN0DB = (a: { modulation: Modulation; bitErrorRate: number }): number => (M.requiredEbN0DB ?? localRequiredEbN0DB)(a);

export function codingProfileNames(): string[] {
  const p = M.CODING_PROFILES;
  if (!p) return LOCAL_CODING.map((c) => c.name);
  return Array.isArray(p) ? p.map((c: CodingProfile) => c.name) : Object.keys(p);
}

/** The named profile, or null when unknown (the caller reports it with the scenario line). */
export function findCodingProfile(name: string): CodingProfile | null {
  if (!codingProfileNames().includes(name)) return null;
  if (M.codingProfile) return M.codingProfile(name);
  return LOCAL_CODING.find((c) => c.name === name) ?? null;
}

export const dvbs2Modes = (): AdaptiveMode[] => (M.DVBS2_MODES ?? LOCAL_DVBS2).map((m) => ({ ...m }));
export const usingLocalModels = (): string[] =>
  (['rainRateForZone', 'defaultIsothermHeightKm', 'rainHeightKm', 'wetRefractivity', 'requiredEbN0DB', 'codingProfile', 'CODING_PROFILES', 'DVBS2_MODES'] as const)
    .filter((k) => M[k] === undefined);

/** Frequency validity ranges (GHz) of the propagation models, from the models' own data where exported. */
export function frequencyValidity(): { rain: Interval; exceedance: Interval; scintillation: Interval; gas: Interval } {
  return {
    rain: M.P618_RAIN_VALIDITY?.frequencyGHz ?? [1, 55],
    exceedance: M.P618_RAIN_VALIDITY?.exceedancePercent ?? [0.001, 5],
    scintillation: M.P618_SCINTILLATION_VALIDITY?.frequencyGHz ?? [4, 55],
    gas: M.P676_SLANT_VALIDITY?.frequencyGHz ?? [1, 1000],
  };
}
