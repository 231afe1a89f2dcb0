/**
 * drift/effectSize: how large a shift in a target rate or mean is, on a scale that does not depend
 * on the sample size (Cohen J., 1988, Statistical Power Analysis for the Behavioral Sciences,
 * 2nd ed.). Conventions there: 0.2 small, 0.5 medium, 0.8 large (Cohen's own labels, offered as
 * conventions rather than tests).
 */

/**
 * Cohen's h for two proportions: h = 2·asin(√p₁) − 2·asin(√p₂) (Cohen 1988, ch. 6, the
 * arcsine transformation φ = 2·asin√p). Signed: positive when p₁ > p₂.
 * Edge cases: p = 0 and p = 1 are fine (φ = 0 and π).
 * @throws RangeError when a proportion is outside [0, 1] or not finite.
 */
export function cohensH(p1: number, p2: number): number {
  for (const p of [p1, p2]) {
    if (!(p >= 0 && p <= 1)) throw new RangeError(`cohensH: proportions must be in [0, 1], got ${p}`);
  }
  return 2 * Math.asin(Math.sqrt(p1)) - 2 * Math.asin(Math.sqrt(p2));
}

/**
 * Cohen's d for two means: d = (m₁ − m₂)/s, with s the reference standard deviation (Cohen 1988,
 * ch. 2). Drift uses the plan's overall target standard deviation as s, so d says how many plan
 * standard deviations a level's mean moved. Signed.
 * Edge cases: s = 0 or s not finite → null (no scale to measure against).
 * @throws RangeError when a mean is not finite.
 */
export function cohensD(m1: number, m2: number, s: number): number | null {
  if (!Number.isFinite(m1) || !Number.isFinite(m2)) throw new RangeError(`cohensD: means must be finite, got ${m1}, ${m2}`);
  if (!(s > 0 && Number.isFinite(s))) return null;
  return (m1 - m2) / s;
}
