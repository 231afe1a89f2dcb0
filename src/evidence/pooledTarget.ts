/**
 * evidence/pooledTarget: target encoding of backoff groups, shared by the backoff candidate
 * (parents from the hierarchy) and the pooled candidate for identifier-like columns (no parents:
 * a level with at least minRows rows keeps its own group, every rarer level shares "other").
 * The groups come from the row counts of all folds (LEVEL_TOTALS, as the pooled one-hot's kept
 * levels do): the selection never reads the target, but it does use the held-out fold's row
 * counts. The prior weight m is fitted on the groups' sums by the flat prior's estimator; a null
 * fit means no detectable spread between groups, and every group then takes the prior (m = ∞).
 */
import type { AdvicePolicy } from "../advice/policy.js";
import { LEVEL_TABLE } from "../engine/aggregate.js";
import type { Engine } from "../engine/db.js";
import { sqlNumber } from "../engine/sql.js";
import { BACKOFF_TABLE, backoffFigures, buildBackoffMap } from "../hierarchy/backoff.js";
import type { ParentSpec } from "../hierarchy/types.js";
import { fitPrior } from "../profile/targetFigures.js";
import type { ColumnProfile, PriorWeight, TargetKind } from "../profile/types.js";
import { scored } from "./candidates.js";
import { forwardFoldFilter, inForwardStep } from "./forwardScope.js";
import { groupedScoredSql } from "./groupedSql.js";
import { scorePredictions, type Score } from "./scoreSql.js";
import type { EvidenceCandidate } from "./types.js";

/** Builds BACKOFF_TABLE for (parents shallowest first, minRows), fits m on the groups and scores. */
export async function groupedTargetScore(engine: Engine, col: number, column: ColumnProfile, parents: readonly ParentSpec[], minRows: number, kind: TargetKind, what: string): Promise<{ weight: PriorWeight; method: string; score: Score | null }> {
  await buildBackoffMap(engine, col, parents, minRows, true);
  // the map carries each level's target totals over all folds: the groups are summed from it
  // alone, except in a forward step (folds restricted), which reads the level table
  const step = inForwardStep();
  const [sums] = await engine.rows<{ levels: number; rows: number; sumY: number; sumY2: number; sumSumSqOverRows: number; sumRowsSq: number }>(
    `SELECT count(*)::DOUBLE AS levels, sum(gn) AS rows, sum(gs) AS sumY, sum(gs2) AS sumY2, sum(gs * gs / gn) AS sumSumSqOverRows, sum(gn * gn) AS sumRowsSq
     FROM ${step
       // a forward step: the groups' sums from the level table, blocks before the scored one only
       ? `(SELECT b.gd, b.gk, sum(l.n_y)::DOUBLE AS gn, sum(l.sum_y)::DOUBLE AS gs, sum(l.sum_y2)::DOUBLE AS gs2
           FROM ${LEVEL_TABLE} l JOIN ${BACKOFF_TABLE} b ON l.level = b.level WHERE l.col = ${sqlNumber(col)} AND l.n_y > 0${forwardFoldFilter("l", true)} GROUP BY b.gd, b.gk)`
       : `(SELECT gd, gk, sum(n_y)::DOUBLE AS gn, sum(sum_y)::DOUBLE AS gs, sum(sum_y2)::DOUBLE AS gs2
           FROM ${BACKOFF_TABLE} WHERE n_y > 0 GROUP BY gd, gk)`}`,
    "summing the target by backoff group");
  const prior = fitPrior(kind, sums && sums.levels > 0 ? { col, ...sums } : undefined, column.target?.prior.mean ?? 0);
  const score = await scorePredictions(engine, groupedScoredSql(col, { sql: `SELECT level, gd, gk, n_y, sum_y, sum_y2, single_fold FROM ${BACKOFF_TABLE}`, carriesTotals: true }, prior.weight), kind, what);
  return { weight: prior.weight, method: prior.method, score };
}

/**
 * Pooled target encoding for an identifier-like column: levels with fewer than minLevelRows rows
 * share "other", the rest keep their own group; as a backoff grouping with no parents (what
 * encode applies). Edge case: no level reaches minLevelRows → null (everything would be "other").
 */
export async function pooledTargetCandidate(engine: Engine, col: number, column: ColumnProfile, kind: TargetKind, policy: AdvicePolicy): Promise<EvidenceCandidate | null> {
  const minRows = policy.minLevelRows;
  // the edge case read off the count-of-counts, before building a map of every level (an
  // identifier has about one level per row): the largest level is below minRows
  if (column.countOfCounts && largestLevelRows(column.countOfCounts) < minRows) return null;
  const { weight, method, score } = await groupedTargetScore(engine, col, column, [], minRows, kind, "pooled target encoding");
  const figures = await backoffFigures(engine, minRows);
  if (figures.levelRowShare === 0) return null;
  return score && {
    candidate: "backoff-target-kfold",
    params: {
      weight, method, folds: policy.folds, seed: policy.seed, priorMean: column.target?.prior.mean ?? null, fallback: "prior mean",
      grouping: "backoff", parents: [], minRows, groups: figures.groups, coverage: figures.levelRowShare,
    },
    ...scored(score),
  };
}

/** Rows of the largest level, from a count-of-counts (0 when there are no levels). */
export function largestLevelRows(countOfCounts: readonly { count: number; levels: number }[]): number {
  return countOfCounts.reduce((m, c) => (c.levels > 0 && c.count > m ? c.count : m), 0);
}
