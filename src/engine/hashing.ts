/**
 * engine/hashing: exact bucket collisions of the hashing trick, computed over the level table.
 *
 * Bucket of a level = (unsigned 64-bit little-endian integer of the first 8 bytes of
 * MD5(salt ‖ UTF-8 level)) mod width. In DuckDB that integer is md5_number_upper(); in Node it is
 * createHash("md5").update(text).digest().readBigUInt64LE(0); in Python
 * int.from_bytes(hashlib.md5(b).digest()[:8], "little"). Widths are powers of two, so the bucket is
 * the integer's low bits. A row "collides" when its level shares a bucket with another level.
 */
import type { Engine } from "./db.js";
import { LEVEL_TOTALS } from "./levels.js";
import { quoteLiteral, sqlNumber } from "./sql.js";

export const HASH_NAME = "md5-first8-le";

export interface CollisionRow { col: number; width: number; collidingLevels: number; collisionRows: number; rows: number }

/** Bucket SQL for a level expression (used by encode too). */
export function bucketSql(levelExpr: string, width: number, salt = ""): string {
  const text = salt === "" ? levelExpr : `(${quoteLiteral(salt)} || ${levelExpr})`;
  return `(md5_number_upper(${text}) % ${sqlNumber(width)}::UBIGINT)::BIGINT`;
}

/**
 * Colliding levels and rows per column and width (missing values are not hashed). With
 * `minRows` (per column) only levels with at least that many rows are counted (advice/hashWidth:
 * the levels frequent enough to matter); a column absent from the map counts every level.
 */
export async function collisionTable(engine: Engine, cols: readonly number[], widths: readonly number[], salt = "", minRows?: ReadonlyMap<number, number>): Promise<CollisionRow[]> {
  if (cols.length === 0 || widths.length === 0) return [];
  const widthValues = widths.map((w) => `(${sqlNumber(w)}::UBIGINT)`).join(", ");
  const text = salt === "" ? "level" : `(${quoteLiteral(salt)} || level)`;
  return engine.rows<CollisionRow>(
    `WITH h AS (SELECT col, md5_number_upper(${text}) AS h, rows FROM ${LEVEL_TOTALS}
                WHERE level IS NOT NULL AND col IN (${cols.map((c) => sqlNumber(c)).join(", ")})
                  AND rows >= CASE col ${cols.map((c) => `WHEN ${sqlNumber(c)} THEN ${sqlNumber(minRows?.get(c) ?? 0)}`).join(" ")} ELSE 0 END),
          ws(width) AS (VALUES ${widthValues}),
          b AS (SELECT col, width, h % width AS bucket, count(*) AS levels, sum(rows) AS rows FROM h CROSS JOIN ws GROUP BY ALL)
     SELECT col, width::DOUBLE AS width, sum(levels) FILTER (WHERE levels > 1)::DOUBLE AS collidingLevels,
            coalesce(sum(rows) FILTER (WHERE levels > 1), 0)::DOUBLE AS collisionRows, sum(rows)::DOUBLE AS rows
     FROM b GROUP BY col, width ORDER BY col, width`, "counting hash collisions");
}
