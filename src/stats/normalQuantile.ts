import { invertConvexTail } from "./invertConvexTail.js";
import { regularizedIncompleteGamma } from "./regularizedIncompleteGamma.js";

/** Upper tail of the standard normal for z ≥ 0: ½·erfc(z/√2) = ½·Q(½, z²/2) (A&S 26.2.29, 6.5.17). */
export function normalUpperTail(z: number): number {
  return 0.5 * regularizedIncompleteGamma(0.5, (z * z) / 2).upper;
}

/** Rough normal quantile for upper tail 0 < q ≤ ½, Abramowitz & Stegun 26.2.23 (|error| < 4.5e-4). */
export function roughNormalQuantile(q: number): number {
  const s = Math.sqrt(-2 * Math.log(q));
  return s - (2.515517 + 0.802853 * s + 0.010328 * s * s) / (1 + 1.432788 * s + 0.189269 * s * s + 0.001308 * s ** 3);
}

/**
 * Quantile Φ⁻¹(p) of the standard normal distribution. The tail is computed from the regularised
 * incomplete gamma function (Abramowitz & Stegun 1964, 26.2.29 with 6.5.17) and inverted by
 * Newton's method ({@link invertConvexTail}) from the A&S 26.2.23 starting value. Relative
 * accuracy about 1e-14.
 *
 * Edge cases: p = ½ → 0; p = 0 → −Infinity; p = 1 → +Infinity.
 * @throws RangeError when p is outside [0, 1].
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`normalQuantile: p must be in [0, 1], got ${p}`);
  if (p === 0.5) return 0;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  const q = p < 0.5 ? p : 1 - p;
  const density = (z: number): number => Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
  const z = invertConvexTail(q, normalUpperTail, density, roughNormalQuantile(q));
  return p < 0.5 ? -z : z;
}
