/**
 * Streaming coefficient of determination R² = 1 − SSE/SST from groups of rows that share one
 * prediction (e.g. one encoded level), using only per-group sums as SQL computes them:
 * SSE = Σ(sumY2 − 2·pred·sumY + rows·pred²), SST = ΣΣy² − (ΣΣy)²/N (the usual definition, e.g.
 * Kvålseth 1985, The American Statistician 39:279–285, form R²₁). Groups may come in any order.
 *
 * Edge cases: result() gives rSquared null when there are no rows or SST is 0 — taken as
 * SST ≤ 1e-12·ΣΣy², so that round-off on a constant target does not produce a huge ratio.
 * R² can be negative (predictions worse than the mean). SSE round-off below 0 is set to 0.
 */
export class RSquaredAccumulator {
  private rows = 0;
  private sumY = 0;
  private sumY2 = 0;
  private sse = 0;

  /**
   * Adds a group of `rows` rows, all predicted `prediction`, with Σy = `sumY` and Σy² = `sumY2`.
   * @throws RangeError for non-finite inputs, negative rows or negative sumY2.
   */
  add(prediction: number, rows: number, sumY: number, sumY2: number): void {
    if (![prediction, rows, sumY, sumY2].every(Number.isFinite) || rows < 0 || sumY2 < 0) {
      throw new RangeError(`RSquaredAccumulator: bad group (prediction=${prediction}, rows=${rows}, sumY=${sumY}, sumY2=${sumY2})`);
    }
    this.rows += rows;
    this.sumY += sumY;
    this.sumY2 += sumY2;
    this.sse += Math.max(0, sumY2 - 2 * prediction * sumY + rows * prediction * prediction);
  }

  /** R² so far and the number of rows; does not end the stream. */
  result(): { rSquared: number | null; rows: number } {
    if (this.rows === 0) return { rSquared: null, rows: 0 };
    const sst = this.sumY2 - (this.sumY * this.sumY) / this.rows;
    if (sst <= 1e-12 * this.sumY2) return { rSquared: null, rows: this.rows };
    return { rSquared: 1 - this.sse / sst, rows: this.rows };
  }
}
