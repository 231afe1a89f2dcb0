import type { CountOfCounts } from "./types.js";
import { summariseCountOfCounts } from "./summariseCountOfCounts.js";

/**
 * Good–Turing unseen-level rate n₁/N (Good 1953) with a normal-approximation interval
 * rate ± z·√Var, using the variance estimate Var ≈ (n₁(1 − n₁/N) + 2·n₂)/N² of Esty (1983),
 * "A normal limit law for a nonparametric estimator of the coverage of a random sample",
 * Annals of Statistics 11:905–912 (citation details and variance formula from memory). Bounds are clamped to [0, 1].
 *
 * Edge cases: no rows → null. No singletons and no doubletons → rate 0 with a zero-width
 * interval [0, 0] (the normal approximation has nothing to work with; treat as optimistic).
 * @param z Standard normal quantile; default 1.959964 (two-sided 95 %).
 * @throws RangeError for negative or non-finite entries, or z < 0.
 */
export function goodTuringUnseenInterval(
  coc: readonly CountOfCounts[],
  z = 1.959964,
): { rate: number; low: number; high: number } | null {
  if (!Number.isFinite(z) || z < 0) throw new RangeError(`goodTuringUnseenInterval: z must be >= 0, got ${z}`);
  const { rows, singletons, doubletons } = summariseCountOfCounts(coc);
  if (rows === 0) return null;
  const rate = singletons / rows;
  const variance = Math.max(0, (singletons * (1 - rate) + 2 * doubletons) / (rows * rows));
  const half = z * Math.sqrt(variance);
  return { rate, low: Math.max(0, rate - half), high: Math.min(1, rate + half) };
}
