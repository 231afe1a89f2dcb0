/**
 * encode/groupMap: the backoff grouping of one column as encode applies it,
 *   groupTable(i)(level, seen, rows, depth, group_key)
 * for every non-missing level of the plan and of the input. Levels the plan saw are grouped by
 * hierarchy/backoff's own query (backoffMapSql) over the plan's full-data rows (levels.parquet
 * summed over folds — the counts the scorer grouped, engine/levels' LEVEL_TOTALS): the level
 * itself (depth 0) with ≥ minRows rows, else the deepest parent whose still-unmapped rare
 * levels pool ≥ minRows rows (depth d ≥ 1, group_key = the parent), else "other" (depth −1,
 * group_key ''). A level the plan never saw has no rows, so it follows the same rule: the
 * deepest depth d whose parent of the level is a depth-d group of the plan's grouping, else
 * "other" (with minRows = 0 no parent group exists, and unseen levels go to "other").
 */
import type { Engine } from "../engine/db.js";
import { LEVEL_TOTALS } from "../engine/levels.js";
import { quoteLiteral, sqlNumber } from "../engine/sql.js";
import { backoffMapSql } from "../hierarchy/backoff.js";
import { parentSql } from "../hierarchy/parent.js";
import type { ParentSpec } from "../hierarchy/types.js";
import { PLAN_LEVELS } from "./levelTables.js";
import { levelSetSql } from "./hierarchySql.js";

export const groupTable = (i: number): string => `tailsift_enc_group_${i}`;

/**
 * Creates groupTable(i). `parents` shallowest first (depth d = parents[d − 1]). Replaces the
 * engine's LEVEL_TOTALS table (encode's engine has no other use for it) with the plan's rows
 * of this column, so backoffMapSql reads exactly what it reads in scan.
 */
export async function buildGroupMap(engine: Engine, i: number, name: string, parents: readonly ParentSpec[], minRows: number): Promise<void> {
  const doing = `grouping the rare levels of '${name}' under their parents`;
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${LEVEL_TOTALS} AS
     SELECT ${sqlNumber(i)}::INTEGER AS col, level, rows FROM ${PLAN_LEVELS} WHERE name = ${quoteLiteral(name)} AND level IS NOT NULL`, doing);
  const candidates = parents.map((p, k) => `SELECT level, ${sqlNumber(k + 1)} AS gd, ${parentSql(p, "level")} AS gk FROM u`).join(" UNION ALL ");
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${groupTable(i)} AS
     WITH planned AS (${backoffMapSql(i, parents, minRows)}),
          lv AS (${levelSetSql(name)}),
          u AS (SELECT level FROM lv WHERE NOT seen),
          pg AS (SELECT DISTINCT gd, gk FROM planned WHERE gd > 0),
          c AS (${candidates || "SELECT NULL::VARCHAR AS level, NULL::INTEGER AS gd, NULL::VARCHAR AS gk LIMIT 0"}),
          best AS (SELECT c.level, arg_max(c.gk, c.gd) AS gk, max(c.gd) AS gd FROM c JOIN pg ON pg.gd = c.gd AND pg.gk = c.gk GROUP BY c.level)
     SELECT lv.level, lv.seen, lv.rows, coalesce(p.gd, b.gd, -1)::INTEGER AS depth, coalesce(p.gk, b.gk, '') AS group_key
     FROM lv LEFT JOIN planned p ON p.level = lv.level LEFT JOIN best b ON b.level = lv.level`, doing);
  await engine.run(`DROP TABLE ${LEVEL_TOTALS}`, doing);
}
