import { DEFAULT_FOLD_COUNT, DEFAULT_FOLD_SEED } from "../engine/folds.js";
import { TailsiftError } from "../errors.js";

/** Largest --max-hash-bits accepted: 2^30 buckets (about a billion) is past any practical model input. */
export const MAX_HASH_BITS = 30;

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
  /** Hash widths considered: 2^minBits … 2^maxBits (maxBits: --max-hash-bits, the cap; advice/hashWidth). */
  hashMinBits: number;
  hashMaxBits: number;
  /** K of the out-of-fold figures and of target-kfold (checked by engine/folds). */
  folds: number;
  seed: number;
  /** Time-ordered blocks (--time, set by scan from the fold contract): the evidence scores forward (evidence/forward). */
  forward?: boolean;
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
  hashMaxBits: 20,
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

/**
 * The advice options other than the folds (engine/folds checks --folds and --seed), checked once
 * before anything is read (scan, scan --levels). Edge case: a bad value → TailsiftError
 * "bad_option" naming the option (one line, exit 2).
 */
export function validatePolicy(p: AdvicePolicy): void {
  const bad = (what: string) => { throw new TailsiftError("bad_option", what); };
  if (!Number.isInteger(p.maxOneHot) || p.maxOneHot < 2) bad(`--max-one-hot must be an integer of at least 2 (got ${p.maxOneHot})`);
  if (!(p.minLevelRows >= 1)) bad(`--min-level-rows must be at least 1 (got ${p.minLevelRows})`);
  if (!(p.coverage > 0 && p.coverage <= 1)) bad(`--coverage must be in (0, 1] (got ${p.coverage})`);
  if (!(p.collisionBudget >= 0 && p.collisionBudget < 1)) bad(`--collision-budget must be in [0, 1) (got ${p.collisionBudget})`);
  if (!(p.minGain >= 0 && p.minGain < 1)) bad(`--min-gain must be in [0, 1) (got ${p.minGain})`);
  if (!Number.isInteger(p.hashMaxBits) || p.hashMaxBits < p.hashMinBits || p.hashMaxBits > MAX_HASH_BITS) {
    bad(`--max-hash-bits must be an integer from ${p.hashMinBits} to ${MAX_HASH_BITS} (got ${p.hashMaxBits})`);
  }
}
