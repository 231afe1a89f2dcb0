/**
 * engine/leakage: scores the m-estimate target encoding of every column in-sample and
 * out-of-fold, from the level table alone (no row sort, no second pass over the raw rows).
 *
 * An out-of-fold encoding takes one value per (level, fold): the level's sums from the other
 * folds, shrunk toward the other folds' overall mean with weight m. Missing levels take the
 * prior (the same fallback the encoder uses). Grouping rows by encoded value gives, per column,
 * (score, positives, negatives); the Mann–Whitney U statistic (ties count one half) is summed
 * over the sorted distinct scores with a running count of negatives below (engine/formulaSql,
 * mirroring stats/aucFromGroups mannWhitneyU). For continuous targets the squared error
 * Σ(y − e)² = Σ(sum_y2 − 2·e·sum_y + n·e²) is summed the same way (as stats/rSquaredFromGroups).
 * The sums stay in SQL (groups are sized by the level table); the AUC and R² are computed from
 * them by stats/aucFromGroups aucFromU and stats/rSquaredFromGroups rSquaredFromSums (profile/targetFigures leakageMetric).
 */
import type { TargetKind } from "./target.js";
import type { Engine } from "./db.js";
import { LEVEL_TABLE } from "./aggregate.js";
import { LEVEL_TOTALS } from "./levels.js";
import { logLossSql, mannWhitneyUSql, mEstimateSql } from "./formulaSql.js";
import { sqlNumber } from "./sql.js";

export interface LeakageSums {
  col: number;
  /** "in" = in-sample, "oof" = out-of-fold. */
  mode: "in" | "oof";
  /** Binary: Mann–Whitney U (pairs where the positive scores higher, ties ½). */
  u: number;
  positives: number;
  negatives: number;
  /** Continuous: Σ(y − e)² over rows with a target. */
  sse: number;
  rows: number;
}

/**
 * One column's flat target encoding scored out-of-fold, per fold (the rows the leakage's
 * out-of-fold figure is summed over): the loss — log loss (binary) or squared error (continuous) —
 * and the target sums. evidence/candidates builds the flat candidate from these instead of
 * predicting the same values again.
 */
export interface OofFoldSums { col: number; fold: number; rows: number; loss: number; sumY: number; sumY2: number }

/**
 * The flat target encoding scored out-of-fold by the leakage statement, handed to the evidence
 * (evidence/candidates flatCandidate reuses it when the weight is the one it would use): the
 * weight each column was scored at, its per-fold sums and its out-of-fold Mann–Whitney sums.
 */
export interface FlatOofScores { weights: ReadonlyMap<number, number | null>; folds: ReadonlyMap<number, OofFoldSums[]>; sums: readonly LeakageSums[] }

export interface LeakageScores {
  sums: LeakageSums[];
  oofFolds: OofFoldSums[];
  /** True when every fold's prior (the other folds' mean) is defined: the other folds have target rows. */
  priorsDefined: boolean;
}

/**
 * The scored rows, as three CTEs over the level table and its totals (LEVEL_TOTALS):
 *   ins(col, score, n, s, s2)        in-sample, one row per level (the in-sample value does not
 *                                    depend on the fold, so the level totals suffice);
 *   oofg(col, fold, score, n, s, s2) out-of-fold, summed by (column, fold, value). A level whose
 *                                    target rows all sit in one fold (LEVEL_TOTALS.single_fold) has
 *                                    no other-fold rows: its value is that fold's prior, so this tail
 *                                    is summed from the totals by fold, not joined row by row; the
 *                                    missing level takes the fold's prior too. Only the other levels'
 *                                    (level, fold) rows are joined to their totals (an equality join).
 * The fold priors are computed once per fold (fp). A weight of null is m = ∞ (no detectable
 * spread): every level scores the prior — the overall mean in-sample, the fold's prior out of
 * fold — so such a column's rows sum to the fold totals: it is scored from those (flatIns,
 * flatOof), without reading its levels (identifier-like columns have about one level per row).
 */
function scoredSql(weights: ReadonlyMap<number, number | null>): string {
  const values = [...weights].map(([col, m]) => `(${sqlNumber(col)}, ${m === null ? "NULL" : sqlNumber(m)}::DOUBLE)`).join(", ");
  const fitted = [...weights].filter(([, m]) => m !== null).map(([c]) => sqlNumber(c));
  return `w(col, m) AS (VALUES ${values}),
  ft AS (SELECT fold, n_y::DOUBLE AS fn, sum_y AS fs, sum_y2 AS fs2 FROM ${LEVEL_TABLE} WHERE col = -1),
  g AS (SELECT sum(fn) AS tn, sum(fs) AS ts, sum(fs2) AS ts2 FROM ft),
  fp AS (SELECT ft.fold, (g.ts - ft.fs) / (g.tn - ft.fn) AS prior FROM ft CROSS JOIN g),
  tl AS (
    SELECT t.col, t.level, t.n_y::DOUBLE AS tn, t.sum_y AS ts, t.sum_y2 AS ts2, t.single_fold, w.m
    FROM ${LEVEL_TOTALS} t JOIN w ON t.col = w.col WHERE t.n_y > 0 AND w.m IS NOT NULL),
  flatIns AS (SELECT w.col, g.ts / g.tn AS score, g.tn AS n, g.ts AS s, g.ts2 AS s2 FROM w CROSS JOIN g WHERE w.m IS NULL AND g.tn > 0),
  ins AS (
    SELECT tl.col, CASE WHEN tl.level IS NULL THEN g.ts / g.tn ELSE ${mEstimateSql("tl.ts", "tl.tn", "tl.m", "g.ts / g.tn")} END AS score,
      tl.tn AS n, tl.ts AS s, tl.ts2 AS s2
    FROM tl CROSS JOIN g
    UNION ALL SELECT * FROM flatIns),
  multi AS (
    SELECT l.col, l.fold, l.n_y::DOUBLE AS n, l.sum_y AS s, l.sum_y2 AS s2,
      ${mEstimateSql("(tl.ts - l.sum_y)", "(tl.tn - l.n_y)", "tl.m", "fp.prior")} AS score
    FROM ${LEVEL_TABLE} l JOIN tl ON l.col = tl.col AND l.level = tl.level JOIN fp ON fp.fold = l.fold
    WHERE tl.single_fold IS NULL AND l.n_y > 0),
  missing AS (
    SELECT l.col, l.fold, l.n_y::DOUBLE AS n, l.sum_y AS s, l.sum_y2 AS s2, fp.prior AS score
    FROM ${LEVEL_TABLE} l JOIN fp ON fp.fold = l.fold WHERE l.level IS NULL AND l.col IN (${fitted.length > 0 ? fitted.join(", ") : "NULL"}) AND l.n_y > 0),
  tail AS (
    SELECT tl.col, tl.single_fold AS fold, tl.tn AS n, tl.ts AS s, tl.ts2 AS s2, fp.prior AS score
    FROM tl JOIN fp ON fp.fold = tl.single_fold WHERE tl.level IS NOT NULL),
  flatOof AS (
    SELECT w.col, ft.fold, ft.fn AS n, ft.fs AS s, ft.fs2 AS s2, fp.prior AS score
    FROM w CROSS JOIN ft JOIN fp ON fp.fold = ft.fold WHERE w.m IS NULL AND ft.fn > 0),
  oofg AS MATERIALIZED (
    SELECT col, fold, score, sum(n) AS n, sum(s) AS s, sum(s2) AS s2
    FROM (SELECT * FROM multi UNION ALL SELECT * FROM missing UNION ALL SELECT * FROM tail UNION ALL SELECT * FROM flatOof) GROUP BY col, fold, score)`;
}

/** In-sample and out-of-fold sums for every column in `weights` (col → m used; null = ∞). */
export async function leakageSums(engine: Engine, weights: ReadonlyMap<number, number | null>, kind: TargetKind): Promise<LeakageSums[]> {
  return (await leakageScores(engine, weights, kind)).sums;
}

/**
 * The leakage sums and, from the same statement, the flat encoding's out-of-fold loss per
 * (column, fold) (OofFoldSums).
 */
export async function leakageScores(engine: Engine, weights: ReadonlyMap<number, number | null>, kind: TargetKind): Promise<LeakageScores> {
  if (weights.size === 0) return { sums: [], oofFolds: [], priorsDefined: false };
  const [p] = await engine.rows<{ defined: boolean | null }>(
    `WITH ft AS (SELECT n_y::DOUBLE AS fn FROM ${LEVEL_TABLE} WHERE col = -1) SELECT bool_and((SELECT sum(fn) FROM ft) - fn > 0) AS defined FROM ft`,
    "checking the fold priors");
  const priorsDefined = p?.defined === true;
  const foldLoss = kind === "binary" ? logLossSql("s", "(n - s)", "score") : "s2 - 2 * score * s + n * score * score";
  const folds = `SELECT col, 'fold' AS mode, fold, 0::DOUBLE AS u, 0::DOUBLE AS positives, 0::DOUBLE AS negatives,
         sum(${foldLoss})::DOUBLE AS sse, sum(n)::DOUBLE AS rows, sum(s)::DOUBLE AS sumY, sum(s2)::DOUBLE AS sumY2 FROM oofg GROUP BY col, fold`;
  let rows: (Omit<LeakageSums, "mode"> & { mode: "in" | "oof" | "fold"; fold: number | null; sumY: number | null; sumY2: number | null })[];
  if (kind === "continuous") {
    rows = await engine.rows(
      `WITH ${scoredSql(weights)}
       SELECT col, 'in' AS mode, NULL::INTEGER AS fold, 0::DOUBLE AS u, 0::DOUBLE AS positives, 0::DOUBLE AS negatives,
              sum(s2 - 2 * score * s + n * score * score) AS sse, sum(n) AS rows, NULL::DOUBLE AS sumY, NULL::DOUBLE AS sumY2 FROM ins GROUP BY col
       UNION ALL
       SELECT col, 'oof', NULL, 0, 0, 0, sum(s2 - 2 * score * s + n * score * score), sum(n), NULL, NULL FROM oofg GROUP BY col
       UNION ALL ${folds}
       ORDER BY col, mode, fold`, "scoring the encodings in-sample and out-of-fold");
  } else {
    const grouped = `SELECT col, 'in' AS mode, score, sum(s) AS pos, sum(n - s) AS neg FROM ins GROUP BY col, score
       UNION ALL
       SELECT col, 'oof', score, sum(s), sum(n - s) FROM oofg GROUP BY col, score`;
    rows = await engine.rows(
      `WITH ${scoredSql(weights)},
       mw AS (${mannWhitneyUSql(grouped, ["col", "mode"])})
       SELECT col, mode, NULL::INTEGER AS fold, u, positives, negatives, 0::DOUBLE AS sse, positives + negatives AS rows, NULL::DOUBLE AS sumY, NULL::DOUBLE AS sumY2 FROM mw
       UNION ALL ${folds}
       ORDER BY col, mode, fold`,
      "scoring the encodings in-sample and out-of-fold");
  }
  const sums: LeakageSums[] = [];
  const oofFolds: OofFoldSums[] = [];
  for (const r of rows) {
    if (r.mode === "fold") oofFolds.push({ col: r.col, fold: r.fold ?? 0, rows: r.rows, loss: r.sse, sumY: r.sumY ?? 0, sumY2: r.sumY2 ?? 0 });
    else sums.push({ col: r.col, mode: r.mode === "in" ? "in" : "oof", u: r.u, positives: r.positives, negatives: r.negatives, sse: r.sse, rows: r.rows });
  }
  return { sums, oofFolds, priorsDefined };
}
