import type { CountOfCounts } from "./types.js";
import { summariseCountOfCounts } from "./summariseCountOfCounts.js";

/**
 * Chao1 lower-bound estimate of the total number of levels, seen and unseen, in its classic form
 * S_obs + f₁²/(2f₂) (Chao 1984, "Nonparametric estimation of the number of classes in a
 * population", Scandinavian Journal of Statistics 11:265–270). This classic form is the one that
 * gives 14.5 on the R package fossil's documentation example; the bias-corrected form gives 11.5.
 *
 * Edge cases: when f₂ = 0 the classic form is undefined, so the bias-corrected form
 * S_obs + f₁(f₁−1)/2 is used (as {@link chao1BiasCorrected}). Empty table → 0.
 * @throws RangeError for negative or non-finite entries.
 */
export function chao1(coc: readonly CountOfCounts[]): number {
  const { distinct, singletons: f1, doubletons: f2 } = summariseCountOfCounts(coc);
  if (f2 === 0) return distinct + (f1 * (f1 - 1)) / 2;
  return distinct + (f1 * f1) / (2 * f2);
}
