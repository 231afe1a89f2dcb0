/**
 * Funnel-plot control limits for a proportion, normal approximation:
 * p₀ ± z·√(p₀(1−p₀)/n) (Spiegelhalter 2005, "Funnel plots for comparing institutional
 * performance", Statistics in Medicine 24:1185–1202), clamped to [0, 1]. z = 1.959964 gives
 * 95 % limits, z = 3.090232 gives 99.8 %.
 *
 * Edge cases: p₀ = 0 or 1 → zero-width limits at p₀ (the approximation breaks down near the
 * edges; exact binomial limits are wider). Non-integer n is accepted.
 * @throws RangeError when p₀ is outside [0, 1], n ≤ 0, or z < 0 or any input is not finite.
 */
export function funnelLimits(p0: number, n: number, z: number): { low: number; high: number } {
  if (!(p0 >= 0 && p0 <= 1)) throw new RangeError(`funnelLimits: p0 must be in [0, 1], got ${p0}`);
  if (!(n > 0 && Number.isFinite(n))) throw new RangeError(`funnelLimits: n must be finite and > 0, got ${n}`);
  if (!(z >= 0 && Number.isFinite(z))) throw new RangeError(`funnelLimits: z must be finite and >= 0, got ${z}`);
  const half = z * Math.sqrt((p0 * (1 - p0)) / n);
  return { low: Math.max(0, p0 - half), high: Math.min(1, p0 + half) };
}
