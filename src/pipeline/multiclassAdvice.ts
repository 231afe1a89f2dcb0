/**
 * pipeline/multiclassAdvice: a multi-class target's evidence and decision per column, after the
 * per-class runs of pipeline/multiclass. Two candidates are scored by the out-of-fold multi-class
 * log loss (engine/multiclassLoss): the class shares (the column unused) and one-vs-rest target
 * encoding (each class's m-estimate at the weight its binary run fitted, renormalised). The
 * encoding is chosen when it beats the class shares by more than one standard error of its
 * per-fold losses (the one-standard-error rule, Breiman et al. 1984, as evidence/oneSe) AND
 * saves at least --min-gain of their loss (evidence/margin). It then replaces the advice without
 * a target when that was frequency, pooled one-hot, codes or hashing (a one-hot of few levels,
 * a drop of an identifier or constant, and --decide overrides stand, as on the binary path).
 */
import type { AdvicePolicy } from "../advice/policy.js";
import { TailsiftError } from "../errors.js";
import type { Engine } from "../engine/db.js";
import { multiclassFoldLosses } from "../engine/multiclassLoss.js";
import { foldLoss } from "../evidence/foldLoss.js";
import { gainText } from "../evidence/margin.js";
import { fmt } from "../evidence/oneSe.js";
import { stepMean } from "../stats/stepMean.js";
import type { ColumnProfile, Encoding, MulticlassEvidence, MulticlassTarget, Recommendation } from "../profile/types.js";

/** The advice without a target that the multi-class evidence may replace. */
export const MULTICLASS_REVISABLE: readonly Encoding[] = ["frequency", "pooled-one-hot", "codes", "hashing", "target-kfold"];

/** Scores every categorical column with per-class figures; returns the evidence by column name. */
export async function multiclassEvidence(engine: Engine, levelColumns: readonly string[], columns: readonly ColumnProfile[], target: MulticlassTarget, policy: AdvicePolicy): Promise<Map<string, MulticlassEvidence>> {
  const weights = new Map<number, (number | null)[]>();
  levelColumns.forEach((name, col) => {
    const column = columns.find((c) => c.name === name);
    if (column?.role === "categorical" && column.classes) weights.set(col, column.classes.map((k) => k.target.prior.weight));
  });
  // --time: both fitted on the earlier blocks and scored forward, the mean over the steps (as evidence/forward)
  const forward = policy.forward === true;
  const losses = await multiclassFoldLosses(engine, target.classes.length, weights, undefined, forward);
  const summary = forward ? forwardLoss : foldLoss;
  const out = new Map<string, MulticlassEvidence>();
  for (const col of weights.keys()) {
    const folds = losses.filter((l) => l.col === col);
    const shares = summary(folds.map((f) => ({ fold: f.fold, rows: f.rows, loss: f.shares })));
    const encoded = summary(folds.map((f) => ({ fold: f.fold, rows: f.rows, loss: f.encoded })));
    if (!shares || !encoded) continue;
    out.set(levelColumns[col]!, decide(shares, encoded, folds.reduce((s, f) => s + f.rows, 0), policy, forward));
  }
  return out;
}

/** Forward steps: the mean of the steps' per-row losses with its SE (stats/stepMean, as evidence/forward). */
function forwardLoss(steps: readonly { fold: number; rows: number; loss: number }[]): ReturnType<typeof foldLoss> {
  const foldLosses = steps.filter((f) => f.rows > 0).map((f) => f.loss / f.rows);
  const m = stepMean(foldLosses);
  return m && { loss: m.mean, se: m.se, foldLosses };
}

function decide(shares: NonNullable<ReturnType<typeof foldLoss>>, encoded: NonNullable<ReturnType<typeof foldLoss>>, rows: number, policy: AdvicePolicy, forward: boolean): MulticlassEvidence {
  const gain = shares.loss > 0 ? (shares.loss - encoded.loss) / shares.loss : 0;
  const se = encoded.se ?? 0;
  const beats = encoded.loss + se < shares.loss;
  const chosen = beats && gain >= policy.minGain ? "target-kfold" : "class-shares";
  const figures = `one-vs-rest target encoding: ${forward ? `forward multi-class log loss (fitted on earlier time blocks, mean over ${encoded.foldLosses.length} steps)` : "out-of-fold multi-class log loss"} ${fmt(encoded.loss, 5)} ± ${fmt(encoded.se, 2)} SE against ${fmt(shares.loss, 5)} for the class shares (the column unused)`;
  const reason = chosen === "target-kfold"
    ? `${figures}: it beats them by more than one standard error and saves ${gainText(gain)}, at least the practical margin of ${gainText(policy.minGain)} (--min-gain ${policy.minGain}).`
    : beats
      ? `${figures}: it saves only ${gainText(gain)}, below the practical margin of ${gainText(policy.minGain)} (--min-gain ${policy.minGain}).`
      : `${figures}: it does not beat them by more than one standard error.`;
  return {
    metric: "multiclass-log-loss", folds: shares.foldLosses.length, rows, ...(forward ? { validation: "forward" as const } : {}),
    candidates: [{ candidate: "class-shares", ...shares }, { candidate: "target-kfold", ...encoded }],
    chosen, reason,
  };
}

/** The per-class target encoding params of a column with per-class figures. */
function classParams(column: ColumnProfile, policy: AdvicePolicy) {
  return {
    weight: null, folds: policy.folds, seed: policy.seed, priorMean: null, fallback: "prior mean" as const,
    classes: (column.classes ?? []).map((k) => ({ value: k.value, weight: k.target.prior.weight, priorMean: k.target.prior.mean })),
  };
}

/** --decide COL=target-kfold with a multi-class target: the per-class encoding, recording what was advised. */
export function decidedTargetEncoding(column: ColumnProfile, policy: AdvicePolicy): Recommendation {
  const advised = column.recommendation;
  if (!column.classes) throw new TailsiftError("bad_option", `--decide ${column.name}=target-kfold: the column has no per-class figures (role ${column.role})`);
  return {
    encoding: "target-kfold", params: classParams(column, policy),
    reasons: [`Chosen by the user with --decide ${column.name}=target-kfold (one column per class of the multi-class target); the rules advised ${advised.encoding}:`, ...advised.reasons.map((r) => `(advised) ${r}`)],
    ...(advised.cautions ? { cautions: advised.cautions } : {}),
    overridden: { from: advised.encoding, by: "--decide" },
  };
}

/** The column's decision: the one-vs-rest target encoding when the evidence chose it and the advice may be revised. */
export function multiclassRecommendation(column: ColumnProfile, evidence: MulticlassEvidence | undefined, policy: AdvicePolicy): Recommendation {
  const rec = column.recommendation;
  if (!evidence || rec.overridden || column.role !== "categorical" || !column.classes) return rec;
  if (evidence.chosen === "target-kfold" && MULTICLASS_REVISABLE.includes(rec.encoding)) {
    return {
      encoding: "target-kfold",
      params: classParams(column, policy),
      reasons: [`Multi-class target, one class against the rest: ${evidence.reason} Each class gets its own out-of-fold m-estimate (weights ${column.classes.map((k) => `${k.value} ${k.target.prior.weight === null ? "∞" : fmt(k.target.prior.weight, 3)}`).join(", ")}).`],
      ...(rec.cautions ? { cautions: rec.cautions } : {}),
    };
  }
  const stands = evidence.chosen === "target-kfold" ? `; the ${rec.encoding} advice is not one target encoding replaces, so it stands` : ", so the advice without the target stands";
  return { ...rec, reasons: [...rec.reasons, `Multi-class target: ${evidence.reason.replace(/\.$/, "")}${stands}.`] };
}
