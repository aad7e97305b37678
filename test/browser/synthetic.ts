/**
 * A small invented scenario for the report and calendar tests: satellite
 * ORBILUX-3 on a 550 km circular orbit, stations Kaldfjell, Pico Verde and
 * Maraka, links uhf-tm, s-band (fixed rate) and x-band (adaptive), weather
 * cases clear, p1 and p0.1, two UTC days. Passes come from spherical
 * geometry (central angle ψ with cos ψ = cos ψmin · cos ωτ, elevation
 * tan e = (cos ψ − Re/r)/sin ψ, range by the law of cosines), and the budget
 * is a free-space term plus a zenith attenuation scaled by 1/sin e, so every
 * summary, daily row and trade point is computed from the same samples and
 * is mutually consistent. Values are invented; nothing here is a real mission.
 */
import { mean, median, quantile } from 'd3-array';
import type {
  DailyRow, MaskFinding, MaskTradePoint, PassCaseSummary, PassLinkSummary, RateTradePoint, RunSummary, RunTotals,
} from '../../src/analysis/types.js';
import type { PassSeries, ReportInput } from '../../src/output/report/types.js';

const RE_KM = 6378.137;
const R_KM = RE_KM + 550;
const MU = 398600.4418;
const OMEGA = Math.sqrt(MU / R_KM ** 3); // rad/s
const DEG = Math.PI / 180;
export const START_S = Date.UTC(2031, 5, 1) / 1000;
export const DAYS = 2;
const STEP_S = 5;
export const SATELLITE = 'ORBILUX-3';
export const WEATHER = ['clear', 'p1', 'p0.1'];
export const LINKS = ['uhf-tm', 's-band', 'x-band'];

interface LinkModel {
  /** Eb/N0 (fixed) or Es/N0 (adaptive) at 1000 km and zero attenuation (dB). */
  e0DB: number;
  requiredEbN0DB: number;
  requiredMarginDB: number;
  bitRateBps?: number;
  adaptive?: { symbolRateBaud: number; modes: { esN0DB: number; eta: number }[] };
  zenithDB: Record<string, number>;
}

const MODELS: Record<string, LinkModel> = {
  'uhf-tm': { e0DB: 19, requiredEbN0DB: 9.6, requiredMarginDB: 3, bitRateBps: 9600, zenithDB: { clear: 0.02, p1: 0.05, 'p0.1': 0.1 } },
  's-band': { e0DB: 16.5, requiredEbN0DB: 4.4, requiredMarginDB: 3, bitRateBps: 1e6, zenithDB: { clear: 0.04, p1: 0.2, 'p0.1': 0.5 } },
  'x-band': {
    e0DB: 12, requiredEbN0DB: -2.4, requiredMarginDB: 1,
    adaptive: { symbolRateBaud: 10e6, modes: [{ esN0DB: -2.4, eta: 0.49 }, { esN0DB: 1, eta: 0.99 }, { esN0DB: 5.2, eta: 1.98 }, { esN0DB: 9.4, eta: 2.64 }] },
    zenithDB: { clear: 0.08, p1: 0.8, 'p0.1': 3.0 },
  },
};

export const HORIZON_MASKS_BASE: [number, number][][] = [
  [[0, 6], [60, 10], [120, 3], [200, 2], [260, 4], [320, 8], [360, 6]],
  [[0, 2], [90, 12], [150, 15], [210, 5], [360, 2]],
  [[0, 3], [360, 3]],
];

function maskAt(mask: [number, number][], az: number): number {
  for (let i = 0; i < mask.length - 1; i++) {
    const [a0, e0] = mask[i];
    const [a1, e1] = mask[i + 1];
    if (az >= a0 && az <= a1) return a1 === a0 ? e0 : e0 + ((e1 - e0) * (az - a0)) / (a1 - a0);
  }
  return mask[mask.length - 1][1];
}

interface Sample { t: number; az: number; el: number; rangeKm: number }

/** Samples above the station's mask for a pass of peak geometric elevation `peakDeg` at time `tcaS`. */
function passSamples(tcaS: number, peakDeg: number, headingDeg: number, side: number, mask: [number, number][]): Sample[] {
  const e = peakDeg * DEG;
  const psiMin = Math.PI / 2 - e - Math.asin((RE_KM / R_KM) * Math.cos(e));
  const out: Sample[] = [];
  for (let tau = -900; tau <= 900; tau += STEP_S) {
    const cosPsi = Math.cos(psiMin) * Math.cos(OMEGA * tau);
    const psi = Math.acos(cosPsi);
    const el = Math.atan2(cosPsi - RE_KM / R_KM, Math.sin(psi)) / DEG;
    const a = OMEGA * tau;
    const hd = headingDeg * DEG;
    const east = a * Math.sin(hd) + side * psiMin * Math.cos(hd);
    const north = a * Math.cos(hd) - side * psiMin * Math.sin(hd);
    const az = ((Math.atan2(east, north) / DEG) + 360) % 360;
    if (el < maskAt(mask, az)) continue;
    out.push({ t: tcaS + tau, az, el, rangeKm: Math.sqrt(RE_KM ** 2 + R_KM ** 2 - 2 * RE_KM * R_KM * cosPsi) });
  }
  return out;
}

/** Eb/N0 (fixed) or Es/N0 (adaptive) at one sample (dB). */
function linkEsN0(m: LinkModel, s: Sample, weather: string): number {
  // Slant factor capped at 6 (≈ 9.6°), a crude stand-in for the finite rain path of P.618; invented, not a model.
  return m.e0DB - 20 * Math.log10(s.rangeKm / 1000) - m.zenithDB[weather] * Math.min(1 / Math.sin(Math.max(s.el, 1) * DEG), 6);
}

function stepRate(m: LinkModel, esn0: number, rateScale = 1): number {
  if (m.adaptive) {
    let best = 0;
    for (const md of m.adaptive.modes) if (esn0 - md.esN0DB >= m.requiredMarginDB) best = Math.max(best, m.adaptive.symbolRateBaud * md.eta);
    return best;
  }
  return esn0 - 10 * Math.log10(rateScale) - m.requiredEbN0DB >= m.requiredMarginDB ? (m.bitRateBps as number) * rateScale : 0;
}

export interface Synthetic { input: ReportInput; samples: Map<string, Sample[]> }

export function syntheticScenario(stations = ['Kaldfjell', 'Pico Verde', 'Maraka']): ReportInput {
  const horizonMasks: Record<string, [number, number][]> = {};
  stations.forEach((s, i) => { horizonMasks[s] = HORIZON_MASKS_BASE[i % HORIZON_MASKS_BASE.length]; });
  const passes: PassLinkSummary[] = [];
  const series: PassSeries[] = [];
  const stepsByPass = new Map<PassLinkSummary, Sample[]>();
  const peaks = [12, 58, 27, 84, 8, 35];
  stations.forEach((station, si) => {
    let n = 0;
    for (let d = 0; d < DAYS; d++) {
      for (let k = 0; k < 3; k++) {
        const tca = START_S + d * 86400 + (2.3 + si * 1.7 + k * 1.58) * 3600 + si * 97 + k * 41;
        const peak = peaks[(si * 2 + d * 3 + k) % peaks.length];
        const samples = passSamples(tca, peak, k % 2 === 0 ? 12 : 168, si % 2 === 0 ? 1 : -1, horizonMasks[station]);
        if (samples.length < 2) continue;
        n++;
        const passId = `${SATELLITE}/${station}/${n}`;
        for (const link of LINKS) {
          const m = MODELS[link];
          const cases: PassCaseSummary[] = [];
          const sc: PassSeries['cases'] = [];
          for (const w of WEATHER) {
            const es = samples.map((s) => linkEsN0(m, s, w));
            const req = m.adaptive ? m.adaptive.modes[0].esN0DB : m.requiredEbN0DB;
            const margin = es.map((x) => x - req);
            const usable = margin.map((x) => x >= m.requiredMarginDB);
            const ui = usable.map((u, i) => (u ? i : -1)).filter((i) => i >= 0);
            const usableDurationS = ui.length * STEP_S;
            const adaptive = m.adaptive ? es.reduce((a, x) => a + stepRate(m, x) * STEP_S, 0) : null;
            let fixed = usableDurationS * (m.bitRateBps ?? 0);
            if (m.adaptive) {
              fixed = Math.max(...m.adaptive.modes.map((md) => es.filter((x) => x - md.esN0DB >= m.requiredMarginDB).length * STEP_S * m.adaptive!.symbolRateBaud * md.eta));
            }
            const verdict = usableDurationS >= 180 ? 'usable' : usableDurationS > 0 ? 'marginal' : 'unusable';
            cases.push({
              weather: w,
              usableStartS: ui.length ? samples[ui[0]].t : null,
              usableEndS: ui.length ? samples[ui[ui.length - 1]].t : null,
              usableDurationS,
              minMarginDB: Math.min(...margin), meanMarginDB: mean(margin) as number, maxMarginDB: Math.max(...margin),
              fixedVolumeBits: fixed, adaptiveVolumeBits: adaptive, verdict,
              verdictRule: `${verdict}: usable ${usableDurationS} s against 180 s needed for usable (margin ≥ ${m.requiredMarginDB} dB)`,
            });
            sc.push({ weather: w, marginDB: margin, ebN0DB: m.adaptive ? es.map((x) => x - 10 * Math.log10(0.99)) : es });
          }
          const p: PassLinkSummary = {
            passId, satellite: SATELLITE, station, link, direction: 'downlink',
            aosS: samples[0].t, tcaS: tca, losS: samples[samples.length - 1].t,
            maxElevationDeg: Math.max(...samples.map((s) => s.el)),
            durationS: samples[samples.length - 1].t - samples[0].t,
            clippedStart: false, clippedEnd: false, steps: samples.length, cases,
          };
          passes.push(p);
          stepsByPass.set(p, samples);
          series.push({ passId, link, timeS: samples.map((s) => s.t), azimuthDeg: samples.map((s) => s.az), elevationDeg: samples.map((s) => s.el), cases: sc });
        }
      }
    }
  });

  const NET = '(network)';
  const dayOf = (t: number) => new Date(t * 1000).toISOString().slice(0, 10);
  const days = Array.from({ length: DAYS }, (_, d) => dayOf(START_S + d * 86400));
  const daily: DailyRow[] = [];
  const totals: RunTotals[] = [];
  for (const link of LINKS) for (const w of WEATHER) for (const st of [...stations, NET]) {
    const mine = passes.filter((p) => p.link === link && (st === NET || p.station === st));
    const rows = days.map((day) => {
      const ps = mine.filter((p) => dayOf(p.aosS) === day);
      const cs = ps.map((p) => p.cases.find((c) => c.weather === w) as PassCaseSummary);
      const windows = cs.filter((c) => c.usableStartS !== null).map((c) => [c.usableStartS as number, c.usableEndS as number]).sort((a, b) => a[0] - b[0]);
      const d0 = Date.parse(`${day}T00:00:00Z`) / 1000;
      let last = d0;
      let gap = 0;
      for (const [a, b] of windows) { gap = Math.max(gap, a - last); last = Math.max(last, b); }
      gap = Math.max(gap, d0 + 86400 - last);
      const row: DailyRow = {
        dayUtc: day, station: st, satellite: SATELLITE, link, weather: w,
        passes: ps.length, usablePasses: cs.filter((c) => c.usableDurationS > 0).length,
        usableMinutes: cs.reduce((a, c) => a + c.usableDurationS, 0) / 60,
        fixedVolumeBits: cs.reduce((a, c) => a + c.fixedVolumeBits, 0),
        adaptiveVolumeBits: MODELS[link].adaptive ? cs.reduce((a, c) => a + (c.adaptiveVolumeBits ?? 0), 0) : null,
        longestGapH: gap / 3600,
      };
      return row;
    });
    daily.push(...rows);
    const vol = rows.map((r) => r.adaptiveVolumeBits ?? r.fixedVolumeBits);
    totals.push({
      link, weather: w, station: st,
      passes: rows.reduce((a, r) => a + r.passes, 0), usablePasses: rows.reduce((a, r) => a + r.usablePasses, 0),
      usableMinutes: rows.reduce((a, r) => a + r.usableMinutes, 0),
      fixedVolumeBits: rows.reduce((a, r) => a + r.fixedVolumeBits, 0),
      adaptiveVolumeBits: MODELS[link].adaptive ? rows.reduce((a, r) => a + (r.adaptiveVolumeBits ?? 0), 0) : null,
      dailyVolumeBits: { mean: mean(vol) as number, median: median(vol) as number, p10: quantile(vol, 0.1) as number, p90: quantile(vol, 0.9) as number },
    });
  }

  // Trade curves from the same samples.
  const maskTrade: MaskTradePoint[] = [];
  const rateTrade: RateTradePoint[] = [];
  const maskFindings: MaskFinding[] = [];
  for (const link of LINKS) for (const w of WEATHER) for (const st of [...stations, NET]) {
    const m = MODELS[link];
    const mine = passes.filter((p) => p.link === link && (st === NET || p.station === st));
    const steps = mine.flatMap((p) => stepsByPass.get(p) as Sample[]);
    for (let mask = 0; mask <= 40; mask += 5) {
      const above = steps.filter((s) => s.el >= mask);
      const rates = above.map((s) => stepRate(m, linkEsN0(m, s, w)));
      maskTrade.push({ station: st, link, weather: w, maskDeg: mask, dailyVolumeBits: rates.reduce((a, r) => a + r * STEP_S, 0) / DAYS, usableMinutesPerDay: rates.filter((r) => r > 0).length * STEP_S / 60 / DAYS });
    }
    if (!m.adaptive) {
      for (const scale of [0.125, 0.25, 0.5, 1, 2, 4, 8]) {
        const rates = steps.map((s) => stepRate(m, linkEsN0(m, s, w), scale));
        rateTrade.push({ station: st, link, weather: w, bitRateBps: (m.bitRateBps as number) * scale, dailyVolumeBits: rates.reduce((a, r) => a + r * STEP_S, 0) / DAYS, usableMinutesPerDay: rates.filter((r) => r > 0).length * STEP_S / 60 / DAYS });
      }
    }
    if (st !== NET) {
      const req = m.adaptive ? m.adaptive.modes[0].esN0DB : m.requiredEbN0DB;
      let found: number | null = null;
      for (let mask = 0; mask <= 90; mask += 1) {
        const above = steps.filter((s) => s.el >= mask);
        if (above.every((s) => linkEsN0(m, s, w) - req >= m.requiredMarginDB)) { found = mask; break; }
      }
      maskFindings.push({ station: st, link, weather: w, fraction: 1, maskDeg: found });
    }
  }

  const summary: RunSummary = {
    scenario: 'orbilux-three-station-demo',
    scenarioFile: 'fixtures/demo/orbilux.yaml',
    window: { startUtc: new Date(START_S * 1000).toISOString(), endUtc: new Date((START_S + DAYS * 86400) * 1000).toISOString(), stepS: STEP_S, days: DAYS },
    satellites: [SATELLITE], stations, links: LINKS, weatherCases: WEATHER,
    networkPolicy: 'sum over stations (overlapping contacts counted at each station)',
    totals,
    models: [
      { name: 'free-space loss', source: 'ITU-R P.525-4 eq. (6)' },
      { name: 'gaseous attenuation', source: 'ITU-R P.676-13 Annex 2' },
      { name: 'rain attenuation', source: 'ITU-R P.618-13 §2.2.1.1 with P.838-3' },
    ],
    software: [{ name: 'passbudget', version: '0.1.0' }, { name: 'satellite.js', version: '7.1.0' }],
    defaultsApplied: [
      { path: 'stations.Maraka.climate.rainRate001MmH', value: '62 mm/h', reason: 'not given; taken from the P.837 map at the station' },
      { path: 'links.x-band.implementationLossDB', value: '1.5 dB', reason: 'not given; project default' },
    ],
    warnings: ['2 passes at Pico Verde peak below 10°; their margins are dominated by the slant path.'],
    inputsSha256: '3f9a1c0d5b7e2a4c6e8f0a1b3c5d7e9f1a2b3c4d5e6f708192a3b4c5d6e7f809',
    files: ['passes.csv', 'daily.csv', 'summary.json', 'report.html', 'passes.ics'],
    cautions: ['Results are planning estimates from models, not measurements or guarantees of link performance.'],
  };
  return {
    summary, passes, daily, series,
    requiredMarginDB: Object.fromEntries(LINKS.map((l) => [l, MODELS[l].requiredMarginDB])),
    horizonMasks, maskTrade, maskFindings, rateTrade,
    generatedNote: 'synthetic data for the report tests',
  };
}

/** Charts the renderer should draw: 3 per pass (margin, Eb/N0, sky) and per link: bars and trades per case, one envelope. */
export function expectedChartCount(input: ReportInput): number {
  let n = input.passes.length * 3;
  for (const link of input.summary.links) {
    n += input.summary.weatherCases.length + 1;
    for (const t of [input.maskTrade ?? [], input.rateTrade ?? []]) n += new Set(t.filter((p) => p.link === link).map((p) => p.weather)).size;
  }
  return n;
}
