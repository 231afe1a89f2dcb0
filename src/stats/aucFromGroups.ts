/** A group of rows sharing one score: how many are positive and how many negative. */
export interface ScoreGroup {
  score: number;
  positives: number;
  negatives: number;
}

/**
 * Area under the ROC curve from score groups: the Mann–Whitney probability that a random
 * positive scores above a random negative, ties counted one half (Mann & Whitney 1947; Hanley &
 * McNeil 1982, Radiology 143:29–36). Exact: groups are sorted by score (equal scores merged) and
 * AUC = Σ_g pos_g·(neg below g + ½·neg_g) / (P·N). The input is not mutated.
 *
 * Edge cases: no positives or no negatives → null. All rows at one score → 0.5.
 * @throws RangeError for non-finite scores or negative / non-finite counts.
 */
export function aucFromGroups(groups: readonly ScoreGroup[]): number | null {
  for (const g of groups) {
    if (!Number.isFinite(g.score)) throw new RangeError(`aucFromGroups: score must be finite, got ${g.score}`);
    if (!(g.positives >= 0 && g.negatives >= 0 && Number.isFinite(g.positives) && Number.isFinite(g.negatives))) {
      throw new RangeError(`aucFromGroups: counts must be finite and >= 0, got ${g.positives}/${g.negatives}`);
    }
  }
  const sorted = [...groups].sort((a, b) => a.score - b.score);
  let negativesBelow = 0;
  let positives = 0;
  let pairs = 0;
  for (let i = 0; i < sorted.length; ) {
    const score = sorted[i]?.score;
    let groupPositives = 0;
    let groupNegatives = 0;
    for (; i < sorted.length && sorted[i]?.score === score; i++) {
      groupPositives += sorted[i]?.positives ?? 0;
      groupNegatives += sorted[i]?.negatives ?? 0;
    }
    pairs += groupPositives * (negativesBelow + groupNegatives / 2);
    negativesBelow += groupNegatives;
    positives += groupPositives;
  }
  if (positives === 0 || negativesBelow === 0) return null;
  return pairs / (positives * negativesBelow);
}
