/**
 * What the decision record and the HTML report both say about a column's out-of-fold evidence
 * (candidate encodings compared under the one-standard-error rule) and its detected structure
 * (nested codes, candidate parents, backoff grouping), as plain (unescaped) text. Each renderer
 * escapes these strings for its own format; level values (pooled candidates' kept levels) are
 * data and are escaped like every other level value.
 */
import { label } from "../evidence/oneSe.js";
import type { CandidateName, Evidence, EvidenceCandidate } from "../profile/evidenceTypes.js";
import { describeParent } from "../hierarchy/parent.js";
import type { HierarchyFigures, ParentSpec } from "../profile/hierarchyTypes.js";
import type { ColumnProfile, PriorWeight, Recommendation } from "../profile/types.js";
import { levelText, type Figure } from "./figures.js";
import { formatCompact, formatCount, formatNumber, formatShare } from "./format.js";

/** One candidate of the out-of-fold comparison as plain-text table cells. */
export interface EvidenceRow {
  candidate: string;
  params: string;
  loss: string;
  se: string;
  score: string;
  /** The number cells in table order: loss, ± SE, (with forward evidence: k-fold loss, ± SE,) score. */
  numbers: string[];
  /** "best", "chosen", "best and chosen", "within 1 SE" (at or below the threshold) or "". */
  mark: string;
  chosen: boolean;
  best: boolean;
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

/**
 * A chain of parents in the order given: "first 4 → 3 → 2 characters" when all are prefixes (or
 * all tokens on the same delimiters), else each described in full. No parents → "—".
 */
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

/** A weight: a number, else (null: no detectable spread; or absent from an edited profile) m = ∞. */
const weightText = (w: PriorWeight | undefined): string => (finite(w) ? formatCompact(w) : "∞");
/** A count that an edited profile may lack: "n/a" then. */
const countText = (n: number | null | undefined): string => formatCount(finite(n) ? n : null);

/**
 * The key parameters of a candidate, short: what it fitted, without repeating the folds. A pooled
 * candidate shows its first three kept levels (data: the renderers escape them). A null weight
 * means no detectable spread, shown as m = ∞; other missing figures print "n/a" (a saved profile
 * may have been edited, so every figure is read defensively).
 */
export function candidateParamsText(c: EvidenceCandidate): string {
  switch (c.candidate) {
    case "pooled-one-hot": {
      const keep: readonly unknown[] = Array.isArray(c.params.keep) ? c.params.keep : [];
      const shown = keep.slice(0, KEPT_SHOWN).map(shortLevel).join(", ") + (keep.length > KEPT_SHOWN ? ", …" : "");
      return `keep ${formatCount(keep.length)} (${shown}) + other; ${formatShare(finite(c.params.pooledRowShare) ? c.params.pooledRowShare : null)} of rows pooled`;
    }
    case "target-kfold": return `m = ${weightText(c.params.weight)}`;
    case "backoff-target-kfold": {
      const p = c.params;
      // no parents: the pooled target encoding of an identifier-like column
      if (Array.isArray(p.parents) && p.parents.length === 0) {
        return `pooled: levels with < ${countText(p.minRows)} rows share "other"; ${countText(p.groups)} levels kept; m = ${weightText(p.weight)}`;
      }
      return `parents ${parentChainText(Array.isArray(p.parents) ? p.parents : [])}; ≥ ${countText(p.minRows)} rows; `
        + `${countText(p.groups)} groups; m = ${weightText(p.weight)}`;
    }
    case "hierarchical-target-kfold": {
      const p = c.params;
      const parent = typeof p.parent === "object" && p.parent !== null ? parentChainText([p.parent]) : "—";
      return `parent ${parent}, ${countText(p.parentGroups)} groups; m = ${weightText(p.weight)}, parent m = ${weightText(p.parentWeight)}`;
    }
    case "overall-mean": return "—";
  }
}

/** Column headings of the evidence table. */
export function evidenceHeader(e: Evidence): string[] {
  const metric = e.metric === "log-loss" ? "log loss" : "squared error";
  const score = e.metric === "log-loss" ? "AUC" : "R²";
  // --time: the forward figures decide; the k-fold ones over the same blocks sit beside them
  if (e.validation === "forward") return ["candidate", "key parameters", `forward ${metric}`, "± SE", `${e.folds}-fold ${metric}`, "± SE", `${e.folds}-fold ${score}`, "one-SE rule (forward)"];
  return ["candidate", "key parameters", `out-of-fold ${metric}`, "± SE", score, "one-SE rule"];
}

/** The section title of the evidence table. */
export function evidenceTitle(e: Evidence): string {
  return e.validation === "forward" ? "Evidence (forward in time, with k-fold beside)" : "Evidence (out-of-fold)";
}

/**
 * The evidence table in the evidence's order (simplest first). Losses, SEs share one number of
 * decimals (five significant digits at the largest loss); a missing or non-finite figure → "n/a".
 */
export function evidenceRows(e: Evidence): EvidenceRow[] {
  const decimals = lossDecimals(e);
  return e.candidates.map((c) => {
    const within = finite(c.loss) && c.loss <= e.threshold;
    const marks = [c.candidate === e.best ? "best" : "", c.candidate === e.chosen ? "chosen" : ""].filter((m) => m !== "");
    const k = e.validation === "forward" ? e.kfold?.find((x) => x.candidate === c.candidate) : undefined;
    const scored = e.validation === "forward" ? k : c;
    const score = formatNumber(e.metric === "log-loss" ? scored?.auc : scored?.r2, 3);
    const loss = formatNumber(c.loss, decimals), se = formatNumber(c.se, decimals);
    const numbers = e.validation === "forward" ? [loss, se, formatNumber(k?.loss, decimals), formatNumber(k?.se, decimals), score] : [loss, se, score];
    return {
      candidate: label(c.candidate), params: candidateParamsText(c), numbers,
      loss, se, score,
      mark: marks.length > 0 ? marks.join(" and ") : within ? "within 1 SE" : "", chosen: c.candidate === e.chosen, best: c.candidate === e.best,
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

/** The sentences under the evidence table (plain text). */
export interface EvidenceNotes {
  /** The one-standard-error rule's reason, capitalised. */
  reason: string;
  threshold: string;
  /** "The user chose X; the evidence favoured Y." when an override differs from the evidence's choice. */
  override: string | null;
}

/**
 * The sentences under the evidence table: the rule's reason, the threshold, and — when the user
 * overrode the recommendation with something the evidence did not choose — the disagreement.
 * No evidence → null.
 */
export function evidenceNotes(column: ColumnProfile): EvidenceNotes | null {
  const e = column.evidence;
  if (!e) return null;
  const threshold = `One-standard-error threshold: ${formatNumber(e.threshold, lossDecimals(e))} (the best loss plus its standard error); `
    + (e.validation === "forward"
      ? `${formatCount(e.folds - 1)} forward steps over ${formatCount(e.folds)} time blocks (block 0 is fit-only).`
      : `${formatCount(e.folds)} folds, ${formatCount(e.rows)} rows scored.`);
  const rec = column.recommendation;
  const mine = candidateOf(rec);
  const chose = rec.encoding === "target-kfold" && mine !== null ? label(mine) : rec.encoding;
  return {
    reason: e.reason.charAt(0).toUpperCase() + e.reason.slice(1),
    threshold,
    override: rec.overridden && mine !== e.chosen ? `The user chose ${chose}; the evidence favoured ${label(e.chosen)}.` : null,
  };
}

/** The structure in words: pattern and shape, prior parent, counter and usefulness. */
export function hierarchyNotes(h: HierarchyFigures): string[] {
  const sample = `${formatShare(h.matchingShare)} of ${formatCount(h.sampledLevels)} sampled levels follow it`;
  const notes = [h.pattern === "fixed-length"
    ? `Fixed-length codes of shape ${h.shape} (D digit, L letter); ${sample}.`
    : h.shape.length === 1 ? `Delimited codes of two tokens split by "${h.shape}"; ${sample}.`
      : `Delimited codes of ${formatCount(h.shape.length + 1)} tokens, delimiters "${h.shape}" in order; ${sample}.`];
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
  return ["parent", "groups", `rows in groups of ≥ ${formatCount(h.backoff.minRows)} rows`, "median group rows"];
}

/** One row per candidate parent, shallowest first; the prior parent is marked. */
export function parentRows(h: HierarchyFigures): string[][] {
  const prior = JSON.stringify(h.priorParent);
  return h.parents.map((p) => [
    parentChainText([p.parent]) + (JSON.stringify(p.parent) === prior ? " — prior parent" : ""),
    formatCount(p.groups), formatShare(p.wellFilledRowShare), formatCompact(p.medianGroupRows),
  ]);
}

/** The backoff grouping as figures: groups, coverage and where the rows went. */
export function backoffFigures(h: HierarchyFigures): Figure[] {
  const b = h.backoff;
  const figures: Figure[] = [
    { label: "min. rows for a level to keep its group", value: formatCount(b.minRows) },
    { label: "groups (levels kept + parents used)", value: formatCount(b.groups) },
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
