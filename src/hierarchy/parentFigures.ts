/**
 * hierarchy/parentFigures: for each candidate parent of one column, computed in DuckDB over every
 * level (never pulled into JavaScript): the number of groups, the share of non-missing rows in
 * groups with at least minRows rows, and the median group size (median over groups of rows;
 * DuckDB's median interpolates between the two middle groups when their number is even).
 */
import type { Engine } from "../engine/db.js";
import { LEVEL_TOTALS } from "../engine/levels.js";
import { sqlNumber } from "../engine/sql.js";
import { parentSql } from "./parent.js";
import type { ParentFigures, ParentSpec } from "./types.js";

/**
 * One row per parent, in the order given. Edge cases: no parents → []; a column without
 * non-missing levels → every figure 0.
 */
export async function parentFigures(engine: Engine, col: number, parents: readonly ParentSpec[], minRows: number): Promise<ParentFigures[]> {
  if (parents.length === 0) return [];
  const grouped = parents.map((p, i) => `SELECT ${i} AS i, ${parentSql(p, "level")} AS parent, sum(rows) AS rows FROM lv GROUP BY 1, 2`).join(" UNION ALL ");
  const rows = await engine.rows<{ i: number; groups: number; well: number | null; rows: number; median: number | null }>(
    `WITH lv AS (SELECT level, rows FROM ${LEVEL_TOTALS} WHERE col = ${sqlNumber(col)} AND level IS NOT NULL),
          p AS (${grouped})
     SELECT i, count(*)::DOUBLE AS groups, sum(rows) FILTER (WHERE rows >= ${sqlNumber(minRows)})::DOUBLE AS well,
            sum(rows)::DOUBLE AS rows, median(rows)::DOUBLE AS median
     FROM p GROUP BY i ORDER BY i`, "measuring candidate parents");
  return parents.map((parent, i) => {
    const r = rows.find((x) => x.i === i);
    const total = r?.rows ?? 0;
    return {
      parent,
      groups: r?.groups ?? 0,
      wellFilledRowShare: total > 0 ? (r?.well ?? 0) / total : 0,
      medianGroupRows: r?.median ?? 0,
    };
  });
}
