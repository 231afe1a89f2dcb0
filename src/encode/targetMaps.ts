/**
 * encode/targetMaps: the mapping tables of target encoding (m-estimate, Cestnik 1990: a level's
 * value is (sum + m·prior)/(n + m), n = rows with a target, sum = their target total), built in
 * DuckDB from level sums, never from rows:
 *  - full-data (scoring, and the mapping file of a training run): one row per level,
 *    prior p = the target mean of the sums used (scoring: the plan's target mean);
 *  - out-of-fold (training): one row per (level, fold) for EVERY level and fold, from the other
 *    folds' sums, prior = the other folds' target mean (a fold holding every target row falls
 *    back to the overall mean); a level with no target rows in the other folds and m = 0 gets
 *    the other folds' prior.
 * Formulas as in stats/mEstimate.ts and engine/leakage.ts (the scan's out-of-fold score).
 *
 * Past-only (training with a time-blocks plan, --time): every "other folds" sum becomes a sum
 * over the EARLIER blocks only, with no change to the map formulas: a map subtracts a (level,
 * fold f) sum from the level's total, and pastSumsSql makes that sum the one over blocks ≥ f, so
 * total − it = the sum over blocks < f. Block 0 has no earlier rows: its levels and its missing
 * values take the prior (the fallback of a fold holding every target row: the input's overall
 * mean — a constant, the same for every row of block 0).
 */
import type { Engine } from "../engine/db.js";
import { mEstimateSql } from "../engine/formulaSql.js";
import { quoteLiteral, sqlNumber } from "../engine/sql.js";

export const mapTable = (i: number): string => `tailsift_enc_map_${i}`;
export const fullTable = (i: number): string => `tailsift_enc_full_${i}`;
/** DuckDB variable: the prior p of column i (DOUBLE). */
export const priorVar = (i: number): string => `tailsift_enc_p_${i}`;
/** DuckDB variable: the other-folds prior of column i, a list indexed by fold + 1. */
export const foldPriorVar = (i: number): string => `tailsift_enc_fold_prior_${i}`;

/** A double as exact SQL (the text round-trips; DuckDB parses it as DOUBLE, not DECIMAL). */
export const sqlDouble = (x: number): string => `CAST(${quoteLiteral(sqlNumber(x))} AS DOUBLE)`;
/**
 * Past-only form of a per-(key…, fold) sums query (`perFold`: columns `keys`, fold, and `sums`):
 * for each fold f in 0..K−1 the sums over folds ≥ f (a key with no row at fold ≥ f has no row).
 * Subtracted from a key's total it leaves the sum over folds < f.
 */
export function pastSumsSql(perFold: string, keys: readonly string[], sums: readonly string[], folds: number): string {
  const k = keys.map((c) => `x.${c}`).join(", ");
  return `SELECT ${k ? `${k}, ` : ""}f.fold, ${sums.map((s) => `sum(x.${s}) AS ${s}`).join(", ")}
    FROM (${perFold}) x JOIN (SELECT range::INTEGER AS fold FROM range(${sqlNumber(folds)})) f ON x.fold >= f.fold
    GROUP BY ${k ? `${k}, ` : ""}f.fold`;
}

/** A flat weight as SQL: null is m = ∞ (NULL: mEstimateSql then gives the prior). */
const weightOrNull = (m: number | null): string => (m === null ? "NULL::DOUBLE" : sqlDouble(m));



/**
 * Sets p (`priorVar(i)`) to `prior` (SQL) and creates `fullTable(i)`(level, rows, n_y, sum_y,
 * value) from `from` (a level table with name, level, rows, n_y, sum_y; folds are summed).
 */
export async function fullTargetMap(engine: Engine, i: number, from: string, name: string, m: number | null, prior: string): Promise<void> {
  await engine.run(`SET VARIABLE ${priorVar(i)} = (${prior})::DOUBLE`, `setting the prior of '${name}'`);
  const p = `getvariable(${quoteLiteral(priorVar(i))})`;
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${fullTable(i)} AS
     SELECT level, sum(rows)::BIGINT AS rows, sum(n_y)::BIGINT AS n_y, sum(sum_y)::DOUBLE AS sum_y,
            ${mEstimateSql("sum(sum_y)", "sum(n_y)", weightOrNull(m), p)} AS value
     FROM ${from} WHERE name = ${quoteLiteral(name)} AND level IS NOT NULL GROUP BY level`,
    `building the target mapping of '${name}'`);
}

/** The training input's target mean for one column's sums (SQL, for `fullTargetMap`). */
export const inputMeanSql = (from: string, name: string): string =>
  `SELECT sum(sum_y) / sum(n_y) FROM ${from} WHERE name = ${quoteLiteral(name)}`;

/** The table of other-folds priors of column i: (fold, prior), one row per fold 0..K−1. */
export const foldPriorTable = (i: number): string => `tailsift_enc_fold_prior_t${i}`;

/**
 * Creates `foldPriorTable(i)` from `from`'s sums of column `name` (missing levels included: the
 * other folds' target mean over all their rows) and sets the list variable `foldPriorVar(i)`.
 * A fold holding every target row falls back to the overall mean.
 */
export async function foldPriors(engine: Engine, i: number, from: string, name: string, folds: number, pastOnly = false): Promise<void> {
  const col = quoteLiteral(name);
  const perFold = `SELECT fold, sum(n_y) AS fn, sum(sum_y) AS fs FROM ${from} WHERE name = ${col} GROUP BY fold`;
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${foldPriorTable(i)} AS
     WITH f AS (${pastOnly ? pastSumsSql(perFold, [], ["fn", "fs"], folds) : perFold}),
          g AS (SELECT sum(n_y) AS tn, sum(sum_y) AS ts FROM ${from} WHERE name = ${col}),
          k AS (SELECT range::INTEGER AS fold FROM range(${sqlNumber(folds)}))
     SELECT k.fold, CASE WHEN g.tn - coalesce(f.fn, 0) > 0 THEN (g.ts - coalesce(f.fs, 0)) / (g.tn - coalesce(f.fn, 0))
                         ELSE g.ts / g.tn END AS prior
     FROM k LEFT JOIN f USING (fold) CROSS JOIN g`, `computing the other-folds priors of '${name}'`);
  await engine.run(`SET VARIABLE ${foldPriorVar(i)} = (SELECT list(prior ORDER BY fold) FROM ${foldPriorTable(i)})`, `setting the fold priors of '${name}'`);
}

/**
 * Creates `mapTable(i)`(level, fold, n_other, sum_other, prior_other, value), dense over every
 * level × fold, and the list variable `foldPriorVar(i)` of the other-folds priors.
 */
export async function outOfFoldMap(engine: Engine, i: number, from: string, name: string, m: number | null, folds: number, pastOnly = false): Promise<void> {
  const col = quoteLiteral(name);
  await foldPriors(engine, i, from, name, folds, pastOnly);
  const perFold = `SELECT level, fold, sum(n_y) AS n, sum(sum_y) AS s FROM ${from} WHERE name = ${col} AND level IS NOT NULL GROUP BY ALL`;
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${mapTable(i)} AS
     WITH raw AS (${perFold}),
          l AS (${pastOnly ? pastSumsSql("SELECT * FROM raw", ["level"], ["n", "s"], folds) : "SELECT * FROM raw"}),
          t AS (SELECT level, sum(n) AS tn, sum(s) AS ts FROM raw GROUP BY level),
          o AS (SELECT t.level, p.fold, t.tn - coalesce(l.n, 0) AS n_other, t.ts - coalesce(l.s, 0) AS sum_other, p.prior AS prior_other
                FROM t CROSS JOIN ${foldPriorTable(i)} p LEFT JOIN l ON l.level = t.level AND l.fold = p.fold)
     SELECT level, fold, n_other, sum_other, prior_other, ${mEstimateSql("sum_other", "n_other", weightOrNull(m), "prior_other")} AS value FROM o`,
    `building the out-of-fold mapping of '${name}'`);
}
