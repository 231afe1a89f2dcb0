import { hanleyMcNeilSE } from "../../stats/hanleyMcNeilSE.js";
import type { ColumnProfile, ProfileTarget, Recommendation } from "../../profile/types.js";
import type { AdvicePolicy } from "../policy.js";
import { count, num, pct } from "../words.js";

/**
 * Is the out-of-fold signal distinguishable from none? Binary: the out-of-fold AUC's lower 95 %
 * bound (Hanley & McNeil 1982 standard error) must exceed 0.5. Continuous: out-of-fold R² > 0.
 */
export function outOfFoldSignal(column: ColumnProfile, target: ProfileTarget): { present: boolean; text: string } {
  const leak = column.target?.leakage;
  const oof = leak?.outOfFold ?? null;
  if (oof === null) return { present: false, text: "the out-of-fold score could not be computed" };
  if (target.kind === "binary") {
    const positives = Math.round(target.mean * target.rows);
    const se = hanleyMcNeilSE(oof, positives, target.rows - positives);
    const low = oof - 1.959964 * se;
    return { present: low > 0.5, text: `out-of-fold AUC ${num(oof)} (95 % lower bound ${num(low)})` };
  }
  return { present: oof > 0, text: `out-of-fold R² ${num(oof, 4)}` };
}

const leakOk = (text: string) => !text.includes("could not be computed");

/** Rule 5: with a target, the out-of-fold m-estimate — or frequency when there is no signal. */
export function targetRule(column: ColumnProfile, policy: AdvicePolicy, target: ProfileTarget | undefined): Recommendation | null {
  if (!target || !column.target) return null;
  const prior = column.target.prior;
  const signal = outOfFoldSignal(column, target);
  if (prior.weight === null || !signal.present) {
    const levels95 = column.coverage.find((c) => c.share === 0.95)?.levels ?? column.distinct;
    const why = prior.weight === null
      ? "no detectable between-level signal: the spread of level means is no larger than sampling noise explains"
      : leakOk(signal.text) ? `the ${signal.text} is indistinguishable from no signal` : `${signal.text}`;
    return {
      encoding: "frequency",
      params: { tableSize: column.distinct, unseen: 0 },
      reasons: [
        `Frequency: ${count(column.distinct)} levels are too many for one-hot (${count(levels95)} levels needed for ${pct(0.95, 0)} of rows), and target encoding is not advised: ${why}.`,
        `Each level is replaced by its training share of rows; unseen levels get 0.`,
      ],
    };
  }
  const gap = column.target.leakage;
  return {
    encoding: "target-kfold",
    params: { weight: prior.weight, folds: policy.folds, seed: policy.seed, priorMean: prior.mean, fallback: "prior mean" },
    reasons: [
      `Target encoding, ${policy.forward ? `past-only over ${policy.folds} time blocks` : `${policy.folds}-fold out-of-fold`}: ${count(column.distinct)} levels are too many for one-hot, and the levels differ by more than noise (fitted prior weight m = ${num(prior.weight, 1)} by ${prior.method}).`,
      `The ${signal.text}; in-sample the same encoding scores ${num(gap.inSample)}, so fitting on in-sample means would overstate it.`,
      `${count(column.target.flaggedLevels)} levels have an interval that excludes the overall mean, against ${num(column.target.expectedFalseFlags, 1)} expected by chance.`,
    ],
  };
}
