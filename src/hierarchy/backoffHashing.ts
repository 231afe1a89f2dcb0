/**
 * hierarchy/backoffHashing: the hashing trick applied to backoff groups instead of levels (no
 * target, identifier-like codes). Each group's text (the level or the parent) is hashed exactly as
 * engine/hashing hashes levels (md5, first 8 bytes little-endian, modulo the width); "other" is not
 * hashed. A row collides when its group shares a bucket with another group. The width chosen is
 * the smallest whose colliding row share is within the budget, else the widest.
 */
import type { Engine } from "../engine/db.js";
import { HASH_NAME } from "../engine/hashing.js";
import { sqlNumber } from "../engine/sql.js";
import { BACKOFF_TABLE } from "./backoff.js";

/**
 * Reads BACKOFF_TABLE. Edge cases: no widths or no groups → null.
 */
export async function backoffHashing(engine: Engine, widths: readonly number[], budget: number): Promise<{ width: number; collisionRowShare: number; hash: string } | null> {
  if (widths.length === 0) return null;
  const values = widths.map((w) => `(${sqlNumber(w)}::UBIGINT)`).join(", ");
  const rows = await engine.rows<{ width: number; collisionRows: number; rows: number }>(
    `WITH grp AS (SELECT gk, sum(rows) AS rows FROM ${BACKOFF_TABLE} WHERE gd >= 0 GROUP BY gd, gk),
          ws(width) AS (VALUES ${values}),
          b AS (SELECT width, md5_number_upper(gk) % width AS bucket, count(*) AS n, sum(rows) AS rows FROM grp CROSS JOIN ws GROUP BY ALL)
     SELECT width::DOUBLE AS width, coalesce(sum(rows) FILTER (WHERE n > 1), 0)::DOUBLE AS collisionRows, sum(rows)::DOUBLE AS rows
     FROM b GROUP BY width ORDER BY width`, "counting hash collisions of backoff groups");
  if (rows.length === 0) return null;
  const shares = rows.map((r) => ({ width: r.width, collisionRowShare: r.rows > 0 ? r.collisionRows / r.rows : 0 }));
  const chosen = shares.find((s) => s.collisionRowShare <= budget) ?? shares[shares.length - 1]!;
  return { ...chosen, hash: HASH_NAME };
}
