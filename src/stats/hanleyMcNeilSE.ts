/**
 * Standard error of an AUC by Hanley & McNeil (1982), "The meaning and use of the area under a
 * receiver operating characteristic (ROC) curve", Radiology 143:29–36, equation with
 * Q1 = A/(2−A), Q2 = 2A²/(1+A):
 *   SE² = [A(1−A) + (n_P − 1)(Q1 − A²) + (n_N − 1)(Q2 − A²)] / (n_P·n_N).
 *
 * Edge cases: A = 0 or 1 gives SE 0 (the formula's value; it understates the uncertainty
 * there). A negative round-off variance is set to 0. With no positives or no negatives there is
 * no AUC to have an error, so that is treated as misuse and throws.
 * @throws RangeError when auc is outside [0, 1], or a count is not finite and > 0.
 */
export function hanleyMcNeilSE(auc: number, nPositive: number, nNegative: number): number {
  if (!(auc >= 0 && auc <= 1)) throw new RangeError(`hanleyMcNeilSE: auc must be in [0, 1], got ${auc}`);
  if (!(nPositive > 0 && nNegative > 0 && Number.isFinite(nPositive) && Number.isFinite(nNegative))) {
    throw new RangeError(`hanleyMcNeilSE: counts must be finite and > 0, got ${nPositive}/${nNegative}`);
  }
  const q1 = auc / (2 - auc);
  const q2 = (2 * auc * auc) / (1 + auc);
  const a2 = auc * auc;
  const variance = (auc * (1 - auc) + (nPositive - 1) * (q1 - a2) + (nNegative - 1) * (q2 - a2)) / (nPositive * nNegative);
  return Math.sqrt(Math.max(0, variance));
}
