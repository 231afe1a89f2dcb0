import type { CountOfCounts } from "./types.js";

/**
 * Checks a count-of-counts table and returns a clean copy: rows with `count` 0 or `levels` 0 are
 * dropped (a level with no rows does not exist), rows with the same `count` are merged, and the
 * result is sorted by `count`, most frequent first. The input is not mutated.
 *
 * Edge cases: an empty table gives `[]`.
 * @throws RangeError when a count or a number of levels is negative or not finite (misuse).
 */
export function normaliseCountOfCounts(coc: readonly CountOfCounts[]): CountOfCounts[] {
  const byCount = new Map<number, number>();
  for (const row of coc) {
    if (!Number.isFinite(row.count) || row.count < 0) {
      throw new RangeError(`count-of-counts: count must be a finite number >= 0, got ${row.count}`);
    }
    if (!Number.isFinite(row.levels) || row.levels < 0) {
      throw new RangeError(`count-of-counts: levels must be a finite number >= 0, got ${row.levels}`);
    }
    if (row.count === 0 || row.levels === 0) continue;
    byCount.set(row.count, (byCount.get(row.count) ?? 0) + row.levels);
  }
  return [...byCount.entries()]
    .map(([count, levels]) => ({ count, levels }))
    .sort((a, b) => b.count - a.count);
}
