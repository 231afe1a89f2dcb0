/**
 * encode/encodings/codes: the level's rank by descending training rows, ties by level text in
 * byte order (1 = most frequent); levels ranked past `tableSize` are pooled into 0. Built from the
 * plan's level table in both modes: mapTable(i)(level, rows, value BIGINT). Missing and unseen
 * levels are not in the table → 0.
 */
import { quoteLiteral, sqlNumber } from "../../engine/sql.js";
import { lookupOf } from "../expressions.js";
import type { EncodingModule } from "../encodingModule.js";
import { PLAN_LEVELS } from "../levelTables.js";
import { mainFile } from "../mappingFiles.js";
import { mapTable } from "../targetMaps.js";
import type { EncodingSpec } from "../types.js";

type Spec = Extract<EncodingSpec, { encoding: "codes" }>;

export const codes: EncodingModule<Spec> = {
  outputNames: (c) => [c.name],
  outputHolds: () => [{}],
  outputType: "BIGINT",
  async buildMap(engine, { index: i, name, spec }) {
    await engine.run(
      `CREATE OR REPLACE TEMP TABLE ${mapTable(i)} AS
       SELECT level, rows, (CASE WHEN r <= ${sqlNumber(spec.tableSize)} THEN r ELSE 0 END)::BIGINT AS value
       FROM (SELECT level, rows, row_number() OVER (ORDER BY rows DESC, level) AS r
             FROM ${PLAN_LEVELS} WHERE name = ${quoteLiteral(name)} AND level IS NOT NULL)`,
      `building the codes of '${name}'`);
    return { table: mapTable(i), fields: ["value"], perFold: false, files: [mainFile(mapTable(i))] };
  },
  columnSql: (c, ctx) => [`coalesce(${lookupOf(c, ctx).value("value")}, 0)::BIGINT`],
  fallbackCondition: () => "l.level IS NOT NULL AND coalesce(m.value, 0) = 0",
  fallbackRule: () => "missing, pooled and unseen → code 0",
  manifestParams: (_e, c) => Promise.resolve({ tableSize: c.spec.tableSize, value: "rank by descending training rows, ties by level text in byte order; ranks past tableSize → 0" }),
};
