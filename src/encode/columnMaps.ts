/**
 * encode/columnMaps: builds, per encoded column, the mapping tables its encoding reads (see
 * targetMaps.ts and countMaps.ts) and says which table the output query looks up and which
 * tables are written as mapping files (target encoding over a hierarchy: encode/structureMaps).
 * Encodings without a table (indicator, one-hot, pooled one-hot, plain hashing) return null:
 * their parameters alone define them. Hashing of backoff groups: encode/hashedGroupMap.
 */
import type { Engine } from "../engine/db.js";
import { buildCodedGroupMap } from "./codedGroupMap.js";
import { codesMap, frequencyMap } from "./countMaps.js";
import { buildHashedGroupMap } from "./hashedGroupMap.js";
import { INPUT_LEVELS, PLAN_LEVELS } from "./levelTables.js";
import { foldFile, mainFile } from "./mappingFiles.js";
import { buildStructureMap } from "./structureMaps.js";
import { fullTable, fullTargetMap, inputMeanSql, mapTable, outOfFoldMap, sqlDouble } from "./targetMaps.js";
import type { ColumnMap, EncodedColumn, MapContext } from "./types.js";

export type { ColumnMap, MapContext } from "./types.js";

/** Builds the mapping tables of one column; null when its encoding needs none. */
export async function buildColumnMap(engine: Engine, column: EncodedColumn, ctx: MapContext): Promise<ColumnMap | null> {
  const { index: i, name, spec } = column;
  if (spec.encoding === "codes" && spec.grouping) return buildCodedGroupMap(engine, i, name, spec.tableSize, spec.grouping);
  if (spec.encoding === "frequency" || spec.encoding === "codes") {
    if (spec.encoding === "frequency") await frequencyMap(engine, i, name);
    else await codesMap(engine, i, name, spec.tableSize);
    return { table: mapTable(i), fields: ["value"], perFold: false, files: [mainFile(mapTable(i))] };
  }
  if (spec.encoding === "hashing" && spec.grouping) return buildHashedGroupMap(engine, i, name, spec.width, spec.salt, spec.grouping);
  if (spec.encoding !== "target-kfold") return null;
  if (spec.structure) return buildStructureMap(engine, column, spec.structure, ctx);
  const m = spec.weight;
  if (ctx.mode === "scoring") {
    if (ctx.targetMean === undefined) throw new Error("target encoding without a plan target");
    await fullTargetMap(engine, i, PLAN_LEVELS, name, m, sqlDouble(ctx.targetMean));
    return { table: fullTable(i), fields: ["value"], perFold: false, files: [mainFile(fullTable(i))] };
  }
  await fullTargetMap(engine, i, INPUT_LEVELS, name, m, inputMeanSql(INPUT_LEVELS, name));
  if (ctx.leaveOneOut) {
    return { table: fullTable(i), fields: ["n_y", "sum_y"], perFold: false, files: [mainFile(fullTable(i))] };
  }
  await outOfFoldMap(engine, i, INPUT_LEVELS, name, m, ctx.folds);
  return { table: mapTable(i), fields: ["value"], perFold: true, files: [mainFile(fullTable(i)), foldFile(mapTable(i))] };
}
