import { logGamma } from "./logGamma.js";

const EPS = 1e-16;
const TINY = 1e-300;
const MAX_ITERATIONS = 100_000;

/**
 * Regularised incomplete gamma functions P(a, x) (lower) and Q(a, x) = 1 − P (upper), by the
 * series for x < a + 1 and the continued fraction (modified Lentz) otherwise, as in Press et al.,
 * Numerical Recipes (3rd ed., 2007) §6.2. Each branch computes the smaller-error side directly.
 *
 * Edge cases: x = 0 → { lower: 0, upper: 1 }; x = Infinity → { lower: 1, upper: 0 }.
 * @throws RangeError when a is not finite and > 0 or x < 0; Error if a loop fails to converge.
 */
export function regularizedIncompleteGamma(a: number, x: number): { lower: number; upper: number } {
  if (!(a > 0 && Number.isFinite(a))) throw new RangeError(`regularizedIncompleteGamma: a must be finite and > 0, got ${a}`);
  if (!(x >= 0)) throw new RangeError(`regularizedIncompleteGamma: x must be >= 0, got ${x}`);
  if (x === 0) return { lower: 0, upper: 1 };
  if (x === Infinity) return { lower: 1, upper: 0 };
  const front = Math.exp(-x + a * Math.log(x) - logGamma(a));
  if (x < a + 1) {
    let term = 1 / a;
    let sum = term;
    for (let n = 1; n <= MAX_ITERATIONS; n++) {
      term *= x / (a + n);
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * EPS) {
        const lower = front * sum;
        return { lower, upper: 1 - lower };
      }
    }
  } else {
    let b = x + 1 - a;
    let c = 1 / TINY;
    let d = 1 / b;
    let h = d;
    for (let i = 1; i <= MAX_ITERATIONS; i++) {
      const an = -i * (i - a);
      b += 2;
      d = an * d + b;
      d = 1 / (Math.abs(d) < TINY ? TINY : d);
      c = b + an / c;
      if (Math.abs(c) < TINY) c = TINY;
      const delta = d * c;
      h *= delta;
      if (Math.abs(delta - 1) < EPS) {
        const upper = front * h;
        return { lower: 1 - upper, upper };
      }
    }
  }
  throw new Error(`regularizedIncompleteGamma: did not converge (a=${a}, x=${x})`);
}
