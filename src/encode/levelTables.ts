/**
 * encode/levelTables: the level table of the input being encoded,
 *   tailsift_enc_input(name, level, fold, rows, n_y, sum_y)   (level NULL = missing)
 * one row per encoded column, level and fold. It holds the training sums of an out-of-fold
 * encoding and the counts of the summary (missing, unseen, fallback rows). When the input is the
 * extract the plan was made from (same fingerprint), the plan's levels.parquet IS this table and
 * no pass is made; otherwise one GROUP BY pass (the scan's own query) builds it. The plan's own
 * level table (PLAN_LEVELS) is loaded by plan/load, the loader encode shares with drift.
 */
import { buildLevelTable, LEVEL_TABLE, type PassPlan } from "../engine/aggregate.js";
import { classSumColumn, planClasses } from "../engine/passPlan.js";
import type { Engine } from "../engine/db.js";
import { quoteLiteral, sqlNumber } from "../engine/sql.js";
import { planLevelRowsSql } from "../plan/load.js";
import { TailsiftError } from "../errors.js";

export const INPUT_LEVELS = "tailsift_enc_input";

/** A multi-class target's class sums (sum_c0 …) in a level-table SELECT ("" for other targets). */
export const classSums = (classes: number, alias = ""): string =>
  Array.from({ length: classes }, (_, k) => `, ${alias}${classSumColumn(k)}::DOUBLE AS ${classSumColumn(k)}`).join("");
/** The plan's level table (plan/load): (name, level, rows, n_y, sum_y, sum_y2), summed over folds. */
export { PLAN_LEVELS } from "../plan/load.js";

const EMPTY = `SELECT NULL::VARCHAR AS name, NULL::VARCHAR AS level, 0::INTEGER AS fold, 0::DOUBLE AS rows, 0::DOUBLE AS n_y, 0::DOUBLE AS sum_y LIMIT 0`;

/** Loads the plan's per-fold level table (levels.parquet) for `names` as the input's table. */
export async function inputLevelsFromPlan(engine: Engine, levelsPath: string, names: readonly string[], classes = 0): Promise<void> {
  const select = names.length === 0 ? EMPTY
    : `SELECT "column" AS name, level, fold::INTEGER AS fold, rows::DOUBLE AS rows, n_y::DOUBLE AS n_y, sum_y::DOUBLE AS sum_y${classSums(classes)}
       FROM (${planLevelRowsSql(levelsPath, names)})`;
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${INPUT_LEVELS} AS ${select}`, `reading the plan's level table '${levelsPath}'`);
}

/** The input view, the fold (the plan's contract in training; a single fold otherwise) and the target of the pass. */
export type PassSpec = Pick<PassPlan, "view" | "fold" | "target">;

/**
 * One pass over the input (engine/aggregate's GROUPING SETS query) for `names`, renamed by
 * column name. Returns the input's row count.
 * @throws TailsiftError when target values do not fit the plan's target kind, or (with a
 *   target) when no row has a usable target value.
 */
export async function inputLevelsFromPass(engine: Engine, names: readonly string[], pass: PassSpec, doing: string): Promise<number> {
  const totals = await buildLevelTable(engine, {
    ...pass, levelColumns: names, countColumns: [],
  }, doing);
  if (pass.target && totals.badTargets > 0) {
    throw new TailsiftError("bad_target", `target '${pass.target.column}': ${totals.badTargets} values do not fit the plan's ${pass.target.kind} target${pass.target.positive !== undefined ? ` (positive '${pass.target.positive}')` : ""}; clean them or rescan`);
  }
  if (pass.target && totals.rows > 0 && totals.targetRows === 0) {
    throw new TailsiftError("target_empty", `target '${pass.target.column}' has no values in the input; --for training needs them`);
  }
  const select = names.length === 0 ? EMPTY
    : `SELECT n.name, l.level, l.fold, l.rows::DOUBLE AS rows, l.n_y::DOUBLE AS n_y, l.sum_y${classSums(planClasses(pass).length, "l.")}
       FROM ${LEVEL_TABLE} l JOIN (VALUES ${names.map((c, i) => `(${sqlNumber(i)}, ${quoteLiteral(c)})`).join(", ")}) n(col, name) ON l.col = n.col`;
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${INPUT_LEVELS} AS ${select}`, "naming the input's level table");
  return totals.rows;
}
