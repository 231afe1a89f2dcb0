import type { CountOfCounts } from "./types.js";
import { summariseCountOfCounts } from "./summariseCountOfCounts.js";

/**
 * Bias-corrected Chao1 estimate of the total number of levels:
 * S_obs + f₁(f₁−1)/(2(f₂+1)) (Chao 1984; bias-corrected form after Chao 1987, Biometrics 43:783–791 —
 * memory). Always finite, never below S_obs.
 *
 * Edge cases: empty table → 0; no singletons → S_obs.
 * @throws RangeError for negative or non-finite entries.
 */
export function chao1BiasCorrected(coc: readonly CountOfCounts[]): number {
  const { distinct, singletons: f1, doubletons: f2 } = summariseCountOfCounts(coc);
  return distinct + (f1 * Math.max(0, f1 - 1)) / (2 * (f2 + 1));
}
