/**
 * encode/hierarchyCounts: the summary of target encoding over a hierarchy — which rows got the
 * prior (the fallback count), the rule in words, and where the input's levels went (backoff:
 * own group, a parent group, "other"; hierarchical: own mean, parent mean, prior), from the
 * level and mapping tables only, never the rows. Where the levels went is counted the same way
 * for the hashing of backoff groups.
 */
import type { Engine } from "../engine/db.js";
import { quoteLiteral } from "../engine/sql.js";
import { INPUT_LEVELS } from "./levelTables.js";
import type { EncodeMode, EncodingSpec, GroupingCounts, HashGrouping, TargetStructure } from "./types.js";

const isNull = (w: number | null) => (w === null ? "true" : "false");

/** SQL over `l` (input level row) and `m` (its mapping row): non-missing rows that got the prior. */
export function hierarchyFallbackCondition(s: TargetStructure, mode: EncodeMode): string {
  const training = mode === "training";
  if (s.kind === "backoff") return `l.level IS NOT NULL AND (${training ? "m.n_other" : "m.group_n_y"} <= 0 OR ${isNull(s.weight)})`;
  const own = `(${training ? "m.n_other" : "m.n_y"} <= 0 OR ${isNull(s.weight)})`;
  const parent = `(${training ? "m.parent_n_other" : "m.parent_n_y"} <= 0 OR ${isNull(s.parentWeight)})`;
  return `l.level IS NOT NULL AND ${own} AND ${parent}`;
}

/** What missing, unseen and fallback rows receive, in words. */
export function hierarchyFallbackRule(s: TargetStructure, mode: EncodeMode): string {
  const p = mode === "scoring" ? "p" : "the other folds' mean";
  if (s.kind === "backoff") {
    return `missing → ${p}; unseen → their deepest parent group, else "other"; a group without target rows${mode === "training" ? " in other folds" : ""} → ${p}`;
  }
  return `missing → ${p}; a level without target rows${mode === "training" ? " in other folds" : " (unseen included)"} → its parent's mean; a parent without any → ${p}`;
}

/** The grouping a column's levels go through: a target structure, a hashed backoff grouping, or none. */
export function groupingOf(spec: EncodingSpec): TargetStructure | HashGrouping | undefined {
  if (spec.encoding === "target-kfold") return spec.structure;
  return spec.encoding === "hashing" ? spec.grouping : undefined;
}

/**
 * Counts over the input's non-missing levels joined to `levelTable` (backoff, target or hashing:
 * encode/groupMap's table; hierarchical: the full-data table). Hierarchical classes follow the full-data sums
 * and weights: own mean when the level has target rows and m is not null, else the parent's
 * when the parent has target rows and M is not null, else the prior.
 */
export async function groupingCounts(engine: Engine, name: string, s: TargetStructure | HashGrouping, levelTable: string): Promise<GroupingCounts> {
  const cls = s.kind === "backoff"
    ? "CASE WHEN t.depth = 0 THEN 'own' WHEN t.depth > 0 THEN 'parent' ELSE 'other' END"
    : `CASE WHEN t.n_y > 0 AND NOT ${isNull(s.weight)} THEN 'own' WHEN t.parent_n_y > 0 AND NOT ${isNull(s.parentWeight)} THEN 'parent' ELSE 'other' END`;
  const rows = await engine.rows<{ cls: string; seen: boolean; levels: number; rows: number }>(
    `WITH il AS (SELECT level, sum(rows) AS rows FROM ${INPUT_LEVELS} WHERE name = ${quoteLiteral(name)} AND level IS NOT NULL GROUP BY level)
     SELECT ${cls} AS cls, t.seen, count(*)::DOUBLE AS levels, sum(il.rows)::DOUBLE AS rows
     FROM il JOIN ${levelTable} t ON t.level = il.level GROUP BY ALL`, `counting where the levels of '${name}' went`);
  const sum = (keep: (r: { cls: string; seen: boolean }) => boolean) => {
    const picked = rows.filter(keep);
    return { levels: picked.reduce((a, r) => a + r.levels, 0), rows: picked.reduce((a, r) => a + r.rows, 0) };
  };
  return {
    kind: s.kind, own: sum((r) => r.cls === "own"), parent: sum((r) => r.cls === "parent"),
    other: sum((r) => r.cls === "other"), unseen: sum((r) => !r.seen),
  };
}
