/**
 * engine/keyNesting: how far a column's levels nest in the entities of the --fold-by key.
 *
 * For a column c and key K: a level "stays within one entity" when every row carrying it has the
 * same key value. The nesting share is the share of the column's rows whose level stays within
 * one entity:  Σ_v rows(v) · [distinct K among rows(v) = 1] / Σ_v rows(v).
 * Near 1, the column is close to an entity label: under row folds an entity's other rows sit in
 * the fitting folds, so the column's out-of-fold encoding still sees the entity's own outcomes and
 * its row-fold figures are optimistic. The 0.95 threshold (NESTING_THRESHOLD) is common practice
 * (no citable source): "nearly every row". A missing key counts as one entity; a missing level as
 * one level. One query over the source, GROUP BY GROUPING SETS per column; only one number per
 * column crosses into JavaScript.
 */
import type { Engine } from "./db.js";
import { quoteIdent } from "./sql.js";

/** Nesting share from which the record says a column is nearly a function of the key (common practice). */
export const NESTING_THRESHOLD = 0.95;

/** Nesting share of each column (same order as `columns`); null for a column with no rows. */
export async function keyNestingShares(engine: Engine, view: string, columns: readonly string[], keyColumns: readonly string[]): Promise<(number | null)[]> {
  if (columns.length === 0 || keyColumns.length === 0) return columns.map(() => null);
  const key = keyColumns.length === 1 ? quoteIdent(keyColumns[0]!) : `[${keyColumns.map(quoteIdent).join(", ")}]`;
  const inner = [`${key} AS __k`, ...columns.map((c, i) => `${quoteIdent(c)} AS __v${i}`)].join(", ");
  const sets = columns.map((_, i) => `(__v${i})`).join(", ");
  const which = columns.length === 1 ? "0" : `CASE ${columns.map((_, i) => `WHEN GROUPING(__v${i}) = 0 THEN ${i}`).join(" ")} END`;
  // count(DISTINCT) ignores NULL, so a missing key is counted as its own entity through the flag
  const rows = await engine.rows<{ col: number; nested: number; total: number }>(
    `SELECT col, sum(rows) FILTER (WHERE entities = 1)::DOUBLE AS nested, sum(rows)::DOUBLE AS total FROM (
       SELECT (${which})::INTEGER AS col, count(*) AS rows,
              count(DISTINCT __k) + max(CASE WHEN __k IS NULL THEN 1 ELSE 0 END) AS entities
       FROM (SELECT ${inner} FROM ${view}) GROUP BY GROUPING SETS (${sets})
     ) GROUP BY col ORDER BY col`, "measuring how columns nest in the --fold-by key");
  const out: (number | null)[] = columns.map(() => null);
  for (const r of rows) if (r.total > 0) out[r.col] = (r.nested ?? 0) / r.total;
  return out;
}
