import type { CountOfCounts } from "./types.js";
import { normaliseCountOfCounts } from "./normaliseCountOfCounts.js";

/**
 * For each share s, the minimum number of levels, taken most frequent first, whose rows add up to
 * at least s·N. Exact from a count-of-counts table: inside one bucket of levels with `count` rows
 * each, it takes ceil(remaining rows / count) of them. (A direct definition; common practice
 * in profiling "how many levels cover 90 % of rows".)
 *
 * Edge cases: s = 0 → 0 levels; no rows → 0 levels for every share. A relative tolerance of
 * 1e-12 absorbs floating-point noise in s·N (so 0.3 of 10 rows needs 3 rows, not 4).
 * @throws RangeError for a share outside [0, 1] or a bad table.
 */
export function coverageLevels(
  coc: readonly CountOfCounts[],
  shares: readonly number[],
): { share: number; levels: number }[] {
  const rows = normaliseCountOfCounts(coc);
  let total = 0;
  for (const { count, levels } of rows) total += count * levels;
  return shares.map((share) => {
    if (!(share >= 0 && share <= 1)) throw new RangeError(`coverageLevels: share must be in [0, 1], got ${share}`);
    const target = share * total * (1 - 1e-12);
    let covered = 0;
    let used = 0;
    for (const { count, levels } of rows) {
      if (covered >= target) break;
      const bucketRows = count * levels;
      if (covered + bucketRows >= target) {
        used += Math.min(levels, Math.ceil((target - covered) / count));
        covered = target;
        break;
      }
      covered += bucketRows;
      used += levels;
    }
    return { share, levels: used };
  });
}
