/**
 * The report's what-if panel, in the browser: reads the run's what-if data
 * from the page (a JSON block), exposes `window.passbudgetWhatIf(change)`
 * and draws, per link, controls and the figures they change. Bundled into
 * report.html at build time (scripts/bundle-page.mjs); the rules come from
 * analysis/whatIf.ts, the same modules as the run.
 */
import { decodeWhatIfPayload, whatIf, whatIfDetail, type WhatIfChange, type WhatIfData, type WhatIfDetail, type WhatIfPayload } from '../analysis/whatIf.js';
import { NETWORK_STATION } from '../analysis/dailyAccumulator.js';
import { decodeWhatIfSummaryPayload, whatIfSummaryDetail, type WhatIfSummaryData, type WhatIfSummaryDetail, type WhatIfSummaryPayload } from '../analysis/whatIfSummary.js';

const fromBase64 = (s: string): Uint8Array => {
  const bin = atob(s);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
};

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
const fixed = (x: number | null | undefined, d: number) => (x === null || x === undefined || !Number.isFinite(x) ? '–' : x.toFixed(d).replace(/^-/, '−'));
/** Bits with an SI prefix, 3 significant digits. */
function bits(x: number): string {
  if (!Number.isFinite(x)) return '–';
  if (x === 0) return '0 bit';
  const p = ['', 'k', 'M', 'G', 'T', 'P'];
  let e = Math.min(p.length - 1, Math.max(0, Math.floor(Math.log10(Math.abs(x)) / 3)));
  let v = x / 10 ** (3 * e);
  if (Number(v.toPrecision(3)) >= 1000 && e < p.length - 1) { e++; v /= 1000; }
  return `${Number(v.toPrecision(3))} ${p[e]}bit`;
}

interface Figures { volumePerDay: number; usablePassesPerDay: number; usableMinPerDay: number; worstMarginDB: number }

/** Either recomputation's detail: every step (WhatIfDetail) or the long window's summary. */
type Detail = WhatIfDetail | WhatIfSummaryDetail;
const isSummary = (d: Detail): d is WhatIfSummaryDetail => 'verdicts' in d;

function figures(d: Detail, weather: string, days: number): Figures {
  const net = d.daily.filter((r) => r.station === NETWORK_STATION && r.weather === weather);
  const sum = (f: (r: (typeof net)[number]) => number) => net.reduce((a, r) => a + f(r), 0);
  let worst = Infinity;
  if (isSummary(d)) worst = d.worstMarginDB[weather];
  else for (const p of d.passes) for (const c of p.cases) if (c.weather === weather && c.minMarginDB < worst) worst = c.minMarginDB;
  return {
    volumePerDay: sum((r) => r.adaptiveVolumeBits ?? r.fixedVolumeBits) / days,
    usablePassesPerDay: sum((r) => r.usablePasses) / days,
    usableMinPerDay: sum((r) => r.usableMinutes) / days,
    worstMarginDB: Number.isFinite(worst) ? worst : NaN,
  };
}

function barChart(days: string[], run: number[], now: number[]): string {
  const W = 520, H = 170, L = 54, B = 26, T = 8;
  const max = Math.max(1, ...run, ...now);
  const bw = (W - L - 8) / Math.max(1, days.length);
  const every = Math.max(1, Math.ceil(days.length / 10));
  const y = (v: number) => T + (H - T - B) * (1 - v / max);
  let s = `<svg class="chart" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="network volume per day, run and what-if">`;
  for (let k = 0; k <= 4; k++) {
    const v = (max * k) / 4;
    s += `<line x1="${L}" x2="${W - 8}" y1="${y(v).toFixed(1)}" y2="${y(v).toFixed(1)}" stroke="#e4e2dc"/><text class="tick" x="${L - 4}" y="${(y(v) + 3).toFixed(1)}" text-anchor="end">${esc(bits(v))}</text>`;
  }
  days.forEach((d, i) => {
    const x = L + i * bw;
    s += `<rect x="${(x + bw * 0.1).toFixed(1)}" y="${y(run[i]).toFixed(1)}" width="${(bw * 0.38).toFixed(1)}" height="${(H - B - y(run[i])).toFixed(1)}" fill="#9aa5b1"><title>${esc(d)} run: ${esc(bits(run[i]))}</title></rect>`;
    s += `<rect x="${(x + bw * 0.5).toFixed(1)}" y="${y(now[i]).toFixed(1)}" width="${(bw * 0.38).toFixed(1)}" height="${(H - B - y(now[i])).toFixed(1)}" fill="#1f5fa8"><title>${esc(d)} what-if: ${esc(bits(now[i]))}</title></rect>`;
    // At most about ten day labels, whatever the window.
    if (i % every === 0) s += `<text class="tick" x="${(x + bw / 2).toFixed(1)}" y="${H - 10}" text-anchor="middle">${esc(d.slice(5))}</text>`;
  });
  return `${s}</svg>`;
}

interface Control { key: keyof WhatIfChange; label: string; run: number; step: number; unit: string }

/** A summary verdict as a word. */
const said = (v: boolean | null | undefined) => (v === true ? 'usable' : v === false ? 'not usable' : v === null ? 'below the mask' : '–');

function setup(data: WhatIfData | WhatIfSummaryData, root: HTMLElement, maxPasses: number): void {
  const summary = 'kind' in data && data.kind === 'summary';
  const detailOf = (c: WhatIfChange): Detail => (summary ? whatIfSummaryDetail(data as WhatIfSummaryData, c) : whatIfDetail(data as WhatIfData, c));
  const passInfo = new Map(data.satellites.flatMap((s) => s.passes.map((p) => [p.passId, { ...p, station: s.stations[p.station]?.name ?? '' }] as const)));
  const days = Math.max(1, (data.endS - data.startS) / 86_400);
  const links = [...new Set(data.satellites.flatMap((s) => s.linkNames))];
  for (const link of links) {
    const spec = data.satellites.flatMap((s) => s.stations.flatMap((st) => st.links)).find((l) => l.name === link)!;
    const controls: Control[] = [
      { key: 'eirp_delta_db', label: 'Δ EIRP', run: 0, step: 0.5, unit: 'dB' },
      { key: 'gt_delta_db', label: 'Δ G/T', run: 0, step: 0.5, unit: 'dB' },
      spec.modcod.kind === 'fixed'
        ? { key: 'bit_rate_bps', label: 'bit rate', run: spec.modcod.bitRateBps, step: 1, unit: 'b/s' }
        : { key: 'symbol_rate_baud', label: 'symbol rate', run: spec.modcod.symbolRateBaud, step: 1, unit: 'Bd' },
      { key: 'required_margin_db', label: 'required margin', run: spec.requiredMarginDB, step: 0.5, unit: 'dB' },
      { key: 'mask_deg', label: 'elevation mask at least', run: NaN, step: 1, unit: '°' },
    ];
    const box = document.createElement('div');
    box.className = 'whatif-link';
    box.dataset.link = link;
    const inputs = controls.map((c) => `<label>${esc(c.label)} <input type="number" data-key="${c.key}" step="${c.step}" value="${Number.isNaN(c.run) ? '' : c.run}" placeholder="as run"> ${esc(c.unit)}</label>`).join(' ');
    box.innerHTML = `<h3>${esc(link)} <span class="whatif-changed" hidden>changed from the run</span></h3>
<p class="whatif-controls">${inputs} <label>weather <select data-key="weather">${data.weather.map((w) => `<option>${esc(w)}</option>`).join('')}</select></label> <button type="button" data-reset>reset</button></p>
<div class="whatif-out"></div>`;
    root.appendChild(box);
    const base = detailOf({ link });
    // The link's drawn pass sections: each shows its what-if verdict and volume beside the run's while a control is moved.
    const drawn = new Map<string, HTMLElement>();
    document.querySelectorAll<HTMLElement>('details.pass[data-link]').forEach((d) => {
      const span = d.querySelector<HTMLElement>('.whatif-pass');
      if (d.dataset.link === link && span && d.dataset.pass) drawn.set(d.dataset.pass, span);
    });
    // The link's rows of the "at a glance" table: redrawn in place with the what-if figures, restored on reset.
    const glanceRows = Array.from(document.querySelectorAll<HTMLTableRowElement>('tr[data-glance-link]')).filter((r) => r.dataset.glanceLink === link);
    const glanceRun = new Map(glanceRows.map((r) => [r, Array.from(r.querySelectorAll<HTMLElement>('[data-g]'), (c) => c.innerHTML)]));
    const redrawGlance = (now: Detail | null) => {
      for (const r of glanceRows) {
        const cellsOf = Array.from(r.querySelectorAll<HTMLElement>('[data-g]'));
        r.classList.toggle('whatif-now', now !== null);
        if (now === null) { cellsOf.forEach((c, k) => { c.innerHTML = glanceRun.get(r)![k]; }); continue; }
        const f = figures(now, r.dataset.glanceWeather ?? '', days);
        const text: Record<string, string> = {
          volume: `<strong>${esc(bits(f.volumePerDay))}</strong>`, passes: fixed(f.usablePassesPerDay, 1), minutes: fixed(f.usableMinPerDay, 1), worst: fixed(f.worstMarginDB, 1),
        };
        for (const c of cellsOf) c.innerHTML = text[c.dataset.g ?? ''] ?? c.innerHTML;
      }
    };
    const out = box.querySelector('.whatif-out') as HTMLElement;
    const marker = box.querySelector('.whatif-changed') as HTMLElement;
    const read = (): { change: WhatIfChange; changed: boolean; weather: string } => {
      const change: WhatIfChange = { link };
      let changed = false;
      for (const c of controls) {
        const el = box.querySelector(`input[data-key="${c.key}"]`) as HTMLInputElement;
        if (el.value.trim() === '') continue;
        const v = Number(el.value);
        if (!Number.isFinite(v) || v === c.run) continue;
        (change as unknown as Record<string, number>)[c.key] = v;
        changed = true;
      }
      return { change, changed, weather: (box.querySelector('select[data-key="weather"]') as HTMLSelectElement).value };
    };
    const draw = () => {
      const { change, changed, weather } = read();
      marker.hidden = !changed;
      let now: Detail;
      try { now = changed ? detailOf(change) : base; } catch (e) { out.innerHTML = `<p class="bad">${esc((e as Error).message)}</p>`; return; }
      redrawGlance(changed ? now : null);
      const a = figures(base, weather, days), b = figures(now, weather, days);
      const row = (label: string, x: string, y: string) => `<tr><th>${esc(label)}</th><td class="num">${x}</td><td class="num"><strong>${y}</strong></td></tr>`;
      const r0 = base.result.cases[weather].network, r1 = now.result.cases[weather].network;
      let passRows = '';
      if (isSummary(now) && isSummary(base)) {
        // The summary knows each pass's verdict (usable or not), not its volume.
        let k = 0;
        for (const [id, v] of now.verdicts) {
          if (k++ >= maxPasses) break;
          const p = passInfo.get(id);
          const r = base.verdicts.get(id)?.[weather], w = v[weather];
          passRows += `<tr><td>${esc(id)}</td><td>${esc(p?.station ?? '')}</td><td>${esc(p ? new Date(p.aosS * 1000).toISOString().slice(0, 19).replace('T', ' ') : '')}</td>`
            + `<td class="verdict-${r ? 'usable' : 'unusable'}">${esc(said(r))}</td><td class="verdict-${w ? 'usable' : 'unusable'}">${esc(said(w))}</td><td class="num">–</td><td class="num">–</td></tr>`;
        }
        for (const [id, span] of drawn) {
          const w = now.verdicts.get(id)?.[weather];
          span.innerHTML = changed ? ` · what-if ${esc(weather)}: <span class="verdict-${w ? 'usable' : 'unusable'}">${esc(said(w))}</span>` : '';
        }
      } else if (!isSummary(now) && !isSummary(base)) {
        const shown = (d: WhatIfDetail) => d.passes.slice(0, maxPasses);
        const runPass = new Map(shown(base).map((p) => [p.passId, p]));
        passRows = shown(now).map((p) => {
          const c = p.cases.find((x) => x.weather === weather)!;
          const r = runPass.get(p.passId)?.cases.find((x) => x.weather === weather);
          const v = c.adaptiveVolumeBits ?? c.fixedVolumeBits;
          return `<tr><td>${esc(p.passId)}</td><td>${esc(p.station)}</td><td>${esc(new Date(p.aosS * 1000).toISOString().slice(0, 19).replace('T', ' '))}</td>`
            + `<td class="verdict-${r?.verdict ?? 'unusable'}">${esc(r?.verdict ?? '–')}</td><td class="verdict-${c.verdict}">${esc(c.verdict)}</td>`
            + `<td class="num">${esc(r ? bits(r.adaptiveVolumeBits ?? r.fixedVolumeBits) : '–')}</td><td class="num">${esc(bits(v))}</td></tr>`;
        }).join('');
        const seen = new Set<string>();
        for (const p of now.passes) {
          const span = drawn.get(p.passId);
          if (!span || seen.has(p.passId)) continue;
          seen.add(p.passId);
          const c = p.cases.find((x) => x.weather === weather)!;
          span.innerHTML = changed ? ` · what-if ${esc(weather)}: <span class="verdict-${c.verdict}">${esc(c.verdict)}</span>, ${esc(bits(c.adaptiveVolumeBits ?? c.fixedVolumeBits))}` : '';
        }
        if (changed) for (const [id, span] of drawn) if (!seen.has(id)) span.textContent = ' · what-if: below the mask';
      }
      out.innerHTML = `<div class="charts"><figure><table class="kv whatif-figures"><thead><tr><th></th><th class="num">run</th><th class="num">what-if</th></tr></thead><tbody>`
        + row('network volume per day', esc(bits(a.volumePerDay)), esc(bits(b.volumePerDay)))
        + row('usable passes per day', fixed(a.usablePassesPerDay, 1), fixed(b.usablePassesPerDay, 1))
        + row('usable minutes per day', fixed(a.usableMinPerDay, 1), fixed(b.usableMinPerDay, 1))
        + row('worst margin (dB)', fixed(a.worstMarginDB, 1), fixed(b.worstMarginDB, 1))
        + `</tbody></table><figcaption>${esc(weather)}; network figures.</figcaption></figure>`
        + `<figure>${barChart(r1.days_utc, r0.daily_volume_bits, r1.daily_volume_bits)}<figcaption>Network volume per UTC day: run (grey), what-if (blue).</figcaption></figure></div>`
        + `<details><summary>Passes of this link (first ${maxPasses}): verdict and volume</summary><div class="tablewrap"><table><thead><tr><th>pass</th><th>station</th><th>AOS (UTC)</th><th>run verdict</th><th>what-if verdict</th><th class="num">run volume</th><th class="num">what-if volume</th></tr></thead><tbody>${passRows}</tbody></table></div></details>`;
    };
    box.addEventListener('input', draw);
    box.addEventListener('change', draw);
    (box.querySelector('[data-reset]') as HTMLButtonElement).addEventListener('click', () => {
      for (const c of controls) (box.querySelector(`input[data-key="${c.key}"]`) as HTMLInputElement).value = Number.isNaN(c.run) ? '' : String(c.run);
      draw();
    });
    draw();
  }
}

const block = document.getElementById('passbudget-whatif-data');
const root = document.getElementById('whatif-panel');
if (block && root) {
  const raw = JSON.parse(block.textContent ?? '{}') as WhatIfPayload | WhatIfSummaryPayload;
  const data = 'kind' in raw && raw.kind === 'summary' ? decodeWhatIfSummaryPayload(raw, fromBase64) : decodeWhatIfPayload(raw as WhatIfPayload, fromBase64);
  (window as unknown as { passbudgetWhatIf: (c: WhatIfChange) => unknown }).passbudgetWhatIf = (c) =>
    ('kind' in data ? whatIfSummaryDetail(data, c).result : whatIf(data, c));
  // The pass sections come after this script in the page: draw once the document is parsed.
  const start = () => setup(data, root, Number(root.dataset.maxPasses ?? '300'));
  if (document.readyState === 'loading') document.addEventListener('DOMContentLoaded', start); else start();
}
