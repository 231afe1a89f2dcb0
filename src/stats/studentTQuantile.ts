import { invertConvexTail } from "./invertConvexTail.js";
import { logBeta } from "./logBeta.js";
import { normalQuantile, roughNormalQuantile } from "./normalQuantile.js";
import { regularizedIncompleteBeta } from "./regularizedIncompleteBeta.js";

/** Above this df the Cornish–Fisher series is exact to double precision and the beta route is slow. */
const LARGE_DF = 1e4;

/** t quantile from the normal quantile z: A&S 26.7.5 (Cornish–Fisher), terms to ν⁻⁴. */
function cornishFisher(z: number, df: number): number {
  const g1 = (z ** 3 + z) / 4;
  const g2 = (5 * z ** 5 + 16 * z ** 3 + 3 * z) / 96;
  const g3 = (3 * z ** 7 + 19 * z ** 5 + 17 * z ** 3 - 15 * z) / 384;
  const g4 = (79 * z ** 9 + 776 * z ** 7 + 1482 * z ** 5 - 1920 * z ** 3 - 945 * z) / 92160;
  return z + g1 / df + g2 / df ** 2 + g3 / df ** 3 + g4 / df ** 4;
}

/**
 * Quantile (inverse CDF) of Student's t distribution with `df` degrees of freedom: the t with
 * P(T ≤ t) = p. For df ≤ 10⁴ the upper tail ½·I_{ν/(ν+t²)}(ν/2, ½) (Abramowitz & Stegun 1964,
 * 26.7.1 with 26.5.27) is computed from the regularised incomplete beta function and inverted by
 * Newton's method; for larger df the Cornish–Fisher expansion about the normal quantile
 * (A&S 26.7.5, four terms; truncation error below 1e-14 there) is used. Accuracy about 1e-10
 * relative or better.
 *
 * Edge cases: p = 0.5 → 0; p = 0 → −Infinity; p = 1 → +Infinity. Non-integer df is allowed.
 * @throws RangeError when p is outside [0, 1] or df is not finite and > 0.
 */
export function studentTQuantile(p: number, df: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`studentTQuantile: p must be in [0, 1], got ${p}`);
  if (!(df > 0 && Number.isFinite(df))) throw new RangeError(`studentTQuantile: df must be finite and > 0, got ${df}`);
  if (p === 0.5) return 0;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  if (df > LARGE_DF) return cornishFisher(normalQuantile(p), df);
  const q = p < 0.5 ? p : 1 - p;
  const tail = (t: number): number => {
    const r = (t * t) / df;
    return 0.5 * regularizedIncompleteBeta(1 / (1 + r), df / 2, 0.5, r / (1 + r)).lower;
  };
  // Density f(t) = (1 + t²/ν)^(−(ν+1)/2) / (√ν·B(ν/2, ½)).
  const logConstant = -0.5 * Math.log(df) - logBeta(df / 2, 0.5);
  const density = (t: number): number => Math.exp(logConstant - ((df + 1) / 2) * Math.log1p((t * t) / df));
  const t = invertConvexTail(q, tail, density, Math.max(0, cornishFisher(roughNormalQuantile(q), df)));
  return p < 0.5 ? -t : t;
}
