/**
 * evidence/hierarchicalWeights: the two weights of the hierarchical prior, fitted for each fold on
 * the other folds' rows only (and once on all rows, fold −1, for the recommendation): the parent's
 * weight toward the overall mean by the same estimator as the flat prior, applied to parent sums
 * (beta-binomial moments for a binary target, DerSimonian–Laird normal–normal for a continuous
 * one), and the level's weight toward its parent by nestedPriorWeight. Out-of-fold sums are
 * formed in DuckDB without a level × fold cross product: each parent's all-fold sums are corrected
 * by the levels present in the held-out fold (a level absent from fold f keeps its total).
 */
import type { Engine } from "../engine/db.js";
import { LEVEL_TABLE } from "../engine/aggregate.js";
import { sqlNumber } from "../engine/sql.js";
import { parentSql } from "../hierarchy/parent.js";
import type { ParentSpec } from "../hierarchy/types.js";
import { fitPrior } from "../profile/targetFigures.js";
import type { TargetKind } from "../profile/types.js";
import { nestedPriorWeight } from "../stats/nestedPriorWeight.js";
import { forwardFoldFilter } from "./forwardScope.js";

export interface FoldWeights { fold: number; parentWeight: number | null; levelWeight: number | null; method: string }

interface FoldSums { fold: number; parents: number; rows: number; sumY: number; sumY2: number; pss: number; pnn: number; levels: number; lss: number; nested: number }

/** Weights per fold (fold −1 = fitted on all rows). Missing values are left out of both fits. */
export async function hierarchicalWeights(engine: Engine, col: number, parent: ParentSpec, kind: TargetKind, overallMean: number): Promise<FoldWeights[]> {
  const sums = await engine.rows<FoldSums>(
    `WITH lf AS (SELECT level, fold, sum(n_y)::DOUBLE AS n, sum(sum_y)::DOUBLE AS s, sum(sum_y2)::DOUBLE AS s2 FROM ${LEVEL_TABLE}
                 WHERE col = ${sqlNumber(col)} AND n_y > 0 AND level IS NOT NULL${forwardFoldFilter()} GROUP BY level, fold),
          lt AS (SELECT level, ${parentSql(parent, "level")} AS parent, sum(n) AS n, sum(s) AS s, sum(s2) AS s2 FROM lf GROUP BY level),
          pt AS (SELECT parent, sum(n) AS n, sum(s) AS s, sum(s2) AS s2, sum(n * n) AS nn, sum(s * s / n) AS ss, count(*) AS k FROM lt GROUP BY parent),
          d AS (SELECT lt.parent, lf.fold, sum(lf.n) AS n, sum(lf.s) AS s, sum(lf.s2) AS s2,
                  sum((lt.n - lf.n) * (lt.n - lf.n) - lt.n * lt.n) AS nn,
                  sum(CASE WHEN lt.n - lf.n > 0 THEN (lt.s - lf.s) * (lt.s - lf.s) / (lt.n - lf.n) ELSE 0 END - lt.s * lt.s / lt.n) AS ss,
                  count(*) FILTER (WHERE lt.n - lf.n <= 0) AS k
                FROM lf JOIN lt USING (level) GROUP BY lt.parent, lf.fold),
          fo AS (SELECT DISTINCT fold FROM ${LEVEL_TABLE} WHERE col = -1${forwardFoldFilter()} UNION ALL SELECT -1),
          po AS (SELECT fo.fold, pt.n - coalesce(d.n, 0) AS n, pt.s - coalesce(d.s, 0) AS s, pt.s2 - coalesce(d.s2, 0) AS s2,
                   pt.nn + coalesce(d.nn, 0) AS nn, pt.ss + coalesce(d.ss, 0) AS ss, pt.k - coalesce(d.k, 0) AS k
                 FROM pt CROSS JOIN fo LEFT JOIN d ON d.parent = pt.parent AND d.fold = fo.fold)
     SELECT fold, count(*) FILTER (WHERE n > 0)::DOUBLE AS parents, coalesce(sum(n), 0)::DOUBLE AS rows, coalesce(sum(s), 0)::DOUBLE AS sumY,
            coalesce(sum(s2), 0)::DOUBLE AS sumY2, coalesce(sum(s * s / n) FILTER (WHERE n > 0), 0)::DOUBLE AS pss,
            coalesce(sum(n * n), 0)::DOUBLE AS pnn, coalesce(sum(k), 0)::DOUBLE AS levels, coalesce(sum(ss), 0)::DOUBLE AS lss,
            coalesce(sum(nn / n) FILTER (WHERE n > 0), 0)::DOUBLE AS nested
     FROM po GROUP BY fold ORDER BY fold`, "fitting the hierarchical prior's weights");
  return sums.map((f) => {
    const parentFit = fitPrior(kind, { col, levels: f.parents, rows: f.rows, sumY: f.sumY, sumY2: f.sumY2, sumSumSqOverRows: f.pss, sumRowsSq: f.pnn }, overallMean);
    const levelFit = nestedPriorWeight({ rows: f.rows, levels: f.levels, parents: f.parents, sumY2: f.sumY2, levelSumSqOverRows: f.lss, parentSumSqOverRows: f.pss, nestedRowsSq: f.nested });
    return { fold: f.fold, parentWeight: parentFit.weight, levelWeight: levelFit.weight, method: `${parentFit.method} (parents); nested ANOVA moments (levels within parents)` };
  });
}
