// The report's stylesheet: screen and print (A4 and Letter both fit the 180 mm column), readable in greyscale.
export const STYLES = `
:root{--ink:#1d2733;--muted:#5f6b78;--rule:#d5dae0;--paper:#fff;--wash:#f3f5f7;--t1:#1d2733;--t2:#0f6e74;--t3:#b4531c;--t4:#7d8791;--warn:#8a3b12}
*{box-sizing:border-box}
html{background:#e9ecef}
body{margin:0 auto;max-width:960px;background:var(--paper);color:var(--ink);font:15px/1.45 "DejaVu Sans","Segoe UI",system-ui,sans-serif;padding:28px 40px 40px}
h1{font:600 30px/1.15 "DejaVu Serif",Georgia,serif;margin:2px 0 18px;letter-spacing:-.01em}
h2{font:600 13px/1.2 "DejaVu Sans",system-ui,sans-serif;text-transform:uppercase;letter-spacing:.12em;color:var(--muted);margin:28px 0 10px;padding-bottom:5px;border-bottom:1px solid var(--rule)}
.toc{margin:-8px 0 18px;font-size:13px}
.toc a{margin-right:14px;text-decoration:none;border-bottom:1px solid var(--rule)}
.kicker{margin:0;font-size:12px;letter-spacing:.14em;text-transform:uppercase;color:var(--t2);font-weight:600}
.cols{display:grid;grid-template-columns:1fr 1fr;gap:20px}
.card h2{margin-top:0}
.facts{margin:0}
.kv{display:grid;grid-template-columns:10.5em 1fr;gap:8px;padding:3px 0;border-bottom:1px dotted var(--rule)}
.kv dt{color:var(--muted)}
.kv dd{margin:0;overflow-wrap:anywhere}
code{font:13px "DejaVu Sans Mono",ui-monospace,monospace}
.hash{font-size:11.5px;word-break:break-all}
.muted{color:var(--muted)}
.small{font-size:12.5px;color:var(--muted);margin:8px 0 0}
.result{margin-top:26px;border:2px solid var(--ink);border-left:10px solid var(--t2);padding:14px 22px 16px;background:var(--wash)}
.result h2{margin-top:0;border-bottom:0}
.result dl{margin:0;display:grid;grid-template-columns:1fr 1fr;gap:14px 28px}
.result dt{font-size:12.5px;color:var(--muted)}
.result dd{margin:2px 0 0;font-size:17px}
.result dd .muted{font-size:13.5px}
.result .big dd{font:600 26px/1.2 "DejaVu Sans",system-ui,sans-serif}
.num{font-variant-numeric:tabular-nums}
.pm,.k{color:var(--muted);font-weight:400}
.k{font-size:.55em}
.sub{display:block;font:400 12.5px/1.35 "DejaVu Sans",system-ui,sans-serif;color:var(--muted);margin-top:2px}
.missing{border:1px dashed var(--warn);padding:4px 18px 10px;margin-top:18px}
.missing h2{color:var(--warn);border-bottom-color:transparent}
.tbl{width:100%;border-collapse:collapse;font-size:13.5px}
.tbl th,.tbl td{text-align:left;padding:5px 8px;border-bottom:1px solid var(--rule);vertical-align:top}
.tbl thead th{font-weight:600;font-size:12px;color:var(--muted);border-bottom:1.5px solid var(--ink)}
.tbl tbody th{font-weight:600;width:30%}
.tbl .n{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
.tbl .note,.tbl .ref{color:var(--muted)}
.tbl tr.sum th,.tbl tr.sum td{border-top:1.5px solid var(--ink);border-bottom:0}
.tbl .yes{font-weight:600}
.tbl .no{color:var(--muted);font-style:italic}
.bar{display:block;margin-top:3px}
.bar-bg{fill:var(--wash);stroke:var(--rule)}
.bar-fg{fill:var(--t2)}
.counts{display:grid;grid-template-columns:repeat(auto-fill,minmax(150px,1fr));gap:8px}
.count{border:1px solid var(--rule);padding:6px 10px}
.count-v{display:block;font:600 20px/1.2 "DejaVu Sans",system-ui,sans-serif;font-variant-numeric:tabular-nums;color:var(--muted)}
.count-k{font-size:12px;color:var(--muted)}
.count.nz{border:1.5px solid var(--ink)}
.count.nz .count-v{color:var(--ink)}
.warn li,.notes li,.missing li{margin:4px 0}
.notes{list-style:none;padding:0}
.tag{display:inline-block;font-size:10.5px;text-transform:uppercase;letter-spacing:.1em;border:1px solid currentColor;padding:0 5px;margin-right:6px;vertical-align:1px}
.note-safety .tag{color:var(--warn);font-weight:700}
.note-method .tag{color:var(--t2)}
.fig{margin:0 0 26px;break-inside:avoid;page-break-inside:avoid}
.fig-body svg{display:block;width:100%;height:auto}
figcaption{font-size:13px;color:var(--muted);margin-top:6px}
figcaption strong{color:var(--ink)}
.fig-n{font-weight:700;color:var(--t2)}
.nodata{border:1px dashed var(--rule);background:var(--wash);padding:22px;margin:0;color:var(--muted);text-align:center}
.nodata-k{display:block;font-weight:700;color:var(--ink);text-transform:uppercase;font-size:12px;letter-spacing:.1em;margin-bottom:4px}
.toggle-l{font-size:12.5px;color:var(--muted);cursor:pointer;user-select:none}
.toggle{vertical-align:-2px;margin:0 6px 6px 0}
.amp-log{display:none}
.toggle:checked ~ .fig-body .amp-log{display:block}
.toggle:checked ~ .fig-body .amp-lin{display:none}
footer{margin-top:30px;padding-top:10px;border-top:1px solid var(--rule);font-size:12.5px;color:var(--muted)}
a{color:var(--t2)}
svg.chart{font-family:"DejaVu Sans",system-ui,sans-serif}
.plot-bg{fill:#fff}
.frame{fill:none;stroke:var(--ink);stroke-width:1}
.grid{stroke:#e3e7eb;stroke-width:1}
.tick{font-size:11px;fill:var(--muted)}
.axt{font-size:12px;fill:var(--ink)}
.lg{font-size:11.5px;fill:var(--ink)}
.pnote{font-size:11px;fill:var(--ink);font-style:italic;paint-order:stroke;stroke:#fff;stroke-width:4px;stroke-linejoin:round}
.ln{fill:none;stroke-width:1.8}
.mk{stroke-width:.9}
.bd{stroke:none;opacity:.22}
.ln.t1{stroke:var(--t1)}.ln.t2{stroke:var(--t2)}.ln.t3{stroke:var(--t3)}.ln.t4{stroke:var(--t4);stroke-width:1}
.mk.t1{fill:none;stroke:var(--t1)}.mk.t2{fill:var(--t2);stroke:var(--t2)}.mk.t3{fill:none;stroke:var(--t3)}.mk.t4{fill:var(--t4);stroke:var(--t4)}
.bd.t1{fill:var(--t1)}.bd.t2{fill:var(--t2)}.bd.t3{fill:var(--t3)}.bd.t4{fill:var(--t4)}
.legend .mk.t1{fill:none}
@media screen and (max-width:760px){body{padding:16px}.cols,.result dl{grid-template-columns:1fr}}
@media print{
  @page{margin:14mm 13mm}
  html{background:none}
  body{max-width:none;padding:0;font-size:10pt}
  h1{font-size:20pt}
  .result{background:none}
  .toggle,.toggle-l,.toc{display:none}
  *{-webkit-print-color-adjust:exact;print-color-adjust:exact}
  section,.fig,.count,tr{break-inside:avoid;page-break-inside:avoid}
  h2{break-after:avoid;page-break-after:avoid}
  a{color:inherit;text-decoration:none}
}
`;
