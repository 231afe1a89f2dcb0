/**
 * hierarchy/counter: tells a counter ("R0000001", "R0000002", …) from a code. Fixed-length codes
 * ending in a run of at least 3 digits are read as (head, number); when the distinct levels fill
 * at least COUNTER_DENSITY of the number ranges spanned within each head, the prefixes are just
 * blocks of consecutive numbers, not parents that mean something (common practice: a density
 * test for sequential keys). Computed in DuckDB over every level.
 */
import type { Engine } from "../engine/db.js";
import { LEVEL_TOTALS } from "../engine/levels.js";
import { sqlNumber } from "../engine/sql.js";

export const COUNTER_DENSITY = 0.8;
/** Fewer distinct levels than this are never called a counter. */
export const COUNTER_MIN_LEVELS = 100;

/**
 * Edge cases: a shape without a trailing digit run of 3 to 15 positions (15 keeps the number
 * exact in a DOUBLE) → false; no levels of the shape's length → false.
 */
export async function isCounterLike(engine: Engine, col: number, shape: string): Promise<boolean> {
  const run = shape.length - shape.replace(/D+$/, "").length;
  if (run < 3 || run > 15) return false;
  const head = shape.length - run;
  const [r] = await engine.rows<{ levels: number | null; span: number | null }>(
    `SELECT sum(n)::DOUBLE AS levels, sum(hi - lo + 1)::DOUBLE AS span FROM (
       SELECT left(level, ${sqlNumber(head)}) AS head, count(*) AS n,
              min(TRY_CAST(substr(level, ${sqlNumber(head + 1)}) AS DOUBLE)) AS lo, max(TRY_CAST(substr(level, ${sqlNumber(head + 1)}) AS DOUBLE)) AS hi
       FROM ${LEVEL_TOTALS}
       WHERE col = ${sqlNumber(col)} AND level IS NOT NULL AND length(level) = ${sqlNumber(shape.length)}
         AND regexp_full_match(substr(level, ${sqlNumber(head + 1)}), '[0-9]+')
       GROUP BY 1)`, "checking for counter-like codes");
  const levels = r?.levels ?? 0;
  const span = r?.span ?? 0;
  return levels >= COUNTER_MIN_LEVELS && span > 0 && levels / span >= COUNTER_DENSITY;
}
