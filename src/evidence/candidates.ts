/**
 * evidence/candidates: builds and scores the candidates that need no hierarchy — the overall
 * mean, pooled one-hot at the advised threshold and flat target-kfold with the column's fitted m.
 */
import type { AdvicePolicy } from "../advice/policy.js";
import type { Engine } from "../engine/db.js";
import { LEVEL_TOTALS } from "../engine/levels.js";
import { quoteLiteral, sqlNumber } from "../engine/sql.js";
import type { ColumnProfile, TargetKind } from "../profile/types.js";
import { groupedScoredSql } from "./groupedSql.js";
import type { Score } from "./scoreSql.js";
import { scorePredictions, scorePredictionsByColumn } from "./scoreSql.js";
import { foldPriorCtes } from "./baseSql.js";
import { LEVEL_TABLE } from "../engine/aggregate.js";
import type { FlatOofScores } from "../engine/leakage.js";
import { aucFromU } from "../stats/aucFromGroups.js";
import { rSquaredFromSums } from "../stats/rSquaredFromGroups.js";
import { foldLoss } from "./foldLoss.js";
import type { EvidenceCandidate, ScoredCandidate } from "./types.js";

/** The scored part of a candidate; AUC or R² only when the score has it. */
export function scored(score: Score): ScoredCandidate {
  return {
    loss: score.loss, se: score.se, foldLosses: score.foldLosses,
    ...(score.auc !== undefined ? { auc: score.auc } : {}), ...(score.r2 !== undefined ? { r2: score.r2 } : {}),
  };
}

/** Every row gets the other folds' overall mean: what the column adds nothing to. */
export async function overallMeanCandidate(engine: Engine, col: number, kind: TargetKind): Promise<EvidenceCandidate | null> {
  const score = await scorePredictions(engine, groupedScoredSql(col, "none", 0), kind, "the overall mean");
  return score && { candidate: "overall-mean", params: {}, ...scored(score) };
}

/**
 * The overall-mean candidate of every column in `cols`, in one set of statements. Its prediction
 * is the fold's prior whatever the level, so a column's (level, fold) rows are summed to one row
 * per (column, fold) first: the loss sums, the squared error and the Mann–Whitney U are linear in
 * (n, s, s2) at a fixed prediction, so the figures are those of overallMeanCandidate up to the
 * order of summation. Edge case: a column with no target rows is absent.
 */
export async function overallMeanCandidates(engine: Engine, cols: readonly number[], kind: TargetKind): Promise<Map<number, EvidenceCandidate>> {
  const out = new Map<number, EvidenceCandidate>();
  if (cols.length === 0) return out;
  const sql = `WITH ${foldPriorCtes()},
  cf AS (SELECT col, fold, sum(n_y)::DOUBLE AS n, sum(sum_y)::DOUBLE AS s, sum(sum_y2)::DOUBLE AS s2 FROM ${LEVEL_TABLE}
         WHERE col IN (${cols.map((c) => sqlNumber(c)).join(", ")}) AND n_y > 0 GROUP BY col, fold)
  SELECT cf.col, cf.fold, cf.n, cf.s, cf.s2, pf.prior AS pred FROM cf JOIN pf USING (fold)`;
  for (const [col, score] of await scorePredictionsByColumn(engine, sql, kind, "the overall mean")) {
    out.set(col, { candidate: "overall-mean", params: {}, ...scored(score) });
  }
  return out;
}

/**
 * Target-kfold with the column's fitted m. No detectable spread (weight null) is scored at its
 * limit m → ∞: every level predicts the other folds' prior (not m = 0, the raw level means).
 */
export async function flatCandidate(engine: Engine, col: number, column: ColumnProfile, kind: TargetKind, policy: AdvicePolicy, shared?: FlatOofScores): Promise<EvidenceCandidate | null> {
  const weight = column.target ? column.target.prior.weight : null;
  const reused = shared && shared.weights.has(col) && shared.weights.get(col) === weight ? sharedFlatScore(shared, col, kind) : undefined;
  const score = reused !== undefined ? reused : await scorePredictions(engine, groupedScoredSql(col, "identity", weight), kind, "flat target encoding");
  return score && {
    candidate: "target-kfold",
    params: { weight, folds: policy.folds, seed: policy.seed, priorMean: column.target?.prior.mean ?? null, fallback: "prior mean" },
    ...scored(score),
  };
}

/**
 * The flat candidate's score from the leakage statement (engine/leakage leakageScores): the same
 * predictions — the other folds' level sums shrunk with the same m toward the same fold prior,
 * missing values at the fold prior — summed per fold there, and the out-of-fold Mann–Whitney sums
 * of the leakage figure are those of the flat candidate's predictions. undefined when the column
 * was not scored there (its evidence is then predicted again).
 */
function sharedFlatScore(shared: FlatOofScores, col: number, kind: TargetKind): Score | null | undefined {
  const folds = shared.folds.get(col);
  const oof = shared.sums.find((s) => s.col === col && s.mode === "oof");
  if (!folds || !oof) return undefined;
  const summary = foldLoss(folds);
  if (!summary) return null;
  const rows = folds.reduce((s, f) => s + f.rows, 0);
  if (kind === "binary") return { ...summary, rows, auc: aucFromU(oof) };
  const n = rows;
  const sy = folds.reduce((s, f) => s + f.sumY, 0);
  const sy2 = folds.reduce((s, f) => s + f.sumY2, 0);
  return { ...summary, rows, r2: rSquaredFromSums(folds.reduce((s, f) => s + f.loss, 0), sy2 - (sy * sy) / n) };
}

/**
 * Pooled one-hot: kept = levels with at least minLevelRows rows, the largest maxOneHot − 1 (ties by
 * value, as topLevels); every other non-missing level is "other". Each group predicts its raw
 * out-of-fold rate (an unpenalised one-hot model). Edge case: no level qualifies → null.
 */
export async function pooledCandidate(engine: Engine, col: number, column: ColumnProfile, kind: TargetKind, policy: AdvicePolicy): Promise<EvidenceCandidate | null> {
  const kept = await engine.rows<{ level: string; rows: number }>(
    `SELECT level, rows::DOUBLE AS rows FROM ${LEVEL_TOTALS} WHERE col = ${sqlNumber(col)} AND level IS NOT NULL AND rows >= ${sqlNumber(policy.minLevelRows)}
     ORDER BY rows DESC, level LIMIT ${sqlNumber(Math.max(1, policy.maxOneHot - 1))}`, "choosing the pooled one-hot levels");
  if (kept.length === 0) return null;
  const list = kept.map((k) => quoteLiteral(k.level)).join(", ");
  const mapping = { sql: `SELECT level, CASE WHEN level IN (${list}) THEN 0 ELSE -1 END AS gd, CASE WHEN level IN (${list}) THEN level ELSE '' END AS gk,
      n_y, sum_y, sum_y2, single_fold
    FROM ${LEVEL_TOTALS} WHERE col = ${sqlNumber(col)} AND level IS NOT NULL`, carriesTotals: true as const };
  const score = await scorePredictions(engine, groupedScoredSql(col, mapping, 0), kind, "pooled one-hot");
  const nonMissing = column.rows - column.missing;
  const keptRows = kept.reduce((s, k) => s + k.rows, 0);
  return score && {
    candidate: "pooled-one-hot",
    params: { keep: kept.map((k) => k.level), other: "other", pooledRowShare: nonMissing > 0 ? Math.max(0, 1 - keptRows / nonMissing) : 0, minRows: policy.minLevelRows },
    ...scored(score),
  };
}
