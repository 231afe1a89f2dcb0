/** Sufficient sums over a level table for a continuous target, as SQL computes them. */
export interface NormalNormalSums {
  /** k, levels with at least one row. */ levels: number;
  /** N = Σnᵢ. */ rows: number;
  /** ΣΣy over all rows. */ sumY: number;
  /** ΣΣy² over all rows. */ sumY2: number;
  /** Σ sumᵢ²/nᵢ over levels. */ sumSumSqOverRows: number;
  /** Σnᵢ². */ sumRowsSq: number;
}

/**
 * Prior weight m = σ²_w/τ² for smoothing level means of a continuous target (normal–normal
 * model), with τ² from DerSimonian & Laird (1986, Controlled Clinical Trials 7:177–188) applied
 * to the level means. Pooled within-level variance σ²_w = (ΣΣy² − Σsumᵢ²/nᵢ)/(N − k); level i's
 * mean has variance σ²_w/nᵢ, so wᵢ = nᵢ/σ²_w, μ̂ = Σsumᵢ/N, Q = (Σsumᵢ²/nᵢ − Nμ̂²)/σ²_w and
 * τ² = max(0, (Q − (k−1))·σ²_w/(N − Σnᵢ²/N)). Then (sumᵢ + m·μ̂)/(nᵢ + m) is the posterior mean.
 *
 * Edge cases (our policy): weight is null when k < 2, N − k ≤ 0 (σ²_w not estimable; it is then
 * reported as 0), N − Σnᵢ²/N ≤ 0, or τ² = 0 (no detectable between-level spread). When σ²_w = 0
 * (every level constant) τ² is its limit, the between-level sum of squares over N − Σnᵢ²/N:
 * if the levels differ, weight is 0 (level means are exact, no smoothing); if not, null.
 * No rows → mean 0 by convention, weight null. Negative round-off in variances is set to 0.
 * @throws RangeError for non-finite sums or negative counts.
 */
export function normalNormalPriorWeight(s: NormalNormalSums): {
  mean: number; sigma2Within: number; tau2: number; weight: number | null;
} {
  const all = [s.levels, s.rows, s.sumY, s.sumY2, s.sumSumSqOverRows, s.sumRowsSq];
  if (!all.every(Number.isFinite) || s.levels < 0 || s.rows < 0 || s.sumY2 < 0 || s.sumRowsSq < 0) {
    throw new RangeError(`normalNormalPriorWeight: sums must be finite, counts >= 0, got ${JSON.stringify(s)}`);
  }
  const { levels: k, rows: n } = s;
  if (n === 0) return { mean: 0, sigma2Within: 0, tau2: 0, weight: null };
  const mean = s.sumY / n;
  const scale = n - s.sumRowsSq / n; // Σw − Σw²/Σw, times σ²_w
  if (n - k <= 0) return { mean, sigma2Within: 0, tau2: 0, weight: null };
  const sigma2Within = Math.max(0, (s.sumY2 - s.sumSumSqOverRows) / (n - k));
  const between = Math.max(0, s.sumSumSqOverRows - n * mean * mean); // Q·σ²_w
  if (k < 2 || scale <= 0) return { mean, sigma2Within, tau2: 0, weight: null };
  const tau2 = Math.max(0, (between - (k - 1) * sigma2Within) / scale);
  if (tau2 === 0) return { mean, sigma2Within, tau2, weight: null };
  return { mean, sigma2Within, tau2, weight: sigma2Within / tau2 };
}
