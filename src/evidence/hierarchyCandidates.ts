/**
 * evidence/hierarchyCandidates: the two candidates that use a column's hierarchy — backoff
 * grouping then target encoding (m fitted on the groups' sums by the flat prior's estimator; a
 * null fit means no detectable spread between groups, and every group then takes the prior),
 * and the hierarchical prior (level → parent → overall mean, weights fitted per fold).
 */
import type { AdvicePolicy } from "../advice/policy.js";
import type { Engine } from "../engine/db.js";
import type { HierarchyFigures } from "../hierarchy/types.js";
import type { ColumnProfile, TargetKind } from "../profile/types.js";
import { scored } from "./candidates.js";
import { hierarchicalScoredSql } from "./hierarchicalSql.js";
import { hierarchicalWeights } from "./hierarchicalWeights.js";
import { groupedTargetScore } from "./pooledTarget.js";
import { scorePredictions } from "./scoreSql.js";
import type { EvidenceCandidate } from "./types.js";

const base = (column: ColumnProfile, policy: AdvicePolicy) =>
  ({ folds: policy.folds, seed: policy.seed, priorMean: column.target?.prior.mean ?? null, fallback: "prior mean" as const });

/** Backoff grouping (hierarchy/backoff), then target-kfold on the groups; "other" is a group. */
export async function backoffCandidate(engine: Engine, col: number, column: ColumnProfile, h: HierarchyFigures, kind: TargetKind, policy: AdvicePolicy): Promise<EvidenceCandidate | null> {
  const parents = h.parents.map((p) => p.parent);
  // null weight: no detectable spread between groups → each group takes the prior
  const { weight, method, score } = await groupedTargetScore(engine, col, column, parents, h.backoff.minRows, kind, "backoff grouping");
  return score && {
    candidate: "backoff-target-kfold",
    params: {
      weight, method, ...base(column, policy), grouping: "backoff", parents: [...parents].reverse(),
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
