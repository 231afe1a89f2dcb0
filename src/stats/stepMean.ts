/**
 * stats/stepMean: the mean of per-step figures of a rolling-origin evaluation (fit on the blocks
 * before, score the next; Tashman 2000, International Journal of Forecasting 16(4):437–450 —
 * docs/references.md "Rolling-origin evaluation") with its standard error s/√n, s the sample
 * standard deviation (n − 1 in the denominator), the usual standard error of a mean.
 *
 * Edge cases: no steps → null; one step → se null (no spread to measure). Non-finite values throw.
 */
export function stepMean(values: readonly number[]): { mean: number; se: number | null; last: number } | null {
  for (const v of values) if (!Number.isFinite(v)) throw new RangeError(`stepMean: non-finite step value ${v}`);
  const n = values.length;
  if (n === 0) return null;
  const mean = values.reduce((s, x) => s + x, 0) / n;
  const last = values[n - 1]!;
  if (n < 2) return { mean, se: null, last };
  const variance = values.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1);
  return { mean, se: Math.sqrt(variance / n), last };
}
