/**
 * m-estimate of a level's mean: (sum + m·prior)/(n + m) (Cestnik 1990, "Estimating
 * probabilities: a crucial task in machine learning", ECAI 1990, 147–149). For a binary target
 * it is the posterior mean under a Beta(m·prior, m·(1−prior)) prior; for any target it blends
 * the level mean and the prior with weight n/(n + m) on the level.
 *
 * Edge cases: n + m = 0 (no rows and no prior weight) → prior. m = 0 → the raw level mean
 * (needs n > 0). An unseen level (n = 0, m > 0) → prior.
 * @throws RangeError for negative n or weight, or non-finite inputs.
 */
export function mEstimate(sum: number, n: number, weight: number, prior: number): number {
  if (!Number.isFinite(sum) || !Number.isFinite(prior)) {
    throw new RangeError(`mEstimate: sum and prior must be finite, got sum=${sum}, prior=${prior}`);
  }
  if (!Number.isFinite(n) || n < 0) throw new RangeError(`mEstimate: n must be finite and >= 0, got ${n}`);
  if (!Number.isFinite(weight) || weight < 0) throw new RangeError(`mEstimate: weight must be finite and >= 0, got ${weight}`);
  if (n + weight === 0) return prior;
  return (sum + weight * prior) / (n + weight);
}
