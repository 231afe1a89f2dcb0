/** A group of rows sharing one score: how many are positive and how many negative. */
export interface ScoreGroup {
  score: number;
  positives: number;
  negatives: number;
}

/** The Mann–Whitney sums: U (pairs where the positive scores higher, ties ½) and the class sizes. */
export interface MannWhitneySums {
  u: number;
  positives: number;
  negatives: number;
}

/**
 * Area under the ROC curve from the Mann–Whitney sums: AUC = U / (P·N), the probability that a
 * random positive scores above a random negative, ties counted one half (Mann & Whitney 1947;
 * Hanley & McNeil 1982, Radiology 143:29–36). This is the step the tool runs: the engine sums U
 * in SQL (engine/formulaSql mannWhitneyUSql, one row per distinct score, as
 * {@link mannWhitneyU} does here) and this function turns the sums into the AUC it prints.
 *
 * Edge cases: no positives or no negatives → null.
 * @throws RangeError for non-finite or negative sums, or U outside [0, P·N].
 */
export function aucFromU(sums: MannWhitneySums): number | null {
  const { u, positives, negatives } = sums;
  if (![u, positives, negatives].every(Number.isFinite) || positives < 0 || negatives < 0) {
    throw new RangeError(`aucFromU: sums must be finite and >= 0, got ${u}/${positives}/${negatives}`);
  }
  const pairs = positives * negatives;
  if (pairs === 0) return null;
  if (u < 0 || u > pairs * (1 + 1e-12)) throw new RangeError(`aucFromU: U must lie in [0, ${pairs}], got ${u}`);
  return u / pairs;
}

/**
 * The Mann–Whitney sums from score groups: groups are sorted by score (equal scores merged) and
 * U = Σ_g pos_g·(neg below g + ½·neg_g). The input is not mutated. The tool computes the same
 * sums in SQL (the groups are sized by the level table); tests check the SQL against this.
 * @throws RangeError for non-finite scores or negative / non-finite counts.
 */
export function mannWhitneyU(groups: readonly ScoreGroup[]): MannWhitneySums {
  for (const g of groups) {
    if (!Number.isFinite(g.score)) throw new RangeError(`aucFromGroups: score must be finite, got ${g.score}`);
    if (!(g.positives >= 0 && g.negatives >= 0 && Number.isFinite(g.positives) && Number.isFinite(g.negatives))) {
      throw new RangeError(`aucFromGroups: counts must be finite and >= 0, got ${g.positives}/${g.negatives}`);
    }
  }
  const sorted = [...groups].sort((a, b) => a.score - b.score);
  let negativesBelow = 0;
  let positives = 0;
  let u = 0;
  for (let i = 0; i < sorted.length; ) {
    const score = sorted[i]?.score;
    let groupPositives = 0;
    let groupNegatives = 0;
    for (; i < sorted.length && sorted[i]?.score === score; i++) {
      groupPositives += sorted[i]?.positives ?? 0;
      groupNegatives += sorted[i]?.negatives ?? 0;
    }
    u += groupPositives * (negativesBelow + groupNegatives / 2);
    negativesBelow += groupNegatives;
    positives += groupPositives;
  }
  return { u, positives, negatives: negativesBelow };
}

/**
 * AUC from score groups: {@link aucFromU} of {@link mannWhitneyU}.
 *
 * Edge cases: no positives or no negatives → null. All rows at one score → 0.5.
 * @throws RangeError for non-finite scores or negative / non-finite counts.
 */
export function aucFromGroups(groups: readonly ScoreGroup[]): number | null {
  return aucFromU(mannWhitneyU(groups));
}
