/**
 * evidence/scoreSql: scores one candidate's out-of-fold predictions in DuckDB. The candidate
 * gives a query of (fold, n, s, s2, pred) — one row per (level, fold) with its target sums and
 * the prediction every row in it receives. Per fold, in SQL: log loss −Σ[s·ln p + (n − s)·ln(1 − p)]
 * with p clipped to [1e-15, 1 − 1e-15] (binary), or squared error Σ(s2 − 2·pred·s + n·pred²)
 * (continuous). Over all folds: AUC by the Mann–Whitney U statistic summed over distinct
 * predictions (ties ½, as engine/leakage does), or R² = 1 − SSE/SST.
 */
import type { Engine } from "../engine/db.js";
import { logLossSql, mannWhitneyUSql } from "../engine/formulaSql.js";
import type { TargetKind } from "../profile/types.js";
import { aucFromU } from "../stats/aucFromGroups.js";
import { rSquaredFromSums } from "../stats/rSquaredFromGroups.js";
import { foldLoss } from "./foldLoss.js";
import { recordFoldSums } from "./forwardScope.js";

const SCORED = "tailsift_evidence_scored";

export interface Score { loss: number; se: number | null; foldLosses: number[]; rows: number; auc?: number | null; r2?: number | null }

/** Runs the candidate's query once (into a temp table) and reads bounded sums back. */
export async function scorePredictions(engine: Engine, scoredSql: string, kind: TargetKind, what: string): Promise<Score | null> {
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${SCORED} AS ${scoredSql}`, `predicting out-of-fold (${what})`);
  const loss = kind === "binary"
    ? logLossSql("s", "(n - s)", "pred")
    : "s2 - 2 * pred * s + n * pred * pred";
  const folds = await engine.rows<{ fold: number; rows: number; loss: number }>(
    `SELECT fold, sum(n)::DOUBLE AS rows, sum(${loss})::DOUBLE AS loss FROM ${SCORED} GROUP BY fold ORDER BY fold`, `scoring ${what}`);
  recordFoldSums(folds); // a forward step (evidence/forward) keeps its scored block's sums
  const summary = foldLoss(folds);
  if (!summary) return null;
  const rows = folds.reduce((s, f) => s + f.rows, 0);
  if (kind === "continuous") {
    const [t] = await engine.rows<{ sse: number; sst: number }>(
      `SELECT sum(s2 - 2 * pred * s + n * pred * pred)::DOUBLE AS sse, (sum(s2) - sum(s) * sum(s) / sum(n))::DOUBLE AS sst FROM ${SCORED}`, `scoring ${what}`);
    return { ...summary, rows, r2: t ? rSquaredFromSums(t.sse, t.sst) : null };
  }
  const [u] = await engine.rows<{ u: number; positives: number; negatives: number }>(
    mannWhitneyUSql(`SELECT pred AS score, sum(s) AS pos, sum(n - s) AS neg FROM ${SCORED} GROUP BY pred`, []), `scoring ${what}`);
  return { ...summary, rows, auc: u ? aucFromU(u) : null };
}
