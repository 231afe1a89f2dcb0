import { checkHashingInputs } from "./checkHashingInputs.js";

/**
 * Probability that at least two of n distinct levels land in the same one of w uniform hash
 * buckets: 1 − Π_{i<n}(1 − i/w), the birthday problem (von Mises 1939; Feller 1968 §II.3 —
 * memory). Exact product, accumulated as a sum of log1p terms and finished with expm1 so that
 * tiny probabilities keep their precision. O(n) time.
 *
 * Edge cases: n ≤ 1 → 0; n > w → 1 (pigeonhole).
 * @throws RangeError for non-integer or negative n, or width < 1.
 */
export function birthdayCollisionProbability(n: number, width: number): number {
  checkHashingInputs(n, width, "birthdayCollisionProbability", true);
  if (n <= 1) return 0;
  if (n > width) return 1;
  let logNoCollision = 0;
  for (let i = 1; i < n; i++) logNoCollision += Math.log1p(-i / width);
  return -Math.expm1(logNoCollision);
}
