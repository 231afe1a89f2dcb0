import type { CountOfCounts } from "./types.js";
import { normaliseCountOfCounts } from "./normaliseCountOfCounts.js";

/**
 * Inverse Simpson index 1/Σp², the Hill number of order 2 (Jost 2006, Oikos 113:363–375; Simpson
 * 1949): the effective number of levels when common levels count more. From a count-of-counts
 * table, Σp² = Σ levels·(c/N)². k equal levels give exactly k; it never exceeds the order-1
 * number {@link effectiveLevels}.
 *
 * Edge cases: empty table → 0 (no levels), as for {@link effectiveLevels}; a single level → 1.
 * @throws RangeError for negative or non-finite entries.
 */
export function inverseSimpson(coc: readonly CountOfCounts[]): number {
  const rows = normaliseCountOfCounts(coc);
  let total = 0;
  for (const { count, levels } of rows) total += count * levels;
  if (total === 0) return 0;
  let sumSquares = 0;
  for (const { count, levels } of rows) {
    const p = count / total;
    sumSquares += levels * p * p;
  }
  return 1 / sumSquares;
}
