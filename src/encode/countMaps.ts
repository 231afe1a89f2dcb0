/**
 * encode/countMaps: the mapping tables of the encodings that use level counts, built in DuckDB
 * from the plan's level table (the training extract, summed over folds) in both modes, so a
 * model sees the same feature at training and at scoring time:
 *  - frequency: value = the level's share of the training rows (rows / all rows, missing rows
 *    included, as in the profile's topLevels.share);
 *  - codes: value = the level's rank by descending training rows, ties by level text in
 *    byte order (1 = most frequent); levels ranked past `tableSize` are pooled into 0.
 * Missing and unseen levels are not in the table; the encoder gives them 0.
 */
import type { Engine } from "../engine/db.js";
import { quoteLiteral, sqlNumber } from "../engine/sql.js";
import { PLAN_LEVELS } from "./levelTables.js";
import { mapTable } from "./targetMaps.js";

/** Creates `mapTable(i)`(level, rows, value DOUBLE) of training shares. */
export async function frequencyMap(engine: Engine, i: number, name: string): Promise<void> {
  const col = quoteLiteral(name);
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${mapTable(i)} AS
     SELECT level, rows, rows::DOUBLE / (SELECT sum(rows) FROM ${PLAN_LEVELS} WHERE name = ${col})::DOUBLE AS value
     FROM ${PLAN_LEVELS} WHERE name = ${col} AND level IS NOT NULL`, `building the frequency mapping of '${name}'`);
}

/** Creates `mapTable(i)`(level, rows, value BIGINT) of frequency-ranked integer codes. */
export async function codesMap(engine: Engine, i: number, name: string, tableSize: number): Promise<void> {
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${mapTable(i)} AS
     SELECT level, rows, (CASE WHEN r <= ${sqlNumber(tableSize)} THEN r ELSE 0 END)::BIGINT AS value
     FROM (SELECT level, rows, row_number() OVER (ORDER BY rows DESC, level) AS r
           FROM ${PLAN_LEVELS} WHERE name = ${quoteLiteral(name)} AND level IS NOT NULL)`,
    `building the codes of '${name}'`);
}
