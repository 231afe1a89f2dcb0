/**
 * Wilson score interval for a binomial proportion, without continuity correction
 * (Wilson 1927, JASA 22:209–212; method 3 of Newcombe 1998, Statistics in Medicine 17:857–872):
 * centre = (p̂ + z²/2n)/(1 + z²/n), half = z·√(p̂(1−p̂)/n + z²/4n²)/(1 + z²/n).
 *
 * Edge cases: n = 0 → null (no data). 0 successes → low is exactly 0; n successes → high is
 * exactly 1; bounds are clamped to [0, 1] against round-off. Non-integer counts (weighted rows)
 * are accepted.
 * @param z Standard normal quantile; default 1.959964 (two-sided 95 %).
 * @throws RangeError when n < 0, successes < 0, successes > n, z < 0 or any input is not finite.
 */
export function wilsonInterval(
  successes: number,
  n: number,
  z = 1.959964,
): { low: number; high: number; centre: number } | null {
  if (!Number.isFinite(n) || n < 0) throw new RangeError(`wilsonInterval: n must be >= 0, got ${n}`);
  if (!Number.isFinite(successes) || successes < 0 || successes > n) {
    throw new RangeError(`wilsonInterval: successes must be in [0, n=${n}], got ${successes}`);
  }
  if (!Number.isFinite(z) || z < 0) throw new RangeError(`wilsonInterval: z must be >= 0, got ${z}`);
  if (n === 0) return null;
  const p = successes / n;
  const z2 = z * z;
  const denominator = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denominator;
  const half = (z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n))) / denominator;
  const low = successes === 0 ? 0 : Math.max(0, centre - half);
  const high = successes === n ? 1 : Math.min(1, centre + half);
  // Round-off must never push a bound past the point estimate it is meant to contain.
  return { low: Math.min(low, p), high: Math.max(high, p), centre };
}
