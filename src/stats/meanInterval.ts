import { studentTQuantile } from "./studentTQuantile.js";

/**
 * Confidence interval for a mean from running sums: mean ± t_{(1+c)/2, n−1}·s/√n, with the
 * sample variance s² = (Σy² − (Σy)²/n)/(n − 1) (the textbook t interval, e.g. NIST/SEMATECH
 * e-Handbook of Statistical Methods §7.2.2.1). The sums are what SQL computes per level; for
 * very large means with tiny spread the sums-of-squares form loses precision: a centred sum
 * of squares below 1e-12·Σy² (including negative round-off) is taken as 0.
 *
 * Edge cases: n < 2 → null (no variance estimate). All values equal → sd 0 and low = high = mean.
 * @param confidence Two-sided confidence level in (0, 1); default 0.95.
 * @throws RangeError for negative or non-finite inputs or a confidence outside (0, 1).
 */
export function meanInterval(
  n: number,
  sum: number,
  sumSquares: number,
  confidence = 0.95,
): { mean: number; low: number; high: number; sd: number } | null {
  if (!Number.isFinite(n) || n < 0) throw new RangeError(`meanInterval: n must be finite and >= 0, got ${n}`);
  if (!Number.isFinite(sum) || !Number.isFinite(sumSquares) || sumSquares < 0) {
    throw new RangeError(`meanInterval: sums must be finite (sumSquares >= 0), got sum=${sum}, sumSquares=${sumSquares}`);
  }
  if (!(confidence > 0 && confidence < 1)) {
    throw new RangeError(`meanInterval: confidence must be in (0, 1), got ${confidence}`);
  }
  if (n < 2) return null;
  const mean = sum / n;
  const centred = sumSquares - sum * mean;
  // Below 1e-12 of Σy² the difference is round-off, not spread: call it 0.
  const variance = centred <= 1e-12 * sumSquares ? 0 : centred / (n - 1);
  const sd = Math.sqrt(variance);
  const half = (studentTQuantile((1 + confidence) / 2, n - 1) * sd) / Math.sqrt(n);
  return { mean, low: mean - half, high: mean + half, sd };
}
