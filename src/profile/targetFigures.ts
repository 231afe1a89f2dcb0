/**
 * profile/targetFigures: per-column target figures from sums computed in SQL — the fitted prior
 * weight m, level rates with intervals and the smoothed value, funnel-plot flags, and the
 * in-sample vs out-of-fold leakage gap. Formulas live in stats/; this module only wires them.
 */
import { betaBinomialPriorWeight } from "../stats/betaBinomialPriorWeight.js";
import { expectedFalseFlags } from "../stats/expectedFalseFlags.js";
import { meanInterval } from "../stats/meanInterval.js";
import { mEstimate } from "../stats/mEstimate.js";
import { normalNormalPriorWeight } from "../stats/normalNormalPriorWeight.js";
import { wilsonInterval } from "../stats/wilsonInterval.js";
import { aucFromU } from "../stats/aucFromGroups.js";
import { rSquaredFromSums } from "../stats/rSquaredFromGroups.js";
import type { IntervalGroup, LevelRow, TargetColumnSums } from "../engine/levels.js";
import type { LeakageSums } from "../engine/leakage.js";
import type { ColumnTargetFigures, LevelFigure, PriorWeight, TargetKind } from "./types.js";

/** weight null: no detectable spread, m = ∞ (the prior). */
export interface FittedPrior { method: string; weight: PriorWeight; mean: number; rho?: number | null; tau2?: number | null }

/** Fits the prior weight m for one column from its level sums. */
export function fitPrior(kind: TargetKind, sums: TargetColumnSums | undefined, overallMean: number): FittedPrior {
  if (!sums || sums.levels < 2) {
    return { method: kind === "binary" ? "beta-binomial moments" : "normal-normal DerSimonian-Laird", weight: null, mean: overallMean };
  }
  if (kind === "binary") {
    const fit = betaBinomialPriorWeight({
      levels: sums.levels, rows: sums.rows, positives: sums.sumY,
      sumPositivesSqOverRows: sums.sumSumSqOverRows, sumRowsSq: sums.sumRowsSq,
    });
    return { method: "beta-binomial moments", weight: fit.weight, mean: fit.mean, rho: fit.rho };
  }
  const fit = normalNormalPriorWeight({
    levels: sums.levels, rows: sums.rows, sumY: sums.sumY, sumY2: sums.sumY2,
    sumSumSqOverRows: sums.sumSumSqOverRows, sumRowsSq: sums.sumRowsSq,
  });
  return { method: "normal-normal DerSimonian-Laird", weight: fit.weight, mean: fit.mean, tau2: fit.tau2 };
}

/** The interval of one level's target mean: Wilson (binary) or mean ± t·s/√n (continuous, n ≥ 2). */
export function levelInterval(kind: TargetKind, n: number, sumY: number, sumY2: number): { low: number; high: number } | null {
  if (kind === "binary") {
    const w = wilsonInterval(Math.round(sumY), n);
    return w ? { low: w.low, high: w.high } : null;
  }
  const m = meanInterval(n, sumY, sumY2);
  return m ? { low: m.low, high: m.high } : null;
}

/** Adds targetMean, interval, smoothed value and flag to a top-level entry. */
export function describeLevel(kind: TargetKind, level: LevelFigure, row: LevelRow, prior: FittedPrior, overallMean: number): LevelFigure {
  if (row.n_y <= 0) return level;
  const out: LevelFigure = { ...level, targetMean: row.sum_y / row.n_y };
  const interval = levelInterval(kind, row.n_y, row.sum_y, row.sum_y2);
  if (interval) {
    out.low = interval.low;
    out.high = interval.high;
    if (interval.low > overallMean) out.flag = "above";
    else if (interval.high < overallMean) out.flag = "below";
  }
  // no detectable spread (weight null) is the limit m → ∞: the smoothed value is the prior itself
  out.smoothed = prior.weight === null ? prior.mean : mEstimate(row.sum_y, row.n_y, prior.weight, prior.mean);
  return out;
}

/** Counts flagged levels over interval groups (each group = levels sharing n and sums). */
export function countFlags(kind: TargetKind, groups: readonly IntervalGroup[], overallMean: number): { flagged: number; tested: number } {
  let flagged = 0;
  let tested = 0;
  for (const g of groups) {
    const interval = levelInterval(kind, g.n, g.sumY, g.sumY2);
    if (!interval) continue;
    tested += g.levels;
    if (interval.low > overallMean || interval.high < overallMean) flagged += g.levels;
  }
  return { flagged, tested };
}

/** AUC = U / (P·N) (stats/aucFromGroups aucFromU), or R² = 1 − SSE/SST (stats/rSquaredFromSums). Null when undefined. */
export function leakageMetric(kind: TargetKind, sums: LeakageSums | undefined, sst: number): number | null {
  if (!sums) return null;
  return kind === "binary" ? aucFromU(sums) : rSquaredFromSums(sums.sse, sst);
}

export function targetFigures(
  kind: TargetKind, prior: FittedPrior, flags: { flagged: number; tested: number },
  inSample: number | null, outOfFold: number | null, weightUsed: PriorWeight,
  funnel: ColumnTargetFigures["funnel"],
): ColumnTargetFigures {
  return {
    prior: { method: prior.method, weight: prior.weight, mean: prior.mean,
      ...(prior.rho !== undefined ? { rho: prior.rho } : {}), ...(prior.tau2 !== undefined ? { tau2: prior.tau2 } : {}) },
    flaggedLevels: flags.flagged,
    expectedFalseFlags: expectedFalseFlags(flags.tested),
    testedLevels: flags.tested,
    leakage: { inSample, outOfFold, metric: kind === "binary" ? "auc" : "r2", weightUsed },
    ...(funnel ? { funnel } : {}),
  };
}
