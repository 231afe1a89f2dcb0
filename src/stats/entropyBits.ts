import type { CountOfCounts } from "./types.js";
import { entropyNats } from "./entropyNats.js";

/**
 * Shannon entropy in bits (base 2) of the distribution of rows over levels, from a
 * count-of-counts table: H₂ = H_nats / ln 2 (Shannon 1948). A column whose rows are spread
 * evenly over k levels has log₂ k bits.
 *
 * Edge cases: empty table → 0 (as {@link entropyNats}); a single level → 0.
 * @throws RangeError for negative or non-finite entries.
 */
export function entropyBits(coc: readonly CountOfCounts[]): number {
  return entropyNats(coc) / Math.LN2;
}
