/**
 * encode/hierarchicalMaps: target encoding with a hierarchical prior, the encoding the evidence
 * scores as `hierarchical-target-kfold` (evidence/hierarchicalSql). With p the prior, M the
 * parent weight and m the level weight (null = infinite: the prior itself):
 *   parent mean = (S_p + M·p)/(N_p + M),   value = (s_i + m·parent mean)/(n_i + m);
 * a parent without target rows gives p, a level without target rows its parent's mean:
 *  - full data (scoring: the plan's sums, p = the plan's target mean; training: the mapping
 *    file, from the input's sums): levelParentTable(i)(level, seen, rows, parent, n_y, sum_y),
 *    parentsTable(i)(parent, levels, n_y, sum_y, value) and fullTable(i)(level, seen, rows,
 *    parent, n_y, sum_y, parent_n_y, parent_value, value) — every level of the plan and input,
 *    so an unseen level takes its parent's mean and an unseen parent p;
 *  - out-of-fold (training): mapTable(i)(level, fold, parent, n_other, sum_other,
 *    parent_n_other, parent_sum_other, prior_other, parent_value, value), dense over level ×
 *    fold, every sum from the other folds and prior_f the other folds' mean. The weights are
 *    the plan's (fitted on all rows); the scorer refits them on each fold's other folds.
 */
import type { Engine } from "../engine/db.js";
import { mEstimateSql } from "../engine/formulaSql.js";
import { parentSql } from "../hierarchy/parent.js";
import type { ParentSpec } from "../hierarchy/types.js";
import { foldPriorTable, fullTable, mapTable } from "./targetMaps.js";
import { levelFoldSumsSql, levelSetSql, levelSumsSql, priorSql, weightSql } from "./hierarchySql.js";

export const levelParentTable = (i: number): string => `tailsift_enc_lp_${i}`;
export const parentsTable = (i: number): string => `tailsift_enc_parents_${i}`;

interface Weights { parent: ParentSpec; weight: number | null; parentWeight: number | null }

/** Creates the three full-data tables from `from`'s sums; the prior variable must be set. */
export async function hierarchicalFullMap(engine: Engine, i: number, from: string, name: string, w: Weights): Promise<void> {
  const doing = `building the hierarchical mapping of '${name}'`;
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${levelParentTable(i)} AS
     SELECT lv.level, lv.seen, lv.rows, ${parentSql(w.parent, "lv.level")} AS parent, coalesce(s.n, 0)::DOUBLE AS n_y, coalesce(s.s, 0)::DOUBLE AS sum_y
     FROM (${levelSetSql(name)}) lv LEFT JOIN (${levelSumsSql(from, name)}) s ON s.level = lv.level`, doing);
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${parentsTable(i)} AS
     SELECT parent, count(*) FILTER (WHERE seen)::BIGINT AS levels, sum(n_y) AS n_y, sum(sum_y) AS sum_y,
            ${mEstimateSql("sum(sum_y)", "sum(n_y)", weightSql(w.parentWeight), priorSql(i))} AS value
     FROM ${levelParentTable(i)} GROUP BY parent`, doing);
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${fullTable(i)} AS
     SELECT l.*, p.n_y AS parent_n_y, p.value AS parent_value, ${mEstimateSql("l.sum_y", "l.n_y", weightSql(w.weight), "p.value")} AS value
     FROM ${levelParentTable(i)} l JOIN ${parentsTable(i)} p ON p.parent = l.parent`, doing);
}

/** Creates mapTable(i); needs the full-data tables from the same sums and foldPriorTable(i). */
export async function hierarchicalFoldMap(engine: Engine, i: number, from: string, name: string, w: Weights, pastOnly?: { folds: number }): Promise<void> {
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${mapTable(i)} AS
     WITH lf AS (${levelFoldSumsSql(from, name, pastOnly)}),
          pf AS (SELECT l.parent, lf.fold, sum(lf.n) AS n, sum(lf.s) AS s FROM lf JOIN ${levelParentTable(i)} l ON l.level = lf.level GROUP BY ALL),
          o AS (SELECT l.level, f.fold, l.parent, l.n_y - coalesce(lf.n, 0) AS n_other, l.sum_y - coalesce(lf.s, 0) AS sum_other,
                       p.n_y - coalesce(pf.n, 0) AS parent_n_other, p.sum_y - coalesce(pf.s, 0) AS parent_sum_other, f.prior AS prior_other
                FROM ${levelParentTable(i)} l CROSS JOIN ${foldPriorTable(i)} f JOIN ${parentsTable(i)} p ON p.parent = l.parent
                LEFT JOIN lf ON lf.level = l.level AND lf.fold = f.fold LEFT JOIN pf ON pf.parent = l.parent AND pf.fold = f.fold),
          v AS (SELECT *, ${mEstimateSql("parent_sum_other", "parent_n_other", weightSql(w.parentWeight), "prior_other")} AS parent_value FROM o)
     SELECT *, ${mEstimateSql("sum_other", "n_other", weightSql(w.weight), "parent_value")} AS value FROM v`,
    `building the out-of-fold hierarchical mapping of '${name}'`);
}
