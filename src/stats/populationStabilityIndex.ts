import { normaliseShares } from "./normaliseShares.js";

/** Shares with zero bins raised to epsilon, then renormalised to sum to 1. */
function floorShares(values: readonly number[], epsilon: number, what: string): number[] {
  const shares = normaliseShares(values, what);
  return normaliseShares(shares.map((s) => (s === 0 ? epsilon : s)), what);
}

/**
 * Population stability index PSI = Σ(aᵢ − eᵢ)·ln(aᵢ/eᵢ), the symmetric Kullback–Leibler
 * divergence KL(a‖e) + KL(e‖a) between the actual (new) and expected (reference) distribution
 * over the same bins (Kullback & Leibler 1951; its use as "PSI" in model monitoring is common
 * practice). Inputs may be shares or counts: each is normalised to sum to 1. A bin where a share
 * is 0 gets `epsilon` and the shares are renormalised, so the index stays finite (common
 * practice). Every term is ≥ 0, so PSI ≥ 0; identical inputs give exactly 0.
 * Bands of < 0.10 / 0.10–0.25 / > 0.25 are a rule of thumb (common practice), not a test.
 *
 * @throws RangeError for unequal lengths, empty or all-zero inputs, negative entries, or
 *   epsilon not in (0, 1).
 */
export function populationStabilityIndex(
  actual: readonly number[],
  expected: readonly number[],
  epsilon = 1e-4,
): number {
  if (actual.length !== expected.length) {
    throw new RangeError(`populationStabilityIndex: bin counts differ (${actual.length} vs ${expected.length})`);
  }
  if (!(epsilon > 0 && epsilon < 1)) throw new RangeError(`populationStabilityIndex: epsilon must be in (0, 1), got ${epsilon}`);
  const a = floorShares(actual, epsilon, "populationStabilityIndex");
  const e = floorShares(expected, epsilon, "populationStabilityIndex");
  let psi = 0;
  for (let i = 0; i < a.length; i++) {
    const ai = a[i] ?? 0;
    const ei = e[i] ?? 0;
    psi += (ai - ei) * Math.log(ai / ei);
  }
  return psi;
}
