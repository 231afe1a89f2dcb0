/**
 * Helpers for the hierarchy and evidence tests: generated CSVs and the real scan pass (the level
 * table and its totals built exactly as scan builds them), with an engine kept open for queries.
 */
import { buildLevelTable } from "../../src/engine/aggregate.js";
import { withEngine, type Engine } from "../../src/engine/db.js";
import { buildLevelTotals } from "../../src/engine/levels.js";
import { openSource } from "../../src/engine/source.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { resolveTarget } from "../../src/engine/target.js";
import { rowHashFoldSql as foldSql, rowHashFolds } from "../../src/engine/folds.js";
import type { TargetKind } from "../../src/profile/types.js";

export interface Pass { engine: Engine; columns: string[]; levelColumns: string[] }

/** Runs the level pass over `file` (as scan does: folds 5, seed 42) and calls `fn` with the open engine. */
export async function withLevelTable<T>(
  file: string, levelColumns: string[], target: { column: string; kind: TargetKind } | undefined,
  fn: (pass: Pass) => Promise<T>,
): Promise<T> {
  return withEngine({ threads: 1 }, async (engine) => {
    const source = await openSource(engine, [file]);
    await buildLevelTable(engine, {
      view: source.view, levelColumns, countColumns: [], fold: rowHashFolds(source.columns, 5, 42),
      target: target ? resolveTarget({ column: target.column, kind: target.kind }, target.kind === "binary" ? ["0", "1"] : ["1.5", "2.5", "3"]) : undefined,
    });
    await buildLevelTotals(engine);
    return fn({ engine, columns: source.columns, levelColumns });
  });
}

/** Every row of a CSV as text, with the fold scan assigns it (foldSql over all columns, seed 42, 5 folds). */
export async function rowsWithFolds(engine: Engine, file: string, columns: string[]): Promise<(Record<string, string | null> & { fold: number })[]> {
  return engine.rows(`SELECT *, ${foldSql(columns, 42, 5)} AS fold FROM read_csv(${quoteLiteral(file)}, all_varchar = true, header = true)`, "reading rows back");
}

/** CSV text from a header and rows (no quoting needed for the generated values). */
export function csv(header: string[], rows: (string | number)[][]): string {
  return `${[header.join(","), ...rows.map((r) => r.join(","))].join("\n")}\n`;
}

/**
 * One row of the coded extract of the brute-force evidence tests (bruteForce, forwardHierarchy):
 * ~30 % of rows in three big codes ("99x0", rate ½), the rest 4-digit codes under 8 two-digit
 * parents whose rate rises with the parent (and by 0.4 for every fourth leaf); rows 0–14 have
 * the code missing, every 35th row (from 7) the target. Draws from `rand` in a fixed order.
 */
export function codedRow(rand: () => number, i: number): { code: string; y: number | ""; parent: number; leaf: number } {
  const big = rand() < 0.3;
  const parent = 10 + Math.floor(rand() * 8);
  const leaf = Math.floor(rand() * 20);
  const code = i < 15 ? "" : big ? `99${String(Math.floor(rand() * 3))}0` : `${parent}${String(leaf).padStart(2, "0")}`;
  const rate = big ? 0.5 : 0.05 + 0.06 * (parent - 10) + (leaf % 4 === 0 ? 0.4 : 0);
  const y = i % 35 === 7 ? "" : rand() < rate ? 1 : 0;
  return { code, y, parent, leaf };
}
