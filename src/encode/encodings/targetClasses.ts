/**
 * encode/encodings/targetClasses: target encoding of a MULTI-CLASS target, one class against the
 * rest (the plan's params.classes, pipeline/multiclassAdvice). For class k the binary module's
 * maps (encode/targetMaps: m-estimate, Cestnik 1990) are built on the class's rows — the level
 * table with sum_y = the class's rows (sum_ck) — with the class's own m_k; the K values of a
 * (level[, fold]) row are then renormalised to sum 1,
 *     q_k = p_k / Σ_j p_j,
 * the same predictions the multi-class evidence scored (engine/multiclassLoss; Zadrozny & Elkan,
 * KDD 2002). Missing levels take the priors, which already sum to 1: scoring, each class's share
 * of the plan's rows with a target; training (k-fold), the other folds' class shares; past-only
 * (--time), the earlier blocks'. Because the K values sum to 1, K − 1 of them carry all of it:
 * by default the largest class of the plan is not written (`dropped`, stated in the manifest);
 * encode --all-classes writes all K. No leave-one-out form (refused by encode).
 */
import type { Engine } from "../../engine/db.js";
import { FOLD_FIELD, lookupOf, ref, variableSql } from "../expressions.js";
import { readVariable, type ColumnOf, type EncodingModule } from "../encodingModule.js";
import { INPUT_LEVELS, PLAN_LEVELS } from "../levelTables.js";
import { foldFile, mainFile } from "../mappingFiles.js";
import { foldPriorVar, fullTable, fullTargetMap, inputMeanSql, mapTable, outOfFoldMap, priorVar, sqlDouble } from "../targetMaps.js";
import type { ClassSpec, EncodingSpec } from "../types.js";
import { classSumColumn } from "../../engine/passPlan.js";

export type ClassesSpec = Extract<EncodingSpec, { encoding: "target-kfold"; classes: ClassSpec[] }>;

/** The map number of class k of column i (its own tables and variables in encode/targetMaps). */
const classIndex = (i: number, k: number): number => (i + 1) * 100_000 + k;
const combinedFull = (i: number): string => `tailsift_enc_cfull_${i}`;
const combinedMap = (i: number): string => `tailsift_enc_cmap_${i}`;
const field = (k: number): string => `value_c${k}`;
/** The classes written, by index. */
const written = (spec: ClassesSpec): number[] => spec.classes.map((_, k) => k).filter((k) => k !== spec.dropped);

/** The one-vs-rest view of class k over a level table with class sums. */
async function classView(engine: Engine, i: number, k: number, from: string): Promise<string> {
  const view = `tailsift_enc_cls_${i}_${k}`;
  const fold = from === PLAN_LEVELS ? "" : "fold, ";
  await engine.run(`CREATE OR REPLACE TEMP VIEW ${view} AS SELECT name, level, ${fold}rows, n_y, ${classSumColumn(k)} AS sum_y FROM ${from}`, "preparing a class's sums");
  return view;
}

/** SELECT of the renormalised values of K maps joined on `keys`. */
function renormalised(tables: readonly string[], keys: readonly string[], extra: readonly string[]): string {
  const total = tables.map((_, k) => `t${k}.value`).join(" + ");
  const values = tables.map((_, k) => `t${k}.value / nullif(${total}, 0) AS ${field(k)}`).join(", ");
  const joins = tables.slice(1).map((t, j) => `JOIN ${t} t${j + 1} ON ${keys.map((c) => `t${j + 1}.${c} = t0.${c}`).join(" AND ")}`).join(" ");
  return `SELECT ${[...keys, ...extra].map((c) => `t0.${c}`).join(", ")}, ${values} FROM ${tables[0]} t0 ${joins}`;
}

export const targetClasses: EncodingModule<ClassesSpec> = {
  outputNames: (c) => written(c.spec).map((k) => `${c.name}=${c.spec.classes[k]!.value}`),
  outputHolds: (c) => written(c.spec).map((k) => ({ class: c.spec.classes[k]!.value })),
  outputType: "DOUBLE",

  async buildMap(engine, column, ctx) {
    const { index: i, name, spec } = column;
    const ks = spec.classes.map((_, k) => k);
    const from = ctx.mode === "scoring" ? PLAN_LEVELS : INPUT_LEVELS;
    for (const k of ks) {
      const view = await classView(engine, i, k, from);
      const c = spec.classes[k]!;
      await fullTargetMap(engine, classIndex(i, k), view, name, c.weight, ctx.mode === "scoring" ? sqlDouble(c.share) : inputMeanSql(view, name));
      if (ctx.mode === "training") await outOfFoldMap(engine, classIndex(i, k), view, name, c.weight, ctx.folds, ctx.pastOnly);
    }
    const fulls = ks.map((k) => fullTable(classIndex(i, k)));
    await engine.run(`CREATE OR REPLACE TEMP TABLE ${combinedFull(i)} AS ${renormalised(fulls, ["level"], ["rows", "n_y"])}`, `combining the class mappings of '${name}'`);
    if (ctx.mode === "scoring") return { table: combinedFull(i), fields: written(spec).map(field), perFold: false, files: [mainFile(combinedFull(i))] };
    const maps = ks.map((k) => mapTable(classIndex(i, k)));
    await engine.run(`CREATE OR REPLACE TEMP TABLE ${combinedMap(i)} AS ${renormalised(maps, ["level", "fold"], ["n_other"])}`, `combining the out-of-fold class mappings of '${name}'`);
    return { table: combinedMap(i), fields: written(spec).map(field), perFold: true, files: [mainFile(combinedFull(i)), foldFile(combinedMap(i))] };
  },

  columnSql(column, ctx) {
    const look = lookupOf(column, ctx);
    return written(column.spec).map((k) => {
      const id = classIndex(column.index, k);
      const prior = ctx.mode === "scoring" ? variableSql(priorVar(id)) : `${variableSql(foldPriorVar(id))}[${ref(FOLD_FIELD)} + 1]`;
      return `coalesce(${look.value(field(k))}, ${prior})`;
    });
  },

  fallbackCondition(spec, mode) {
    if (spec.classes.every((c) => c.weight === null)) return "l.level IS NOT NULL"; // m = ∞ for every class: the priors
    if (mode === "scoring") return "l.level IS NOT NULL AND m.level IS NULL";
    return "l.level IS NOT NULL AND (m.level IS NULL OR m.n_other <= 0)";
  },

  fallbackRule(_spec, mode) {
    if (mode === "scoring") return "missing and unseen → the plan's class shares";
    return "missing, or no target rows of the level in other folds → the other folds' class shares";
  },

  async manifestParams(engine, column: ColumnOf<ClassesSpec>, outputs, mode) {
    const { spec, index: i } = column;
    const names = new Map(written(spec).map((k, j) => [k, outputs[j]]));
    const classes = [];
    for (const [k, c] of spec.classes.entries()) {
      const id = classIndex(i, k);
      classes.push({
        class: c.value, output: names.get(k) ?? null, weight: c.weight, prior: await readVariable<number>(engine, priorVar(id)),
        ...(mode === "training" ? { foldPriors: await readVariable<number[]>(engine, foldPriorVar(id)) } : {}),
      });
    }
    return {
      classes, dropped: spec.dropped === null ? null : spec.classes[spec.dropped]!.value,
      ...(spec.dropped === null ? {} : { droppedValue: `1 − the sum of the written columns (the values of a row sum to 1)` }),
      value: "one against the rest, renormalised: p_k = (sum_k + m_k·prior_k)/(n_y + m_k) (prior_k when m_k is null), q_k = p_k / Σ_j p_j; missing → prior_k",
      ...(mode === "training" ? { training: "out-of-fold: the (level, fold) row of the .folds file; missing → foldPriors[fold] per class" } : {}),
    };
  },
};

