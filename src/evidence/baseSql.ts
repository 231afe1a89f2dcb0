/**
 * evidence/baseSql: the CTEs every candidate's out-of-fold predictions start from, read from the
 * level table alone:
 *   ft(fold, fn, fs)      per-fold totals of rows with a target (col = −1 rows);
 *   pf(fold, prior)       the out-of-fold overall mean: the other folds' Σy / n;
 *   lf(level, fold, n, s, s2)  one column's (level, fold) sums over rows with a target
 *                          (level NULL = missing value).
 * The level table may hold several rows per key (merged shards), so every CTE sums. Within a
 * forward step (evidence/forwardScope) both reads keep the folds up to the scored block only.
 */
import { LEVEL_TABLE } from "../engine/aggregate.js";
import { sqlNumber } from "../engine/sql.js";
import { forwardFoldFilter } from "./forwardScope.js";

/** ft, g and pf alone (without the leading WITH): one row per fold, for every column. */
export function foldPriorCtes(): string {
  return `ft AS (SELECT fold, sum(n_y)::DOUBLE AS fn, sum(sum_y)::DOUBLE AS fs FROM ${LEVEL_TABLE} WHERE col = -1${forwardFoldFilter()} GROUP BY fold),
  g AS (SELECT sum(fn) AS gn, sum(fs) AS gs FROM ft),
  pf AS (SELECT ft.fold, CASE WHEN g.gn - ft.fn > 0 THEN (g.gs - ft.fs) / (g.gn - ft.fn) ELSE g.gs / g.gn END AS prior FROM ft CROSS JOIN g)`;
}

/** The shared CTE text (without the leading WITH). */
export function baseCtes(col: number): string {
  return `${foldPriorCtes()},
  lf AS (SELECT level, fold, sum(n_y)::DOUBLE AS n, sum(sum_y)::DOUBLE AS s, sum(sum_y2)::DOUBLE AS s2
         FROM ${LEVEL_TABLE} WHERE col = ${sqlNumber(col)} AND n_y > 0${forwardFoldFilter()} GROUP BY level, fold)`;
}

export { mEstimateSql } from "../engine/formulaSql.js";
