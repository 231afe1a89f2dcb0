/**
 * evidence/hierarchyCandidates: the two candidates that use a column's hierarchy — backoff
 * grouping then target encoding (m fitted on the groups' sums by the flat prior's estimator; a
 * null fit means no detectable spread between groups, and every group then takes the prior),
 * and the hierarchical prior (level → parent → overall mean, weights fitted per fold).
 */
import type { AdvicePolicy } from "../advice/policy.js";
import { LEVEL_TABLE } from "../engine/aggregate.js";
import type { Engine } from "../engine/db.js";
import { sqlNumber } from "../engine/sql.js";
import { BACKOFF_TABLE, buildBackoffMap } from "../hierarchy/backoff.js";
import type { HierarchyFigures } from "../hierarchy/types.js";
import { fitPrior } from "../profile/targetFigures.js";
import type { ColumnProfile, TargetKind } from "../profile/types.js";
import { scored } from "./candidates.js";
import { groupedScoredSql } from "./groupedSql.js";
import { hierarchicalScoredSql } from "./hierarchicalSql.js";
import { hierarchicalWeights } from "./hierarchicalWeights.js";
import { scorePredictions } from "./scoreSql.js";
import type { EvidenceCandidate } from "./types.js";

const base = (column: ColumnProfile, policy: AdvicePolicy) =>
  ({ folds: policy.folds, seed: policy.seed, priorMean: column.target?.prior.mean ?? null, fallback: "prior mean" as const });

/** Backoff grouping (hierarchy/backoff), then target-kfold on the groups; "other" is a group. */
export async function backoffCandidate(engine: Engine, col: number, column: ColumnProfile, h: HierarchyFigures, kind: TargetKind, policy: AdvicePolicy): Promise<EvidenceCandidate | null> {
  const parents = h.parents.map((p) => p.parent);
  await buildBackoffMap(engine, col, parents, h.backoff.minRows);
  const [sums] = await engine.rows<{ levels: number; rows: number; sumY: number; sumY2: number; sumSumSqOverRows: number; sumRowsSq: number }>(
    `SELECT count(*)::DOUBLE AS levels, sum(gn) AS rows, sum(gs) AS sumY, sum(gs2) AS sumY2, sum(gs * gs / gn) AS sumSumSqOverRows, sum(gn * gn) AS sumRowsSq
     FROM (SELECT b.gd, b.gk, sum(l.n_y)::DOUBLE AS gn, sum(l.sum_y)::DOUBLE AS gs, sum(l.sum_y2)::DOUBLE AS gs2
           FROM ${LEVEL_TABLE} l JOIN ${BACKOFF_TABLE} b ON l.level = b.level WHERE l.col = ${sqlNumber(col)} AND l.n_y > 0 GROUP BY b.gd, b.gk)`,
    "summing the target by backoff group");
  const prior = fitPrior(kind, sums && sums.levels > 0 ? { col, ...sums } : undefined, column.target?.prior.mean ?? 0);
  const weight = prior.weight; // null: no detectable spread between groups → each group takes the prior
  const score = await scorePredictions(engine, groupedScoredSql(col, { sql: `SELECT level, gd, gk FROM ${BACKOFF_TABLE}` }, weight), kind, "backoff grouping");
  return score && {
    candidate: "backoff-target-kfold",
    params: {
      weight, method: prior.method, ...base(column, policy), grouping: "backoff", parents: [...parents].reverse(),
      minRows: h.backoff.minRows, groups: h.backoff.groups, coverage: h.backoff.coverage,
    },
    ...scored(score),
  };
}

/** The hierarchical prior toward h.priorParent. Edge case: no prior parent → null. */
export async function hierarchicalCandidate(engine: Engine, col: number, column: ColumnProfile, h: HierarchyFigures, kind: TargetKind, policy: AdvicePolicy): Promise<EvidenceCandidate | null> {
  const parent = h.priorParent;
  if (!parent) return null;
  const weights = await hierarchicalWeights(engine, col, parent, kind, column.target?.prior.mean ?? 0);
  const all = weights.find((w) => w.fold === -1);
  const score = await scorePredictions(engine, hierarchicalScoredSql(col, parent, weights), kind, "hierarchical prior");
  const groups = h.parents.find((p) => JSON.stringify(p.parent) === JSON.stringify(parent))?.groups ?? null;
  return score && {
    candidate: "hierarchical-target-kfold",
    params: {
      weight: all?.levelWeight ?? null, parentWeight: all?.parentWeight ?? null, method: all?.method ?? null, ...base(column, policy),
      prior: "hierarchical", parent, parentGroups: groups,
    },
    ...scored(score),
  };
}
