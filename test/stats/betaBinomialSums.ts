import type { BetaBinomialSums } from "../../src/stats/index.js";

/**
 * Test helper: builds the sums that betaBinomialPriorWeight takes from a list of levels, each with its
 * row count nᵢ and positive count yᵢ — the same sums the engine computes in SQL. Levels with
 * zero rows are skipped (they carry no information and would divide by zero).
 *
 * Edge cases: empty list → all sums 0.
 * @throws RangeError for negative or non-finite counts, or positives > rows.
 */
export function betaBinomialSums(levels: readonly { rows: number; positives: number }[]): BetaBinomialSums {
  const sums: BetaBinomialSums = { levels: 0, rows: 0, positives: 0, sumPositivesSqOverRows: 0, sumRowsSq: 0 };
  for (const { rows, positives } of levels) {
    if (!Number.isFinite(rows) || !Number.isFinite(positives) || rows < 0 || positives < 0 || positives > rows) {
      throw new RangeError(`betaBinomialSums: need 0 <= positives <= rows, got ${positives}/${rows}`);
    }
    if (rows === 0) continue;
    sums.levels += 1;
    sums.rows += rows;
    sums.positives += positives;
    sums.sumPositivesSqOverRows += (positives * positives) / rows;
    sums.sumRowsSq += rows * rows;
  }
  return sums;
}
