/**
 * hierarchy/sample: the bounded sample of levels that pattern detection looks at — per column the
 * TOP_LEVELS largest levels plus HASHED_LEVELS levels picked by a hash of their text (a
 * reproducible pseudo-random sample of the tail). At most TOP_LEVELS + HASHED_LEVELS strings per
 * column cross into JavaScript, however many levels the column has.
 */
import type { Engine } from "../engine/db.js";
import { LEVEL_TOTALS } from "../engine/levels.js";
import { sqlNumber } from "../engine/sql.js";

export const TOP_LEVELS = 5000;
export const HASHED_LEVELS = 2000;

/**
 * Sampled non-missing levels per column index. Edge cases: no columns → empty map; a column
 * with no non-missing level is absent from the map.
 */
export async function sampleLevels(engine: Engine, cols: readonly number[]): Promise<Map<number, string[]>> {
  const out = new Map<number, string[]>();
  if (cols.length === 0) return out;
  // per-column ORDER BY … LIMIT keeps a small heap per column (as engine/levels does for top levels)
  const parts = cols.flatMap((c) => [
    `(SELECT col, level FROM ${LEVEL_TOTALS} WHERE col = ${sqlNumber(c)} AND level IS NOT NULL ORDER BY rows DESC, level LIMIT ${TOP_LEVELS})`,
    `(SELECT col, level FROM ${LEVEL_TOTALS} WHERE col = ${sqlNumber(c)} AND level IS NOT NULL ORDER BY hash(level), level LIMIT ${HASHED_LEVELS})`,
  ]);
  const rows = await engine.rows<{ col: number; level: string }>(
    `SELECT DISTINCT col, level FROM (${parts.join(" UNION ALL ")}) ORDER BY col, level`, "sampling levels for hierarchy detection");
  for (const r of rows) {
    const levels = out.get(r.col);
    if (levels) levels.push(r.level);
    else out.set(r.col, [r.level]);
  }
  return out;
}
