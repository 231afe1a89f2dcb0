import type { CountOfCounts } from "./types.js";
import { normaliseCountOfCounts } from "./normaliseCountOfCounts.js";

/** Totals read off a count-of-counts table. */
export interface CountOfCountsSummary {
  /** N = Σ count·levels, the number of rows. */
  rows: number;
  /** S_obs = Σ levels, the number of distinct levels seen. */
  distinct: number;
  /** f₁ (n₁): levels seen exactly once. */
  singletons: number;
  /** f₂ (n₂): levels seen exactly twice. */
  doubletons: number;
}

/**
 * Rows, distinct levels, singletons (f₁) and doubletons (f₂) of a count-of-counts
 * ("frequency of frequencies") table, the inputs of Good (1953) and Chao (1984).
 *
 * Edge cases: empty table → all zeros. Rows with the same count may repeat; they are added.
 * @throws RangeError for negative or non-finite entries.
 */
export function summariseCountOfCounts(coc: readonly CountOfCounts[]): CountOfCountsSummary {
  let rows = 0;
  let distinct = 0;
  let singletons = 0;
  let doubletons = 0;
  for (const { count, levels } of normaliseCountOfCounts(coc)) {
    rows += count * levels;
    distinct += levels;
    if (count === 1) singletons += levels;
    if (count === 2) doubletons += levels;
  }
  return { rows, distinct, singletons, doubletons };
}
