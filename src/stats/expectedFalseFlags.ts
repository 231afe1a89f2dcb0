/**
 * Expected number of levels whose confidence interval excludes the overall mean by chance alone
 * when no level truly differs: levels × (1 − confidence). Follows from the definition of a
 * confidence interval (each covers the truth with probability `confidence`); common practice as
 * a multiple-comparisons warning (cf. Spiegelhalter 2005 on funnel plots).
 *
 * Edge cases: 0 levels → 0.
 * @throws RangeError when levels < 0 or not finite, or confidence is outside [0, 1].
 */
export function expectedFalseFlags(levels: number, confidence = 0.95): number {
  if (!(levels >= 0 && Number.isFinite(levels))) throw new RangeError(`expectedFalseFlags: levels must be finite and >= 0, got ${levels}`);
  if (!(confidence >= 0 && confidence <= 1)) {
    throw new RangeError(`expectedFalseFlags: confidence must be in [0, 1], got ${confidence}`);
  }
  return levels * (1 - confidence);
}
