/**
 * evidence/types: the out-of-fold comparison of candidate encodings a column carries
 * (`ColumnProfile.evidence`). JSON-friendly and bounded: at most five candidates, K fold losses
 * each, and at most maxOneHot − 1 level values (the pooled one-hot's kept levels).
 */

import type { BackoffTargetParams, FlatTargetParams, HierarchicalTargetParams, PooledOneHotParams, PriorWeight } from "./recommendation.js";

/**
 * Candidates, simplest first — the order the one-standard-error rule prefers:
 * overall-mean (the column unused: every row gets the other folds' mean), pooled-one-hot (kept
 * levels plus "other"), target-kfold (one smoothed mean per level), backoff-target-kfold (rare
 * levels grouped under parents, then one smoothed mean per group), hierarchical-target-kfold
 * (level → parent → overall mean, two fitted weights).
 */
export const CANDIDATES = ["overall-mean", "pooled-one-hot", "target-kfold", "backoff-target-kfold", "hierarchical-target-kfold"] as const;
export type CandidateName = (typeof CANDIDATES)[number];

/** Rank in the complexity order (0 = simplest). */
export function complexity(name: CandidateName): number {
  return CANDIDATES.indexOf(name);
}

/** What each candidate fitted: weights, kept levels, parents (the recommendation's params come from here). */
export interface CandidateParamsOf {
  "overall-mean": Record<string, never>;
  "pooled-one-hot": PooledOneHotParams;
  "target-kfold": FlatTargetParams;
  "backoff-target-kfold": BackoffTargetParams;
  "hierarchical-target-kfold": HierarchicalTargetParams;
}

/** One scored candidate; `params` is typed by `candidate`. */
export type EvidenceCandidate = { [C in CandidateName]: ScoredCandidate & { candidate: C; params: CandidateParamsOf[C] } }[CandidateName];

export interface ScoredCandidate {
  /** Out-of-fold loss per row over all folds: log loss in nats (binary) or squared error (continuous). */
  loss: number;
  /** Standard error of the loss: sample sd of the per-fold losses / √K; null with fewer than 2 folds. */
  se: number | null;
  foldLosses: number[];
  /** Binary: out-of-fold AUC (Mann–Whitney, ties ½). */
  auc?: number | null;
  /** Continuous: out-of-fold R² = 1 − SSE/SST. */
  r2?: number | null;
}

/** With --time: the forward choice of the flat candidate's prior weight (evidence/forward). */
export interface ForwardWeight {
  /** The weight fitted on all rows (moments; null = ∞) and its forward loss. */
  fitted: PriorWeight;
  fittedLoss: number | null;
  /** The weight with the lowest forward loss (the flat candidate's weight) and that loss. */
  chosen: PriorWeight;
  chosenLoss: number;
  /** Every weight tried (null = ∞) and its forward loss. */
  tried: { weight: PriorWeight; loss: number }[];
}

export interface Evidence {
  metric: "log-loss" | "squared-error";
  folds: number;
  /** Rows with a target that were scored. */
  rows: number;
  candidates: EvidenceCandidate[];
  /** Lowest out-of-fold loss. */
  best: CandidateName;
  /** After the one-standard-error rule. */
  chosen: CandidateName;
  rule: "one-standard-error";
  /** Best loss + its standard error: any candidate at or below it is "as good". */
  threshold: number;
  reason: string;
  /**
   * With --time (time-blocks folds): "forward" — `candidates` were scored forward (fit on blocks
   * before, score the next; loss = mean over the K − 1 steps, se = their SE) and decided; `kfold`
   * holds the same candidates scored k-fold over the same blocks, for comparison.
   */
  validation?: "forward";
  kfold?: EvidenceCandidate[];
  forwardWeight?: ForwardWeight;
}
