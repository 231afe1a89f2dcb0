/**
 * evidence/applyEvidence: turns the evidence's choice into a recommendation (pure). The rules'
 * choice stands for user overrides, when the overall mean is chosen (nothing beats the column
 * unused by more than one standard error and by the practical margin), and for identifier-like
 * columns unless a grouped candidate (backoff, pooled target encoding, hierarchical) is chosen; in every case the comparison is added to the reasons.
 */
import { cautionsFor } from "../advice/cautions.js";
import type { AdvicePolicy } from "../advice/policy.js";
import { count, num, pct } from "../advice/words.js";
import { describeParent } from "../hierarchy/parent.js";
import type { ColumnProfile, PriorWeight, Recommendation } from "../profile/types.js";
import { forwardComparisonText, withForwardWeight } from "./forward.js";
import { gainText, relativeGain } from "./margin.js";
import { fmt, label } from "./oneSe.js";
import type { Evidence, EvidenceCandidate } from "./types.js";

const weightText = (w: PriorWeight) => (w === null ? "∞ (no detectable spread)" : num(w, 1));

/** `how`: "5-fold out-of-fold", or with --time "past-only over 5 time blocks" (what encode --for training writes). */
function headline(c: EvidenceCandidate, how: string): string {
  switch (c.candidate) {
    case "pooled-one-hot": {
      const p = c.params;
      return `Pooled one-hot: the ${p.keep.length} levels with at least ${count(p.minRows)} rows keep their own column; the other ${pct(p.pooledRowShare)} of non-missing rows share "other".`;
    }
    case "target-kfold": return `Target encoding, ${how}, prior weight m = ${weightText(c.params.weight)}.`;
    case "backoff-target-kfold": {
      const p = c.params;
      if (p.parents.length === 0) {
        return `Pooled target encoding (${how}): the ${count(p.groups)} levels with at least ${count(p.minRows)} rows (${pct(p.coverage)} of non-missing rows) keep their own mean, every rarer level shares "other"; means smoothed with m = ${weightText(p.weight)}. Which levels are pooled is decided from the row counts of all folds (not from the target).`;
      }
      return `Backoff grouping, then target encoding (${how}): a level with at least ${count(p.minRows)} rows keeps its own group, a rarer one backs off to its longest parent with that many rows (${p.parents.map(describeParent).join(", then ")}), the rest share "other" — ${count(p.groups)} groups covering ${pct(p.coverage)} of non-missing rows, group means smoothed with m = ${weightText(p.weight)}.`;
    }
    case "hierarchical-target-kfold": {
      const p = c.params;
      return `Target encoding with a hierarchical prior (${how}): each level's mean shrinks toward its parent's smoothed mean (parent = ${describeParent(p.parent)}, ${count(p.parentGroups ?? Number.NaN)} groups) with weight m = ${weightText(p.weight)}, and each parent's toward the overall mean with weight ${weightText(p.parentWeight)}.`;
    }
    case "overall-mean": return "The overall mean.";
  }
}

/** The comparison as one sentence, simplest candidate first. */
export function comparisonText(e: Evidence): string {
  const metric = e.metric === "log-loss" ? "log loss (nats per row)" : "squared error per row";
  const items = e.candidates.map((c) => `${label(c.candidate)} ${fmt(c.loss, 5)} ± ${fmt(c.se, 2)}${c.auc !== undefined ? ` (AUC ${num(c.auc)})` : ""}${c.r2 !== undefined ? ` (R² ${num(c.r2, 4)})` : ""}`);
  if (e.validation === "forward") return forwardComparisonText(e, metric, items); // --time (evidence/forward)
  return `Out-of-fold ${metric} over ${e.folds} folds, ± one standard error across folds: ${items.join("; ")}.`;
}

/** The evidence's choice as a recommendation (pooled one-hot or one of the target encodings). */
function asRecommendation(c: Exclude<EvidenceCandidate, { candidate: "overall-mean" }>, reasons: string[]): Recommendation {
  return c.candidate === "pooled-one-hot" ? { encoding: "pooled-one-hot", params: c.params, reasons } : { encoding: "target-kfold", params: c.params, reasons };
}

/**
 * The recommendation the evidence implies for `column`, or its existing one (the rules' answer)
 * with the comparison added. The reasons describe the decision that results: when the rules'
 * answer stands, the evidence's own preference is not quoted as if it were the decision.
 */
export function applyEvidence(column: ColumnProfile, evidence: Evidence, policy: AdvicePolicy): Recommendation {
  // --time: a flat target encoding takes the prior weight chosen for forward loss (evidence/forward)
  return withForwardWeight(decide(column, evidence, policy), evidence);
}

function decide(column: ColumnProfile, evidence: Evidence, policy: AdvicePolicy): Recommendation {
  const was = column.recommendation;
  if (was.overridden) return was;
  const chosen = evidence.candidates.find((c) => c.candidate === evidence.chosen);
  const comparison = comparisonText(evidence);
  if (!chosen || chosen.candidate === "overall-mean") {
    const best = evidence.candidates.find((c) => c.candidate === evidence.best);
    const bestText = best && best.candidate !== "overall-mean" ? ` (the best, ${label(best.candidate)}, scores ${fmt(best.loss, 5)} ± ${fmt(best.se, 2)})` : "";
    const overall = evidence.candidates.find((c) => c.candidate === "overall-mean");
    if (overall && best && best !== overall && overall.loss > evidence.threshold) {
      // the one-SE rule alone would have used the column: the practical margin decided
      return { ...was, reasons: [...was.reasons, comparison, `Evidence: ${evidence.reason} So ${was.encoding} stands.`] };
    }
    const gain = overall && best && best !== overall ? `, and the best saves ${gainText(relativeGain(best, overall.loss))} of the overall mean's loss against a practical margin of ${gainText(policy.minGain)}` : "";
    return { ...was, reasons: [...was.reasons, comparison,
      `Evidence: no candidate beats the overall mean by more than one standard error${bestText}${gain}, so the out-of-fold comparison gives no ground to change the rules' choice; ${was.encoding} stands.`] };
  }
  const hierarchical = chosen.candidate === "backoff-target-kfold" || chosen.candidate === "hierarchical-target-kfold";
  if (column.role === "identifier" && !hierarchical) {
    return { ...was, reasons: [...was.reasons, comparison,
      `The rules' choice (${was.encoding}) stands: the evidence's choice, ${label(chosen.candidate)}, is not taken, because without a hierarchy an identifier-like column's out-of-fold score overstates how it generalises to new levels.`] };
  }
  const told = [`Evidence: ${evidence.reason}`, comparison];
  const encoding = chosen.candidate === "pooled-one-hot" ? "pooled-one-hot" : "target-kfold";
  const sameAsRules = encoding === was.encoding && (chosen.candidate === "pooled-one-hot" || chosen.candidate === "target-kfold");
  if (sameAsRules) return { ...was, reasons: [...was.reasons, ...told] };
  const rec = asRecommendation(chosen, [headline(chosen, evidence.validation === "forward" ? `past-only over ${evidence.folds} time blocks` : `${evidence.folds}-fold out-of-fold`), ...told, `The rules alone advised ${was.encoding}: ${was.reasons[0] ?? ""}`]);
  const cautions = cautionsFor(column, rec);
  return cautions.length > 0 ? { ...rec, cautions } : rec;
}
