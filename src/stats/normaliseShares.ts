/**
 * Normalises non-negative weights (shares or counts) to shares that sum to 1. `what` names the
 * caller in error messages. The input is not mutated.
 *
 * Edge cases: an empty list or all zeros has no distribution → RangeError (misuse).
 * @throws RangeError for negative or non-finite entries, or a zero total.
 */
export function normaliseShares(values: readonly number[], what: string): number[] {
  let total = 0;
  for (const v of values) {
    if (!Number.isFinite(v) || v < 0) throw new RangeError(`${what}: entries must be finite and >= 0, got ${v}`);
    total += v;
  }
  if (!(total > 0)) throw new RangeError(`${what}: entries must not all be zero`);
  return values.map((v) => v / total);
}

