import { normaliseShares } from "./normaliseShares.js";

/**
 * Kullback–Leibler divergence KL(p‖q) = Σ pᵢ ln(pᵢ/qᵢ), in nats (Kullback & Leibler 1951).
 * As in SciPy's `scipy.stats.entropy(p, q)`, each input is first normalised to sum to 1
 * (counts are accepted). A bin with pᵢ = 0 contributes 0.
 *
 * Edge cases: pᵢ > 0 where qᵢ = 0 → Infinity (the divergence is infinite; not NaN).
 * @throws RangeError for unequal lengths, empty or all-zero inputs, or negative entries.
 */
export function klDivergence(p: readonly number[], q: readonly number[]): number {
  if (p.length !== q.length) throw new RangeError(`klDivergence: lengths differ (${p.length} vs ${q.length})`);
  const ps = normaliseShares(p, "klDivergence");
  const qs = normaliseShares(q, "klDivergence");
  let d = 0;
  for (let i = 0; i < ps.length; i++) {
    const a = ps[i] ?? 0;
    const b = qs[i] ?? 0;
    if (a === 0) continue;
    if (b === 0) return Infinity;
    d += a * Math.log(a / b);
  }
  return Math.max(0, d);
}
