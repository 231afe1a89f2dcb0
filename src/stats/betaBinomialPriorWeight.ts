/** Sufficient sums for {@link betaBinomialPriorWeight}, as SQL computes them over a level table. */
export interface BetaBinomialSums {
  /** k, the number of levels (with at least one row). */
  levels: number;
  /** N = Σnᵢ. */
  rows: number;
  /** Σyᵢ, the positive rows. */
  positives: number;
  /** Σyᵢ²/nᵢ. */
  sumPositivesSqOverRows: number;
  /** Σnᵢ². */
  sumRowsSq: number;
}

/**
 * Prior weight m for smoothing level rates of a binary target, from the beta-binomial moment
 * estimator of the intra-level correlation for unequal level sizes (Kleinman 1973, JASA
 * 68:46–54, tradition — memory):
 *   p̂ = Σyᵢ/N, S = Σnᵢ(yᵢ/nᵢ − p̂)² = Σyᵢ²/nᵢ − p̂²N,
 *   ρ̂ = [S/(p̂(1−p̂)) − (k−1)] / [N − Σnᵢ²/N − (k−1)],  m = 1/ρ̂ − 1,
 * so that the smoothed rate (yᵢ + m·p̂)/(nᵢ + m) is the posterior mean under a
 * Beta(m·p̂, m·(1−p̂)) prior (Cestnik 1990 m-estimate). Takes sums only, as SQL computes them.
 *
 * Edge cases: rho and weight are null when there is no detectable between-level signal
 * (ρ̂ ≤ 0), when p̂ is 0 or 1 (all rows one target value), k < 2 (single level) or the
 * denominator is ≤ 0. ρ̂ ≥ 1 (levels perfectly separate the target) is reported as rho 1 and
 * weight 0 (no smoothing). No rows at all → mean 0 and S 0 by convention, rho/weight null.
 * @throws RangeError for negative or non-finite sums, or positives > rows.
 */
export function betaBinomialPriorWeight(s: BetaBinomialSums): {
  mean: number;
  S: number;
  rho: number | null;
  weight: number | null;
} {
  const fields = [s.levels, s.rows, s.positives, s.sumPositivesSqOverRows, s.sumRowsSq];
  for (const [i, value] of fields.entries()) {
    const name = ["levels", "rows", "positives", "sumPositivesSqOverRows", "sumRowsSq"][i];
    if (!Number.isFinite(value) || value < 0) throw new RangeError(`betaBinomialPriorWeight: ${name} must be finite and >= 0, got ${value}`);
  }
  if (s.positives > s.rows) throw new RangeError(`betaBinomialPriorWeight: positives ${s.positives} > rows ${s.rows}`);
  if (s.rows === 0) return { mean: 0, S: 0, rho: null, weight: null };
  const k = s.levels;
  const n = s.rows;
  const mean = s.positives / n;
  const S = Math.max(0, s.sumPositivesSqOverRows - mean * mean * n);
  const variance = mean * (1 - mean);
  const denominator = n - s.sumRowsSq / n - (k - 1);
  if (k < 2 || variance <= 0 || denominator <= 0) return { mean, S, rho: null, weight: null };
  const rho = (S / variance - (k - 1)) / denominator;
  if (!(rho > 0)) return { mean, S, rho: null, weight: null };
  if (rho >= 1) return { mean, S, rho: 1, weight: 0 };
  return { mean, S, rho, weight: 1 / rho - 1 };
}
