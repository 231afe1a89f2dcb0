/**
 * The report's stylesheet, inlined into report.html. System fonts only (no web fonts, nothing to
 * load); prints legibly; charts scale down on narrow screens.
 */
export const REPORT_CSS = `
:root { --ink: #1d2430; --muted: #5b6472; --rule: #d9dde3; --soft: #f4f6f8; --accent: #3a6ea5; --warn: #9a3412; }
* { box-sizing: border-box; }
body { margin: 0 auto; max-width: 1240px; padding: 24px 28px 48px; color: var(--ink); background: #fff;
  font: 14px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; }
h1 { font-size: 26px; margin: 0 0 4px; }
h2 { font-size: 19px; margin: 0 0 10px; display: flex; flex-wrap: wrap; align-items: baseline; gap: 8px; }
h3 { font-size: 14px; margin: 14px 0 4px; }
p { margin: 6px 0; }
.lead { color: var(--muted); margin-bottom: 14px; overflow-wrap: anywhere; }
.note { background: #fff7e6; border-left: 4px solid #e0a030; padding: 6px 10px; }
.meta { color: var(--muted); }
.ctl { font: 0.85em ui-monospace, Menlo, Consolas, monospace; color: #9a3412; background: #fbeee6; border-radius: 3px; padding: 0 2px; }
code { font: 12.5px/1.4 ui-monospace, "SFMono-Regular", Menlo, Consolas, monospace; overflow-wrap: anywhere; }
section { margin-top: 28px; }
section.column { border-top: 2px solid var(--rule); padding-top: 18px; }
.idx { color: var(--muted); font-weight: normal; }
.name { overflow-wrap: anywhere; }
.split { display: flex; flex-wrap: wrap; gap: 16px 28px; align-items: flex-start; }
table { border-collapse: collapse; font-variant-numeric: tabular-nums; }
caption { text-align: left; font-weight: 600; padding: 0 0 4px; }
th, td { border-bottom: 1px solid var(--rule); padding: 3px 8px; text-align: left; vertical-align: top; }
thead th { background: var(--soft); font-weight: 600; }
table.figures th { font-weight: normal; color: var(--muted); white-space: nowrap; }
td.num { text-align: right; white-space: nowrap; }
td.level { max-width: 22em; overflow-wrap: anywhere; }
table.overview { width: 100%; }
table.overview td.reasons { color: var(--muted); font-size: 13px; }
a { color: var(--accent); }
table.evidence td.params { max-width: 26em; font-size: 13px; color: var(--muted); overflow-wrap: anywhere; }
table.evidence td.mark { white-space: nowrap; font-size: 13px; }
table.evidence tr.chosen td { background: #fbeee6; font-weight: 600; }
table.evidence tr.chosen td.params { color: var(--ink); }
table.evidence { margin-bottom: 12px; }
table.evidence td { vertical-align: baseline; }
table.evidence tr.best td.mark { color: #24476b; font-weight: 600; }
table.evidence tr.chosen td.mark { color: #c0392b; }
.evidence-notes { flex: 1 1 320px; max-width: 640px; }
.badge { display: inline-block; padding: 1px 8px; border-radius: 10px; font-size: 12px; font-weight: 600;
  background: #e8eef6; color: #24476b; white-space: nowrap; }
.enc-drop { background: #eceff2; color: #4a5260; }
.enc-target-kfold { background: #e6f2ea; color: #1f5f36; }
.enc-hashing { background: #f1eafa; color: #553785; }
.enc-pooled-one-hot, .enc-one-hot, .enc-indicator { background: #e8eef6; color: #24476b; }
.enc-frequency, .enc-codes { background: #fdf0e1; color: #7a4a12; }
.override { font-size: 12px; font-weight: normal; color: var(--warn); }
.charts { display: flex; flex-wrap: wrap; gap: 18px; margin-top: 14px; }
figure.chart { margin: 0; max-width: 100%; }
figure.chart svg { max-width: 100%; height: auto; display: block; }
figcaption { max-width: 360px; font-size: 12px; color: var(--muted); }
ul { margin: 4px 0; padding-left: 22px; }
ul.cautions li { color: var(--warn); }
footer { margin-top: 36px; padding-top: 10px; border-top: 1px solid var(--rule); color: var(--muted); font-size: 12px; }
@media print { section.column { break-inside: avoid-page; } body { max-width: none; } }
`;
