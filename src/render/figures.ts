/**
 * What the decision record and the HTML report both say, as plain (unescaped) text: the key
 * figures of a column, the wording of a decision and its parameters, the settings, and the
 * standing cautions. Each renderer escapes these strings for its own format.
 */
import { foldKindText } from "../engine/folds.js";
import type { ColumnProfile, Profile, Recommendation } from "../profile/types.js";
import { formatCompact, formatCount, formatNumber, formatShare } from "./format.js";
import { classParamsText } from "./classFigures.js";
import { numericValuesText, passThroughFigures, placeholderFigure, roleNotes } from "./passThroughFigures.js";

/** A labelled figure: label and value are plain text (not escaped). */
export interface Figure {
  label: string;
  value: string;
}

/** The standing cautions printed at the end of every record and report. */
export const STANDING_CAUTIONS: readonly string[] = [
  "Target-encoded or pooled columns that describe places or people (postcodes, regions, age bands, gender, ethnicity, language and the like) can act as proxies for protected characteristics. Check what a model learns from them before relying on it.",
  "Decisions in regulated areas (credit, insurance, employment, housing, health) follow local law, the regulators and the organisation's own review; this record is an input to that review, not a substitute for it.",
  "Level values may be personal data. Share this record with care, or produce it again with --redact.",
];

const PREVIEW = 5;

/** A level value as plain text: null → "(missing)", the empty string → "(empty)". */
export function levelText(value: string | null): string {
  if (value === null) return "(missing)";
  return value === "" ? "(empty)" : value;
}

/**
 * A parameter value as text: numbers compact, strings quoted, lists shortened to their first
 * five items plus the total, objects as JSON.
 */
export function paramValueText(value: unknown): string {
  if (typeof value === "number") return formatCompact(value);
  if (typeof value === "string") return `"${value}"`;
  if (value === null) return "(missing)";
  if (Array.isArray(value)) {
    const shown = value.slice(0, PREVIEW).map(paramValueText).join(", ");
    return value.length > PREVIEW ? `[${shown}, … ${formatCount(value.length)} in all]` : `[${shown}]`;
  }
  if (typeof value === "object") return JSON.stringify(value);
  return String(value);
}

/** Parameters as `name=value` pairs in the order the recommendation lists them. */
export function paramsText(params: object): string {
  const classes = classParamsText(params);
  if (classes !== null) return classes;
  const entries = Object.entries(params);
  return entries.length === 0 ? "—" : entries.map(([k, v]) => `${k}=${paramValueText(v)}`).join(", ");
}

/** "(overridden by the user, was X)" when the decision was overridden, else "". */
export function overrideText(rec: Recommendation): string {
  if (!rec.overridden) return "";
  const by = rec.overridden.by === "user" ? "the user" : rec.overridden.by;
  return `(overridden by ${by}, was ${rec.overridden.from})`;
}

/** The decision in words, with the override when there is one. */
export function decisionText(rec: Recommendation): string {
  return rec.overridden ? `${rec.encoding} ${overrideText(rec)}` : rec.encoding;
}

/** Whether a column was profiled as levels (numeric, time, target and excluded columns were not). */
export function profiledAsLevels(column: ColumnProfile): boolean {
  return column.role !== "numeric" && column.role !== "time" && column.role !== "target" && column.role !== "excluded" && column.numericValues === undefined;
}

/** Distinct levels for a summary table: "—" for columns not profiled as levels. */
export function distinctText(column: ColumnProfile): string {
  return profiledAsLevels(column) ? formatCount(column.distinct) : numericValuesText(column) ?? "—";
}

/** Rows with a share of the total: "1,234 (5.6 %)". */
function rowsWithShare(rows: number, total: number): string {
  return `${formatCount(rows)} (${formatShare(total > 0 ? rows / total : null)})`;
}

/** The forward unseen-level share (--time), read beside the Good–Turing forecast above it. */
function forwardUnseenFigure(f: NonNullable<ColumnProfile["forwardUnseen"]>): Figure {
  const se = f.se === null ? "" : ` ± ${formatShare(f.se, 2)} SE`;
  return { label: "unseen-level share forward in time", value: `${formatShare(f.mean, 2)}${se} (mean over ${f.steps.length} steps: blocks seen before vs the next); last block ${formatShare(f.last, 2)}` };
}

/** The key figures of one column, in the order both renderers show them (rows and missing only
 * for columns not profiled as levels). */
export function keyFigures(column: ColumnProfile, profile: Profile): Figure[] {
  if (!profiledAsLevels(column)) {
    return [{ label: "rows", value: formatCount(column.rows) }, { label: "missing", value: rowsWithShare(column.missing, column.rows) }, ...passThroughFigures(column)];
  }
  const target = profile.settings.coverage ?? 0.95;
  const cover = column.coverage.find((c) => Math.abs(c.share - target) < 1e-9);
  const interval = column.unseenInterval
    ? ` (interval ${formatShare(column.unseenInterval.low, 2)} – ${formatShare(column.unseenInterval.high, 2)})` : "";
  const figures: Figure[] = [
    { label: "rows", value: formatCount(column.rows) },
    { label: "missing", value: rowsWithShare(column.missing, column.rows) },
    ...(placeholderFigure(column) ? [placeholderFigure(column)!] : []),
    { label: "distinct levels", value: formatCount(column.distinct) },
    { label: "singletons (levels seen once)", value: formatCount(column.singletons) },
    { label: "unseen-level rate (Good–Turing)", value: formatShare(column.unseenRate, 2) + interval },
    ...(column.forwardUnseen ? [forwardUnseenFigure(column.forwardUnseen)] : []),
    { label: "effective levels (exp entropy)", value: `${formatCompact(column.effectiveLevels, 3)} (${formatNumber(column.entropyBits, 2)} bits)` },
    { label: `levels covering ${formatShare(target, 0)} of rows`, value: formatCount(cover?.levels) },
  ];
  for (const rare of column.rare) {
    figures.push({ label: `levels with at most ${formatCount(rare.minRows)} row${rare.minRows === 1 ? "" : "s"}`,
      value: `${formatCount(rare.levels)} levels, ${formatShare(rare.rowShare)} of rows` });
  }
  if (column.variants) {
    const v = column.variants;
    figures.push({ label: "spelling variants", value: `${formatCount(v.groups)} groups over ${formatCount(v.levels)} levels, ${formatShare(v.rowShare)} of rows` });
  }
  const t = column.target;
  if (t) {
    const metric = t.leakage.metric === "auc" ? "AUC" : "R²";
    figures.push(
      { label: "prior weight m", value: `${formatCompact(t.prior.weight)} (${t.prior.method}; prior mean ${formatCompact(t.prior.mean)})` },
      { label: "flagged levels", value: `${formatCount(t.flaggedLevels)} flagged vs ${formatNumber(t.expectedFalseFlags, 1)} expected false flags`
        + (t.testedLevels === undefined ? "" : ` (${formatCount(t.testedLevels)} levels tested)`) },
      { label: `leakage (${metric})`, value: `in-sample ${formatNumber(t.leakage.inSample, 3)}, out-of-fold ${formatNumber(t.leakage.outOfFold, 3)}${t.leakage.forward !== undefined ? `, forward ${formatNumber(t.leakage.forward, 3)}` : ""}` },
    );
  }
  if (column.hashing) {
    figures.push({ label: "hash width", value: `${formatCount(column.hashing.width)} buckets, ${formatShare(column.hashing.collisionRowShare, 2)} of rows colliding` });
  }
  return figures;
}

/** The input, target and tool lines of the header. */
export function headerFigures(profile: Profile): Figure[] {
  const input = profile.input;
  const figures: Figure[] = [
    { label: "tool", value: `${profile.tool.name} ${profile.tool.version}${profile.tool.engine ? ` (${profile.tool.engine})` : ""}` },
    { label: "created", value: profile.createdAt },
    { label: "inputs", value: input.paths.join(", ") },
    { label: "bytes", value: formatCount(input.bytes) },
    { label: "rows", value: formatCount(input.rows) + (input.skippedRows ? ` (${formatCount(input.skippedRows)} skipped)` : "") },
    { label: "fingerprint", value: input.fingerprint },
  ];
  if (input.format) figures.push({ label: "format", value: input.format });
  const t = profile.target;
  figures.push({ label: "target", value: t === undefined ? "none"
    : t.kind === "multiclass"
      ? `${t.column} (multiclass, ${t.classes.length} classes: ${t.classes.map((c) => `${c.value} ${formatShare(c.share)}`).join(", ")}); ${formatCount(t.rows)} rows, ${formatCount(t.missing)} missing`
      : `${t.column} (${t.kind}${t.positive === undefined ? "" : `, positive = "${t.positive}"`}); mean ${formatCompact(t.mean)}`
      + `${t.sd === undefined ? "" : `, sd ${formatCompact(t.sd)}`}; ${formatCount(t.rows)} rows, ${formatCount(t.missing)} missing` });
  return figures;
}

/** Settings: folds and seed first, then the rest by name. */
export function settingsFigures(profile: Profile): Figure[] {
  const { folds, seed, ...rest } = profile.settings;
  const others = Object.keys(rest).sort().map((k) => ({ label: k, value: paramValueText(rest[k]) }));
  return [{ label: "folds", value: String(folds) }, { label: "seed", value: String(seed) }, ...others];
}

/** Notes about how the profile was made (redaction, level table input). */
export function inputNotes(profile: Profile): string[] {
  const notes: string[] = [];
  if (profile.input.redacted) notes.push("Level values are redacted in this profile: the labels shown are stand-ins, not the values in the data.");
  if (profile.input.fromLevels) notes.push("Profiled from a level table (tailsift sql, then scan --levels), not from the raw rows.");
  if (profile.settings.fold?.kind === "grouped" || profile.settings.fold?.kind === "time-blocks") notes.push(`Folds: ${foldKindText(profile.settings.fold)}.`);
  notes.push(...roleNotes(profile));
  return notes;
}
