/**
 * encode/hashedGroupMap: the hashing trick applied to backoff groups, the encoding
 * hierarchy/applyHierarchy advises for identifier-like codes without a target (a postcode seen
 * once per row). Each level goes to its backoff group as the scan grouped it (encode/groupMap:
 * hierarchy/backoff's query over the plan's full-data rows — the level itself with ≥ minRows
 * rows, else its deepest parent whose still-unmapped rare levels pool ≥ minRows rows, else
 * "other"; a level the plan never saw: its deepest parent that is a group, else "other"). The
 * group's key text (the level, or the parent) is hashed as engine/hashing hashes a level and as
 * hierarchy/backoffHashing measured it: md5_number_upper(salt ‖ key) mod width. "other" is not a
 * group and is not hashed: it takes the extra index `width`, so buckets run 0..width. Missing
 * levels are not in the table (→ NULL). No target is read, so training and scoring agree.
 * Source: Weinberger et al. (2009), "Feature hashing for large scale multitask learning" (the
 * hashing trick); the backoff rule is hierarchy/backoff's.
 */
import type { Engine } from "../engine/db.js";
import { bucketSql } from "../engine/hashing.js";
import { sqlNumber } from "../engine/sql.js";
import { buildGroupMap, groupTable } from "./groupMap.js";
import { mainFile } from "./mappingFiles.js";
import { fullTable } from "./targetMaps.js";
import type { ColumnMap, HashGrouping } from "./types.js";

/** SQL over the mapping row `m`: non-missing levels sent to "other" (the fallback rows). */
export const hashedGroupFallbackCondition = "l.level IS NOT NULL AND m.depth < 0";

/** What missing, unseen and "other" rows receive, in words. */
export const hashedGroupFallbackRule = (width: number): string =>
  `missing → NULL; unseen → their deepest parent group's bucket, else "other"; "other" → ${String(width)} (one past the last bucket)`;

/**
 * Creates groupTable(i) and fullTable(i)(level, seen, rows, depth, group_key, bucket BIGINT)
 * over every non-missing level of the plan and of the input, and returns the lookup of
 * `bucket`. Edge cases: a column whose plan levels are all missing → every input level is
 * unseen with no parent group → "other" (width); minRows = 0 → every seen level is its own
 * group and unseen levels go to "other".
 */
export async function buildHashedGroupMap(engine: Engine, i: number, name: string, width: number, salt: string, g: HashGrouping): Promise<ColumnMap> {
  await buildGroupMap(engine, i, name, g.parents, g.minRows);
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${fullTable(i)} AS
     SELECT level, seen, rows, depth, group_key,
            CASE WHEN depth < 0 THEN ${sqlNumber(width)}::BIGINT ELSE ${bucketSql("group_key", width, salt)} END AS bucket
     FROM ${groupTable(i)}`, `hashing the backoff groups of '${name}'`);
  return { table: fullTable(i), fields: ["bucket"], perFold: false, files: [mainFile(fullTable(i))], levelTable: groupTable(i) };
}
