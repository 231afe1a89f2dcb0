/**
 * evidence/scoreSql: scores one candidate's out-of-fold predictions in DuckDB. The candidate
 * gives a query of (fold, n, s, s2, pred) — one row per (level, fold) with its target sums and
 * the prediction every row in it receives. Per fold, in SQL: log loss −Σ[s·ln p + (n − s)·ln(1 − p)]
 * with p clipped to [1e-15, 1 − 1e-15] (binary), or squared error Σ(s2 − 2·pred·s + n·pred²)
 * (continuous). Over all folds: AUC by the Mann–Whitney U statistic summed over distinct
 * predictions (ties ½, as engine/leakage does), or R² = 1 − SSE/SST. scorePredictionsByColumn
 * does the same for several columns in one set of statements (a query with a col column).
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
  const { scores, folds } = await scoreByColumn(engine, `SELECT 0 AS col, fold, n, s, s2, pred FROM (${scoredSql})`, kind, what);
  recordFoldSums(folds.get(0) ?? []); // a forward step (evidence/forward) keeps its scored block's sums
  return scores.get(0) ?? null;
}

/**
 * The same for several columns at once: `scoredSql` is a query of (col, fold, n, s, s2, pred),
 * each column scored on its own rows (one statement per step for all columns, instead of one per
 * column). Columns with no rows are absent from the map.
 */
export async function scorePredictionsByColumn(engine: Engine, scoredSql: string, kind: TargetKind, what: string): Promise<Map<number, Score>> {
  return (await scoreByColumn(engine, scoredSql, kind, what)).scores;
}

type FoldRows = { fold: number; rows: number; loss: number };

async function scoreByColumn(engine: Engine, scoredSql: string, kind: TargetKind, what: string): Promise<{ scores: Map<number, Score>; folds: Map<number, FoldRows[]> }> {
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${SCORED} AS ${scoredSql}`, `predicting out-of-fold (${what})`);
  const loss = kind === "binary"
    ? logLossSql("s", "(n - s)", "pred")
    : "s2 - 2 * pred * s + n * pred * pred";
  const folds = await engine.rows<{ col: number; fold: number; rows: number; loss: number }>(
    `SELECT col, fold, sum(n)::DOUBLE AS rows, sum(${loss})::DOUBLE AS loss FROM ${SCORED} GROUP BY col, fold ORDER BY col, fold`, `scoring ${what}`);
  const byCol = new Map<number, FoldRows[]>();
  for (const f of folds) byCol.set(f.col, [...(byCol.get(f.col) ?? []), f]);
  const out = new Map<number, Score>();
  const extra = kind === "continuous"
    ? await engine.rows<{ col: number; sse: number; sst: number }>(
      `SELECT col, sum(s2 - 2 * pred * s + n * pred * pred)::DOUBLE AS sse, (sum(s2) - sum(s) * sum(s) / sum(n))::DOUBLE AS sst FROM ${SCORED} GROUP BY col`, `scoring ${what}`)
    : await engine.rows<{ col: number; u: number; positives: number; negatives: number }>(
      mannWhitneyUSql(`SELECT col, pred AS score, sum(s) AS pos, sum(n - s) AS neg FROM ${SCORED} GROUP BY col, pred`, ["col"]), `scoring ${what}`);
  const extraOf = new Map(extra.map((e) => [e.col, e]));
  for (const [col, list] of byCol) {
    const summary = foldLoss(list);
    if (!summary) continue;
    const rows = list.reduce((s, f) => s + f.rows, 0);
    const e = extraOf.get(col);
    if (kind === "continuous") {
      const t = e as { sse: number; sst: number } | undefined;
      out.set(col, { ...summary, rows, r2: t ? rSquaredFromSums(t.sse, t.sst) : null });
    } else {
      const u = e as { u: number; positives: number; negatives: number } | undefined;
      out.set(col, { ...summary, rows, auc: u ? aucFromU(u) : null });
    }
  }
  return { scores: out, folds: byCol };
}
