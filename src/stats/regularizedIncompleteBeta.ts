import { logBeta } from "./logBeta.js";

const EPS = 1e-16;
const TINY = 1e-300;
const MAX_ITERATIONS = 200_000;

/** Continued fraction for I_x(a, b), modified Lentz method (Press et al., Numerical Recipes §6.4). */
function betaContinuedFraction(x: number, a: number, b: number): number {
  const guard = (v: number): number => (Math.abs(v) < TINY ? TINY : v);
  let c = 1;
  let d = 1 / guard(1 - ((a + b) * x) / (a + 1));
  let h = d;
  for (let m = 1; m <= MAX_ITERATIONS; m++) {
    const m2 = 2 * m;
    const even = (m * (b - m) * x) / ((a - 1 + m2) * (a + m2));
    d = 1 / guard(1 + even * d);
    c = guard(1 + even / c);
    h *= d * c;
    const odd = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + 1 + m2));
    d = 1 / guard(1 + odd * d);
    c = guard(1 + odd / c);
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPS) return h;
  }
  throw new Error(`regularizedIncompleteBeta: continued fraction did not converge (a=${a}, b=${b}, x=${x})`);
}

/**
 * Regularised incomplete beta function I_x(a, b) and its complement 1 − I_x(a, b), by the
 * continued fraction of Press, Teukolsky, Vetterling & Flannery, Numerical Recipes (3rd ed.,
 * 2007) §6.4, evaluated with the modified Lentz method, switching to the symmetry
 * I_x(a, b) = 1 − I_{1−x}(b, a) where that converges faster. `y` = 1 − x may be passed
 * explicitly so that a tail near x = 1 keeps its precision.
 *
 * Edge cases: x = 0 → { lower: 0, upper: 1 }; x = 1 → { lower: 1, upper: 0 }.
 * @throws RangeError when a ≤ 0, b ≤ 0 or x is outside [0, 1].
 */
export function regularizedIncompleteBeta(
  x: number,
  a: number,
  b: number,
  y: number = 1 - x,
): { lower: number; upper: number } {
  if (!(a > 0 && b > 0 && Number.isFinite(a) && Number.isFinite(b))) {
    throw new RangeError(`regularizedIncompleteBeta: a and b must be finite and > 0, got a=${a}, b=${b}`);
  }
  if (!(x >= 0 && x <= 1 && y >= 0 && y <= 1)) throw new RangeError(`regularizedIncompleteBeta: x must be in [0, 1], got ${x}`);
  if (x === 0) return { lower: 0, upper: 1 };
  if (y === 0) return { lower: 1, upper: 0 };
  const logX = x > 0.5 ? Math.log1p(-y) : Math.log(x);
  const logY = y > 0.5 ? Math.log1p(-x) : Math.log(y);
  const front = Math.exp(a * logX + b * logY - logBeta(a, b));
  if (x < (a + 1) / (a + b + 2)) {
    const lower = (front * betaContinuedFraction(x, a, b)) / a;
    return { lower, upper: 1 - lower };
  }
  const upper = (front * betaContinuedFraction(y, b, a)) / b;
  return { lower: 1 - upper, upper };
}
