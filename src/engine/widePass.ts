/**
 * engine/widePass: the level pass for wide inputs. Instead of one GROUPING SETS query per batch of
 * columns (whose memory grows faster than the number of sets), every input row is turned into one
 * row per measured column — (col, level) — by zipping two UNNESTs (what UNPIVOT does inside
 * DuckDB, but with the column index as an integer rather than its name), after the row's fold,
 * target and bad-target flag have been computed once. One GROUP BY (col, level, fold) then gives
 * exactly the level table of engine/aggregate's GROUPING SETS pass:
 *   tailsift_levels(col, level, fold, rows, n_y, sum_y, sum_y2, bad, __nn0 …)
 * The per-fold totals (col = -1) ride along as one more unnested entry per row; the non-missing
 * counts of numeric columns ride along as marker entries (col = -2 - j, level '' when present),
 * which are summed (and deleted) once the pass is done. Distinct-counted numeric columns add their
 * values as entries col = DISTINCT_COL_BASE - j, which engine/aggregate reads and deletes. Time
 * columns' range aggregates are not taken here: engine/aggregate sums them apart (engine/passExtras;
 * filtered to the totals entries they made this statement crawl).
 * Level rows carry bad per group, as in the GROUPING SETS pass. With plan.contentColumns the row's content hash is
 * computed once, before the unnest, and summed on the totals rows only (__content), as in the
 * GROUPING SETS pass.
 */
import type { Engine } from "./db.js";
import { classSumsSql, DISTINCT_COL_BASE, LEVEL_TABLE, rowFieldsSql, type PassPlan } from "./passPlan.js";
import { quoteIdent, sqlNumber } from "./sql.js";

/**
 * The wide pass is used from this many measured columns on. Measured with bench/wide-crossover.mjs
 * (the pass alone, GROUPING SETS time / wide time; bench/README.md "Wide inputs"): 10k rows 1.54×
 * at 20 columns, 2.56× at 200, 3.84× at 400; 100k rows 1.02× at 20, 1.20× at 200; 1M rows 0.83×
 * at 20 and 0.71× at 60 (GROUPING SETS is faster on long files). The row count is not known
 * before the pass, so the choice is by columns: from 200 on, where GROUPING SETS needed batches
 * (one read of the input each) and its memory grows faster than the number of sets.
 */
export const WIDE_PASS_MIN_COLUMNS = 200;

/** True when the plan is counted by the wide (unnest) pass rather than by GROUPING SETS. */
export function useWidePass(plan: PassPlan): boolean {
  const forced = process.env.TAILSIFT_PASS;
  if (forced === "wide") return true;
  if (forced === "grouping") return false;
  return plan.levelColumns.length >= WIDE_PASS_MIN_COLUMNS;
}

/** The aggregate of the wide pass, including the totals (-1), numeric-marker (≤ -2) and distinct (≤ DISTINCT_COL_BASE) rows. */
export function widePassSql(plan: PassPlan): string {
  const keys = plan.distinctColumns ?? [];
  const cols = [
    ...plan.levelColumns.map((_, i) => sqlNumber(i)),
    "-1",
    ...plan.countColumns.map((_, j) => sqlNumber(-2 - j)),
    ...keys.map((_, j) => sqlNumber(DISTINCT_COL_BASE - j)),
  ];
  const values = [
    ...plan.levelColumns.map((c) => quoteIdent(c)),
    "NULL::VARCHAR",
    ...plan.countColumns.map((c) => `CASE WHEN ${quoteIdent(c)} IS NULL THEN NULL ELSE '' END`),
    ...keys.map((c) => quoteIdent(c)),
  ];
  const content = plan.contentColumns ? `, sum(__h) FILTER (WHERE col = -1)::HUGEINT AS __content` : "";
  const y2 = plan.target?.kind === "binary" ? "coalesce(sum(__y), 0)::DOUBLE" : "coalesce(sum(__y * __y), 0)::DOUBLE";
  return `SELECT col, level, __fold AS fold, count(*)::BIGINT AS rows, count(__y)::BIGINT AS n_y,
  coalesce(sum(__y), 0)::DOUBLE AS sum_y, ${y2} AS sum_y2, count(*) FILTER (WHERE __bad)::BIGINT AS bad${classSumsSql(plan)}${content}
FROM (SELECT __fold, __y, __bad${plan.contentColumns ? ", __h" : ""}, unnest([${cols.join(", ")}])::INTEGER AS col, unnest(__vals) AS level
      FROM (SELECT ${rowFieldsSql(plan).join(", ")}, [${values.join(", ")}]::VARCHAR[] AS __vals
            FROM ${plan.view}))
GROUP BY col, level, __fold`;
}

/**
 * Builds tailsift_levels with the wide pass and returns the numeric columns' non-missing counts,
 * summed from their marker rows (one small GROUP BY col, fold read into JavaScript: at most folds ×
 * numeric columns rows), which are then deleted. The counts used to be pivoted into __nn columns
 * by one aggregate per column with a FILTER — 36 s of a 66 s scan of the bench's 1,500-column file,
 * whose 1,125 numeric-looking columns made 1,125 filtered aggregates.
 */
export async function buildWideLevelTable(engine: Engine, plan: PassPlan, doing: string): Promise<Map<string, number>> {
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${LEVEL_TABLE} AS ${widePassSql(plan)}`, doing);
  const nonMissing = new Map<string, number>();
  if (plan.countColumns.length === 0) return nonMissing;
  const markerFloor = sqlNumber(DISTINCT_COL_BASE);
  const counts = await engine.rows<{ col: number; n: number }>(
    `SELECT col, coalesce(sum(rows) FILTER (WHERE level IS NOT NULL), 0)::DOUBLE AS n
     FROM ${LEVEL_TABLE} WHERE col <= -2 AND col > ${markerFloor} GROUP BY col`, "counting non-missing numeric values");
  for (const r of counts) {
    const c = plan.countColumns[-2 - r.col];
    if (c !== undefined) nonMissing.set(c, r.n);
  }
  // the distinct entries (≤ DISTINCT_COL_BASE) stay for engine/aggregate to read
  await engine.run(`DELETE FROM ${LEVEL_TABLE} WHERE col <= -2 AND col > ${markerFloor}`, "counting non-missing numeric values");
  return nonMissing;
}
