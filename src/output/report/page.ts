/** The page shell: inline style sheet and the one small script (table sorting, expand/collapse all). */
import { escapeHtml } from './escape.js';

export const STYLE = `
:root{--ink:#1a1a1a;--muted:#5c5c5c;--line:#d6d6d6;--bg:#fbfaf7;--card:#ffffff;--bad:#b00020;--good:#1f6f4a;--warn:#8a5a00}
*{box-sizing:border-box}
body{margin:0;font:14px/1.45 system-ui,-apple-system,"Segoe UI",Roboto,"Helvetica Neue",Arial,sans-serif;color:var(--ink);background:var(--bg)}
main{max-width:1260px;margin:0 auto;padding:18px 22px 60px}
h1{font-size:24px;margin:4px 0 2px}h2{font-size:19px;margin:30px 0 8px;border-bottom:2px solid var(--ink);padding-bottom:3px}
h3{font-size:15px;margin:18px 0 6px}h4{font-size:14px;margin:10px 0 4px}
.sub{color:var(--muted);margin:0 0 10px}
.cautions{border-left:4px solid var(--warn);background:#fff6e5;padding:8px 12px;margin:10px 0}
.cautions ul{margin:4px 0 0 18px;padding:0}
table.glance{background:var(--card);border:1px solid var(--line);font-size:15px}
table.glance th,table.glance td{padding:5px 12px}
table.glance tr.group-start>*{border-top:2px solid var(--ink)}
.glance-link{font-size:16px;background:#f1efe9}
table{border-collapse:collapse;font-variant-numeric:tabular-nums}
th,td{padding:3px 8px;border-bottom:1px solid var(--line);text-align:left;vertical-align:top}
td.num,th.num{text-align:right}
.kv th{font-weight:600;color:var(--muted);padding-right:14px}
.bad{color:var(--bad);font-weight:600}.good{color:var(--good)}.warn{color:var(--warn)}
.verdict-usable{color:var(--good);font-weight:600}.verdict-marginal{color:var(--warn);font-weight:600}.verdict-unusable{color:var(--bad);font-weight:600}
.charts{display:flex;flex-wrap:wrap;gap:10px;align-items:flex-start}
figure{display:flex;flex-direction:column;margin:0;background:var(--card);border:1px solid var(--line);border-radius:6px;padding:6px}
figcaption{width:0;min-width:100%;font-size:12.5px;color:var(--muted);padding:2px 4px 4px}
svg.chart{display:block;font-size:11px;max-width:100%;height:auto}
svg .tick{fill:var(--muted);font-size:10.5px}svg .axis-label{fill:var(--ink);font-size:11.5px}
svg .direct-label{font-size:10.5px;font-weight:600;paint-order:stroke;stroke:#fff;stroke-width:3px;stroke-linejoin:round}svg .compass{font-weight:700;font-size:11px}
ul.legend{list-style:none;display:flex;flex-wrap:wrap;gap:4px 14px;margin:4px 0;padding:0 4px;font-size:12.5px}
ul.legend li{display:flex;align-items:center;gap:5px}
svg.swatch{display:inline-block;vertical-align:middle}
details.pass{background:var(--card);border:1px solid var(--line);border-radius:6px;margin:6px 0;padding:4px 10px}
details.pass>summary{cursor:pointer;padding:4px 0}
details.pass[open]>summary{border-bottom:1px solid var(--line);margin-bottom:8px}
button{font:inherit;padding:3px 10px;margin:0 6px 6px 0;border:1px solid var(--line);background:#fff;border-radius:4px;cursor:pointer}
table.sortable th{cursor:pointer;user-select:none;white-space:nowrap;background:#f1efe9;position:sticky;top:0}
table.sortable th[aria-sort=ascending]::after{content:" ▲"}table.sortable th[aria-sort=descending]::after{content:" ▼"}
.tablewrap{max-height:640px;overflow:auto;border:1px solid var(--line);background:var(--card)}
code{font-size:12.5px}
table.daily td:first-child{white-space:nowrap}
.small{font-size:12.5px;color:var(--muted)}
`;

/** Sort on header click (numeric columns by their data-v value), toggle all pass sections. */
export const SCRIPT = `
(function(){
  document.querySelectorAll('table.sortable').forEach(function(table){
    var heads = table.querySelectorAll('thead th');
    heads.forEach(function(th, col){
      th.addEventListener('click', function(){
        var asc = th.getAttribute('aria-sort') !== 'ascending';
        heads.forEach(function(h){ h.removeAttribute('aria-sort'); });
        th.setAttribute('aria-sort', asc ? 'ascending' : 'descending');
        var numeric = th.getAttribute('data-type') === 'num';
        var body = table.tBodies[0];
        var rows = Array.prototype.slice.call(body.rows);
        var key = function(r){ var c = r.cells[col]; var v = c.getAttribute('data-v'); if (v === null) v = c.textContent; return numeric ? (v === '' ? NaN : Number(v)) : v; };
        rows.sort(function(a, b){
          var x = key(a), y = key(b), d;
          if (numeric) { if (isNaN(x) && isNaN(y)) d = 0; else if (isNaN(x)) return 1; else if (isNaN(y)) return -1; else d = x - y; }
          else d = String(x).localeCompare(String(y));
          return asc ? d : -d;
        });
        rows.forEach(function(r){ body.appendChild(r); });
      });
    });
  });
  document.querySelectorAll('[data-toggle]').forEach(function(b){
    b.addEventListener('click', function(){
      var open = b.getAttribute('data-toggle') === 'open';
      var scope = document.getElementById(b.getAttribute('data-scope'));
      (scope || document).querySelectorAll('details.pass').forEach(function(d){ d.open = open; });
    });
  });
})();
`;

export function pageShell(title: string, body: string): string {
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; script-src 'unsafe-inline'; img-src data:">
<title>${escapeHtml(title)}</title>
<style>${STYLE}</style>
</head>
<body>
<main>
${body}
</main>
<script>${SCRIPT}</script>
</body>
</html>
`;
}
