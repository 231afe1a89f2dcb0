/**
 * The decision record (decisions.md): what was measured, what was decided for each column, with
 * the numbers and reasons behind it, in Markdown a reviewer can read raw or rendered. Every
 * string from the data is escaped (see escape.ts), so level values cannot break tables or inject
 * markup. The output depends on the profile only: the same profile gives the same bytes.
 */
import { classTables } from "./classFigures.js";
import type { ColumnProfile, LevelFigure, Profile, ProfileTarget } from "../profile/types.js";
import { escapeMarkdownCell, escapeMarkdownText } from "./escape.js";
import { formatCompact, formatCount, formatShare } from "./format.js";
import {
  backoffFigures, evidenceHeader, evidenceNotes, evidenceTitle, evidenceRows, hierarchyNotes, parentHeader, parentRows,
} from "./evidence-figures.js";
import {
  STANDING_CAUTIONS, decisionText, distinctText, headerFigures, inputNotes, keyFigures, levelText, paramValueText,
  paramsText, settingsFigures, type Figure,
} from "./figures.js";

const TOP_LEVELS_SHOWN = 10;
const VARIANT_GROUPS_SHOWN = 3;

/** One table row; every cell is escaped as a table cell. */
function row(cells: readonly string[]): string {
  return `| ${cells.map(escapeMarkdownCell).join(" | ")} |`;
}

/** A table whose header and cells are plain text (each cell escaped). */
function table(header: readonly string[], rows: readonly (readonly string[])[]): string[] {
  return [row(header), `| ${header.map(() => "---").join(" | ")} |`, ...rows.map(row)];
}

function figureTable(header: [string, string], figures: readonly Figure[]): string[] {
  return table(header, figures.map((f) => [f.label, f.value]));
}

/** A level value for a table cell; missing and empty values are marked in italics. */
function levelCell(value: string | null): string {
  return value === null || value === "" ? `*${levelText(value)}*` : escapeMarkdownCell(value);
}

function bullets(lines: readonly string[]): string[] {
  return lines.map((line) => `- ${escapeMarkdownText(line)}`);
}

function targetValue(x: number | undefined, target: ProfileTarget): string {
  if (x === undefined) return "";
  return target.kind === "binary" ? formatShare(x) : formatCompact(x);
}

function topLevelsTable(levels: readonly LevelFigure[], profileTarget: ProfileTarget | undefined): string[] {
  const shown = levels.slice(0, TOP_LEVELS_SHOWN);
  const target = shown.some((l) => l.targetMean !== undefined) ? profileTarget : undefined;
  const header = ["level", "rows", "share"];
  if (target) header.push("target mean", "95 % interval", "smoothed", "flag");
  const lines = [row(header), `| ${header.map(() => "---").join(" | ")} |`];
  for (const level of shown) {
    const cells = [formatCount(level.rows), formatShare(level.share)];
    if (target) {
      const interval = level.low === undefined || level.high === undefined ? ""
        : `${targetValue(level.low, target)} – ${targetValue(level.high, target)}`;
      cells.push(targetValue(level.targetMean, target), interval, targetValue(level.smoothed, target), level.flag ?? "");
    }
    lines.push(`| ${levelCell(level.value)} | ${cells.map(escapeMarkdownCell).join(" | ")} |`);
  }
  return lines;
}

/** The out-of-fold comparison: one row per candidate (the chosen one in bold), then the rule's sentences. */
function evidenceSection(column: ColumnProfile): string[] {
  const e = column.evidence;
  if (!e) return [];
  const header = evidenceHeader(e);
  const lines = [row(header), `| ${header.map(() => "---").join(" | ")} |`];
  for (const r of evidenceRows(e)) {
    const name = r.chosen ? `**${escapeMarkdownCell(r.candidate)}**` : escapeMarkdownCell(r.candidate);
    lines.push(`| ${name} | ${[r.params, ...r.numbers, r.mark].map(escapeMarkdownCell).join(" | ")} |`);
  }
  const notes = evidenceNotes(column);
  const said = notes ? [notes.reason, notes.threshold, ...(notes.override ? [notes.override] : [])] : [];
  return [`**${evidenceTitle(e)}**`, "", ...lines, "", ...said.flatMap((n) => [escapeMarkdownText(n), ""])];
}

/** Detected structure: pattern, candidate parents and the backoff grouping. */
function structureSection(column: ColumnProfile): string[] {
  const h = column.hierarchy;
  if (!h) return [];
  const parents = h.parents.length > 0 ? [...table(parentHeader(h), parentRows(h)), ""] : ["No candidate parents.", ""];
  return ["**Structure**", "", ...bullets(hierarchyNotes(h)), "", ...parents,
    ...figureTable(["backoff grouping", "value"], backoffFigures(h)), ""];
}

function columnSection(column: ColumnProfile, index: number, profile: Profile): string[] {
  const rec = column.recommendation;
  const out = [
    `### ${index + 1}. ${escapeMarkdownText(column.name)}`, "",
    `**Decision:** ${escapeMarkdownText(decisionText(rec))} (role: ${column.role})`, "",
    `**Parameters:** ${escapeMarkdownText(paramsText(rec.params))}`, "",
    "**Key figures**", "",
    ...figureTable(["figure", "value"], keyFigures(column, profile)), "",
  ];
  const examples = column.variants?.examples.slice(0, VARIANT_GROUPS_SHOWN) ?? [];
  if (examples.length > 0) {
    out.push("**Spelling variants (examples)**", "", ...bullets(examples.map((g) => g.map(paramValueText).join(" / "))), "");
  }
  if (column.topLevels.length > 0) {
    const more = column.topLevels.length > TOP_LEVELS_SHOWN ? ` (first ${TOP_LEVELS_SHOWN} of ${column.topLevels.length})` : "";
    out.push(`**Top levels**${more}`, "", ...topLevelsTable(column.topLevels, profile.target?.kind === "multiclass" ? undefined : profile.target), "");
  }
  for (const t of classTables(column, TOP_LEVELS_SHOWN)) out.push(`**${t.title}**`, "", ...table(t.header, t.rows), "", ...(t.note ? [escapeMarkdownText(t.note), ""] : []));
  out.push(...evidenceSection(column), ...structureSection(column));
  out.push("**Reasons**", "", ...(rec.reasons.length > 0 ? bullets(rec.reasons) : ["- none given"]), "");
  if (rec.cautions && rec.cautions.length > 0) out.push("**Cautions**", "", ...bullets(rec.cautions), "");
  return out;
}

/**
 * Renders the decision record of a profile as Markdown: a header (tool, date, inputs, target,
 * settings), a summary table, one section per column (decision, parameters, key figures, top
 * levels, the out-of-fold evidence and the detected structure when the profile has them, reasons,
 * cautions) and the standing cautions. A profile without columns still gets a
 * header and says so. Deterministic: no clock, no locale, no randomness.
 */
export function renderDecisionRecord(profile: Profile): string {
  const out: string[] = ["# tailsift decision record", ""];
  out.push(...figureTable(["input", "value"], headerFigures(profile)), "");
  for (const note of inputNotes(profile)) out.push(`> **Note:** ${escapeMarkdownText(note)}`, "");
  out.push("## Settings", "", ...figureTable(["setting", "value"], settingsFigures(profile)), "");
  out.push("## Summary", "");
  if (profile.columns.length === 0) {
    out.push("No columns were profiled.", "");
  } else {
    out.push(...table(["column", "role", "distinct", "decision", "key parameters"], profile.columns.map((c) => [
      c.name, c.role, distinctText(c), decisionText(c.recommendation), paramsText(c.recommendation.params),
    ])), "");
    out.push("## Columns", "");
    profile.columns.forEach((column, index) => out.push(...columnSection(column, index, profile)));
  }
  out.push("## Cautions", "", ...bullets(STANDING_CAUTIONS), "");
  return out.join("\n").replace(/\n{3,}/g, "\n\n").trimEnd() + "\n";
}
