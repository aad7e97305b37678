/**
 * The what-if section of the report: the data block (analysis/whatIf.ts
 * WhatIfPayload as JSON), the place the page script fills, and the page
 * script itself (src/page/whatIfPage.ts, bundled with the rule modules at
 * build time into dist/page/whatIfPage.js and inlined here: the report stays
 * one file, no request).
 */
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { WhatIfPayload } from '../../analysis/whatIf.js';
import type { WhatIfSummaryPayload } from '../../analysis/whatIfSummary.js';
import { escapeHtml as h } from './escape.js';
import { WHATIF_MAX_DAYS } from './whatIfData.js';

let bundle: string | null = null;

/** The bundled page script (built by `npm run build`). */
export function whatIfScript(): string {
  if (bundle !== null) return bundle;
  const candidates = [
    new URL('../../page/whatIfPage.js', import.meta.url), // dist/output/report → dist/page
    new URL('../../../dist/page/whatIfPage.js', import.meta.url), // src/output/report (tests) → dist/page
  ].map((u) => fileURLToPath(u));
  const file = candidates.find((f) => existsSync(f));
  if (!file) throw new Error(`report: the what-if page script is missing (looked for ${candidates.join(', ')}; run npm run build)`);
  bundle = readFileSync(file, 'utf8').replace(/<\/(script)/gi, '<\\/$1');
  return bundle;
}

const STYLE = `.whatif-link{background:var(--card);border:1px solid var(--line);border-radius:6px;padding:4px 12px 10px;margin:10px 0}
.whatif-controls label{white-space:nowrap;margin-right:10px}.whatif-controls input{width:8em}
tr.whatif-now td[data-g]{background:#fbecd0}
.whatif-changed{font-size:12.5px;color:#fff;background:var(--warn);border-radius:3px;padding:1px 6px;margin-left:8px}`;

export function whatIfSection(data: WhatIfPayload | WhatIfSummaryPayload | { missing: string } | undefined, maxPasses: number): string {
  const head = `<section id="whatif"><h2>What if</h2>`;
  if (!data || 'missing' in data) {
    return `${head}<p class="small">${h(data?.missing ?? 'This report carries no what-if data (it was built from outputs without the per-step columns).')}</p></section>`;
  }
  const json = JSON.stringify(data).replace(/</g, '\\u003c');
  return `${head}<style>${STYLE}</style>
<p class="small">Move a link's EIRP, G/T, rate, required margin or elevation mask and the figures below are recomputed in this page, with the run's own rules (usable test, adaptive mode choice, network arbitration, pass verdicts), ${'kind' in data
    ? `from histograms: this window is longer than ${WHATIF_MAX_DAYS} days, too long to carry every step. Volumes and usable minutes come from each UTC day's steps binned by elevation (${data.elevationBinDeg}°) and C/N0 (${data.cn0BinDB} dB, each bin's steps spread evenly across it); usable-pass counts from each pass's K-th best step per whole-degree mask (that step's C/N0 to ${data.thresholdQuantumDB} dB), so a mask is applied in whole degrees (rounded up). The network is the best in-view station per grid time (exact for fixed-rate links; for adaptive links under a priority policy an upper bound). Pass verdicts are usable or not, without volumes.`
    : `from every step of the run (C/N0 to ${data.cn0QuantumDB} dB, elevation to ${data.elevationQuantumDeg}°). A raised mask's new AOS/LOS are interpolated between grid steps.`} Planning estimates, as the rest of this report. Scripts: <code>window.passbudgetWhatIf({ link, eirp_delta_db, gt_delta_db, bit_rate_bps, symbol_rate_baud, required_margin_db, mask_deg })</code>.</p>
<div id="whatif-panel" data-max-passes="${maxPasses}"></div>
<script type="application/json" id="passbudget-whatif-data">${json}</script>
<script>${whatIfScript()}</script></section>`;
}
