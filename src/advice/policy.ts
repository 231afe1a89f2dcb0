import { DEFAULT_FOLD_COUNT, DEFAULT_FOLD_SEED } from "../engine/folds.js";

/** The policy options that turn a column's numbers into advice; every default can be overridden. */
export interface AdvicePolicy {
  /** Widest one-hot block we recommend (kept levels, plus "other" when pooled). */
  maxOneHot: number;
  /** Fewest rows a level needs to get its own one-hot column. */
  minLevelRows: number;
  /** Row share the kept levels of a pooled one-hot must cover. */
  coverage: number;
  /** Largest share of rows whose hashed level may share a bucket with another level. */
  collisionBudget: number;
  /** Hash widths considered: 2^minBits … 2^maxBits. */
  hashMinBits: number;
  hashMaxBits: number;
  /** K of the out-of-fold figures and of target-kfold (checked by engine/folds). */
  folds: number;
  seed: number;
  /**
   * Practical margin: a candidate must beat the overall mean by at least this share of its
   * out-of-fold loss (log loss or squared error), besides the one-standard-error rule.
   */
  minGain: number;
}

export const DEFAULT_POLICY: AdvicePolicy = {
  maxOneHot: 16,
  minLevelRows: 30,
  coverage: 0.95,
  collisionBudget: 0.01,
  hashMinBits: 4,
  hashMaxBits: 24,
  folds: DEFAULT_FOLD_COUNT,
  seed: DEFAULT_FOLD_SEED,
  minGain: 0.001,
};

/** The hash widths considered, smallest first. */
export function hashWidths(policy: AdvicePolicy): number[] {
  const widths: number[] = [];
  for (let b = policy.hashMinBits; b <= policy.hashMaxBits; b++) widths.push(2 ** b);
  return widths;
}
