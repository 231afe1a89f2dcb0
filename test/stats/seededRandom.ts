/** Deterministic pseudo-random numbers for tests: mulberry32 (common practice), shared helper. */
export { mulberry32 as seededRandom } from "../helpers/tmp.js";

/** A whole number in [low, high] from `random`. */
export function randomInt(random: () => number, low: number, high: number): number {
  return low + Math.floor(random() * (high - low + 1));
}
