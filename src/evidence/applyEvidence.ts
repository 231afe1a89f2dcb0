/**
 * evidence/applyEvidence: turns the evidence's choice into a recommendation (pure). The rules'
 * choice stands for user overrides, when the overall mean is chosen (nothing beats the column
 * unused by more than one standard error), and for identifier-like columns unless a hierarchy
 * candidate is chosen; in every case the comparison is added to the reasons.
 */
import { cautionsFor } from "../advice/cautions.js";
import type { AdvicePolicy } from "../advice/policy.js";
import { count, num, pct } from "../advice/words.js";
import { describeParent } from "../hierarchy/parent.js";
import type { ParentSpec } from "../hierarchy/types.js";
import type { ColumnProfile, Recommendation } from "../profile/types.js";
import { fmt, label } from "./oneSe.js";
import type { Evidence, EvidenceCandidate } from "./types.js";

const weightText = (w: unknown) => (typeof w === "number" ? num(w, 1) : "∞ (no detectable spread)");

function headline(c: EvidenceCandidate, folds: number): string {
  const p = c.params;
  switch (c.candidate) {
    case "pooled-one-hot": return `Pooled one-hot: the ${(p.keep as string[]).length} levels with at least ${count(p.minRows as number)} rows keep their own column; the other ${pct(p.pooledRowShare as number)} of non-missing rows share "other".`;
    case "target-kfold": return `Target encoding, ${folds}-fold out-of-fold, prior weight m = ${weightText(p.weight)}.`;
    case "backoff-target-kfold": return `Backoff grouping, then target encoding (${folds}-fold out-of-fold): a level with at least ${count(p.minRows as number)} rows keeps its own group, a rarer one backs off to its longest parent with that many rows (${(p.parents as ParentSpec[]).map(describeParent).join(", then ")}), the rest share "other" — ${count(p.groups as number)} groups covering ${pct(p.coverage as number)} of non-missing rows, group means smoothed with m = ${weightText(p.weight)}.`;
    case "hierarchical-target-kfold": return `Target encoding with a hierarchical prior (${folds}-fold out-of-fold): each level's mean shrinks toward its parent's smoothed mean (parent = ${describeParent(p.parent as ParentSpec)}, ${count(p.parentGroups as number)} groups) with weight m = ${weightText(p.weight)}, and each parent's toward the overall mean with weight ${weightText(p.parentWeight)}.`;
    default: return "The overall mean.";
  }
}

/** The comparison as one sentence, simplest candidate first. */
export function comparisonText(e: Evidence): string {
  const metric = e.metric === "log-loss" ? "log loss (nats per row)" : "squared error per row";
  const items = e.candidates.map((c) => `${label(c.candidate)} ${fmt(c.loss, 5)} ± ${fmt(c.se, 2)}${c.auc !== undefined ? ` (AUC ${num(c.auc)})` : ""}${c.r2 !== undefined ? ` (R² ${num(c.r2, 4)})` : ""}`);
  return `Out-of-fold ${metric} over ${e.folds} folds, ± one standard error across folds: ${items.join("; ")}.`;
}

/** The recommendation the evidence implies for `column`, or its existing one (with the evidence added to the reasons). */
export function applyEvidence(column: ColumnProfile, evidence: Evidence, _policy: AdvicePolicy): Recommendation {
  const was = column.recommendation;
  if (was.overridden) return was;
  const chosen = evidence.candidates.find((c) => c.candidate === evidence.chosen);
  const told = [`Evidence: ${evidence.reason}`, comparisonText(evidence)];
  const hierarchical = chosen?.candidate === "backoff-target-kfold" || chosen?.candidate === "hierarchical-target-kfold";
  if (!chosen || chosen.candidate === "overall-mean" || (column.role === "identifier" && !hierarchical)) {
    const stands = chosen?.candidate === "overall-mean"
      ? `No candidate beats the overall mean by more than one standard error; the rules' choice (${was.encoding}) stands.`
      : `The rules' choice (${was.encoding}) stands: without a hierarchy an identifier-like column's out-of-fold score overstates how it generalises to new levels.`;
    return { ...was, reasons: [...was.reasons, ...told, stands] };
  }
  const encoding = chosen.candidate === "pooled-one-hot" ? "pooled-one-hot" : "target-kfold";
  const sameAsRules = encoding === was.encoding && (chosen.candidate === "pooled-one-hot" || chosen.candidate === "target-kfold");
  if (sameAsRules) return { ...was, reasons: [...was.reasons, ...told] };
  const rec: Recommendation = {
    encoding,
    params: chosen.params,
    reasons: [headline(chosen, evidence.folds), ...told, `The rules alone advised ${was.encoding}: ${was.reasons[0] ?? ""}`],
  };
  const cautions = cautionsFor(column, rec);
  return cautions.length > 0 ? { ...rec, cautions } : rec;
}
