import { checkHashingInputs } from "./checkHashingInputs.js";

/**
 * Expected number of distinct buckets used when n distinct levels are hashed uniformly into w
 * buckets: w·(1 − (1 − 1/w)ⁿ) (occupancy problem, Feller 1968, An Introduction to Probability
 * Theory and Its Applications I, §II.11 — memory). Computed stably as −w·expm1(n·log1p(−1/w)).
 *
 * Edge cases: n = 0 → 0; w = 1 → 1 for any n > 0. A fractional n (an estimated level count)
 * is accepted.
 * @throws RangeError for negative or non-finite levels, or a width that is not a whole number >= 1.
 */
export function expectedBucketsUsed(levels: number, width: number): number {
  checkHashingInputs(levels, width, "expectedBucketsUsed");
  if (levels === 0) return 0;
  if (width === 1) return 1;
  return -width * Math.expm1(levels * Math.log1p(-1 / width));
}
