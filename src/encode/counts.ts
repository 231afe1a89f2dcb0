/**
 * encode/counts: the summary counts of each encoded column, from level tables only (never the
 * rows): missing rows, unseen rows (levels absent from the plan's level table) and fallback
 * rows (non-missing rows that got the documented fallback — for hashing of backoff groups, the
 * rows sent to "other"), plus the fallback rule in words. Which rows are fallback rows, and the
 * rule, each encoding's module says (encode/encodings/*).
 */
import type { Engine } from "../engine/db.js";
import { quoteLiteral } from "../engine/sql.js";
import { encoderFor } from "./encodings/registry.js";
import { INPUT_LEVELS, PLAN_LEVELS } from "./levelTables.js";
import type { ColumnMap, EncodedColumn, EncodeMode } from "./types.js";

export interface ColumnCounts { missing: number; unseen: number; fallback: number }

/** What missing, unseen and fallback rows receive, in words (the column's encoding module says). */
export function fallbackRule(column: EncodedColumn, mode: EncodeMode, leaveOneOut: boolean): string {
  return encoderFor(column).fallbackRule(column.spec, mode, leaveOneOut);
}

/** Counts for one column; `map` is its mapping (null for encodings without one). */
export async function columnCounts(engine: Engine, column: EncodedColumn, map: ColumnMap | null, mode: EncodeMode, leaveOneOut: boolean): Promise<ColumnCounts> {
  const name = quoteLiteral(column.name);
  const perFold = map?.perFold ?? false;
  const input = perFold
    ? `(SELECT level, fold, rows FROM ${INPUT_LEVELS} WHERE name = ${name})`
    : `(SELECT level, sum(rows) AS rows FROM ${INPUT_LEVELS} WHERE name = ${name} GROUP BY level)`;
  const join = map === null ? "" : ` LEFT JOIN ${map.table} m ON m.level = l.level${perFold ? " AND m.fold = l.fold" : ""}`;
  const [row] = await engine.rows<ColumnCounts>(
    `SELECT coalesce(sum(l.rows) FILTER (WHERE l.level IS NULL), 0)::DOUBLE AS missing,
            coalesce(sum(l.rows) FILTER (WHERE l.level IS NOT NULL AND p.level IS NULL), 0)::DOUBLE AS unseen,
            coalesce(sum(l.rows) FILTER (WHERE ${encoderFor(column).fallbackCondition(column.spec, mode, leaveOneOut)}), 0)::DOUBLE AS fallback
     FROM ${input} l${join}
     LEFT JOIN (SELECT DISTINCT level FROM ${PLAN_LEVELS} WHERE name = ${name} AND level IS NOT NULL) p ON p.level = l.level`,
    `counting the fallbacks of '${column.name}'`);
  return row ?? { missing: 0, unseen: 0, fallback: 0 };
}
