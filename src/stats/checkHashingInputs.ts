/**
 * Validates hashing inputs of {@link expectedBucketsUsed} (and the functions built on it): the
 * number of levels must be finite and ≥ 0 (an estimated count may be fractional) and the width a
 * whole number ≥ 1. `what` names the caller in the message.
 *
 * @throws RangeError describing the bad value.
 */
export function checkHashingInputs(levels: number, width: number, what: string): void {
  if (!(Number.isFinite(levels) && levels >= 0)) {
    throw new RangeError(`${what}: levels must be a finite number >= 0, got ${levels}`);
  }
  if (!(Number.isInteger(width) && width >= 1)) {
    throw new RangeError(`${what}: width must be a whole number >= 1, got ${width}`);
  }
}
