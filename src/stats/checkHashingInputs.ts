/**
 * Validates hashing inputs shared by {@link expectedBucketsUsed} and
 * {@link birthdayCollisionProbability}: the number of levels must be finite and ≥ 0 (a whole
 * number when `wholeLevels`; an estimated count such as Chao1 may be fractional otherwise) and
 * the width a whole number ≥ 1. `what` names the caller in the message.
 *
 * @throws RangeError describing the bad value.
 */
export function checkHashingInputs(levels: number, width: number, what: string, wholeLevels = false): void {
  if (!(Number.isFinite(levels) && levels >= 0) || (wholeLevels && !Number.isInteger(levels))) {
    const kind = wholeLevels ? "a whole number" : "a finite number";
    throw new RangeError(`${what}: levels must be ${kind} >= 0, got ${levels}`);
  }
  if (!(Number.isInteger(width) && width >= 1)) {
    throw new RangeError(`${what}: width must be a whole number >= 1, got ${width}`);
  }
}
