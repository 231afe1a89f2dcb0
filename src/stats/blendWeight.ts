/**
 * Blending weight of a level's own mean in smoothed target encoding,
 * λ(n) = 1/(1 + exp(−(n − k)/f)) (Micci-Barreca 2001, "A preprocessing scheme for
 * high-cardinality categorical attributes in classification and prediction problems", SIGKDD
 * Explorations 3(1):27–32 — formula from memory). The encoding is λ·ȳ_level + (1 − λ)·ȳ_all;
 * k is the row count at which both count equally (λ(k) = ½), f the steepness.
 *
 * Edge cases: n = 0 (unseen level) gives 1/(1 + e^{k/f}), not 0; callers wanting exactly the
 * prior for unseen levels must special-case it.
 * @throws RangeError when f ≤ 0 or any input is not finite, or n < 0.
 */
export function blendWeight(n: number, k: number, f: number): number {
  if (!Number.isFinite(n) || n < 0) throw new RangeError(`blendWeight: n must be finite and >= 0, got ${n}`);
  if (!Number.isFinite(k)) throw new RangeError(`blendWeight: k must be finite, got ${k}`);
  if (!Number.isFinite(f) || f <= 0) throw new RangeError(`blendWeight: f must be finite and > 0, got ${f}`);
  return 1 / (1 + Math.exp(-(n - k) / f));
}
