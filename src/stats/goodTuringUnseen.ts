import type { CountOfCounts } from "./types.js";
import { summariseCountOfCounts } from "./summariseCountOfCounts.js";

/**
 * Good–Turing estimate of the probability that the next row carries a level never seen so far:
 * n₁/N, the share of rows that belong to levels seen exactly once (Good 1953, "The population
 * frequencies of species and the estimation of population parameters", Biometrika 40:237–264).
 * One minus it is the estimated sample coverage.
 *
 * Edge cases: no rows → null (nothing to estimate from). No singletons → 0. Every level seen
 * once (e.g. an identifier column) → 1.
 * @throws RangeError for negative or non-finite entries.
 */
export function goodTuringUnseen(coc: readonly CountOfCounts[]): number | null {
  const { rows, singletons } = summariseCountOfCounts(coc);
  if (rows === 0) return null;
  return singletons / rows;
}
