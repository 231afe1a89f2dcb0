/**
 * What the decision record and the HTML report both say, as plain (unescaped) text: the key
 * figures of a column, the wording of a decision and its parameters, the settings, and the
 * standing cautions. Each renderer escapes these strings for its own format.
 */
import { label } from "../evidence/oneSe.js";
import type { CandidateName, Evidence, EvidenceCandidate } from "../evidence/types.js";
import { describeParent } from "../hierarchy/parent.js";
import type { HierarchyFigures, ParentSpec } from "../hierarchy/types.js";
import type { ColumnProfile, Profile, Recommendation } from "../profile/types.js";
import { formatCompact, formatCount, formatNumber, formatShare } from "./format.js";

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
export function paramsText(params: Record<string, unknown>): string {
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

/** Whether a column was profiled as levels (numeric, target and excluded columns were not). */
export function profiledAsLevels(column: ColumnProfile): boolean {
  return column.role !== "numeric" && column.role !== "target" && column.role !== "excluded";
}

/** Distinct levels for a summary table: "—" for columns not profiled as levels. */
export function distinctText(column: ColumnProfile): string {
  return profiledAsLevels(column) ? formatCount(column.distinct) : "—";
}

/** Rows with a share of the total: "1,234 (5.6 %)". */
function rowsWithShare(rows: number, total: number): string {
  return `${formatCount(rows)} (${formatShare(total > 0 ? rows / total : null)})`;
}

/** The key figures of one column, in the order both renderers show them (rows and missing only
 * for columns not profiled as levels). */
export function keyFigures(column: ColumnProfile, profile: Profile): Figure[] {
  if (!profiledAsLevels(column)) {
    return [{ label: "rows", value: formatCount(column.rows) }, { label: "missing", value: rowsWithShare(column.missing, column.rows) }];
  }
  const target = profile.settings.coverage ?? 0.95;
  const cover = column.coverage.find((c) => Math.abs(c.share - target) < 1e-9);
  const interval = column.unseenInterval
    ? ` (interval ${formatShare(column.unseenInterval.low, 2)} – ${formatShare(column.unseenInterval.high, 2)})` : "";
  const figures: Figure[] = [
    { label: "rows", value: formatCount(column.rows) },
    { label: "missing", value: rowsWithShare(column.missing, column.rows) },
    { label: "distinct levels", value: formatCount(column.distinct) },
    { label: "singletons (levels seen once)", value: formatCount(column.singletons) },
    { label: "unseen-level rate (Good–Turing)", value: formatShare(column.unseenRate, 2) + interval },
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
      { label: `leakage (${metric})`, value: `in-sample ${formatNumber(t.leakage.inSample, 3)}, out-of-fold ${formatNumber(t.leakage.outOfFold, 3)}` },
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
  return notes;
}

// ---- Evidence (out-of-fold comparison) and structure (hierarchy): shared wording -------------

/** One candidate of the out-of-fold comparison as plain-text table cells. */
export interface EvidenceRow {
  candidate: string;
  params: string;
  loss: string;
  se: string;
  score: string;
  /** "best", "chosen", "best, chosen", "within 1 SE" or "". */
  mark: string;
  chosen: boolean;
}

const KEPT_SHOWN = 3;
const KEPT_LENGTH = 24;
const finite = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);

/** Decimals that give every loss in the comparison five significant digits at the largest loss. */
function lossDecimals(e: Evidence): number {
  const largest = Math.max(0, ...e.candidates.map((c) => Math.abs(c.loss)).filter(finite));
  return largest > 0 ? Math.min(12, Math.max(0, 4 - Math.floor(Math.log10(largest)))) : 4;
}

/** A level for a short list: quoted, missing/empty named, shortened to 24 characters. */
function shortLevel(value: unknown): string {
  if (typeof value !== "string" || value === "") return levelText(typeof value === "string" ? value : null);
  const chars = [...value];
  return `"${chars.length > KEPT_LENGTH ? `${chars.slice(0, KEPT_LENGTH - 1).join("")}…` : value}"`;
}

/** A chain of parents, deepest first: "first 4 → 3 → 2 characters", else each described. */
export function parentChainText(specs: readonly ParentSpec[]): string {
  const plain = (s: ParentSpec) => describeParent(s).replace(/^the /, "");
  if (specs.length < 2) return specs.length === 1 ? plain(specs[0]!) : "—";
  if (specs.every((s) => s.kind === "prefix")) return `first ${specs.map((s) => s.length).join(" → ")} characters`;
  const first = specs[0]!;
  if (first.kind === "tokens" && specs.every((s) => s.kind === "tokens" && s.delimiters === first.delimiters)) {
    return `first ${specs.map((s) => (s.kind === "tokens" ? s.count : 0)).join(" → ")} tokens (split on '${first.delimiters}')`;
  }
  return specs.map(plain).join(" → ");
}

const weightText = (w: unknown): string => (finite(w) ? formatCompact(w) : "∞");

/** The key parameters of a candidate, short: what it fitted, without repeating the folds. */
export function candidateParamsText(c: EvidenceCandidate): string {
  const p = c.params;
  switch (c.candidate) {
    case "pooled-one-hot": {
      const keep = Array.isArray(p.keep) ? p.keep : [];
      const shown = keep.slice(0, KEPT_SHOWN).map(shortLevel).join(", ") + (keep.length > KEPT_SHOWN ? ", …" : "");
      return `keep ${formatCount(keep.length)} (${shown}) + other; ${formatShare(finite(p.pooledRowShare) ? p.pooledRowShare : null)} of rows pooled`;
    }
    case "target-kfold": return `m = ${weightText(p.weight)}`;
    case "backoff-target-kfold": {
      const parents = Array.isArray(p.parents) ? (p.parents as ParentSpec[]) : [];
      return `parents ${parentChainText(parents)}; ≥ ${formatCount(finite(p.minRows) ? p.minRows : null)} rows; `
        + `${formatCount(finite(p.groups) ? p.groups : null)} groups; m = ${weightText(p.weight)}`;
    }
    case "hierarchical-target-kfold": {
      const parent = p.parent && typeof p.parent === "object" ? parentChainText([p.parent as ParentSpec]) : "—";
      return `parent ${parent}, ${formatCount(finite(p.parentGroups) ? p.parentGroups : null)} groups; m = ${weightText(p.weight)}, parent m = ${weightText(p.parentWeight)}`;
    }
    default: return "—";
  }
}

/** Column headings of the evidence table. */
export function evidenceHeader(e: Evidence): string[] {
  const metric = e.metric === "log-loss" ? "log loss" : "squared error";
  return ["candidate", "key parameters", `out-of-fold ${metric}`, "± SE", e.metric === "log-loss" ? "AUC" : "R²", "one-SE rule"];
}

/** The evidence table, simplest candidate first; losses share one number of decimals. */
export function evidenceRows(e: Evidence): EvidenceRow[] {
  const decimals = lossDecimals(e);
  return e.candidates.map((c) => {
    const within = finite(c.loss) && c.loss <= e.threshold;
    const marks = [c.candidate === e.best ? "best" : "", c.candidate === e.chosen ? "chosen" : ""].filter((m) => m !== "");
    const score = e.metric === "log-loss" ? c.auc : c.r2;
    return {
      candidate: label(c.candidate), params: candidateParamsText(c),
      loss: formatNumber(c.loss, decimals), se: formatNumber(c.se, decimals), score: formatNumber(score, 3),
      mark: marks.length > 0 ? marks.join(", ") : within ? "within 1 SE" : "", chosen: c.candidate === e.chosen,
    };
  });
}

/** The candidate a recommendation amounts to (drop = the column unused), or null for other encodings. */
function candidateOf(rec: Recommendation): CandidateName | null {
  switch (rec.encoding) {
    case "drop": return "overall-mean";
    case "pooled-one-hot": return "pooled-one-hot";
    case "target-kfold":
      return rec.params.prior === "hierarchical" ? "hierarchical-target-kfold"
        : rec.params.grouping === "backoff" ? "backoff-target-kfold" : "target-kfold";
    default: return null;
  }
}

/**
 * The sentences under the evidence table: the one-standard-error rule's reason, the threshold,
 * and — when the user overrode the recommendation with something the evidence did not choose —
 * "The user chose X; the evidence favoured Y."
 */
export function evidenceNotes(column: ColumnProfile): string[] {
  const e = column.evidence;
  if (!e) return [];
  const reason = e.reason.charAt(0).toUpperCase() + e.reason.slice(1);
  const notes = [reason, `One-standard-error threshold: ${formatNumber(e.threshold, lossDecimals(e))} (the best loss plus its standard error); `
    + `${formatCount(e.folds)} folds, ${formatCount(e.rows)} rows scored.`];
  const rec = column.recommendation;
  const mine = candidateOf(rec);
  if (rec.overridden && mine !== e.chosen) {
    const chose = rec.encoding === "target-kfold" && mine !== null ? label(mine) : rec.encoding;
    notes.push(`The user chose ${chose}; the evidence favoured ${label(e.chosen)}.`);
  }
  return notes;
}

/** The structure in words: pattern and shape, prior parent, counter and usefulness. */
export function hierarchyNotes(h: HierarchyFigures): string[] {
  const sample = `${formatShare(h.matchingShare)} of ${formatCount(h.sampledLevels)} sampled levels follow it`;
  const notes = [h.pattern === "fixed-length"
    ? `Fixed-length codes of shape ${h.shape} (D digit, L letter); ${sample}.`
    : `Delimited codes with the delimiters "${h.shape}" in order; ${sample}.`];
  notes.push(h.priorParent
    ? `The hierarchical prior shrinks each level toward ${describeParent(h.priorParent)}.`
    : "No parent is well filled enough for a hierarchical prior.");
  if (h.counterLike) notes.push("The trailing digits run almost without gaps, as a counter's would: not treated as a hierarchy.");
  const b = h.backoff;
  if (h.useful) notes.push("Backoff moves rare levels to their parents and covers at least half the rows: the grouping is usable.");
  else if (!h.counterLike) {
    notes.push(b.parentRowShare <= 0 ? `No rows back off to a parent: each level has ${formatCount(b.minRows)} rows of its own or no well-filled parent.`
      : b.groups < 2 ? "Backoff leaves fewer than two groups." : "Backoff covers under half the rows: the grouping is not usable on its own.");
  }
  return notes;
}

/** Column headings of the candidate-parent table. */
export function parentHeader(h: HierarchyFigures): string[] {
  return ["parent", "groups", `rows in groups of ≥ ${formatCount(h.backoff.minRows)} rows`, "median rows per group"];
}

/** One row per candidate parent, shallowest first; the prior parent is marked. */
export function parentRows(h: HierarchyFigures): string[][] {
  const prior = JSON.stringify(h.priorParent);
  return h.parents.map((p) => [
    parentChainText([p.parent]) + (JSON.stringify(p.parent) === prior ? " (prior parent)" : ""),
    formatCount(p.groups), formatShare(p.wellFilledRowShare), formatCompact(p.medianGroupRows),
  ]);
}

/** The backoff grouping as figures: groups, coverage and where the rows went. */
export function backoffFigures(h: HierarchyFigures): Figure[] {
  const b = h.backoff;
  const figures: Figure[] = [
    { label: "rows a level needs to keep its own group", value: formatCount(b.minRows) },
    { label: "groups (levels kept plus parents used)", value: formatCount(b.groups) },
    { label: "coverage (rows not in \"other\")", value: formatShare(b.coverage) },
    { label: "rows kept at their own level", value: formatShare(b.levelRowShare) },
    { label: "rows backed off to a parent", value: formatShare(b.parentRowShare) },
    { label: "rows in \"other\"", value: formatShare(b.otherRowShare) },
  ];
  if (b.hashing) {
    figures.push({ label: "hashing of the group keys", value: `${formatCount(b.hashing.width)} buckets, ${formatShare(b.hashing.collisionRowShare, 2)} of rows colliding` });
  }
  return figures;
}
