/**
 * engine/multiclassLoss: the out-of-fold MULTI-CLASS log loss of a column, read from the level
 * table with every class's rows (sum_c0 … sum_c{K-1}, engine/aggregate). Two predictions per
 * (level, fold) cell, each fitted on the other folds only:
 *   - class shares: p_k = the other folds' share of class k (the column unused);
 *   - one-vs-rest target encoding: per class the m-estimate of the binary path,
 *       p_k = (s_k + m_k·π_k) / (n + m_k)  over the level's rows in the other folds (π_k the other
 *     folds' class share; m_k = NULL (∞) or a missing level → π_k), then renormalised,
 *       q_k = p_k / Σ_j p_j,
 *     the sum normalisation of one-vs-rest scores (Zadrozny & Elkan, "Transforming classifier
 *     scores into accurate multiclass probability estimates", KDD 2002, §4). With one m for every
 *     class Σ p_k = 1 already; the fitted m_k differ, so the sum is needed.
 * The loss of a cell is −Σ_k c_k · ln(clip(q_k)), c_k its rows of class k, q clipped to
 * [1e-15, 1 − 1e-15] as the binary log loss (engine/formulaSql LOG_LOSS_EPS): the multi-class
 * cross-entropy −Σ_i ln p(y_i) (Bishop, Pattern Recognition and Machine Learning, 2006, eq. 4.108),
 * summed here per (column, fold). Only (column, fold) sums come back (bounded).
 *
 * `forward` (time-ordered blocks, --time): the same two predictions fitted on the EARLIER blocks
 * only — the level's and the class shares' sums over blocks < b (running sums over the folds in
 * time order), as encode --for training writes them for such a plan — and block 0, which has no
 * past, is not scored (rolling-origin evaluation, Tashman 2000; docs/references.md).
 */
import type { Engine } from "./db.js";
import { LOG_LOSS_EPS } from "../stats/logLossFromGroups.js";
import { EARLIER_FOLDS, mEstimateSql } from "./formulaSql.js";
import { classSumColumn, LEVEL_TABLE } from "./passPlan.js";
import { sqlNumber } from "./sql.js";

export interface MulticlassFoldLoss { col: number; fold: number; rows: number; shares: number; encoded: number }

const clip = (q: string) => `greatest(${LOG_LOSS_EPS}, least(1 - ${LOG_LOSS_EPS}, ${q}))`;

/**
 * The query: `weights` holds, per column index, the prior weight of each class (null = ∞).
 * Columns without a weights entry are not scored.
 */
export function multiclassLossSql(classes: number, weights: ReadonlyMap<number, readonly (number | null)[]>, table = LEVEL_TABLE, forward = false): string {
  const ks = Array.from({ length: classes }, (_, k) => k);
  const c = (k: number) => classSumColumn(k);
  const cols = [...weights.keys()];
  const values = cols.map((col) => `(${[sqlNumber(col), ...ks.map((k) => { const m = weights.get(col)![k]; return m === null || m === undefined ? "NULL::DOUBLE" : `${sqlNumber(m)}::DOUBLE`; })].join(", ")})`).join(", ");
  // the fitting rows of a (level, fold) cell: the other folds (total − own), or forward the earlier blocks
  const pk = ks.map((k) => (forward
    ? mEstimateSql(`lp.ps${k}`, "lp.pn", `mw.m${k}`, `pf.p${k}`)
    : mEstimateSql(`(lt.t${k} - lf.s${k})`, "(lt.tn - lf.n)", `mw.m${k}`, `pf.p${k}`)));
  const pf = forward
    ? `pc AS (SELECT fold, sum(fn) OVER (${EARLIER_FOLDS}) AS cn, ${ks.map((k) => `sum(f${k}) OVER (${EARLIER_FOLDS}) AS c${k}`).join(", ")} FROM ft),
  pf AS (SELECT fold, ${ks.map((k) => `c${k} / cn AS p${k}`).join(", ")} FROM pc WHERE cn > 0)`
    : `g AS (SELECT sum(fn) AS gn, ${ks.map((k) => `sum(f${k}) AS g${k}`).join(", ")} FROM ft),
  pf AS (SELECT ft.fold, ${ks.map((k) => `CASE WHEN g.gn - ft.fn > 0 THEN (g.g${k} - ft.f${k}) / (g.gn - ft.fn) ELSE g.g${k} / g.gn END AS p${k}`).join(", ")} FROM ft CROSS JOIN g)`;
  const fitted = forward
    ? `lp AS (SELECT col, level, fold, coalesce(sum(n) OVER v, 0) AS pn, ${ks.map((k) => `coalesce(sum(s${k}) OVER v, 0) AS ps${k}`).join(", ")}
         FROM lf WINDOW v AS (PARTITION BY col, level ${EARLIER_FOLDS}))`
    : `lt AS (SELECT col, level, sum(n) AS tn, ${ks.map((k) => `sum(s${k}) AS t${k}`).join(", ")} FROM lf GROUP BY col, level)`;
  const join = forward
    ? "JOIN lp ON lp.col = lf.col AND lp.level IS NOT DISTINCT FROM lf.level AND lp.fold = lf.fold"
    : "LEFT JOIN lt ON lt.col = lf.col AND lt.level IS NOT DISTINCT FROM lf.level";
  const p = (k: number) => `CASE WHEN lf.level IS NULL THEN pf.p${k} ELSE ${pk[k]} END`;
  return `WITH ft AS (SELECT fold, sum(n_y)::DOUBLE AS fn, ${ks.map((k) => `sum(${c(k)})::DOUBLE AS f${k}`).join(", ")} FROM ${table} WHERE col = -1 GROUP BY fold),
  ${pf},
  mw AS (SELECT * FROM (VALUES ${values}) v(col, ${ks.map((k) => `m${k}`).join(", ")})),
  lf AS (SELECT l.col, l.level, l.fold, sum(l.n_y)::DOUBLE AS n, ${ks.map((k) => `sum(l.${c(k)})::DOUBLE AS s${k}`).join(", ")}
         FROM ${table} l WHERE l.col IN (SELECT col FROM mw) AND l.n_y > 0 GROUP BY l.col, l.level, l.fold),
  ${fitted},
  pr AS (SELECT lf.col, lf.fold, lf.n, ${ks.map((k) => `lf.s${k}, pf.p${k} AS a${k}, ${p(k)} AS b${k}`).join(", ")}
         FROM lf JOIN pf USING (fold) JOIN mw USING (col) ${join}),
  nz AS (SELECT *, ${ks.map((k) => `b${k}`).join(" + ")} AS bs, ${ks.map((k) => `a${k}`).join(" + ")} AS bsa FROM pr)
  SELECT col, fold, sum(n)::DOUBLE AS rows,
    sum(${ks.map((k) => `-s${k} * ln(${clip(`a${k} / bsa`)})`).join(" + ")})::DOUBLE AS shares,
    sum(${ks.map((k) => `-s${k} * ln(${clip(`b${k} / bs`)})`).join(" + ")})::DOUBLE AS encoded
  FROM nz GROUP BY col, fold ORDER BY col, fold`;
}

/** Runs multiclassLossSql: the per-(column, fold) rows and losses of both predictions. */
export async function multiclassFoldLosses(engine: Engine, classes: number, weights: ReadonlyMap<number, readonly (number | null)[]>, table = LEVEL_TABLE, forward = false): Promise<MulticlassFoldLoss[]> {
  if (weights.size === 0) return [];
  return engine.rows<MulticlassFoldLoss>(multiclassLossSql(classes, weights, table, forward), `scoring the multi-class log loss ${forward ? "forward" : "out-of-fold"}`);
}
