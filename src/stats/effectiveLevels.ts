import type { CountOfCounts } from "./types.js";
import { entropyNats } from "./entropyNats.js";
import { summariseCountOfCounts } from "./summariseCountOfCounts.js";

/**
 * Effective number of levels: the Hill number of order 1, exp(H) with H the Shannon entropy in
 * nats (Jost 2006, "Entropy and diversity", Oikos 113:363–375). It is the number of equally common
 * levels that would have the same entropy: k levels of equal size give exactly k.
 *
 * Edge cases: empty table → 0 (there are no levels; chosen so that "no data" does not read as one
 * level); a single level → 1.
 * @throws RangeError for negative or non-finite entries.
 */
export function effectiveLevels(coc: readonly CountOfCounts[]): number {
  if (summariseCountOfCounts(coc).rows === 0) return 0;
  return Math.exp(entropyNats(coc));
}
