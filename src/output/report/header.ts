/** Report header: scenario, window, cautions and what was assumed. */
import type { RunSummary } from '../../analysis/types.js';
import { escapeHtml as h } from './escape.js';

/** Shown on every report, whatever the run recorded. */
export const STANDING_CAUTIONS = [
  'Results are planning estimates from models, not measurements or guarantees of link performance.',
  'Transmitting needs the proper licences and frequency coordination for every station and spacecraft involved.',
  'RF exposure near transmit antennas follows local regulations; keep people out of the exclusion zones those set.',
];

export function header(s: RunSummary, title: string, note?: string): string {
  const cautions = [...STANDING_CAUTIONS, ...s.cautions.filter((c) => !STANDING_CAUTIONS.includes(c))];
  const list = (xs: string[]) => xs.map(h).join(', ');
  const defaults = s.defaultsApplied.length === 0
    ? '<p class="small">No defaults were applied: every value came from the scenario.</p>'
    : `<table class="kv"><thead><tr><th>field</th><th>value used</th><th>why</th></tr></thead><tbody>${
      s.defaultsApplied.map((d) => `<tr><td><code>${h(d.path)}</code></td><td>${h(d.value)}</td><td>${h(d.reason)}</td></tr>`).join('')}</tbody></table>`;
  const models = s.models.map((m) => `<tr><td>${h(m.name)}</td><td>${h(m.source)}</td></tr>`).join('');
  const software = s.software.map((m) => `${h(m.name)} ${h(m.version)}`).join(', ');
  const warnings = s.warnings.length === 0 ? '' : `<div class="cautions"><strong>Warnings from this run</strong><ul>${s.warnings.map((w) => `<li>${h(w)}</li>`).join('')}</ul></div>`;
  return `<header>
<h1>${h(title)}</h1>
<p class="sub">Link margin, pass by pass. Window ${h(s.window.startUtc)} to ${h(s.window.endUtc)} (${h(s.window.days)} d, step ${h(s.window.stepS)} s) · scenario file <code>${h(s.scenarioFile)}</code></p>
<table class="kv"><tbody>
<tr><th>satellites</th><td>${list(s.satellites)}</td></tr>
<tr><th>stations</th><td>${list(s.stations)}</td></tr>
<tr><th>links</th><td>${list(s.links)}</td></tr>
<tr><th>weather cases</th><td>${list(s.weatherCases)}</td></tr>
<tr><th>network counting</th><td>${h(s.networkPolicy)}</td></tr>
<tr><th>inputs SHA-256</th><td><code>${h(s.inputsSha256)}</code></td></tr>
${note ? `<tr><th>note</th><td>${h(note)}</td></tr>` : ''}
</tbody></table>
<div class="cautions"><strong>Read before use</strong><ul>${cautions.map((c) => `<li>${h(c)}</li>`).join('')}</ul></div>
${warnings}
<details class="assumed"><summary><strong>What was assumed</strong>: ${s.defaultsApplied.length} default(s) applied, ${s.models.length} model(s); software ${software}</summary>
<h4>Defaults applied</h4>${defaults}
<h4>Models and their sources</h4><table class="kv"><tbody>${models}</tbody></table>
</details>
</header>`;
}
