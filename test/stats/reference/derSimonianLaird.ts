/**
 * Test reference (not run by the tool): the textbook form of the estimator that
 * src/stats/normalNormalPriorWeight computes from level-table sums. It is checked against
 * published data (eight schools, BCG trials) in test/stats/derSimonianLaird.test.ts, and
 * normalNormalPriorWeight is checked against it there.
 *
 * DerSimonian–Laird random-effects meta-analysis (DerSimonian & Laird 1986, "Meta-analysis in
 * clinical trials", Controlled Clinical Trials 7:177–188). With wᵢ = 1/vᵢ:
 *   μ̂_FE = Σwy/Σw, Q = Σw(y − μ̂_FE)², τ² = max(0, (Q − (k−1))/(Σw − Σw²/Σw)),
 * then the random-effects mean μ̂ = Σw*y/Σw* with w*ᵢ = 1/(vᵢ + τ²) and SE = 1/√Σw*.
 * I² = max(0, (Q − (k−1))/Q) (Higgins & Thompson 2002, Statistics in Medicine 21:1539–1558).
 *
 * Edge cases: one study → its own effect, τ² = 0, Q = 0, I² = 0. Q = 0 → I² = 0.
 * @throws RangeError for empty or unequal-length inputs, non-finite effects, or a variance ≤ 0.
 */
export function derSimonianLaird(
  effects: readonly number[],
  variances: readonly number[],
): { mean: number; se: number; Q: number; tau2: number; i2: number } {
  const k = effects.length;
  if (k === 0 || variances.length !== k) {
    throw new RangeError(`derSimonianLaird: need equal, non-zero numbers of effects and variances, got ${k} and ${variances.length}`);
  }
  let sumW = 0;
  let sumW2 = 0;
  let sumWY = 0;
  for (let i = 0; i < k; i++) {
    const y = effects[i] ?? NaN;
    const v = variances[i] ?? NaN;
    if (!Number.isFinite(y)) throw new RangeError(`derSimonianLaird: effect ${i} is not finite: ${y}`);
    if (!(v > 0 && Number.isFinite(v))) throw new RangeError(`derSimonianLaird: variance ${i} must be finite and > 0, got ${v}`);
    sumW += 1 / v;
    sumW2 += 1 / (v * v);
    sumWY += y / v;
  }
  const fixedMean = sumWY / sumW;
  let Q = 0;
  for (let i = 0; i < k; i++) Q += ((effects[i] ?? 0) - fixedMean) ** 2 / (variances[i] ?? 1);
  const scale = sumW - sumW2 / sumW;
  const tau2 = k > 1 && scale > 0 ? Math.max(0, (Q - (k - 1)) / scale) : 0;
  let sumWStar = 0;
  let sumWStarY = 0;
  for (let i = 0; i < k; i++) {
    const w = 1 / ((variances[i] ?? 1) + tau2);
    sumWStar += w;
    sumWStarY += w * (effects[i] ?? 0);
  }
  const i2 = Q > 0 ? Math.max(0, (Q - (k - 1)) / Q) : 0;
  return { mean: sumWStarY / sumWStar, se: 1 / Math.sqrt(sumWStar), Q, tau2, i2 };
}
