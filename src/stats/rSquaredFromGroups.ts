/** Rows that share one prediction, summarised by their count, Σy and Σy². */
export interface PredictionGroup {
  prediction: number;
  rows: number;
  sumY: number;
  sumY2: number;
}

/**
 * Coefficient of determination R² = 1 − SSE/SST (the usual definition, e.g. Kvålseth 1985, The
 * American Statistician 39:279–285, form R²₁) from the two sums SQL computes: SSE = Σ(y − ŷ)²,
 * summed per group as Σ(sumY2 − 2·pred·sumY + rows·pred²), and SST = Σ(y − ȳ)². This is the step
 * the tool runs for every R² it prints (leakage and evidence).
 *
 * Edge cases: SST ≤ 0 (a constant target, or no rows) → null. R² can be negative (predictions
 * worse than the mean).
 * @throws RangeError for a non-finite SSE or SST.
 */
export function rSquaredFromSums(sse: number, sst: number): number | null {
  if (!Number.isFinite(sse) || !Number.isFinite(sst)) {
    throw new RangeError(`rSquaredFromSums: need finite SSE and SST, got ${sse} and ${sst}`);
  }
  return sst > 0 ? 1 - sse / sst : null;
}

/**
 * R² from groups of rows sharing one prediction: SSE = Σ(sumY2 − 2·pred·sumY + rows·pred²)
 * (each group's term floored at 0 against round-off), SST = ΣΣy² − (ΣΣy)²/N, then
 * {@link rSquaredFromSums}. The tool sums the same terms in SQL; tests check the SQL against this.
 *
 * Edge cases: no rows, or a constant target (SST = 0) → null. Can be negative.
 * @throws RangeError for non-finite inputs or negative counts.
 */
export function rSquaredFromGroups(groups: readonly PredictionGroup[]): number | null {
  const sums = { sse: 0, rows: 0, sumY: 0, sumY2: 0 };
  for (const g of groups) {
    if (![g.prediction, g.rows, g.sumY, g.sumY2].every(Number.isFinite) || g.rows < 0 || g.sumY2 < 0) {
      throw new RangeError(`rSquaredFromGroups: bad group (prediction=${g.prediction}, rows=${g.rows}, sumY=${g.sumY}, sumY2=${g.sumY2})`);
    }
    sums.sse += Math.max(0, g.sumY2 - 2 * g.prediction * g.sumY + g.rows * g.prediction * g.prediction);
    sums.rows += g.rows;
    sums.sumY += g.sumY;
    sums.sumY2 += g.sumY2;
  }
  if (sums.rows === 0) return null;
  const sst = sums.sumY2 - (sums.sumY * sums.sumY) / sums.rows;
  // SST by subtraction: round-off on a constant target is taken as 0 (SST ≤ 1e-12·Σy²).
  return rSquaredFromSums(sums.sse, sst <= 1e-12 * sums.sumY2 ? 0 : sst);
}
