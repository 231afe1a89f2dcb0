import { logGamma } from "./logGamma.js";
import { regularizedIncompleteBeta } from "./regularizedIncompleteBeta.js";

/** Upper tail P(T > t) for t ≥ 0: ½·I_{ν/(ν+t²)}(ν/2, ½) (Abramowitz & Stegun 26.7.1, 26.5.27). */
function upperTail(t: number, df: number): number {
  const r = (t * t) / df;
  return 0.5 * regularizedIncompleteBeta(1 / (1 + r), df / 2, 0.5, r / (1 + r)).lower;
}

/** Starting point: normal quantile (A&S 26.2.23) with the Cornish–Fisher t correction (A&S 26.7.5). */
function startingPoint(q: number, df: number): number {
  const s = Math.sqrt(-2 * Math.log(q));
  const z = s - (2.515517 + 0.802853 * s + 0.010328 * s * s) / (1 + 1.432788 * s + 0.189269 * s * s + 0.001308 * s ** 3);
  return z + (z ** 3 + z) / (4 * df) + (5 * z ** 5 + 16 * z ** 3 + 3 * z) / (96 * df * df);
}

/**
 * Quantile (inverse CDF) of Student's t distribution with `df` degrees of freedom: the t with
 * P(T ≤ t) = p. The tail is computed exactly from the regularised incomplete beta function
 * (Abramowitz & Stegun 1964, 26.7.1) and inverted by Newton's method. The upper tail is convex
 * for t > 0, so after the first step Newton's iterates approach the root from below and cannot
 * overshoot. Accuracy is about 1e-12 relative for moderate df.
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
  const q = p < 0.5 ? p : 1 - p;
  const logDensityConstant = logGamma((df + 1) / 2) - logGamma(df / 2) - 0.5 * Math.log(df * Math.PI);
  let t = Math.max(0, startingPoint(q, df));
  for (let iteration = 0; iteration < 500; iteration++) {
    const density = Math.exp(logDensityConstant - ((df + 1) / 2) * Math.log1p((t * t) / df));
    const step = (upperTail(t, df) - q) / density;
    if (!Number.isFinite(step)) break; // density underflow: p too extreme for this method
    const next = Math.max(0, t + step);
    if (Math.abs(next - t) <= 1e-14 * Math.max(1, t)) return p < 0.5 ? -next : next;
    t = next;
  }
  throw new Error(`studentTQuantile: Newton iteration failed (p=${p}, df=${df})`);
}
