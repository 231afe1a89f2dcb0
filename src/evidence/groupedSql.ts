/**
 * evidence/groupedSql: out-of-fold predictions for every candidate that maps each level to a
 * group and predicts the group's smoothed mean: the overall mean (no groups), pooled one-hot
 * (kept levels + "other", raw group rates, m = 0), target-kfold (each level its own group, the
 * fitted m) and backoff (groups from the backoff mapping, m fitted on the groups). For a row in
 * fold f the group's sums come from the other folds only:
 *   pred = (S_g − S_g,f + m·prior_f) / (N_g − N_g,f + m),
 * or prior_f when the group has no rows in the other folds or m is null (no detectable spread
 * between groups), and prior_f for missing values and unmapped levels — the fallback encode uses.
 */
import { sqlNumber } from "../engine/sql.js";
import { LEVEL_TABLE } from "../engine/aggregate.js";
import { baseCtes, foldPriorCtes, mEstimateSql } from "./baseSql.js";
import { inForwardStep } from "./forwardScope.js";

/**
 * A mapping is a query of (level, gd, gk) for non-missing levels — gd/gk identify the group (see
 * hierarchy/backoff) — or "identity" (each level its own group) or "none" (no groups). With
 * `carriesTotals` the query maps every non-missing level and also gives its totals from
 * LEVEL_TOTALS (n_y, sum_y, sum_y2, single_fold): see groupTotalsScoredSql.
 */
export type GroupMapping = "identity" | "none" | { sql: string; carriesTotals?: true };

/** The (fold, n, s, s2, pred) query of a grouped candidate with weight m ≥ 0 (null = infinite: every group takes the prior). */
export function groupedScoredSql(col: number, mapping: GroupMapping, weight: number | null): string {
  const m = weight === null ? "NULL::DOUBLE" : `${sqlNumber(weight)}::DOUBLE`;
  // the carried totals span every fold: a forward step (folds restricted) sums the level table instead
  if (typeof mapping === "object" && mapping.carriesTotals && !inForwardStep()) return groupTotalsScoredSql(col, mapping.sql, m);
  const lg = mapping === "identity"
    ? "SELECT lf.*, CASE WHEN level IS NULL THEN NULL ELSE 0 END AS gd, level AS gk FROM lf"
    : mapping === "none"
      ? "SELECT lf.*, NULL::INTEGER AS gd, NULL::VARCHAR AS gk FROM lf"
      : `SELECT lf.*, mp.gd, mp.gk FROM lf LEFT JOIN (${mapping.sql}) mp ON lf.level = mp.level`;
  return `WITH ${baseCtes(col)},
  lg AS (${lg}),
  gt AS (SELECT gd, gk, sum(n) AS gn, sum(s) AS gs FROM lg WHERE gd IS NOT NULL GROUP BY gd, gk),
  gft AS (SELECT gd, gk, fold, sum(n) AS gnf, sum(s) AS gsf FROM lg WHERE gd IS NOT NULL GROUP BY gd, gk, fold)
  SELECT lg.fold, lg.n, lg.s, lg.s2,
    CASE WHEN lg.gd IS NULL THEN pf.prior ELSE ${mEstimateSql("(gt.gs - gft.gsf)", "(gt.gn - gft.gnf)", m, "pf.prior")} END AS pred
  FROM lg JOIN pf USING (fold)
  LEFT JOIN gt ON gt.gd = lg.gd AND gt.gk = lg.gk
  LEFT JOIN gft ON gft.gd = lg.gd AND gft.gk = lg.gk AND gft.fold = lg.fold`;
}

/**
 * The same predictions, one row per (group, fold) instead of per (level, fold): every row of a
 * group in fold f gets the same prediction, and the loss, squared error and Mann–Whitney sums
 * are linear in (n, s, s2) at a fixed prediction, so the scores are unchanged up to the order of
 * summation. The group's per-fold sums come from the level table only for levels whose target
 * rows span several folds; a level with all its target rows in one fold (single_fold) adds its
 * totals, carried by the mapping, to that fold — no join of its rows. Missing values take the
 * fold's prior, as above.
 */
function groupTotalsScoredSql(col: number, mappingSql: string, m: string): string {
  const c = sqlNumber(col);
  return `WITH ${foldPriorCtes()},
  mp AS (${mappingSql}),
  multi AS (SELECT mp.gd, mp.gk, l.fold, sum(l.n_y)::DOUBLE AS n, sum(l.sum_y)::DOUBLE AS s, sum(l.sum_y2)::DOUBLE AS s2
            FROM ${LEVEL_TABLE} l JOIN mp ON l.level = mp.level
            WHERE l.col = ${c} AND l.n_y > 0 AND mp.single_fold IS NULL AND mp.n_y > 0 GROUP BY mp.gd, mp.gk, l.fold),
  tail AS (SELECT gd, gk, single_fold AS fold, sum(n_y)::DOUBLE AS n, sum(sum_y)::DOUBLE AS s, sum(sum_y2)::DOUBLE AS s2
           FROM mp WHERE single_fold IS NOT NULL GROUP BY gd, gk, single_fold),
  gft AS (SELECT gd, gk, fold, sum(n) AS n, sum(s) AS s, sum(s2) AS s2 FROM (SELECT * FROM multi UNION ALL SELECT * FROM tail) GROUP BY gd, gk, fold),
  gt AS (SELECT gd, gk, sum(n) AS gn, sum(s) AS gs FROM gft GROUP BY gd, gk),
  miss AS (SELECT fold, sum(n_y)::DOUBLE AS n, sum(sum_y)::DOUBLE AS s, sum(sum_y2)::DOUBLE AS s2
           FROM ${LEVEL_TABLE} WHERE col = ${c} AND level IS NULL AND n_y > 0 GROUP BY fold)
  SELECT gft.fold, gft.n, gft.s, gft.s2, ${mEstimateSql("(gt.gs - gft.s)", "(gt.gn - gft.n)", m, "pf.prior")} AS pred
  FROM gft JOIN gt ON gt.gd = gft.gd AND gt.gk = gft.gk JOIN pf ON pf.fold = gft.fold
  UNION ALL
  SELECT miss.fold, miss.n, miss.s, miss.s2, pf.prior AS pred FROM miss JOIN pf ON pf.fold = miss.fold`;
}
