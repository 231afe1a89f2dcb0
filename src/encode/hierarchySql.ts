/**
 * encode/hierarchySql: the SQL pieces the backoff and hierarchical mappings share — the level
 * set they cover (the plan's levels and the input's, so unseen levels get their group or parent
 * inside the mapping), per-level target sums, weights as SQL, and the prior variable.
 * The smoothing itself is engine/formulaSql's mEstimateSql, the formula the scorer uses.
 */
import type { Engine } from "../engine/db.js";
import { quoteLiteral } from "../engine/sql.js";
import { INPUT_LEVELS, PLAN_LEVELS } from "./levelTables.js";
import { pastSumsSql, priorVar, sqlDouble } from "./targetMaps.js";

/** A prior weight as SQL: exact DOUBLE, or NULL (infinite: the prior). */
export const weightSql = (w: number | null): string => (w === null ? "NULL::DOUBLE" : sqlDouble(w));

/** The prior variable of column i as SQL. */
export const priorSql = (i: number): string => `getvariable(${quoteLiteral(priorVar(i))})`;

/** Sets the prior p of column i (`priorVar(i)`) to the DOUBLE SQL expression `prior`. */
export async function setPrior(engine: Engine, i: number, prior: string, name: string): Promise<void> {
  await engine.run(`SET VARIABLE ${priorVar(i)} = (${prior})::DOUBLE`, `setting the prior of '${name}'`);
}

/**
 * (level, seen, rows): every non-missing level of the plan's level table (seen, with its training
 * rows) and of the input (unseen ones with rows 0), one row per level.
 */
export function levelSetSql(name: string): string {
  const col = quoteLiteral(name);
  return `SELECT level, bool_or(seen) AS seen, sum(rows)::BIGINT AS rows FROM (
      SELECT level, true AS seen, rows FROM ${PLAN_LEVELS} WHERE name = ${col} AND level IS NOT NULL
      UNION ALL SELECT DISTINCT level, false AS seen, 0 AS rows FROM ${INPUT_LEVELS} WHERE name = ${col} AND level IS NOT NULL)
    GROUP BY level`;
}

/** (level, n, s): target rows and target sum per non-missing level of `from`, summed over folds. */
export function levelSumsSql(from: string, name: string): string {
  return `SELECT level, sum(n_y)::DOUBLE AS n, sum(sum_y)::DOUBLE AS s FROM ${from}
    WHERE name = ${quoteLiteral(name)} AND level IS NOT NULL GROUP BY level`;
}

/** (level, fold, n, s): the same per fold. */
export function levelFoldSumsSql(from: string, name: string, pastOnly?: { folds: number }): string {
  const perFold = `SELECT level, fold, sum(n_y)::DOUBLE AS n, sum(sum_y)::DOUBLE AS s FROM ${from}
    WHERE name = ${quoteLiteral(name)} AND level IS NOT NULL GROUP BY level, fold`;
  // past-only (time-blocks plans): the sums over folds ≥ f, so a map's total − it = blocks < f (encode/targetMaps)
  return pastOnly ? pastSumsSql(perFold, ["level"], ["n", "s"], pastOnly.folds) : perFold;
}
