/**
 * pipeline/targetFigures: step 2 of the advice pipeline for a target — per column the fitted
 * prior weight, flagged levels, the in-sample vs out-of-fold leakage scores (scored at the fitted
 * weight; at m = ∞, the prior, when there is no detectable spread), funnel points, and each top
 * level's rate, interval and smoothed value. Reads the level table alone.
 */
import type { Engine } from "../engine/db.js";
import { leakageSums, type LeakageSums } from "../engine/leakage.js";
import { binaryIntervalGroups, continuousFlagCounts, funnelLevels, targetColumnSums, type IntervalGroup, type LevelRow } from "../engine/levels.js";
import type { TargetKind } from "../engine/target.js";
import { isTailsiftError } from "../errors.js";
import { countFlags, describeLevel, fitPrior, leakageMetric, targetFigures } from "../profile/targetFigures.js";
import type { ColumnProfile, PriorWeight, ProfileTarget } from "../profile/types.js";
import { studentTQuantile } from "../stats/studentTQuantile.js";

const FUNNEL_POINTS = 300;

export async function addTargetFigures(engine: Engine, columns: ColumnProfile[], tops: LevelRow[][], target: ProfileTarget): Promise<void> {
  const kind = target.kind;
  const sums = await targetColumnSums(engine);
  const priors = columns.map((_, col) => fitPrior(kind, sums.get(col), target.mean));
  const flagsByCol = new Map<number, { flagged: number; tested: number }>();
  if (kind === "binary") {
    const byCol = new Map<number, IntervalGroup[]>();
    for (const g of await binaryIntervalGroups(engine)) byCol.set(g.col, [...(byCol.get(g.col) ?? []), g]);
    for (const [col, list] of byCol) flagsByCol.set(col, countFlags(kind, list, target.mean));
  } else {
    const counts = await continuousFlagCounts(engine, target.mean, (n) => studentTQuantile(0.975, n - 1) / Math.sqrt(n));
    for (const [col, f] of counts) flagsByCol.set(col, f);
  }

  // the leakage is scored at the weight the encoding would use: the fitted m, or m = ∞ (null)
  const weights = new Map<number, PriorWeight>(priors.map((p, col) => [col, p.weight]));
  const leak = await leakageWithinMemory(engine, weights, kind);
  const sst = target.rows * (target.sd ?? 0) ** 2;
  const funnel = await funnelLevels(engine, columns.length, FUNNEL_POINTS);
  columns.forEach((column, col) => {
    const prior = priors[col]!;
    const inSample = leakageMetric(kind, leak.find((l) => l.col === col && l.mode === "in"), sst);
    const outOfFold = leakageMetric(kind, leak.find((l) => l.col === col && l.mode === "oof"), sst);
    const points = funnel.filter((f) => f.col === col).map((f) => ({ value: f.level, rows: f.n_y, rate: f.sum_y / f.n_y }));
    column.target = targetFigures(kind, prior, flagsByCol.get(col) ?? { flagged: 0, tested: 0 }, inSample, outOfFold, prior.weight, points);
    const rows = tops[col] ?? [];
    column.topLevels = column.topLevels.map((level, i) => {
      const row = rows[i];
      return row ? describeLevel(kind, level, row, prior, target.mean) : level;
    });
  });
}

/**
 * All columns' leakage sums in one query; if that runs out of memory (a tight --memory-limit and
 * columns with millions of levels), column by column, leaving a column's leakage null (and its
 * reasons saying so) when even that does not fit.
 */
async function leakageWithinMemory(engine: Engine, weights: Map<number, PriorWeight>, kind: TargetKind): Promise<LeakageSums[]> {
  try {
    return await leakageSums(engine, weights, kind);
  } catch (err) {
    if (!(isTailsiftError(err) && err.code === "out_of_memory")) throw err;
  }
  const out: LeakageSums[] = [];
  for (const [col, m] of weights) {
    try {
      out.push(...(await leakageSums(engine, new Map([[col, m]]), kind)));
    } catch (err) {
      if (!(isTailsiftError(err) && err.code === "out_of_memory")) throw err;
    }
  }
  return out;
}
