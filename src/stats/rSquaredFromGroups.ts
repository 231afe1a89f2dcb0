import { RSquaredAccumulator } from "./rSquaredAccumulator.js";

/** Rows that share one prediction, summarised by their count, Σy and Σy². */
export interface PredictionGroup {
  prediction: number;
  rows: number;
  sumY: number;
  sumY2: number;
}

/**
 * Coefficient of determination R² = 1 − SSE/SST from groups of rows sharing one prediction,
 * SSE = Σ(sumY2 − 2·pred·sumY + rows·pred²), SST from the totals (Kvålseth 1985, R²₁).
 * The formula lives in {@link RSquaredAccumulator}; this is its one-call form.
 *
 * Edge cases: no rows, or a constant target (SST = 0) → null. Can be negative.
 * @throws RangeError for non-finite inputs or negative counts.
 */
export function rSquaredFromGroups(groups: readonly PredictionGroup[]): number | null {
  const accumulator = new RSquaredAccumulator();
  for (const g of groups) accumulator.add(g.prediction, g.rows, g.sumY, g.sumY2);
  return accumulator.result().rSquared;
}
