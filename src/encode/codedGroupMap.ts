/**
 * encode/codedGroupMap: codes over backoff groups — the index advice/hashWidth prefers to
 * hashing when the groups of an identifier-like nesting code (hierarchy/applyHierarchy, no
 * target) form a closed vocabulary within the width cap. Each level goes to its backoff group as
 * the scan grouped it (encode/groupMap: the level itself with ≥ minRows rows, else its deepest
 * parent whose still-unmapped rare levels pool ≥ minRows rows, else "other"; a level the plan
 * never saw: its deepest parent that is a group, else "other"). Groups are numbered 1, 2, … by
 * descending plan rows, ties by depth then group key in byte order; groups past tableSize,
 * "other", and (in the output query, as for plain codes) missing levels → 0. No target is read,
 * so training and scoring agree.
 */
import type { Engine } from "../engine/db.js";
import { sqlNumber } from "../engine/sql.js";
import { buildGroupMap, groupTable } from "./groupMap.js";
import { mainFile } from "./mappingFiles.js";
import { fullTable } from "./targetMaps.js";
import type { ColumnMap, HashGrouping } from "./types.js";

/** What missing, unseen and "other" rows receive, in words. */
export const codedGroupFallbackRule = "missing → 0; unseen → their deepest parent group's code, else \"other\"; \"other\" and groups past tableSize → 0";

/**
 * Creates groupTable(i) and fullTable(i)(level, seen, rows, depth, group_key, value BIGINT) over
 * every non-missing level of the plan and of the input, and returns the lookup of `value`.
 * Edge cases: no groups → every level "other" (0).
 */
export async function buildCodedGroupMap(engine: Engine, i: number, name: string, tableSize: number, g: HashGrouping): Promise<ColumnMap> {
  await buildGroupMap(engine, i, name, g.parents, g.minRows);
  await engine.run(
    `CREATE OR REPLACE TEMP TABLE ${fullTable(i)} AS
     WITH grp AS (SELECT depth, group_key, sum(rows) AS rows FROM ${groupTable(i)} WHERE seen AND depth >= 0 GROUP BY depth, group_key),
          ranked AS (SELECT depth, group_key, row_number() OVER (ORDER BY rows DESC, depth, group_key) AS code FROM grp)
     SELECT t.level, t.seen, t.rows, t.depth, t.group_key,
            (CASE WHEN t.depth >= 0 AND r.code <= ${sqlNumber(tableSize)} THEN r.code ELSE 0 END)::BIGINT AS value
     FROM ${groupTable(i)} t LEFT JOIN ranked r ON r.depth = t.depth AND r.group_key = t.group_key`, `numbering the backoff groups of '${name}'`);
  return { table: fullTable(i), fields: ["value"], perFold: false, files: [mainFile(fullTable(i))], levelTable: groupTable(i) };
}
