/**
 * drift/compareSql: the queries that compare the new extract's level table with the plan's,
 * inside DuckDB. Only bounded results cross into JavaScript: one row per column, and the plan's
 * top levels per column.
 */
import { LEVEL_TABLE } from "../engine/aggregate.js";
import type { Engine } from "../engine/db.js";
import { quoteLiteral, sqlNumber } from "../engine/sql.js";
import { PLAN_LEVELS } from "../plan/load.js";

export const NEW_LEVELS = "tailsift_new_levels";

export interface SideStats { rows: number; missing: number; levels: number; n_y: number; sum_y: number; sum_y2: number }
export interface NewStats extends SideStats { unseen_rows: number; new_levels: number }
export interface TopLevelRow {
  name: string; level: string;
  plan_rows: number; plan_n_y: number; plan_sum_y: number; plan_sum_y2: number;
  new_rows: number; new_n_y: number; new_sum_y: number; new_sum_y2: number;
}

/** Names the pass's level table by column and sums it over folds: `tailsift_new_levels`. */
export async function nameNewLevels(engine: Engine, levelColumns: readonly string[]): Promise<void> {
  const names = levelColumns.map((c, i) => `(${sqlNumber(i)}, ${quoteLiteral(c)})`).join(", ");
  const from = levelColumns.length === 0
    ? `(SELECT NULL::VARCHAR AS name, NULL::VARCHAR AS level, 0::BIGINT AS rows, 0::BIGINT AS n_y, 0::DOUBLE AS sum_y, 0::DOUBLE AS sum_y2 LIMIT 0)`
    : `(SELECT n.name, l.level, sum(l.rows)::BIGINT AS rows, sum(l.n_y)::BIGINT AS n_y, sum(l.sum_y)::DOUBLE AS sum_y, sum(l.sum_y2)::DOUBLE AS sum_y2
        FROM ${LEVEL_TABLE} l JOIN (VALUES ${names}) n(col, name) ON l.col = n.col GROUP BY ALL)`;
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${NEW_LEVELS} AS SELECT * FROM ${from}`, "summing the new level table");
}

const SIDE = `sum(rows)::DOUBLE AS rows, coalesce(sum(rows) FILTER (WHERE level IS NULL), 0)::DOUBLE AS missing,
  count(level)::DOUBLE AS levels, sum(n_y)::DOUBLE AS n_y, sum(sum_y) AS sum_y, sum(sum_y2) AS sum_y2`;

/** Per plan column: rows, missing, distinct levels and target sums of the plan. */
export async function planColumnStats(engine: Engine): Promise<Map<string, SideStats>> {
  const rows = await engine.rows<SideStats & { name: string }>(
    `SELECT name, ${SIDE} FROM ${PLAN_LEVELS} GROUP BY name`, "summarising the plan's levels");
  return new Map(rows.map((r) => [r.name, r]));
}

/** Per compared column of the new extract: the same, plus rows and levels the plan never saw. */
export async function newColumnStats(engine: Engine): Promise<Map<string, NewStats>> {
  const rows = await engine.rows<NewStats & { name: string }>(
    `SELECT n.name, sum(n.rows)::DOUBLE AS rows, coalesce(sum(n.rows) FILTER (WHERE n.level IS NULL), 0)::DOUBLE AS missing,
       count(n.level)::DOUBLE AS levels, sum(n.n_y)::DOUBLE AS n_y, sum(n.sum_y) AS sum_y, sum(n.sum_y2) AS sum_y2,
       coalesce(sum(n.rows) FILTER (WHERE n.level IS NOT NULL AND p.level IS NULL), 0)::DOUBLE AS unseen_rows,
       count(n.level) FILTER (WHERE p.level IS NULL)::DOUBLE AS new_levels
     FROM ${NEW_LEVELS} n LEFT JOIN ${PLAN_LEVELS} p ON p.name = n.name AND p.level = n.level
     GROUP BY n.name`, "joining the new levels with the plan's");
  return new Map(rows.map((r) => [r.name, r]));
}

/**
 * The plan's `top` largest non-missing levels per column (ties by level text), each with the
 * plan's and the new extract's rows and target sums (0 when the new extract lacks the level).
 */
export async function topLevelRows(engine: Engine, top: number): Promise<Map<string, TopLevelRow[]>> {
  const rows = await engine.rows<TopLevelRow>(
    `WITH ranked AS (
       SELECT name, level, rows, n_y, sum_y, sum_y2,
              row_number() OVER (PARTITION BY name ORDER BY rows DESC, level) AS rank
       FROM ${PLAN_LEVELS} WHERE level IS NOT NULL)
     SELECT r.name, r.level, r.rows::DOUBLE AS plan_rows, r.n_y::DOUBLE AS plan_n_y, r.sum_y AS plan_sum_y, r.sum_y2 AS plan_sum_y2,
            coalesce(n.rows, 0)::DOUBLE AS new_rows, coalesce(n.n_y, 0)::DOUBLE AS new_n_y,
            coalesce(n.sum_y, 0)::DOUBLE AS new_sum_y, coalesce(n.sum_y2, 0)::DOUBLE AS new_sum_y2
     FROM ranked r LEFT JOIN ${NEW_LEVELS} n ON n.name = r.name AND n.level = r.level
     WHERE r.rank <= ${sqlNumber(Math.max(0, Math.trunc(top)))}
     ORDER BY r.name, r.rank`, "reading the plan's top levels");
  const byName = new Map<string, TopLevelRow[]>();
  for (const r of rows) byName.set(r.name, [...(byName.get(r.name) ?? []), r]);
  return byName;
}
