/**
 * engine/levelFile: the level table as a file — (column, level, fold, rows, n_y, sum_y, sum_y2),
 * one row per column, level and fold. `scan --out` writes it beside profile.json so `encode
 * --for scoring` and `drift` can use the full-data mapping without the training extract, and
 * `scan --levels` reads tables of this shape produced elsewhere (by `tailsift sql`).
 */
import fs from "node:fs";
import path from "node:path";
import type { Engine } from "./db.js";
import { LEVEL_TABLE } from "./aggregate.js";
import { classSumColumn } from "./passPlan.js";
import { quoteLiteral, sqlNumber } from "./sql.js";

export const LEVEL_FILE_NAME = "levels.parquet";

/**
 * Writes the level table with column names instead of indexes, atomically (temp + rename). A
 * multi-class target's table (`classes` > 0) adds its per-class rows sum_c0 … sum_c{K-1}.
 */
export async function writeLevelTable(engine: Engine, columns: readonly string[], destination: string, classes = 0): Promise<void> {
  const extra = Array.from({ length: classes }, (_, k) => `, l.${classSumColumn(k)}`).join("");
  const tmp = path.join(path.dirname(destination), `.${path.basename(destination)}.${process.pid}.tmp`);
  const names = columns.map((c, i) => `(${sqlNumber(i)}, ${quoteLiteral(c)})`).join(", ");
  try {
    if (columns.length === 0) {
      await engine.run(`COPY (SELECT NULL::VARCHAR AS "column", NULL::VARCHAR AS level, 0 AS fold, 0::BIGINT AS rows, 0::BIGINT AS n_y, 0::DOUBLE AS sum_y, 0::DOUBLE AS sum_y2 LIMIT 0) TO ${quoteLiteral(tmp)} (FORMAT parquet)`, "writing the level table");
    } else {
      await engine.run(
        `COPY (SELECT n.name AS "column", l.level, l.fold, l.rows, l.n_y, l.sum_y, l.sum_y2${extra}
               FROM ${LEVEL_TABLE} l JOIN (VALUES ${names}) n(col, name) ON l.col = n.col
               ORDER BY n.col, l.level NULLS FIRST, l.fold)
         TO ${quoteLiteral(tmp)} (FORMAT parquet, COMPRESSION zstd)`, "writing the level table");
    }
    fs.renameSync(tmp, destination);
  } finally {
    fs.rmSync(tmp, { force: true });
  }
}
