/**
 * pipeline/targetFigures: step 2 of the advice pipeline for a target — per column the fitted
 * prior weight, flagged levels, the in-sample vs out-of-fold leakage scores (scored at the fitted
 * weight; at m = ∞, the prior, when there is no detectable spread), funnel points, and each top
 * level's rate, interval and smoothed value. Reads the level table alone.
 */
import type { Engine } from "../engine/db.js";
import { leakageScores, type FlatOofScores, type LeakageScores, type OofFoldSums } from "../engine/leakage.js";
import { binaryIntervalGroups, continuousFlagCounts, funnelLevels, targetColumnSums, type IntervalGroup, type LevelRow } from "../engine/levels.js";
import type { TargetKind } from "../engine/target.js";
import { isTailsiftError } from "../errors.js";
import { countFlags, describeLevel, fitPrior, leakageMetric, targetFigures } from "../profile/targetFigures.js";
import type { ColumnProfile, PriorWeight, ProfileTarget } from "../profile/types.js";
import { studentTQuantile } from "../stats/studentTQuantile.js";

const FUNNEL_POINTS = 300;

export async function addTargetFigures(engine: Engine, columns: ColumnProfile[], tops: LevelRow[][], target: ProfileTarget): Promise<FlatOofScores | undefined> {
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
  const scores = await leakageWithinMemory(engine, weights, kind);
  const leak = scores.sums;
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
  if (!scores.priorsDefined) return undefined;
  // the flat encoding's out-of-fold scores, for evidence (absent when a fold prior is undefined)
  const folds = new Map<number, OofFoldSums[]>();
  for (const f of scores.oofFolds) folds.set(f.col, [...(folds.get(f.col) ?? []), f]);
  return { weights, folds, sums: leak };
}

/**
 * All columns' leakage sums in one query; if that runs out of memory (a tight --memory-limit and
 * columns with millions of levels), column by column, leaving a column's leakage null (and its
 * reasons saying so) when even that does not fit.
 */
async function leakageWithinMemory(engine: Engine, weights: Map<number, PriorWeight>, kind: TargetKind): Promise<LeakageScores> {
  try {
    return await leakageScores(engine, weights, kind);
  } catch (err) {
    if (!(isTailsiftError(err) && err.code === "out_of_memory")) throw err;
  }
  const out: LeakageScores = { sums: [], oofFolds: [], priorsDefined: true };
  for (const [col, m] of weights) {
    try {
      const one = await leakageScores(engine, new Map([[col, m]]), kind);
      out.sums.push(...one.sums);
      out.oofFolds.push(...one.oofFolds);
      out.priorsDefined &&= one.priorsDefined;
    } catch (err) {
      if (!(isTailsiftError(err) && err.code === "out_of_memory")) throw err;
    }
  }
  return out;
}
