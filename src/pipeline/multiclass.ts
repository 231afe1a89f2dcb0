/**
 * pipeline/multiclass: the advice for a multi-class target, ONE CLASS AGAINST THE REST. The pass
 * (engine/aggregate, engine/widePass) added each class's rows to the level table (sum_c0 …
 * sum_c{K-1}); for class k this module makes `tailsift_levels` the table a binary scan with
 * `--positive CLASS_k` would have built (sum_y = sum_y2 = sum_ck: for a 0/1 target Σy² = Σy) and
 * runs the binary pipeline (pipeline/advise) on it unchanged — its prior weight (beta-binomial,
 * stats/betaBinomialPriorWeight), level rates with Wilson intervals, leakage and evidence are the
 * binary path's, figure for figure. A run without a target gives the figures that do not depend
 * on the target (counts, coverage, hashing, hierarchy) and the rules' answer; the per-class runs
 * are kept in `column.classes`. The level table is read once per class (K + 1 runs over a table
 * sized by levels, never by rows); no raw row is read again.
 */
import type { PassTotals } from "../engine/aggregate.js";
import type { Engine } from "../engine/db.js";
import { writeLevelTable } from "../engine/levelFile.js";
import { classSumColumn, LEVEL_TABLE } from "../engine/passPlan.js";
import { checkTarget } from "../profile/checkTarget.js";
import type { ClassFigures, MulticlassTarget, Profile } from "../profile/types.js";
import { adviseFromLevelTable, type AdviceInput } from "./advise.js";
import { decidedTargetEncoding, multiclassEvidence, multiclassRecommendation } from "./multiclassAdvice.js";

/** Where the level table with every class's sums is kept while one class is advised. */
export const MULTICLASS_LEVELS = "tailsift_levels_multiclass";

/** The target's record: classes (sorted as given) with rows and shares; mean = the largest class's share. */
export function multiclassTarget(column: string, classes: readonly string[], totals: PassTotals): MulticlassTarget {
  const counts = totals.classRows ?? [];
  const rows = totals.targetRows;
  const list = classes.map((value, k) => ({ value, rows: counts[k] ?? 0, share: rows > 0 ? (counts[k] ?? 0) / rows : 0 }));
  return { column, kind: "multiclass", rows, missing: totals.rows - rows, mean: Math.max(...list.map((c) => c.share)), classes: list };
}

/** Makes tailsift_levels the one-vs-rest table of class k (from MULTICLASS_LEVELS). */
export async function useClassTable(engine: Engine, k: number): Promise<void> {
  const c = classSumColumn(k);
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${LEVEL_TABLE} AS SELECT * REPLACE (${c} AS sum_y, ${c} AS sum_y2) FROM ${MULTICLASS_LEVELS}`,
    `measuring class ${k + 1} against the rest`);
}

export interface MulticlassInput extends Omit<AdviceInput, "target"> {
  target: MulticlassTarget;
}

/** The advice for a multi-class target; tailsift_levels holds every class's sums again afterwards. */
export async function adviseMulticlass(engine: Engine, ctx: MulticlassInput): Promise<Profile> {
  const { target } = ctx;
  await engine.run(`ALTER TABLE ${LEVEL_TABLE} RENAME TO ${MULTICLASS_LEVELS}`, "keeping the class sums");
  try {
    await engine.run(`CREATE OR REPLACE TEMP TABLE ${LEVEL_TABLE} AS SELECT * FROM ${MULTICLASS_LEVELS}`, "measuring the columns");
    // --decide COL=target-kfold is applied after the evidence (pipeline/multiclassAdvice): the run without a target cannot
    const decide = Object.fromEntries(Object.entries(ctx.decide ?? {}).filter(([, e]) => e !== "target-kfold"));
    const base = await adviseFromLevelTable(engine, { ...ctx, decide, target: undefined, levelTableOut: undefined });
    const perClass = new Map<string, ClassFigures[]>();
    for (const [k, cls] of target.classes.entries()) {
      await useClassTable(engine, k);
      const totals = { ...ctx.totals, sumY: cls.rows, sumY2: cls.rows };
      const binary = checkTarget({ column: target.column, kind: "binary", positive: cls.value }, totals);
      const one = await adviseFromLevelTable(engine, { ...ctx, totals, target: binary, decide: undefined, levelTableOut: undefined });
      for (const column of one.columns) {
        if (!column.target) continue;
        const figures: ClassFigures = {
          value: cls.value, target: column.target,
          levels: column.topLevels.map(({ targetMean, low, high, smoothed, flag }) => dropUndefined({ targetMean, low, high, smoothed, flag })),
          ...(column.evidence ? { evidence: column.evidence } : {}),
          advised: column.recommendation.encoding,
        };
        perClass.set(column.name, [...(perClass.get(column.name) ?? []), figures]);
      }
    }
    for (const column of base.columns) {
      const classes = perClass.get(column.name);
      if (classes) column.classes = classes;
    }
    base.target = target;
    return base;
  } finally {
    await engine.run(`DROP TABLE IF EXISTS ${LEVEL_TABLE}`, "keeping the class sums");
    await engine.run(`ALTER TABLE ${MULTICLASS_LEVELS} RENAME TO ${LEVEL_TABLE}`, "keeping the class sums");
  }
}

/**
 * The multi-class advice: the per-class runs, then the multi-class evidence and decision
 * (pipeline/multiclassAdvice), then the level table with every class's sums written where asked.
 */
export async function adviseMulticlassAndWrite(engine: Engine, ctx: MulticlassInput): Promise<Profile> {
  const profile = await adviseMulticlass(engine, ctx);
  const evidence = await multiclassEvidence(engine, ctx.levelColumns, profile.columns, ctx.target, ctx.policy);
  for (const column of profile.columns) {
    const e = evidence.get(column.name);
    if (!e) continue;
    column.multiclassEvidence = e;
    column.recommendation = multiclassRecommendation(column, e, ctx.policy);
  }
  for (const [name, encoding] of Object.entries(ctx.decide ?? {})) {
    const column = profile.columns.find((c) => c.name === name);
    if (encoding === "target-kfold" && column) column.recommendation = decidedTargetEncoding(column, ctx.policy);
  }
  if (ctx.levelTableOut) await writeLevelTable(engine, ctx.levelColumns, ctx.levelTableOut, ctx.target.classes.length);
  return profile;
}

function dropUndefined<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}
