/**
 * Solves tail(x) = q for x ≥ 0 by Newton's method, where `tail` is a decreasing, convex upper
 * tail on x ≥ 0 (true of the normal and Student t tails, whose densities fall for x > 0) and
 * `density` = −tail′. By convexity the tangent never overshoots to the right, so from any start
 * the iterates reach the left of the root after one step and then rise to it monotonically
 * (a standard property of Newton's method on convex functions). Stops when the step falls below
 * 1e-14 relative, or below 1e-9 relative once round-off in `tail` stops it from shrinking.
 *
 * @throws Error when the density underflows (q too extreme) or 500 steps do not converge.
 */
export function invertConvexTail(
  q: number,
  tail: (x: number) => number,
  density: (x: number) => number,
  start: number,
): number {
  let x = Math.max(0, start);
  let previousStep = Infinity;
  for (let iteration = 0; iteration < 500; iteration++) {
    const step = (tail(x) - q) / density(x);
    if (!Number.isFinite(step)) break;
    const next = Math.max(0, x + step);
    const size = Math.abs(next - x);
    const scale = Math.max(1, x);
    if (size <= 1e-14 * scale || (size <= 1e-9 * scale && size >= previousStep)) return next;
    previousStep = size;
    x = next;
  }
  throw new Error(`invertConvexTail: Newton iteration failed for tail probability ${q}`);
}
