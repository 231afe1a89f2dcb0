import { expectedBucketsUsed } from "./expectedBucketsUsed.js";

/**
 * Expected number of levels that lose their own bucket when n distinct levels are hashed
 * uniformly into w buckets: n − w·(1 − (1 − 1/w)ⁿ), i.e. levels minus expected buckets used
 * (occupancy problem, as {@link expectedBucketsUsed}). It counts "extra" levels per shared
 * bucket; a bucket shared by 3 levels adds 2.
 *
 * Edge cases: n = 0 → 0; never negative (round-off is clamped).
 * @throws RangeError for negative or non-finite levels, or a width that is not a whole number >= 1.
 */
export function expectedCollidingLevels(levels: number, width: number): number {
  return Math.max(0, levels - expectedBucketsUsed(levels, width));
}
