/**
 * Predictions are clipped to [LOG_LOSS_EPS, 1 − LOG_LOSS_EPS] before the logarithm, so that a
 * confident wrong prediction costs a large but finite amount (common practice; 1e-15 is a widely
 * used default). The evidence SQL (engine/formulaSql logLossSql) clips with this same constant.
 */
export const LOG_LOSS_EPS = 1e-15;

/**
 * Mean binary cross-entropy (log loss), in nats per row, from groups of rows sharing one
 * predicted probability: −Σ[pos·ln p + neg·ln(1 − p)] / Σ(pos + neg) (Good 1952, "Rational
 * decisions", JRSS B 14:107–114, logarithmic scoring rule), p clipped to [eps, 1 − eps].
 * The tool sums the same terms in SQL per fold (engine/formulaSql logLossSql: one row per
 * (level, fold), sized by the level table, so the sum stays in DuckDB) and divides by the rows in
 * evidence/foldLoss; tests check that SQL against this function on the same groups.
 *
 * Edge cases: no rows → null. A group with zero positives never evaluates ln p (and likewise
 * for negatives), so exact 0/1 predictions that are right cost 0.
 * @throws RangeError for a prediction outside [0, 1], negative or non-finite counts, or eps
 *   outside [0, 0.5).
 */
export function logLossFromGroups(
  groups: readonly { prediction: number; positives: number; negatives: number }[],
  eps = LOG_LOSS_EPS,
): number | null {
  if (!(eps >= 0 && eps < 0.5)) throw new RangeError(`logLossFromGroups: eps must be in [0, 0.5), got ${eps}`);
  let rows = 0;
  let loss = 0;
  for (const { prediction, positives, negatives } of groups) {
    if (!(prediction >= 0 && prediction <= 1)) {
      throw new RangeError(`logLossFromGroups: prediction must be in [0, 1], got ${prediction}`);
    }
    if (!(positives >= 0 && negatives >= 0 && Number.isFinite(positives) && Number.isFinite(negatives))) {
      throw new RangeError(`logLossFromGroups: counts must be finite and >= 0, got ${positives}/${negatives}`);
    }
    const p = Math.min(1 - eps, Math.max(eps, prediction));
    if (positives > 0) loss -= positives * Math.log(p);
    if (negatives > 0) loss -= negatives * Math.log1p(-p);
    rows += positives + negatives;
  }
  if (rows === 0) return null;
  return loss / rows;
}
