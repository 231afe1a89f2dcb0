/**
 * James–Stein shrinkage constant for k group means with a common known sampling variance σ²
 * (Efron & Morris 1975, "Data analysis using Stein's estimator and its generalizations", JASA
 * 70:311–319): c = 1 − (k−3)σ²/Σ(yᵢ − ȳ)², each mean shrunk to ȳ + c·(yᵢ − ȳ). With equal group
 * sizes n this is an m-estimate with m = n(1 − c)/c.
 *
 * Edge cases: the positive-part rule is applied, c = max(0, ·) (Baranchik 1964 — memory), so
 * when all means are equal c = 0 (shrink fully). For k ≤ 3 the rule gives no shrinkage, c = 1.
 * @throws RangeError for an empty list, non-finite means, or σ² < 0.
 */
export function jamesSteinShrinkage(means: readonly number[], sigma2: number): { grandMean: number; c: number } {
  if (means.length === 0) throw new RangeError("jamesSteinShrinkage: needs at least one mean");
  if (!Number.isFinite(sigma2) || sigma2 < 0) throw new RangeError(`jamesSteinShrinkage: sigma2 must be >= 0, got ${sigma2}`);
  let total = 0;
  for (const y of means) {
    if (!Number.isFinite(y)) throw new RangeError(`jamesSteinShrinkage: means must be finite, got ${y}`);
    total += y;
  }
  const k = means.length;
  const grandMean = total / k;
  if (k <= 3) return { grandMean, c: 1 };
  let spread = 0;
  for (const y of means) spread += (y - grandMean) ** 2;
  if (spread === 0) return { grandMean, c: sigma2 === 0 ? 1 : 0 };
  return { grandMean, c: Math.max(0, 1 - ((k - 3) * sigma2) / spread) };
}
