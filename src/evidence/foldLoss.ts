/**
 * evidence/foldLoss: the loss of a candidate from per-fold sums: the pooled out-of-fold loss per
 * row, the per-fold losses and their standard error sd/√K (sample sd, K − 1 in the denominator),
 * the spread that the one-standard-error rule compares against (Hastie, Tibshirani & Friedman,
 * The Elements of Statistical Learning, 2nd ed., §7.10, for K-fold cross-validation).
 */
import { stepMean } from "../stats/stepMean.js";

export interface FoldSums { fold: number; rows: number; loss: number }

/**
 * Edge cases: folds with no rows are left out; no rows at all → null; a single fold with rows →
 * se null (no spread to measure). Non-finite sums throw (they would mean a broken prediction).
 */
export function foldLoss(folds: readonly FoldSums[]): { loss: number; se: number | null; foldLosses: number[] } | null {
  const used = folds.filter((f) => f.rows > 0);
  for (const f of used) {
    if (!Number.isFinite(f.loss) || !Number.isFinite(f.rows)) throw new RangeError(`foldLoss: fold ${f.fold} has non-finite sums (${f.loss}/${f.rows})`);
  }
  if (used.length === 0) return null;
  const rows = used.reduce((s, f) => s + f.rows, 0);
  const loss = used.reduce((s, f) => s + f.loss, 0) / rows;
  const foldLosses = used.map((f) => f.loss / f.rows);
  // the standard error of the per-fold losses' mean (the same s/√K as a forward evaluation's steps)
  return { loss, se: stepMean(foldLosses)?.se ?? null, foldLosses };
}
