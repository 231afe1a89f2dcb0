import type { CountOfCounts } from "./types.js";
import { normaliseCountOfCounts } from "./normaliseCountOfCounts.js";

/**
 * Shannon entropy, in nats, of the distribution of rows over levels, from a count-of-counts table:
 * H = −Σ levels·(c/N)·ln(c/N), with N = Σ count·levels (Shannon 1948). This is the plug-in
 * (maximum-likelihood) estimate; it is biased low when many levels are rare.
 *
 * Edge cases: empty table (no rows) → 0, by convention (no uncertainty to measure);
 * a single level → 0.
 * @throws RangeError for negative or non-finite entries.
 */
export function entropyNats(coc: readonly CountOfCounts[]): number {
  const rows = normaliseCountOfCounts(coc);
  let total = 0;
  for (const { count, levels } of rows) total += count * levels;
  if (total === 0) return 0;
  let h = 0;
  for (const { count, levels } of rows) {
    const p = count / total;
    h -= levels * p * Math.log(p);
  }
  // A single level gives −1·ln 1 = −0; report a clean 0 and never a tiny negative.
  return h > 0 ? h : 0;
}
