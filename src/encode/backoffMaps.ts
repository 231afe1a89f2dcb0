/**
 * encode/backoffMaps: target encoding of backoff groups (encode/groupMap), the encoding the
 * evidence scores as `backoff-target-kfold` (evidence/groupedSql). Every level takes its group's
 * m-estimate (Cestnik 1990), (S_g + m·p)/(N_g + m), with p the prior; a group without target
 * rows, or a null weight (no detectable spread between groups), gives p:
 *  - full data (scoring: the plan's sums, p = the plan's target mean; training: the mapping
 *    file, from the input's sums, p = their mean): groupsTable(i)(depth, group_key, levels,
 *    rows, n_y, sum_y, value) and fullTable(i)(level, seen, rows, depth, group_key,
 *    group_n_y, group_sum_y, value);
 *  - out-of-fold (training): mapTable(i)(level, fold, depth, group_key, n_other, sum_other,
 *    prior_other, value), dense over level × fold, from the other folds' sums of the group and
 *    the other folds' prior — groupedSql's pred = (S_g − S_g,f + m·prior_f)/(N_g − N_g,f + m).
 */
import type { Engine } from "../engine/db.js";
import { mEstimateSql } from "../engine/formulaSql.js";
import { groupTable } from "./groupMap.js";
import { foldPriorTable, fullTable, mapTable } from "./targetMaps.js";
import { levelFoldSumsSql, levelSumsSql, priorSql, weightSql } from "./hierarchySql.js";

export const groupsTable = (i: number): string => `tailsift_enc_groups_${i}`;

/** Creates groupsTable(i) and fullTable(i) from `from`'s sums; the prior variable must be set. */
export async function backoffFullMap(engine: Engine, i: number, from: string, name: string, weight: number | null): Promise<void> {
  const m = weightSql(weight);
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${groupsTable(i)} AS
     SELECT g.depth, g.group_key, count(*) FILTER (WHERE g.seen)::BIGINT AS levels, sum(g.rows)::BIGINT AS rows,
            coalesce(sum(s.n), 0)::DOUBLE AS n_y, coalesce(sum(s.s), 0)::DOUBLE AS sum_y,
            ${mEstimateSql("coalesce(sum(s.s), 0)", "coalesce(sum(s.n), 0)", m, priorSql(i))} AS value
     FROM ${groupTable(i)} g LEFT JOIN (${levelSumsSql(from, name)}) s ON s.level = g.level
     GROUP BY g.depth, g.group_key`, `building the group mapping of '${name}'`);
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${fullTable(i)} AS
     SELECT g.level, g.seen, g.rows, g.depth, g.group_key, gr.n_y AS group_n_y, gr.sum_y AS group_sum_y, gr.value
     FROM ${groupTable(i)} g JOIN ${groupsTable(i)} gr ON gr.depth = g.depth AND gr.group_key = g.group_key`,
    `building the level mapping of '${name}'`);
}

/** Creates mapTable(i); needs groupsTable(i) from the same sums and foldPriorTable(i). */
export async function backoffFoldMap(engine: Engine, i: number, from: string, name: string, weight: number | null, pastOnly?: { folds: number }): Promise<void> {
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${mapTable(i)} AS
     WITH gf AS (SELECT g.depth, g.group_key, lf.fold, sum(lf.n) AS n, sum(lf.s) AS s
                 FROM (${levelFoldSumsSql(from, name, pastOnly)}) lf JOIN ${groupTable(i)} g ON g.level = lf.level GROUP BY ALL),
          o AS (SELECT gr.depth, gr.group_key, p.fold, gr.n_y - coalesce(gf.n, 0) AS n_other, gr.sum_y - coalesce(gf.s, 0) AS sum_other, p.prior AS prior_other
                FROM ${groupsTable(i)} gr CROSS JOIN ${foldPriorTable(i)} p
                LEFT JOIN gf ON gf.depth = gr.depth AND gf.group_key = gr.group_key AND gf.fold = p.fold)
     SELECT g.level, o.fold, g.depth, g.group_key, o.n_other, o.sum_other, o.prior_other,
            ${mEstimateSql("o.sum_other", "o.n_other", weightSql(weight), "o.prior_other")} AS value
     FROM ${groupTable(i)} g JOIN o ON o.depth = g.depth AND o.group_key = g.group_key`,
    `building the out-of-fold group mapping of '${name}'`);
}
