/**
 * encode/encodings/targetKfold: target encoding by the m-estimate (Cestnik 1990), value =
 * (sum_y + m·p)/(n_y + m), leak-free at training time:
 *  - scoring: the full-data value from the plan's sums, p = the plan's target mean; missing and
 *    unseen → p;
 *  - training, k-fold: the row's (level, fold) value from the other folds' sums (the fold
 *    column is the scan's); missing → the other folds' prior of the row's fold;
 *  - training with a time-blocks plan (--time): past-only, the same with the EARLIER blocks'
 *    sums and prior (encode/targetMaps pastSumsSql); block 0 takes the prior;
 *  - training, leave-one-out: (sum − y + m·p)/(n − 1 + m) from the level's full sums,
 *    n − 1 + m ≤ 0 → p; a row without a target value gets (sum + m·p)/(n + m); missing → p;
 *  - over a hierarchy (backoff groups or a hierarchical prior): encode/hierarchyMaps, as k-fold
 *    and scoring — the mapping covers every plan and input level, so only missing rows take the
 *    fallback;
 *  - a flat weight m of null (no detectable spread, m = ∞): every level takes the prior (in k-fold
 *    training the other folds' mean), never the raw level means of m = 0.
 * Flat maps: encode/targetMaps; the formula as SQL: engine/formulaSql.
 */
import { mEstimateSql } from "../../engine/formulaSql.js";
import { FOLD_FIELD, lookupOf, ref, variableSql, Y_FIELD } from "../expressions.js";
import { readVariable, type EncodingModule } from "../encodingModule.js";
import { buildHierarchyMap } from "../hierarchyMaps.js";
import { hierarchyFallbackCondition, hierarchyFallbackRule } from "../hierarchyCounts.js";
import { hierarchyManifestParams } from "../hierarchyManifest.js";
import { INPUT_LEVELS, PLAN_LEVELS } from "../levelTables.js";
import { foldFile, mainFile } from "../mappingFiles.js";
import { foldPriorVar, fullTable, fullTargetMap, inputMeanSql, mapTable, outOfFoldMap, priorVar, sqlDouble } from "../targetMaps.js";
import type { EncodingSpec } from "../types.js";
import { targetClasses, type ClassesSpec } from "./targetClasses.js";

type Spec = Extract<EncodingSpec, { encoding: "target-kfold" }>;
type Column = Parameters<EncodingModule<Spec>["outputNames"]>[0];
/** A multi-class target's column: its own module (encode/encodings/targetClasses). */
const classesOf = (c: Column) => (c.spec.classes ? c as unknown as Parameters<typeof targetClasses.outputNames>[0] : null);
const isClasses = (s: Spec): s is ClassesSpec => s.classes !== undefined;

export const targetKfold: EncodingModule<Spec> = {
  outputNames: (c) => { const m = classesOf(c); return m ? targetClasses.outputNames(m) : [c.name]; },
  outputHolds: (c) => { const m = classesOf(c); return m ? targetClasses.outputHolds(m) : [{}]; },
  outputType: "DOUBLE",

  async buildMap(engine, column, ctx) {
    const multi = classesOf(column);
    if (multi) return targetClasses.buildMap(engine, multi, ctx);
    const { index: i, name, spec } = column;
    if (spec.structure) return buildHierarchyMap(engine, column, spec.structure, ctx);
    const m = spec.weight ?? null; // (undefined only for the classes form, handled above)
    if (ctx.mode === "scoring") {
      if (ctx.targetMean === undefined) throw new Error("target encoding without a plan target");
      await fullTargetMap(engine, i, PLAN_LEVELS, name, m, sqlDouble(ctx.targetMean));
      return { table: fullTable(i), fields: ["value"], perFold: false, files: [mainFile(fullTable(i))] };
    }
    await fullTargetMap(engine, i, INPUT_LEVELS, name, m, inputMeanSql(INPUT_LEVELS, name));
    if (ctx.leaveOneOut) {
      return { table: fullTable(i), fields: ["n_y", "sum_y"], perFold: false, files: [mainFile(fullTable(i))] };
    }
    await outOfFoldMap(engine, i, INPUT_LEVELS, name, m, ctx.folds, ctx.pastOnly);
    return { table: mapTable(i), fields: ["value"], perFold: true, files: [mainFile(fullTable(i)), foldFile(mapTable(i))] };
  },

  columnSql(column, ctx) {
    const multi = classesOf(column);
    if (multi) return targetClasses.columnSql(multi, ctx);
    const look = lookupOf(column, ctx);
    const p = variableSql(priorVar(column.index));
    if (ctx.mode === "scoring") return [`coalesce(${look.value("value")}, ${p})`];
    if (!ctx.leaveOneOut) return [`coalesce(${look.value("value")}, ${variableSql(foldPriorVar(column.index))}[${ref(FOLD_FIELD)} + 1])`];
    if (column.spec.structure || column.spec.weight === undefined) throw new Error(`column '${column.name}' has no leave-one-out form`);
    if (column.spec.weight === null) return [p]; // m = ∞ (no detectable spread): every row takes the prior
    const n = `${look.value("n_y")}::DOUBLE`;
    const s = look.value("sum_y");
    const y = ref(Y_FIELD);
    const mm = sqlDouble(column.spec.weight);
    return [`(CASE WHEN ${n} IS NULL THEN ${p}
    WHEN ${y} IS NULL THEN ${mEstimateSql(s, n, mm, p)}
    WHEN ${n} - 1 + ${mm} <= 0 THEN ${p}
    ELSE (${s} - ${y} + ${mm} * ${p}) / (${n} - 1 + ${mm}) END)`];
  },

  fallbackCondition(spec, mode, leaveOneOut) {
    if (isClasses(spec)) return targetClasses.fallbackCondition(spec, mode, leaveOneOut);
    if (spec.structure) return hierarchyFallbackCondition(spec.structure, mode);
    if (spec.weight === null) return "l.level IS NOT NULL"; // m = ∞: every level gets the prior
    if (mode === "scoring") return "l.level IS NOT NULL AND m.level IS NULL";
    if (leaveOneOut) return `l.level IS NOT NULL AND (m.level IS NULL OR m.n_y - 1 + ${sqlDouble(spec.weight)} <= 0)`;
    return "l.level IS NOT NULL AND (m.level IS NULL OR m.n_other <= 0)";
  },

  fallbackRule(spec, mode, leaveOneOut) {
    if (isClasses(spec)) return targetClasses.fallbackRule(spec, mode, leaveOneOut);
    if (spec.structure) return hierarchyFallbackRule(spec.structure, mode);
    if (mode === "scoring") return "missing and unseen → prior mean p";
    if (leaveOneOut) return "missing and levels with n − 1 + m ≤ 0 → p";
    return "missing, or no target rows of the level in other folds → other folds' mean";
  },

  async manifestParams(engine, column, outputs, mode, leaveOneOut) {
    const multi = classesOf(column);
    if (multi) return targetClasses.manifestParams(engine, multi, outputs, mode, leaveOneOut);
    const { spec } = column;
    const p = await readVariable<number>(engine, priorVar(column.index));
    if (spec.structure) {
      const priors = mode === "training" ? await readVariable<number[]>(engine, foldPriorVar(column.index)) : null;
      return hierarchyManifestParams(spec.structure, mode, p, priors);
    }
    const base = { weight: spec.weight, prior: p, value: "(sum_y + m·p)/(n_y + m); n_y + m = 0 → p" };
    if (mode === "scoring") return base;
    if (leaveOneOut) return { ...base, training: "leave-one-out: (sum_y − y + m·p)/(n_y − 1 + m); n_y − 1 + m ≤ 0 → p; no target value → the full-data value" };
    const priors = await readVariable<number[]>(engine, foldPriorVar(column.index));
    return { ...base, foldPriors: priors, training: "out-of-fold: the (level, fold) row of the .folds file; missing → foldPriors[fold]" };
  },
};
