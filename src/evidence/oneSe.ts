/**
 * evidence/oneSe: the one-standard-error rule (Breiman, Friedman, Olshen & Stone 1984,
 * Classification and Regression Trees, §3.4.3; Hastie, Tibshirani & Friedman, The Elements of
 * Statistical Learning, 2nd ed., §7.10): take the candidate with the lowest out-of-fold loss, then
 * prefer the simplest candidate whose loss is within one standard error of that best loss.
 * Complexity order, simplest first: overall mean, pooled one-hot, target-kfold, backoff then
 * target-kfold, hierarchical prior (see CANDIDATES).
 */
import { complexity, type EvidenceCandidate, type Evidence } from "./types.js";

const LABELS: Record<EvidenceCandidate["candidate"], string> = {
  "overall-mean": "the overall mean (column unused)",
  "pooled-one-hot": "pooled one-hot",
  "target-kfold": "target encoding",
  "backoff-target-kfold": "backoff grouping then target encoding",
  "hierarchical-target-kfold": "target encoding with a hierarchical prior",
};

/** Words for a candidate in reasons ("target encoding with a hierarchical prior"). */
export const label = (c: EvidenceCandidate["candidate"]): string => LABELS[c];

/** A loss or standard error to `digits` significant digits; null or non-finite → "n/a" (never "NaN"). */
export const fmt = (x: number | null | undefined, digits = 4): string => (x === null || x === undefined || !Number.isFinite(x) ? "n/a" : x.toPrecision(digits));

/**
 * Pure. Ties in loss go to the simpler candidate; a best candidate without a standard error (one
 * fold) gets a zero-width band. Edge case: no candidate with a finite loss → null.
 */
export function chooseByOneSeRule(evidence: Pick<Evidence, "candidates" | "metric">): { candidate: EvidenceCandidate; best: EvidenceCandidate; threshold: number; reason: string } | null {
  const usable = evidence.candidates.filter((c) => Number.isFinite(c.loss));
  const bySimplicity = [...usable].sort((a, b) => complexity(a.candidate) - complexity(b.candidate));
  // losses equal up to floating-point summation order (relative 1e-9) count as ties → the simpler wins
  const lower = (c: EvidenceCandidate, b: EvidenceCandidate) => c.loss < b.loss - 1e-9 * Math.max(1, Math.abs(b.loss));
  const best = bySimplicity.reduce<EvidenceCandidate | null>((b, c) => (b === null || lower(c, b) ? c : b), null);
  if (!best) return null;
  const threshold = best.loss + (best.se ?? 0);
  const candidate = bySimplicity.find((c) => c.loss <= threshold) ?? best;
  const metric = evidence.metric === "log-loss" ? "log loss" : "squared error";
  // ties (as above) go to the simpler candidate, so two candidates that predict the same values
  // (e.g. both at m = ∞, the prior) are named in the same order on every run
  const runnerUp = usable.filter((c) => c !== best)
    .sort((a, b) => (lower(a, b) ? -1 : lower(b, a) ? 1 : complexity(a.candidate) - complexity(b.candidate)))[0];
  const next = runnerUp
    ? `; the next best, ${label(runnerUp.candidate)} (${fmt(runnerUp.loss, 5)}), ${runnerUp.loss > threshold ? "is more than one standard error worse" : "is within one standard error but not simpler"}`
    : "";
  const reason = candidate === best
    ? `${label(best.candidate)} has the lowest out-of-fold ${metric} (${fmt(best.loss, 5)} ± ${fmt(best.se, 2)} standard error across folds)${next}.`
    : `${label(candidate.candidate)} (out-of-fold ${metric} ${fmt(candidate.loss, 5)}) is within one standard error of the best, ${label(best.candidate)} (${fmt(best.loss, 5)} ± ${fmt(best.se, 2)}), and simpler, so the one-standard-error rule (Breiman et al. 1984) prefers it.`;
  return { candidate, best, threshold, reason };
}
