/**
 * hierarchy/backoff: maps every level of one column to a group, in DuckDB: the level itself when
 * it has at least minRows rows, else its deepest parent whose still-unmapped rare levels together
 * have at least minRows rows, else "other" (group depth −1). Parents are tried deepest first, and
 * a rare level taken by a deeper parent no longer counts toward a shallower one, so the groups
 * partition the rows. The mapping sits in the temp table BACKOFF_TABLE(level, rows, gd, gk):
 * gd = 0 for the level itself, d ≥ 1 for the d-th parent (shallowest = 1), −1 for "other";
 * gk = the group's text (the level, the parent, or '' for "other").
 */
import type { Engine } from "../engine/db.js";
import { LEVEL_TOTALS } from "../engine/levels.js";
import { sqlNumber } from "../engine/sql.js";
import { parentSql } from "./parent.js";
import type { BackoffFigures, ParentSpec } from "./types.js";

export const BACKOFF_TABLE = "tailsift_backoff";

/**
 * The mapping query for one column (parents shallowest first). With `carryTargets` each level
 * also carries its target totals and single_fold from LEVEL_TOTALS (n_y, sum_y, sum_y2,
 * single_fold), so the evidence sums groups without joining the level table again.
 */
export function backoffMapSql(col: number, parents: readonly ParentSpec[], minRows: number, carryTargets = false): string {
  const carried = carryTargets ? ", n_y, sum_y, sum_y2, single_fold" : "";
  const min = sqlNumber(minRows);
  const ps = parents.map((p, i) => `${parentSql(p, "level")} AS p${i + 1}`).join(", ");
  const steps = parents.map((_, i) => parents.length - i).map((d, i) => `b${i + 1} AS (SELECT * REPLACE (CASE WHEN gd IS NULL
      AND sum(CASE WHEN gd IS NULL THEN rows ELSE 0 END) OVER (PARTITION BY p${d}) >= ${min} THEN ${d} ELSE gd END AS gd) FROM b${i})`);
  const key = parents.map((_, i) => `WHEN ${i + 1} THEN p${i + 1}`).join(" ");
  return `WITH b0 AS (SELECT level, rows${carried}${ps ? `, ${ps}` : ""}, CASE WHEN rows >= ${min} THEN 0 END AS gd
      FROM ${LEVEL_TOTALS} WHERE col = ${sqlNumber(col)} AND level IS NOT NULL)${steps.length > 0 ? `, ${steps.join(", ")}` : ""}
    SELECT level, rows${carried}, coalesce(gd, -1)::INTEGER AS gd, CASE gd WHEN 0 THEN level ${key} ELSE '' END AS gk FROM b${parents.length}`;
}

/** Creates (or replaces) BACKOFF_TABLE for one column (with the target totals: see backoffMapSql). */
export async function buildBackoffMap(engine: Engine, col: number, parents: readonly ParentSpec[], minRows: number, carryTargets = false): Promise<void> {
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${BACKOFF_TABLE} AS ${backoffMapSql(col, parents, minRows, carryTargets)}`, "grouping rare levels under their parents");
}

/**
 * Group count and row shares of the mapping in BACKOFF_TABLE. Edge case: no non-missing rows →
 * every share 0.
 */
export async function backoffFigures(engine: Engine, minRows: number): Promise<BackoffFigures> {
  const [r] = await engine.rows<{ groups: number; rows: number; lv: number; par: number; oth: number }>(
    `SELECT count(*) FILTER (WHERE gd >= 0)::DOUBLE AS groups, coalesce(sum(rows), 0)::DOUBLE AS rows,
            coalesce(sum(rows) FILTER (WHERE gd = 0), 0)::DOUBLE AS lv, coalesce(sum(rows) FILTER (WHERE gd > 0), 0)::DOUBLE AS par,
            coalesce(sum(rows) FILTER (WHERE gd < 0), 0)::DOUBLE AS oth
     FROM (SELECT gd, gk, sum(rows) AS rows FROM ${BACKOFF_TABLE} GROUP BY gd, gk)`, "measuring the backoff groups");
  const total = r?.rows ?? 0;
  const share = (x: number | undefined) => (total > 0 ? (x ?? 0) / total : 0);
  return {
    minRows, groups: r?.groups ?? 0, coverage: share((r?.lv ?? 0) + (r?.par ?? 0)),
    levelRowShare: share(r?.lv), parentRowShare: share(r?.par), otherRowShare: share(r?.oth),
  };
}
