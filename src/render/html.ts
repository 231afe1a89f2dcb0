/**
 * The HTML report (report.html): one self-contained file a reviewer can open anywhere. Inline
 * CSS, charts as inline SVG rendered by vega, no scripts, no external URLs, and a
 * Content-Security-Policy that forbids every network load. Every string from the data is
 * HTML-escaped; chart text is escaped by vega's SVG renderer. Same profile → same bytes.
 */
import { classTables } from "./classFigures.js";
import type { ColumnProfile, LevelFigure, Profile, ProfileTarget } from "../profile/types.js";
import { chartSvg, collisionChartSpec, coverageChartSpec, evidenceChartSpec, funnelChartSpec, type ChartSpec } from "./charts.js";
import { CONTROL_CHARACTERS, controlEscape, escapeHtml } from "./escape.js";
import { formatCompact, formatCount, formatShare } from "./format.js";
import {
  backoffFigures, evidenceHeader, evidenceNotes, evidenceTitle, evidenceRows, hierarchyNotes, parentHeader, parentRows,
} from "./evidence-figures.js";
import {
  STANDING_CAUTIONS, distinctText, headerFigures, inputNotes, keyFigures, levelText, overrideText, paramValueText,
  paramsText, profiledAsLevels, settingsFigures, type Figure,
} from "./figures.js";
import { REPORT_CSS } from "./html-style.js";

const TOP_LEVELS_SHOWN = 10;
const CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'";

/**
 * Escapes text and marks control characters (shown as \n, \t, …) so they cannot be mistaken for
 * the same characters typed in the data; the one way data reaches the page.
 */
const h = (text: string): string =>
  escapeHtml(text).replace(CONTROL_CHARACTERS, (ch) => `<span class="ctl">${controlEscape(ch)}</span>`);

function figureRows(figures: readonly Figure[]): string {
  return figures.map((f) => `<tr><th scope="row">${h(f.label)}</th><td>${h(f.value)}</td></tr>`).join("\n");
}

function list(items: readonly string[], cls = ""): string {
  return `<ul${cls ? ` class="${cls}"` : ""}>\n${items.map((i) => `<li>${h(i)}</li>`).join("\n")}\n</ul>`;
}

/** A level value as HTML; missing and empty values are marked, not shown as blank. */
function levelHtml(value: string | null): string {
  return value === null || value === "" ? `<em class="meta">${h(levelText(value))}</em>` : h(value);
}

function badge(column: ColumnProfile): string {
  const rec = column.recommendation;
  const note = rec.overridden ? ` <span class="override">${h(overrideText(rec))}</span>` : "";
  return `<span class="badge enc-${rec.encoding}">${h(rec.encoding)}</span>${note}`;
}

function targetValue(x: number | undefined, target: ProfileTarget): string {
  if (x === undefined) return "";
  return target.kind === "binary" ? formatShare(x) : formatCompact(x);
}

function topLevelsTable(levels: readonly LevelFigure[], profileTarget: ProfileTarget | undefined): string {
  const shown = levels.slice(0, TOP_LEVELS_SHOWN);
  if (shown.length === 0) return "";
  const target = shown.some((l) => l.targetMean !== undefined) ? profileTarget : undefined;
  const head = ["level", "rows", "share", ...(target ? ["target mean", "95 % interval", "smoothed", "flag"] : [])];
  const rows = shown.map((l) => {
    const cells = [formatCount(l.rows), formatShare(l.share)];
    if (target) {
      const interval = l.low === undefined || l.high === undefined ? ""
        : `${targetValue(l.low, target)} – ${targetValue(l.high, target)}`;
      cells.push(targetValue(l.targetMean, target), interval, targetValue(l.smoothed, target), l.flag ?? "");
    }
    return `<tr><td class="level">${levelHtml(l.value)}</td>${cells.map((c) => `<td class="num">${h(c)}</td>`).join("")}</tr>`;
  });
  const caption = levels.length > shown.length ? `Top levels (first ${shown.length} of ${levels.length})` : "Top levels";
  return `<table class="levels"><caption>${h(caption)}</caption>\n<thead><tr>${head.map((c) => `<th>${h(c)}</th>`).join("")}</tr></thead>\n<tbody>\n${rows.join("\n")}\n</tbody></table>`;
}

/** Inline SVG for HTML: the XML namespace declarations are implied by the HTML parser. */
async function chartFigure(spec: ChartSpec | null, caption: string): Promise<string> {
  if (spec === null) return "";
  const svg = (await chartSvg(spec)).replace(/^<svg xmlns="[^"]*" xmlns:xlink="[^"]*"/, "<svg");
  return `<figure class="chart">\n${svg}\n<figcaption>${h(caption)}</figcaption>\n</figure>`;
}

async function columnCharts(column: ColumnProfile, profile: Profile): Promise<string> {
  const s = profile.settings;
  const coverage = s.coverage ?? 0.95;
  const figures: string[] = [];
  if (column.distinct >= 2) {
    const source = column.countOfCounts?.length ? "exact, from the count-of-counts" : "from the coverage figures only";
    figures.push(await chartFigure(coverageChartSpec(column, { coverage, maxOneHot: s.maxOneHot }),
      `Share of non-missing rows held by the most frequent levels (${source}). Dashed line: the `
      + `${formatShare(coverage, 0)} coverage target` + (s.maxOneHot === undefined ? "." : `; dotted red line: the one-hot width (${s.maxOneHot}).`)));
  }
  const target = profile.target?.kind === "multiclass" ? undefined : profile.target;
  if (target) {
    const limits = target.kind === "binary" || target.sd !== undefined
      ? "Dots outside the funnel (95 % limits dashed, 99.8 % solid) differ from the overall mean (dark line) by more than chance explains at that size (Spiegelhalter 2005); the most extreme are labelled."
      : "No funnel limits: the profile holds no standard deviation for this continuous target.";
    figures.push(await chartFigure(funnelChartSpec(column, target), `Each dot is a level: its target ${target.kind === "binary" ? "rate" : "mean"} against its rows. ${limits}`));
  }
  const budget = s.collisionBudget ?? 0.01;
  figures.push(await chartFigure(collisionChartSpec(column, budget),
    `Share of rows whose hash bucket is shared with another level. Diamond: the chosen width; dashed line: the budget (${formatShare(budget)} of rows).`));
  const shown = figures.filter((f) => f !== "");
  if (shown.length > 0) return `<div class="charts">\n${shown.join("\n")}\n</div>`;
  return `<p class="meta">No charts: ${profiledAsLevels(column) ? "fewer than two levels" : "not profiled as levels"}.</p>`;
}

const headRow = (cells: readonly string[]): string => `<thead><tr>${cells.map((c) => `<th>${h(c)}</th>`).join("")}</tr></thead>`;

/** The out-of-fold comparison: the table (chosen row highlighted), then its chart beside the rule's sentences. */
async function evidenceSection(column: ColumnProfile): Promise<string> {
  const e = column.evidence;
  if (!e) return "";
  const rowClass = (r: { chosen: boolean; best: boolean }) => [r.chosen ? "chosen" : "", r.best ? "best" : ""].filter((c) => c !== "").join(" ");
  const rows = evidenceRows(e).map((r) => `<tr${rowClass(r) ? ` class="${rowClass(r)}"` : ""}><td>${h(r.candidate)}</td><td class="params">${h(r.params)}</td>`
    + `${r.numbers.map((c) => `<td class="num">${h(c)}</td>`).join("")}<td class="mark">${h(r.mark)}</td></tr>`);
  const table = `<table class="evidence">\n${headRow(evidenceHeader(e))}\n<tbody>\n${rows.join("\n")}\n</tbody></table>`;
  const across = e.validation === "forward" ? `forward ${e.metric === "log-loss" ? "log loss" : "squared error"} (lower is better) with ±1 standard error across the ${e.folds - 1} forward steps`
    : `out-of-fold ${e.metric === "log-loss" ? "log loss" : "squared error"} (lower is better) with ±1 standard error across the ${e.folds} folds`;
  const chart = await chartFigure(evidenceChartSpec(column), `Each candidate's ${across}. Dashed line: the one-standard-error threshold; `
    + "the simplest candidate at or left of it is chosen (red).");
  const notes = evidenceNotes(column);
  const override = notes?.override ? `\n<p class="note">${h(notes.override)}</p>` : "";
  const said = `<div class="evidence-notes">\n<p>${h(notes?.reason ?? "")}</p>\n<p>${h(notes?.threshold ?? "")}</p>${override}\n</div>`;
  return `<h3>${h(evidenceTitle(e))}</h3>\n${table}\n<div class="split">\n${chart}\n${said}\n</div>`;
}

/** Detected structure: pattern, candidate parents and the backoff grouping. */
function structureSection(column: ColumnProfile): string {
  const hierarchy = column.hierarchy;
  if (!hierarchy) return "";
  const rows = parentRows(hierarchy).map(([parent, ...nums]) => `<tr><td>${h(parent ?? "")}</td>${nums.map((c) => `<td class="num">${h(c)}</td>`).join("")}</tr>`);
  const parents = rows.length > 0
    ? `<table class="parents"><caption>Candidate parents</caption>\n${headRow(parentHeader(hierarchy))}\n<tbody>\n${rows.join("\n")}\n</tbody></table>`
    : `<p class="meta">No candidate parents.</p>`;
  return `<h3>Structure</h3>\n${list(hierarchyNotes(hierarchy))}\n<div class="split">\n${parents}\n`
    + `<table class="figures"><caption>Backoff grouping</caption>\n${figureRows(backoffFigures(hierarchy))}\n</table>\n</div>`;
}

async function columnSection(column: ColumnProfile, index: number, profile: Profile): Promise<string> {
  const rec = column.recommendation;
  const examples = column.variants?.examples.slice(0, 3) ?? [];
  const parts = [
    `<section class="column" id="col-${index + 1}">`,
    `<h2><span class="idx">${index + 1}.</span> <span class="name">${h(column.name)}</span> ${badge(column)}</h2>`,
    `<p class="params"><b>Role:</b> ${h(column.role)} · <b>Parameters:</b> <code>${h(paramsText(rec.params))}</code></p>`,
    `<div class="split">`,
    `<table class="figures"><caption>Key figures</caption>\n${figureRows(keyFigures(column, profile))}\n</table>`,
    topLevelsTable(column.topLevels, profile.target?.kind === "multiclass" ? undefined : profile.target),
    `</div>`,
    await columnCharts(column, profile),
    ...classTables(column, 10).map((t) => `<table class="evidence"><caption>${h(t.title)}</caption>\n${headRow(t.header)}\n<tbody>\n`
      + `${t.rows.map((r) => `<tr>${r.map((c, j) => `<td${j > 0 ? ' class="num"' : ""}>${h(c)}</td>`).join("")}</tr>`).join("\n")}\n</tbody></table>${t.note ? `\n<p class="note">${h(t.note)}</p>` : ""}`),
    await evidenceSection(column),
    structureSection(column),
  ];
  if (examples.length > 0) parts.push(`<h3>Spelling variants (examples)</h3>`, list(examples.map((g) => g.map(paramValueText).join(" / "))));
  parts.push(`<h3>Reasons</h3>`, list(rec.reasons.length > 0 ? rec.reasons : ["none given"]));
  if (rec.cautions && rec.cautions.length > 0) parts.push(`<h3>Cautions</h3>`, list(rec.cautions, "cautions"));
  parts.push(`</section>`);
  return parts.filter((p) => p !== "").join("\n");
}

/** The first reason, with a link to the column's section when it gives more. */
function mainReason(column: ColumnProfile, index: number): string {
  const [first = "none given", ...rest] = column.recommendation.reasons;
  return h(first) + (rest.length > 0 ? ` <a class="more" href="#col-${index + 1}">(${rest.length} more)</a>` : "");
}

function overview(profile: Profile): string {
  if (profile.columns.length === 0) return `<p>No columns were profiled.</p>`;
  const rows = profile.columns.map((c, i) => `<tr><td class="num">${i + 1}</td>`
    + `<td><a href="#col-${i + 1}">${h(c.name)}</a></td><td>${h(c.role)}</td><td class="num">${h(distinctText(c))}</td>`
    + `<td>${badge(c)}</td><td class="reasons">${mainReason(c, i)}</td></tr>`);
  return `<table class="overview">\n<thead><tr><th>#</th><th>column</th><th>role</th><th>distinct</th><th>decision</th><th>main reason</th></tr></thead>\n`
    + `<tbody>\n${rows.join("\n")}\n</tbody></table>`;
}

/**
 * Renders the report of a profile as one self-contained HTML document: header (input, target,
 * settings), an overview table of all columns (decision and main reason), a section per column with key figures, top
 * levels, charts (coverage curve; funnel plot with a target; collision curve with hashing
 * figures), the out-of-fold evidence (table and chart) and the detected structure when the profile
 * has them, reasons and cautions, and the standing cautions. Charts are rendered in sequence.
 * A profile without columns gets the header, "No columns were profiled." and the cautions.
 */
export async function renderHtmlReport(profile: Profile): Promise<string> {
  const sections: string[] = [];
  for (const [index, column] of profile.columns.entries()) sections.push(await columnSection(column, index, profile));
  const title = `tailsift report: ${profile.input.paths.join(", ")}`;
  const notes = inputNotes(profile).map((n) => `<p class="note">${h(n)}</p>`).join("\n");
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${CSP}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${h(title)}</title>
<style>${REPORT_CSS}</style>
</head>
<body>
<header>
<h1>tailsift report</h1>
<p class="lead">Categorical columns of ${h(profile.input.paths.join(", "))}: what was measured, and the encoding decided for each column with the numbers behind it.</p>
${notes}
<div class="split">
<table class="figures"><caption>Input</caption>\n${figureRows(headerFigures(profile))}\n</table>
<table class="figures"><caption>Settings</caption>\n${figureRows(settingsFigures(profile))}\n</table>
</div>
</header>
<main>
<section id="overview">
<h2>Overview</h2>
${overview(profile)}
</section>
${sections.join("\n")}
<section id="cautions">
<h2>Cautions</h2>
${list(STANDING_CAUTIONS, "cautions")}
</section>
</main>
<footer>Made by ${h(profile.tool.name)} ${h(profile.tool.version)} from a profile created ${h(profile.createdAt)}. This file runs no scripts and loads nothing from the network.</footer>
</body>
</html>
`;
}
