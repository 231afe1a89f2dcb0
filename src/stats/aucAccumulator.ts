/**
 * Streaming form of {@link aucFromGroups}: feed score groups in ascending score order (as an
 * ORDER BY query returns them) and read the Mann–Whitney AUC, ties counted one half (Mann &
 * Whitney 1947; Hanley & McNeil 1982). Consecutive groups with an equal score are merged.
 * Memory is O(1).
 *
 * Edge cases: result() gives auc null until there is at least one positive and one negative.
 */
export class AucAccumulator {
  private pairs = 0;
  private negativesBelow = 0;
  private positivesBefore = 0;
  private currentScore = -Infinity;
  private currentPositives = 0;
  private currentNegatives = 0;

  /**
   * Adds a group of rows that share `score`.
   * @throws RangeError when `score` is lower than the previous one, not finite, or a count is
   *   negative or not finite.
   */
  add(score: number, positives: number, negatives: number): void {
    if (!Number.isFinite(score)) throw new RangeError(`AucAccumulator: score must be finite, got ${score}`);
    if (!(positives >= 0 && negatives >= 0 && Number.isFinite(positives) && Number.isFinite(negatives))) {
      throw new RangeError(`AucAccumulator: counts must be finite and >= 0, got ${positives}/${negatives}`);
    }
    if (score < this.currentScore) {
      throw new RangeError(`AucAccumulator: scores must come in ascending order, got ${score} after ${this.currentScore}`);
    }
    if (score > this.currentScore) {
      this.flush();
      this.currentScore = score;
    }
    this.currentPositives += positives;
    this.currentNegatives += negatives;
  }

  /** AUC so far with the positive and negative row counts; does not end the stream. */
  result(): { auc: number | null; positives: number; negatives: number } {
    const pairs = this.pairs + this.currentPositives * (this.negativesBelow + this.currentNegatives / 2);
    const positives = this.positivesBefore + this.currentPositives;
    const negatives = this.negativesBelow + this.currentNegatives;
    const auc = positives === 0 || negatives === 0 ? null : pairs / (positives * negatives);
    return { auc, positives, negatives };
  }

  private flush(): void {
    this.pairs += this.currentPositives * (this.negativesBelow + this.currentNegatives / 2);
    this.negativesBelow += this.currentNegatives;
    this.positivesBefore += this.currentPositives;
    this.currentPositives = 0;
    this.currentNegatives = 0;
  }
}
