/**
 * Shannon entropy −Σ pᵢ log pᵢ of a list of proportions or counts, in the given base (default e,
 * nats). Like SciPy's `scipy.stats.entropy`, the inputs are first normalised to sum to 1, and a
 * zero entry contributes 0 (the limit p·ln p → 0).
 *
 * Edge cases: empty list or all zeros → 0, by convention (SciPy would give NaN).
 * @throws RangeError for negative or non-finite entries, or a base that is not > 0 and ≠ 1.
 */
export function entropyOfProportions(p: readonly number[], base?: number): number {
  if (base !== undefined && !(Number.isFinite(base) && base > 0 && base !== 1)) {
    throw new RangeError(`entropyOfProportions: base must be > 0 and not 1, got ${base}`);
  }
  let total = 0;
  for (const x of p) {
    if (!Number.isFinite(x) || x < 0) {
      throw new RangeError(`entropyOfProportions: entries must be finite and >= 0, got ${x}`);
    }
    total += x;
  }
  if (total === 0) return 0;
  let h = 0;
  for (const x of p) {
    if (x === 0) continue;
    const share = x / total;
    h -= share * Math.log(share);
  }
  if (h <= 0) return 0;
  return base === undefined ? h : h / Math.log(base);
}
