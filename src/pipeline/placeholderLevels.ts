/**
 * pipeline/placeholderLevels: step 1 of the advice pipeline, after the column figures — counts, per measured column, the rows whose level is spelled like a
 * missing value (profile/placeholders), from the level totals — a scan of the levels, not of the
 * rows (the regex matcher runs only on the levels a cheap pre-filter lets through,
 * profile/placeholders placeholderEntrySql); only the totals and the largest PLACEHOLDER_TOP
 * such levels per column cross into JavaScript. Sets ColumnProfile.placeholders where there are any.
 */
import { placeholderEntrySql } from "../profile/placeholders.js";
import type { ColumnProfile } from "../profile/types.js";
import type { Engine } from "../engine/db.js";
import { LEVEL_TOTALS } from "../engine/levels.js";

export const PLACEHOLDER_TOP = 10;

export async function addPlaceholderFigures(engine: Engine, columns: ColumnProfile[]): Promise<void> {
  if (columns.length === 0) return;
  const rows = await engine.rows<{ col: number; level: string; rows: number; entry: string; n: number; total: number; rn: number }>(
    `WITH m AS (SELECT col, level, rows::DOUBLE AS rows, ${placeholderEntrySql("level")} AS entry FROM ${LEVEL_TOTALS} WHERE level IS NOT NULL),
     h AS (SELECT *, count(*) OVER (PARTITION BY col)::DOUBLE AS n, sum(rows) OVER (PARTITION BY col)::DOUBLE AS total,
                  row_number() OVER (PARTITION BY col ORDER BY rows DESC, level) AS rn FROM m WHERE entry IS NOT NULL)
     SELECT col, level, rows, entry, n, total, rn FROM h WHERE rn <= ${PLACEHOLDER_TOP} ORDER BY col, rn`,
    "looking for placeholder levels");
  for (const r of rows) {
    const column = columns[r.col];
    if (!column) continue;
    column.placeholders ??= { rows: r.total, levels: r.n, top: [] };
    column.placeholders.top.push({ value: r.level, rows: r.rows, entry: r.entry });
  }
}
