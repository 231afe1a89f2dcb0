/**
 * engine/formulaSql: the formulas that must run inside DuckDB because their inputs are sized by
 * the number of levels (one row per (level, fold) — too many to cross into JavaScript). Each
 * mirrors a function in stats/ (the reference, with its source and tests; test/stats/formulaSql
 * checks each against it on the same data) and lives here once; leakage, evidence and encode all
 * build their SQL from these. The last step of each figure (AUC = U/(P·N), R² = 1 − SSE/SST, the
 * loss per row) runs in stats/ on the sums these return.
 */
import { LOG_LOSS_EPS } from "../stats/logLossFromGroups.js";

/**
 * The m-estimate (Cestnik 1990; stats/mEstimate): (sum + m·prior)/(n + m), or exactly the prior
 * when m is NULL (infinite weight) or the group has no rows (n ≤ 0: an unseen level takes the
 * prior; in floating point (m·prior)/m can differ from prior in the last bit, which would split ties).
 */
export function mEstimateSql(sum: string, n: string, m: string, prior: string): string {
  return `CASE WHEN ${m} IS NULL OR ${n} <= 0 THEN ${prior} ELSE (${sum} + ${m} * ${prior}) / (${n} + ${m}) END`;
}

/**
 * The Mann–Whitney U statistic (ties count ½; mirrors stats/aucFromGroups mannWhitneyU): from
 * `grouped`, a query of (partition columns…, score, pos, neg) with one row per distinct score,
 * sums per partition pos·(negatives scored lower + neg/2). The caller turns the sums into the AUC
 * with stats/aucFromGroups aucFromU (U / (positives · negatives)).
 * Output columns: the partition columns, u, positives, negatives.
 */
export function mannWhitneyUSql(grouped: string, partition: readonly string[]): string {
  const by = partition.join(", ");
  const over = partition.length > 0 ? `PARTITION BY ${by} ` : "";
  return `SELECT ${by}${by ? ", " : ""}sum(pos * (below + neg / 2))::DOUBLE AS u, sum(pos)::DOUBLE AS positives, sum(neg)::DOUBLE AS negatives
FROM (SELECT *, coalesce(sum(neg) OVER (${over}ORDER BY score ROWS BETWEEN UNBOUNDED PRECEDING AND 1 PRECEDING), 0) AS below FROM (${grouped}))
${by ? `GROUP BY ${by}` : ""}`;
}

/**
 * Does a level's t interval (stats/meanInterval: mean ± t·s/√n, s² = (Σy² − (Σy)²/n)/(n − 1),
 * spread below 1e-12·Σy² taken as 0) exclude `value`? `factor` is t_{0.975, n−1}/√n, supplied per
 * n by the caller (the t quantile stays in stats/studentTQuantile). n ≥ 2 is the caller's filter.
 */
export function meanIntervalExcludesSql(n: string, sum: string, sumSquares: string, factor: string, value: string): string {
  const mean = `(${sum} / ${n})`;
  const centred = `(${sumSquares} - ${sum} * ${mean})`;
  const half = `(${factor} * sqrt(CASE WHEN ${centred} <= 1e-12 * ${sumSquares} THEN 0 ELSE ${centred} / (${n} - 1) END))`;
  return `(${mean} - ${half} > ${value} OR ${mean} + ${half} < ${value})`;
}

/**
 * One group's log-loss sum −[pos·ln p + neg·ln(1 − p)] with p = `pred` clipped to
 * [LOG_LOSS_EPS, 1 − LOG_LOSS_EPS] (mirrors stats/logLossFromGroups, which shares the constant;
 * summed per fold by the caller, divided by the rows in evidence/foldLoss).
 */
export function logLossSql(pos: string, neg: string, pred: string): string {
  const p = `greatest(${LOG_LOSS_EPS}, least(1 - ${LOG_LOSS_EPS}, ${pred}))`;
  return `-(${pos} * ln(${p}) + ${neg} * ln(1 - ${p}))`;
}

/**
 * A window frame over the folds in time order that stops before the current one: with --time
 * (time-blocks folds) the sums "of the earlier blocks" of a forward step. Used as
 * `sum(x) OVER (PARTITION BY … ${EARLIER_FOLDS})`.
 */
export const EARLIER_FOLDS = "ORDER BY fold ROWS BETWEEN UNBOUNDED PRECEDING AND 1 PRECEDING";
