import type { CountOfCounts } from "./types.js";
import { normaliseCountOfCounts } from "./normaliseCountOfCounts.js";

/**
 * For each threshold t, the levels with AT MOST t rows (so t = 1 counts the singletons, t = 2
 * singletons and doubletons) and the share of all rows that those levels hold. A direct count
 * from the count-of-counts table (common practice: "rare" levels below a minimum row count).
 *
 * @returns one entry per threshold, in input order: `minRows` = t, `levels` = number of levels
 *   with count ≤ t, `rowShare` = their rows / N.
 * Edge cases: no rows → 0 levels and rowShare 0 for every threshold (documented convention).
 * @throws RangeError for a negative or non-finite threshold, or a bad table.
 */
export function rareLevels(
  coc: readonly CountOfCounts[],
  thresholds: readonly number[],
): { minRows: number; levels: number; rowShare: number }[] {
  const rows = normaliseCountOfCounts(coc);
  let total = 0;
  for (const { count, levels } of rows) total += count * levels;
  return thresholds.map((minRows) => {
    if (!(minRows >= 0) || !Number.isFinite(minRows)) {
      throw new RangeError(`rareLevels: threshold must be a finite number >= 0, got ${minRows}`);
    }
    let levels = 0;
    let rareRows = 0;
    for (const row of rows) {
      if (row.count <= minRows) {
        levels += row.levels;
        rareRows += row.count * row.levels;
      }
    }
    return { minRows, levels, rowShare: total === 0 ? 0 : rareRows / total };
  });
}
