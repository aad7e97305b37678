/**
 * Hand-built inputs for the analysis tests: a link description and StepBudget
 * records with chosen margins and rates. Names are invented for the tests.
 */
import type { AdaptiveMode, CaseBudget, LinkSpec, StepBudget } from '../../src/budget/types.js';

export const SAT = 'TERN-3';
export const STATION = 'Gorsemoor';

/**
 * A DVB-S2 subset, ETSI EN 302 307-1 Table 13 ideal Es/N0 and spectral
 * efficiency as given in PHYSICS.md §12 (from memory). Picked to show that
 * efficiency is not monotone in required Es/N0: 16APSK 3/4 needs less than
 * 8PSK 8/9 and carries more.
 */
export const DVBS2_SUBSET: AdaptiveMode[] = [
  { name: 'QPSK 1/2', requiredEsN0DB: 1.0, efficiencyBitsPerSymbol: 0.988858 },
  { name: '8PSK 8/9', requiredEsN0DB: 10.69, efficiencyBitsPerSymbol: 2.646012 },
  { name: '16APSK 3/4', requiredEsN0DB: 10.21, efficiencyBitsPerSymbol: 2.966728 },
];

export function makeLink(modcod: LinkSpec['modcod'], over: Partial<LinkSpec> = {}): LinkSpec {
  const end = { antenna: { kind: 'isotropic' as const }, polarisation: { axialRatio: 1, tiltDeg: 0 }, lineLossDB: 0 };
  return {
    name: 'tlm',
    satellite: SAT,
    station: STATION,
    direction: 'downlink',
    frequencyGHz: 2.2,
    spacecraft: { ...end, txPowerDBW: 0, pointing: { kind: 'tracking', attitudeErrorDeg: 0 } },
    ground: { ...end, pointing: { kind: 'track', pointingErrorDeg: 0 } },
    modcod,
    implementationLossDB: 0.5,
    otherLossesDB: 0,
    requiredMarginDB: 1,
    ...over,
  };
}

export const fixedLink = (bitRateBps = 9600, over: Partial<LinkSpec> = {}) =>
  makeLink({ kind: 'fixed', bitRateBps, modulation: 'bpsk', coding: 'uncoded', requiredEbN0DB: 9.6, bitsPerSymbol: 1 }, over);

export const adaptiveLink = (symbolRateBaud = 1e6, modes = DVBS2_SUBSET, over: Partial<LinkSpec> = {}) =>
  makeLink({ kind: 'adaptive', symbolRateBaud, modes }, over);

export function makeCase(weather: string, fields: Partial<CaseBudget>): CaseBudget {
  return {
    weather,
    gas_loss_db: 0, rain_loss_db: 0, cloud_loss_db: 0, scintillation_db: 0, atmospheric_loss_db: 0,
    antenna_temperature_k: 100, system_temperature_k: 300, g_over_t_dbk: 0,
    c_over_n0_dbhz: 60, eb_over_n0_db: 20, es_over_n0_db: 20, required_eb_over_n0_db: 9.6,
    margin_db: 10, usable: true, mode: '', information_rate_bps: 0,
    ...fields,
  };
}

export function makeStep(timeS: number, elevationDeg: number, cases: CaseBudget[]): StepBudget {
  return {
    time_s: timeS, range_km: 1000, elevation_deg: elevationDeg, azimuth_deg: 0,
    tx_off_boresight_deg: 0, rx_off_boresight_deg: 0, eirp_dbw: 0, free_space_loss_db: 160,
    polarisation_loss_db: 0, tx_pointing_loss_db: 0, rx_pointing_loss_db: 0, other_losses_db: 0,
    mount_lag_deg: 0, mount_limited: false, doppler_hz: 0, doppler_rate_hz_s: 0, cases,
  };
}

/** Fixed-rate case record: usable iff margin ≥ the link's required margin, rate R_b then. */
export function fixedCase(link: LinkSpec, weather: string, marginDB: number): CaseBudget {
  const rate = link.modcod.kind === 'fixed' ? link.modcod.bitRateBps : 0;
  const usable = marginDB >= link.requiredMarginDB;
  return makeCase(weather, { margin_db: marginDB, usable, information_rate_bps: usable ? rate : 0 });
}

/** Adaptive case record as the engine would make it: the most efficient fitting mode (PHYSICS.md §12). */
export function adaptiveCase(link: LinkSpec, weather: string, esOverN0DB: number): CaseBudget {
  if (link.modcod.kind !== 'adaptive') throw new Error('adaptive link expected');
  let mode = '';
  let eta = 0;
  for (const m of link.modcod.modes) {
    if (esOverN0DB - link.implementationLossDB >= m.requiredEsN0DB + link.requiredMarginDB && m.efficiencyBitsPerSymbol > eta) {
      eta = m.efficiencyBitsPerSymbol;
      mode = m.name;
    }
  }
  return makeCase(weather, {
    es_over_n0_db: esOverN0DB,
    margin_db: esOverN0DB - link.implementationLossDB - (link.modcod.modes.find((m) => m.name === mode)?.requiredEsN0DB ?? 1),
    usable: mode !== '',
    mode,
    information_rate_bps: link.modcod.symbolRateBaud * eta,
  });
}

/** Small deterministic generator (Numerical Recipes LCG constants) for repeatable synthetic data. */
export function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

export const passInfo = (aosS: number, losS: number, over: Partial<{ passId: string; maxElevationDeg: number; tcaS: number }> = {}) => ({
  passId: `${SAT}/${STATION}/1`,
  satellite: SAT,
  station: STATION,
  aosS,
  tcaS: (aosS + losS) / 2,
  losS,
  maxElevationDeg: 45,
  durationS: losS - aosS,
  clippedStart: false,
  clippedEnd: false,
  ...over,
});
