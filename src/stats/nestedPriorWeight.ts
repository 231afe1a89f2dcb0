/** Sums over a two-level table (levels nested in parents), as SQL computes them. */
export interface NestedSums {
  /** N = Σnᵢ over levels. */ rows: number;
  /** k, levels with at least one row. */ levels: number;
  /** P, parents with at least one row. */ parents: number;
  /** ΣΣy² over all rows (for a 0/1 target, Σy). */ sumY2: number;
  /** Σ sumᵢ²/nᵢ over levels. */ levelSumSqOverRows: number;
  /** Σ SUMₚ²/Nₚ over parents. */ parentSumSqOverRows: number;
  /** Σₚ (Σ_{i∈p} nᵢ²)/Nₚ. */ nestedRowsSq: number;
}

/**
 * Prior weight m = σ²/τ² for shrinking a level's mean toward its parent's mean, with σ² the
 * within-level variance and τ² the variance of level means around their parent's mean, by the
 * ANOVA method of moments for the unbalanced nested one-way model (Searle, Casella & McCulloch
 * 1992, Variance Components, ch. 4 — memory):
 *   SSW = ΣΣy² − Σsumᵢ²/nᵢ,  E[SSW] = (N − k)σ²;
 *   SSB = Σsumᵢ²/nᵢ − ΣSUMₚ²/Nₚ = Σᵢ nᵢ(ȳᵢ − ȳₚ₍ᵢ₎)²,  E[SSB] = (k − P)σ² + (N − Σₚ Σnᵢ²/Nₚ)τ²;
 *   σ̂² = SSW/(N − k),  τ̂² = max(0, (SSB − (k − P)σ̂²)/(N − Σₚ Σnᵢ²/Nₚ)).
 * With one parent it is normalNormalPriorWeight's estimator (DerSimonian & Laird 1986 on level
 * means). For a 0/1 target it is the ANOVA estimator of the intra-class correlation (Ridout,
 * Demétrio & Firth 1999, Biometrics 55:137–148 — memory) applied within parents.
 *
 * Edge cases (our policy, as normalNormalPriorWeight): weight null when N − k ≤ 0 (σ² not
 * estimable), N − Σₚ Σnᵢ²/Nₚ ≤ 0 (every parent has one level: nothing to separate), or τ̂² = 0
 * (no detectable spread within parents: the level takes its parent's value). σ̂² = 0 with
 * τ̂² > 0 → weight 0 (level means are exact). Negative round-off in SSW or SSB is set to 0.
 * @throws RangeError for non-finite sums or negative counts.
 */
export function nestedPriorWeight(s: NestedSums): { sigma2: number; tau2: number; weight: number | null } {
  const all = [s.rows, s.levels, s.parents, s.sumY2, s.levelSumSqOverRows, s.parentSumSqOverRows, s.nestedRowsSq];
  if (!all.every(Number.isFinite) || s.rows < 0 || s.levels < 0 || s.parents < 0 || s.nestedRowsSq < 0) {
    throw new RangeError(`nestedPriorWeight: sums must be finite, counts >= 0, got ${JSON.stringify(s)}`);
  }
  const { rows: n, levels: k, parents: p } = s;
  if (n - k <= 0) return { sigma2: 0, tau2: 0, weight: null };
  const sigma2 = Math.max(0, s.sumY2 - s.levelSumSqOverRows) / (n - k);
  const ssb = Math.max(0, s.levelSumSqOverRows - s.parentSumSqOverRows);
  const scale = n - s.nestedRowsSq;
  if (scale <= 1e-9 * n) return { sigma2, tau2: 0, weight: null };
  const tau2 = Math.max(0, (ssb - (k - p) * sigma2) / scale);
  if (tau2 === 0) return { sigma2, tau2, weight: null };
  return { sigma2, tau2, weight: sigma2 / tau2 };
}
