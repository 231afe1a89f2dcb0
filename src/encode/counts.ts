/**
 * encode/counts: the summary counts of each encoded column, from level tables only (never the
 * rows): missing rows, unseen rows (levels absent from the plan's level table) and fallback
 * rows (non-missing rows that got the documented fallback — for hashing of backoff groups, the
 * rows sent to "other"), plus the fallback rule in words.
 */
import type { Engine } from "../engine/db.js";
import { quoteLiteral } from "../engine/sql.js";
import { INPUT_LEVELS, PLAN_LEVELS } from "./levelTables.js";
import type { ColumnMap } from "./columnMaps.js";
import { hashedGroupFallbackCondition, hashedGroupFallbackRule } from "./hashedGroupMap.js";
import { structureFallbackCondition, structureFallbackRule } from "./structureCounts.js";
import { sqlDouble } from "./targetMaps.js";
import type { EncodedColumn, EncodeMode } from "./types.js";

export interface ColumnCounts { missing: number; unseen: number; fallback: number }

const notIn = (values: readonly (string | null)[]) => {
  const texts = values.filter((v): v is string => v !== null);
  return texts.length === 0 ? "" : ` AND l.level NOT IN (${texts.map(quoteLiteral).join(", ")})`;
};

/** SQL condition (over `l` = input level row, `m` = its mapping row) for fallback rows. */
function fallbackCondition(column: EncodedColumn, mode: EncodeMode, leaveOneOut: boolean): string {
  const spec = column.spec;
  switch (spec.encoding) {
    case "indicator": return `l.level IS NOT NULL${notIn([spec.one, spec.zero])}`;
    case "one-hot": return `l.level IS NOT NULL${notIn(spec.levels)}`;
    case "pooled-one-hot": return `l.level IS NOT NULL${notIn(spec.keep)}`;
    case "hashing": return spec.grouping ? hashedGroupFallbackCondition : "false";
    case "frequency": return "l.level IS NOT NULL AND m.level IS NULL";
    case "codes": return "l.level IS NOT NULL AND coalesce(m.value, 0) = 0";
    case "target-kfold":
      if (spec.structure) return structureFallbackCondition(spec.structure, mode);
      if (spec.weight === null) return "l.level IS NOT NULL"; // m = ∞: every level gets the prior
      if (mode === "scoring") return "l.level IS NOT NULL AND m.level IS NULL";
      if (leaveOneOut) return `l.level IS NOT NULL AND (m.level IS NULL OR m.n_y - 1 + ${sqlDouble(spec.weight)} <= 0)`;
      return "l.level IS NOT NULL AND (m.level IS NULL OR m.n_other <= 0)";
  }
}

/** What missing, unseen and fallback rows receive, in words. */
export function fallbackRule(column: EncodedColumn, mode: EncodeMode, leaveOneOut: boolean): string {
  const spec = column.spec;
  switch (spec.encoding) {
    case "indicator": return "missing and other levels → 0";
    case "one-hot": return "missing, unseen and unlisted levels → all columns 0";
    case "pooled-one-hot": return "pooled and unseen levels → the other column; missing → all columns 0";
    case "hashing": return spec.grouping ? hashedGroupFallbackRule(spec.width) : "missing → NULL (unseen levels hash like any level)";
    case "frequency": return "missing and unseen → share 0";
    case "codes": return "missing, pooled and unseen → code 0";
    case "target-kfold":
      if (spec.structure) return structureFallbackRule(spec.structure, mode);
      if (mode === "scoring") return "missing and unseen → prior mean p";
      if (leaveOneOut) return "missing and levels with n − 1 + m ≤ 0 → p";
      return "missing, or no target rows of the level in other folds → other folds' mean";
  }
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
            coalesce(sum(l.rows) FILTER (WHERE ${fallbackCondition(column, mode, leaveOneOut)}), 0)::DOUBLE AS fallback
     FROM ${input} l${join}
     LEFT JOIN (SELECT DISTINCT level FROM ${PLAN_LEVELS} WHERE name = ${name} AND level IS NOT NULL) p ON p.level = l.level`,
    `counting the fallbacks of '${column.name}'`);
  return row ?? { missing: 0, unseen: 0, fallback: 0 };
}
