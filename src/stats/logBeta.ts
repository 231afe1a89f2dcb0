import { logGamma } from "./logGamma.js";

/** Stirling series coefficients B₂ₖ/(2k(2k−1)), k = 1..8 (Abramowitz & Stegun 6.1.40). */
const STIRLING = [1 / 12, -1 / 360, 1 / 1260, -1 / 1680, 1 / 1188, -691 / 360360, 1 / 156, -3617 / 122400] as const;

/**
 * ln Γ(x) − [(x − ½)ln x − x + ½ln 2π], the remainder of Stirling's formula, by its asymptotic
 * series (A&S 6.1.40); absolute error below 1e-16 for x ≥ 10.
 */
export function stirlingCorrection(x: number): number {
  const inverseSquare = 1 / (x * x);
  let sum = 0;
  let power = 1 / x;
  for (const c of STIRLING) {
    sum += c * power;
    power *= inverseSquare;
  }
  return sum;
}

/**
 * ln B(a, b) = ln Γ(a) + ln Γ(b) − ln Γ(a + b), for a, b > 0. When an argument is ≥ 10 the
 * large ln Γ terms are cancelled analytically using Stirling's series (the arrangement used by
 * R's `lbeta`, after Didonato & Morris 1992 — memory), so B(ν/2, ½) stays accurate for ν in the
 * billions, where the plain difference of ln Γ values would lose about 7 digits.
 *
 * @throws RangeError when a or b is not finite and > 0.
 */
export function logBeta(a: number, b: number): number {
  if (!(a > 0 && b > 0 && Number.isFinite(a) && Number.isFinite(b))) {
    throw new RangeError(`logBeta: a and b must be finite and > 0, got a=${a}, b=${b}`);
  }
  const p = Math.min(a, b);
  const q = Math.max(a, b);
  const ratio = p / (p + q);
  if (p >= 10) {
    const correction = stirlingCorrection(p) + stirlingCorrection(q) - stirlingCorrection(p + q);
    return -0.5 * Math.log(q) + 0.5 * Math.log(2 * Math.PI) + correction + (p - 0.5) * Math.log(ratio) + q * Math.log1p(-ratio);
  }
  if (q >= 10) {
    const correction = stirlingCorrection(q) - stirlingCorrection(p + q);
    return logGamma(p) + correction + p - p * Math.log(p + q) + (q - 0.5) * Math.log1p(-ratio);
  }
  return logGamma(p) + logGamma(q) - logGamma(p + q);
}
