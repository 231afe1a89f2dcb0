/**
 * encode/hierarchyMaps: the mapping tables of target encoding over a level hierarchy — backoff
 * groups (encode/backoffMaps) or the hierarchical prior (encode/hierarchicalMaps) — and the
 * files written beside the output:
 *  - `<column>.parquet`: one row per level (plan and input levels, `seen` = in the plan) with
 *    its group (depth, group_key) or parent and the full-data value;
 *  - `<column>.groups.parquet` / `<column>.parents.parquet`: one row per group / parent with
 *    its sums and value — what an unseen level is looked up in when served elsewhere;
 *  - training: `<column>.folds.parquet`, the out-of-fold value of each (level, fold).
 * Scoring reads the plan's sums with p = the plan's target mean; training reads the input's
 * sums (the plan's level table when the input is the scanned extract) with p = their mean and
 * the other folds' means per fold, as flat target encoding does (encode/targetMaps).
 */
import type { Engine } from "../engine/db.js";
import { TailsiftError } from "../errors.js";
import { backoffFoldMap, backoffFullMap, groupsTable } from "./backoffMaps.js";
import { buildGroupMap, groupTable } from "./groupMap.js";
import { hierarchicalFoldMap, hierarchicalFullMap, parentsTable } from "./hierarchicalMaps.js";
import { INPUT_LEVELS, PLAN_LEVELS } from "./levelTables.js";
import { foldFile, mainFile, type MappingFile } from "./mappingFiles.js";
import { setPrior } from "./hierarchySql.js";
import { foldPriors, fullTable, inputMeanSql, mapTable, sqlDouble } from "./targetMaps.js";
import type { ColumnMap, EncodedColumn, MapContext, TargetStructure } from "./types.js";

/** Words for a structure ("backoff grouping", "a hierarchical prior"). */
export const hierarchyWords = (s: TargetStructure): string => (s.kind === "backoff" ? "backoff grouping" : "a hierarchical prior");

/**
 * Builds the tables of one column. Edge cases: no target in the plan (scoring) → Error (the
 * caller checks first); leave-one-out → TailsiftError `bad_option` (only flat target encoding
 * has a leave-one-out form; the out-of-fold form is the one the evidence scored).
 */
export async function buildHierarchyMap(engine: Engine, column: EncodedColumn, s: TargetStructure, ctx: MapContext): Promise<ColumnMap> {
  const { index: i, name } = column;
  if (ctx.leaveOneOut) {
    throw new TailsiftError("bad_option", `--leave-one-out applies to flat target encoding; the plan encodes '${name}' with ${hierarchyWords(s)}, whose out-of-fold form is the one scan scored — drop --leave-one-out`);
  }
  const scoring = ctx.mode === "scoring";
  if (scoring && ctx.targetMean === undefined) throw new Error("target encoding without a plan target");
  const from = scoring ? PLAN_LEVELS : INPUT_LEVELS;
  await setPrior(engine, i, scoring ? sqlDouble(ctx.targetMean ?? 0) : inputMeanSql(INPUT_LEVELS, name), name);
  if (s.kind === "backoff") {
    await buildGroupMap(engine, i, name, s.parents, s.minRows);
    await backoffFullMap(engine, i, from, name, s.weight);
  } else {
    await hierarchicalFullMap(engine, i, from, name, s);
  }
  const side: MappingFile = s.kind === "backoff"
    ? { suffix: ".groups", table: groupsTable(i), key: "groupFile", order: "depth DESC, group_key" }
    : { suffix: ".parents", table: parentsTable(i), key: "parentFile", order: "parent" };
  const levelTable = s.kind === "backoff" ? groupTable(i) : fullTable(i);
  if (scoring) return { table: fullTable(i), fields: ["value"], perFold: false, files: [mainFile(fullTable(i)), side], levelTable };
  // time-blocks plans: past-only sums (encode/targetMaps pastSumsSql)
  const past = ctx.pastOnly ? { folds: ctx.folds } : undefined;
  await foldPriors(engine, i, INPUT_LEVELS, name, ctx.folds, ctx.pastOnly);
  if (s.kind === "backoff") await backoffFoldMap(engine, i, INPUT_LEVELS, name, s.weight, past);
  else await hierarchicalFoldMap(engine, i, INPUT_LEVELS, name, s, past);
  return { table: mapTable(i), fields: ["value"], perFold: true, files: [mainFile(fullTable(i)), side, foldFile(mapTable(i))], levelTable };
}
