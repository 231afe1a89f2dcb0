/**
 * encode/levelTables: the level table of the input being encoded,
 *   tailsift_enc_input(name, level, fold, rows, n_y, sum_y)   (level NULL = missing)
 * one row per encoded column, level and fold. It holds the training sums of an out-of-fold
 * encoding and the counts of the summary (missing, unseen, fallback rows). When the input is the
 * extract the plan was made from (same fingerprint), the plan's levels.parquet IS this table and
 * no pass is made; otherwise one GROUP BY pass (the scan's own query) builds it.
 */
import { buildLevelTable, LEVEL_TABLE } from "../engine/aggregate.js";
import type { Engine } from "../engine/db.js";
import type { FoldContract } from "../engine/folds.js";
import { quoteLiteral, sqlNumber } from "../engine/sql.js";
import type { TargetSpec } from "../engine/target.js";
import { TailsiftError } from "../errors.js";

export const INPUT_LEVELS = "tailsift_enc_input";
/** The plan's level table for the encoded columns, summed over folds: (name, level, rows, n_y, sum_y). */
export const PLAN_LEVELS = "tailsift_enc_plan";

const EMPTY = `SELECT NULL::VARCHAR AS name, NULL::VARCHAR AS level, 0::INTEGER AS fold, 0::DOUBLE AS rows, 0::DOUBLE AS n_y, 0::DOUBLE AS sum_y LIMIT 0`;

const NEEDED = ["column", "level", "fold", "rows", "n_y", "sum_y"];

/**
 * Loads the plan's levels.parquet, only the encoded columns (the file may also hold identifier
 * columns with millions of levels), summed over folds into PLAN_LEVELS.
 * @throws TailsiftError `bad_level_table` when the file lacks a needed field or any of `names`.
 */
export async function planLevels(engine: Engine, levelsPath: string, names: readonly string[]): Promise<void> {
  const doing = `reading the plan's level table '${levelsPath}'`;
  const described = await engine.rows<{ column_name: string }>(`DESCRIBE SELECT * FROM read_parquet(${quoteLiteral(levelsPath)})`, doing);
  const have = new Set(described.map((d) => d.column_name));
  const lacking = NEEDED.filter((c) => !have.has(c));
  if (lacking.length > 0) throw new TailsiftError("bad_level_table", `'${levelsPath}' is not a tailsift level table (no ${lacking.join(", ")}); rescan with scan --out`);
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${PLAN_LEVELS} AS
     SELECT "column" AS name, level, sum(rows)::BIGINT AS rows, sum(n_y)::BIGINT AS n_y, sum(sum_y)::DOUBLE AS sum_y
     FROM read_parquet(${quoteLiteral(levelsPath)}) WHERE "column" IN (${names.map(quoteLiteral).join(", ")}) GROUP BY ALL`, doing);
  const rows = await engine.rows<{ name: string }>(`SELECT DISTINCT name FROM ${PLAN_LEVELS}`, doing);
  const found = new Set(rows.map((r) => r.name));
  const absent = names.filter((n) => !found.has(n));
  if (absent.length > 0) {
    throw new TailsiftError("bad_level_table", `'${levelsPath}' has no levels of ${absent.map((n) => `'${n}'`).join(", ")}; it belongs to another scan — rescan with --out`);
  }
}

/** Loads the plan's per-fold level table (levels.parquet) for `names` as the input's table. */
export async function inputLevelsFromPlan(engine: Engine, levelsPath: string, names: readonly string[]): Promise<void> {
  const select = names.length === 0 ? EMPTY
    : `SELECT "column" AS name, level, fold::INTEGER AS fold, rows::DOUBLE AS rows, n_y::DOUBLE AS n_y, sum_y::DOUBLE AS sum_y
       FROM read_parquet(${quoteLiteral(levelsPath)}) WHERE "column" IN (${names.map(quoteLiteral).join(", ")})`;
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${INPUT_LEVELS} AS ${select}`, `reading the plan's level table '${levelsPath}'`);
}

export interface PassSpec {
  view: string;
  /** The plan's fold contract in training; a single fold otherwise. */
  fold: FoldContract;
  target?: TargetSpec;
}

/**
 * One pass over the input (engine/aggregate's GROUPING SETS query) for `names`, renamed by
 * column name. Returns the input's row count.
 * @throws TailsiftError when target values do not fit the plan's target kind, or (with a
 *   target) when no row has a usable target value.
 */
export async function inputLevelsFromPass(engine: Engine, names: readonly string[], pass: PassSpec, doing: string): Promise<number> {
  const totals = await buildLevelTable(engine, {
    view: pass.view, levelColumns: names, countColumns: [],
    ...(pass.target ? { target: pass.target } : {}), fold: pass.fold,
  }, doing);
  if (pass.target && totals.badTargets > 0) {
    throw new TailsiftError("bad_target", `target '${pass.target.column}': ${totals.badTargets} values do not fit the plan's ${pass.target.kind} target${pass.target.positive !== undefined ? ` (positive '${pass.target.positive}')` : ""}; clean them or rescan`);
  }
  if (pass.target && totals.rows > 0 && totals.targetRows === 0) {
    throw new TailsiftError("target_empty", `target '${pass.target.column}' has no values in the input; --for training needs them`);
  }
  const select = names.length === 0 ? EMPTY
    : `SELECT n.name, l.level, l.fold, l.rows::DOUBLE AS rows, l.n_y::DOUBLE AS n_y, l.sum_y
       FROM ${LEVEL_TABLE} l JOIN (VALUES ${names.map((c, i) => `(${sqlNumber(i)}, ${quoteLiteral(c)})`).join(", ")}) n(col, name) ON l.col = n.col`;
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${INPUT_LEVELS} AS ${select}`, "naming the input's level table");
  return totals.rows;
}
