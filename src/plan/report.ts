/**
 * The report's plan section: per station antenna a timeline (one row per UTC
 * day, 00–24 h across): contacts taken as solid bars coloured by satellite,
 * candidates not taken faint below them, outlined red where they clash with
 * a contact taken (the contention); then the per-satellite, per-day table.
 * Inline SVG, every text escaped.
 */
import { escapeHtml as h } from '../output/report/escape.js';
import { bitsToMegabytes } from '../analysis/units.js';
import { utcDayLabel, utcDaysOfWindow } from '../analysis/utcDay.js';
import type { ResolvedScenario } from '../scenario/types.js';
import type { ContactPlan } from './plan.js';
import { clash } from './plan.js';

/** Okabe–Ito colour-blind-safe colours (Okabe & Ito, Color Universal Design, 2008), cycled with a dash when more satellites. */
const SAT_COLOURS = ['#0072B2', '#E69F00', '#009E73', '#CC79A7', '#D55E00', '#56B4E9', '#F0E442', '#000000'];
/** Days drawn per antenna (the table lists every day). */
export const TIMELINE_MAX_DAYS = 31;

export function planSection(scenario: ResolvedScenario, plan: ContactPlan): string {
  const sats = scenario.satellites.map((s) => s.name);
  const colour = (s: string) => SAT_COLOURS[sats.indexOf(s) % SAT_COLOURS.length];
  const { firstDay, count } = utcDaysOfWindow(scenario.window.startS, scenario.window.endS);
  const days = Math.min(count, TIMELINE_MAX_DAYS);
  const W = 960, left = 88, lane = 9, rowH = 2 * lane + 6, top = 22;
  const x = (t: number, d: number) => left + ((t - (firstDay + d) * 86_400) / 86_400) * (W - left - 8);
  const taken = plan.candidates.filter((c) => plan.chosen[c.id]);
  const charts: string[] = [];
  for (const ant of scenario.plan?.antennas ?? []) {
    const mine = plan.candidates.filter((c) => c.station === ant.station && c.antenna === ant.name);
    if (mine.length === 0) continue;
    const H = top + days * rowH + 6;
    const parts: string[] = [];
    for (let d = 0; d < days; d++) {
      const y = top + d * rowH;
      parts.push(`<text x="4" y="${y + lane + 3}" font-size="10">${h(utcDayLabel(firstDay + d))}</text>`);
      parts.push(`<line x1="${left}" x2="${W - 8}" y1="${y + rowH - 3}" y2="${y + rowH - 3}" stroke="#ddd"/>`);
    }
    for (let hr = 0; hr <= 24; hr += 3) {
      const xx = left + (hr / 24) * (W - left - 8);
      parts.push(`<line x1="${xx.toFixed(1)}" x2="${xx.toFixed(1)}" y1="${top - 4}" y2="${H - 6}" stroke="#eee"/><text x="${xx.toFixed(1)}" y="${top - 8}" font-size="9" text-anchor="middle">${String(hr).padStart(2, '0')}h</text>`);
    }
    for (const c of mine) {
      const d = c.day - firstDay;
      if (d < 0 || d >= days || (c.variant !== 0 && !plan.chosen[c.id])) continue;
      const y = top + d * rowH;
      const x0 = x(c.startS, d), x1 = Math.max(x(c.endS, d), x0 + 1.5);
      const title = `<title>${h(`${c.satellite} ${c.passId} ${new Date(c.startS * 1000).toISOString().slice(11, 19)}–${new Date(c.endS * 1000).toISOString().slice(11, 19)} UTC, ${(c.volumeBits[0] / 1e9).toFixed(2)} Gbit${c.cost ? `, cost ${c.cost.toFixed(2)}` : ''}`)}</title>`;
      if (plan.chosen[c.id]) {
        parts.push(`<rect class="contact" x="${x0.toFixed(1)}" y="${y}" width="${(x1 - x0).toFixed(1)}" height="${lane}" fill="${colour(c.satellite)}">${title}</rect>`);
        const held = x(c.heldEndS, d);
        if (held > x1 + 0.5) parts.push(`<rect x="${x1.toFixed(1)}" y="${y + 3}" width="${(held - x1).toFixed(1)}" height="${lane - 6}" fill="${colour(c.satellite)}" opacity="0.5"/>`);
      } else {
        const conflict = taken.some((t) => t.station === c.station && t.antenna === c.antenna && clash(t, c));
        parts.push(`<rect class="rejected${conflict ? ' conflict' : ''}" x="${x0.toFixed(1)}" y="${y + lane + 1}" width="${(x1 - x0).toFixed(1)}" height="${lane - 2}" fill="${colour(c.satellite)}" opacity="0.3"${conflict ? ' stroke="#c00" stroke-width="0.8"' : ''}>${title}</rect>`);
      }
    }
    charts.push(`<h3>${h(ant.station)} · ${h(ant.name)} <span class="small">(${h(ant.terminals.join(', '))}; setup ${ant.setupS.toFixed(0)} s)</span></h3>`
      + `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-label="${h(`contacts on ${ant.station} ${ant.name}`)}">${parts.join('')}</svg>`);
  }
  const legend = sats.map((s) => `<span style="display:inline-block;width:12px;height:10px;background:${colour(s)};margin:0 4px 0 10px"></span>${h(s)}`).join('');
  const rows = plan.days.map((d) => `<tr><td>${h(d.satellite)}</td><td>${h(d.dayUtc)}</td><td class="num">${d.contacts}</td>`
    + `<td class="num">${bitsToMegabytes(d.unconstrainedBits).toFixed(0)}</td><td class="num"><strong>${bitsToMegabytes(d.plannedBits).toFixed(0)}</strong></td>`
    + `<td class="num">${bitsToMegabytes(d.lostToContentionBits).toFixed(0)}</td>`
    + `<td class="num">${d.targetBits === null ? '–' : bitsToMegabytes(d.targetBits).toFixed(0)}</td><td class="num${d.unmetBits > 0 ? ' bad' : ''}">${d.targetBits === null ? '–' : bitsToMegabytes(d.unmetBits).toFixed(0)}</td>`
    + `<td class="num${d.unmetContacts > 0 ? ' bad' : ''}">${d.minContacts ? `${d.unmetContacts} of ${d.minContacts}` : '–'}</td><td class="num">${d.cost.toFixed(2)}</td></tr>`).join('');
  const hz = plan.horizons;
  return `<section id="plan"><h2>Contact plan</h2>`
    + `<p>Objective ${h(plan.objective)}, weather case ${h(plan.weather)}: ${plan.chosen.reduce((s, v) => s + v, 0)} contacts taken of ${plan.candidates.length} candidates; cost ${plan.totalCost.toFixed(2)} (price units); `
    + `${hz.filter((x) => x.method === 'highs' && x.gap === 0).length} of ${hz.length} horizons proven optimal by HiGHS, worst gap ${plan.gap === null ? 'unknown' : plan.gap.toExponential(2)}. `
    + `The rest of this report, passes.csv and daily.csv are unconstrained (every antenna free for every satellite); this section is the contended plan.</p>`
    + `<p class="small">Solid bars: contacts taken (a paler tail: booked time held past the contact). Faint bars below: candidates not taken; red outline: they clash with a contact taken on this antenna. ${legend}</p>`
    + charts.join('\n')
    + `<h3>Per satellite and day</h3><table><thead><tr><th>satellite</th><th>day (UTC)</th><th>contacts</th><th>unconstrained MB</th><th>planned MB</th><th>lost to contention MB</th><th>target MB</th><th>unmet MB</th><th>contacts short</th><th>cost</th></tr></thead><tbody>${rows}</tbody></table>`
    + `<p class="small">MB = 10^6 bytes, weather case ${h(plan.weather)}. Planning estimates only.</p></section>`;
}
