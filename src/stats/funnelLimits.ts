/**
 * Half-width of a funnel-plot control limit at n rows (Spiegelhalter 2005, "Funnel plots for
 * comparing institutional performance", Statistics in Medicine 24:1185–1202, normal
 * approximation): z·√(p₀(1−p₀))/√n for a proportion p₀, or z·sd/√n for a mean when `sd` is given.
 * z = 1.959964 gives 95 % limits, z = 3.090232 gives 99.8 %.
 *
 * Edge cases: p₀ = 0 or 1 → 0 (the approximation breaks down near the edges; exact binomial
 * limits are wider). Non-integer n is accepted.
 * @throws RangeError when n ≤ 0, z < 0, sd < 0, a proportion p₀ is outside [0, 1], or any input
 *   is not finite.
 */
export function funnelHalfWidth(p0: number, n: number, z: number, sd?: number): number {
  if (sd === undefined ? !(p0 >= 0 && p0 <= 1) : !Number.isFinite(p0)) {
    throw new RangeError(`funnelLimits: p0 must be ${sd === undefined ? "in [0, 1]" : "finite"}, got ${p0}`);
  }
  if (!(n > 0 && Number.isFinite(n))) throw new RangeError(`funnelLimits: n must be finite and > 0, got ${n}`);
  if (!(z >= 0 && Number.isFinite(z))) throw new RangeError(`funnelLimits: z must be finite and >= 0, got ${z}`);
  if (sd !== undefined && !(sd >= 0 && Number.isFinite(sd))) throw new RangeError(`funnelLimits: sd must be finite and >= 0, got ${sd}`);
  const spread = sd === undefined ? Math.sqrt(p0 * (1 - p0)) : sd;
  return (z * spread) / Math.sqrt(n);
}

/**
 * Funnel-plot control limits p₀ ± {@link funnelHalfWidth} (Spiegelhalter 2005). A proportion's
 * limits are clamped to [0, 1]; a mean's (with `sd`) are not.
 * @throws RangeError as {@link funnelHalfWidth}.
 */
export function funnelLimits(p0: number, n: number, z: number, sd?: number): { low: number; high: number } {
  const half = funnelHalfWidth(p0, n, z, sd);
  if (sd !== undefined) return { low: p0 - half, high: p0 + half };
  return { low: Math.max(0, p0 - half), high: Math.min(1, p0 + half) };
}
