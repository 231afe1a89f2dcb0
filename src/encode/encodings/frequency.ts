/**
 * encode/encodings/frequency: the level's share of the training rows (rows / all rows, missing
 * rows included, as in the profile's topLevels.share), from the plan's level table (the training
 * extract, summed over folds) in both modes, so a model sees the same feature at training and
 * at scoring time: mapTable(i)(level, rows, value DOUBLE). Missing and unseen levels are not in
 * the table → 0.
 */
import { quoteLiteral } from "../../engine/sql.js";
import { lookupOf } from "../expressions.js";
import type { EncodingModule } from "../encodingModule.js";
import { PLAN_LEVELS } from "../levelTables.js";
import { mainFile } from "../mappingFiles.js";
import { mapTable } from "../targetMaps.js";
import type { EncodingSpec } from "../types.js";

type Spec = Extract<EncodingSpec, { encoding: "frequency" }>;

export const frequency: EncodingModule<Spec> = {
  outputNames: (c) => [c.name],
  outputHolds: () => [{}],
  outputType: "DOUBLE",
  async buildMap(engine, { index: i, name }) {
    const col = quoteLiteral(name);
    await engine.run(
      `CREATE OR REPLACE TEMP TABLE ${mapTable(i)} AS
       SELECT level, rows, rows::DOUBLE / (SELECT sum(rows) FROM ${PLAN_LEVELS} WHERE name = ${col})::DOUBLE AS value
       FROM ${PLAN_LEVELS} WHERE name = ${col} AND level IS NOT NULL`, `building the frequency mapping of '${name}'`);
    return { table: mapTable(i), fields: ["value"], perFold: false, files: [mainFile(mapTable(i))] };
  },
  columnSql: (c, ctx) => [`coalesce(${lookupOf(c, ctx).value("value")}, 0::DOUBLE)`],
  fallbackCondition: () => "l.level IS NOT NULL AND m.level IS NULL",
  fallbackRule: () => "missing and unseen → share 0",
  manifestParams: () => Promise.resolve({ value: "training rows of the level / all training rows" }),
};
