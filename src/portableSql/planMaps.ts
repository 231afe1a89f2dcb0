/**
 * portableSql/planMaps: the scoring mappings of a plan, computed once in DuckDB by encode's own
 * builders (each encoding's module, encode/encodings/registry, in scoring mode, over the plan's levels.parquet, with an empty
 * input level table so only the plan's levels are mapped), and read back as small key → value
 * tables that the printed SQL looks up:
 *  - frequency, codes, flat target encoding: `level` (level → value);
 *  - backoff target encoding: `level` (seen level → its group's value), `group d` per parent
 *    depth d ≥ 1 (parent text → group value; an unseen level takes its deepest parent that is a
 *    group), and the "other" group's value (the prior p when no seen level is "other");
 *  - hierarchical prior: `level`, `parent` (parent text → parent mean; an unseen parent → p);
 *  - hashing of backoff groups: `level` (seen level → bucket, "other" → width) and `group d`;
 *  - codes over backoff groups (encode/codedGroupMap): `level` (seen level → its group's code,
 *    "other" → 0) and `group d`; a level in no table → 0, missing → 0.
 * encode's mapping rules are not restated here: only its results are read.
 */
import type { Engine } from "../engine/db.js";
import { groupsTable } from "../encode/backoffMaps.js";
import { encoderFor } from "../encode/encodings/registry.js";
import { parentsTable } from "../encode/hierarchicalMaps.js";
import { inputLevelsFromPlan } from "../encode/levelTables.js";
import { planColumns } from "../encode/planColumns.js";
import { fullTable, mapTable } from "../encode/targetMaps.js";
import type { EncodedColumn, OutputSqlType, PassType } from "../encode/types.js";
import { loadPlanLevels } from "../plan/load.js";
import type { ParentSpec } from "../profile/hierarchyTypes.js";
import { TailsiftError } from "../errors.js";
import type { Profile } from "../profile/types.js";

export interface KeyValue { key: string; value: number }

/** One lookup table of a column: its role, the parent it is keyed by (groups), and its rows. */
export interface Lookup { role: string; parent?: ParentSpec; rows: KeyValue[] }

export interface ScoringColumn {
  column: EncodedColumn;
  /** The column's raw output names (its encoding module's; safe names are made from them: portableSql/outputNames). */
  outputs: string[];
  /** The type encode writes them as (its encoding module's outputType). */
  outputType: OutputSqlType;
  /** The level table first, then group tables deepest first, or the parent table. */
  lookups: Lookup[];
  /** What a non-missing level found in no table gets (p, the "other" value, or the width). */
  fallback: number | null;
  /** What a missing level gets. */
  missing: number | null;
}

/** A passed-through column carries encode's pass type (encode/planColumns), which encode/passThrough's passSqlType turns into the output type. */
export type ScoringItem = { kind: "pass"; column: string; type: PassType } | { kind: "encoded"; scoring: ScoringColumn };

async function keyValues(engine: Engine, table: string, key: string, value: string, where = "true"): Promise<KeyValue[]> {
  const rows = await engine.rows<{ k: string; v: number }>(
    `SELECT ${key} AS k, (${value})::DOUBLE AS v FROM ${table} WHERE ${key} IS NOT NULL AND ${where} ORDER BY k`, "reading a scoring mapping");
  return rows.map((r) => ({ key: r.k, value: r.v }));
}

async function lookupsOf(engine: Engine, c: EncodedColumn, prior: number | null): Promise<Omit<ScoringColumn, "column" | "outputs" | "outputType">> {
  const spec = c.spec;
  const i = c.index;
  if (spec.encoding === "codes" && spec.grouping) {
    const parents = spec.grouping.parents;
    const groups: Lookup[] = [];
    for (let d = parents.length; d >= 1; d--) {
      groups.push({ role: `group ${d}`, parent: parents[d - 1]!, rows: await keyValues(engine, `(SELECT DISTINCT depth, group_key, value FROM ${fullTable(i)})`, "group_key", "value", `depth = ${d}`) });
    }
    return { lookups: [{ role: "level", rows: await keyValues(engine, fullTable(i), "level", "value") }, ...groups], fallback: 0, missing: 0 };
  }
  if (spec.encoding === "frequency" || spec.encoding === "codes") {
    return { lookups: [{ role: "level", rows: await keyValues(engine, mapTable(i), "level", "value") }], fallback: 0, missing: 0 };
  }
  if (spec.encoding === "hashing" && spec.grouping) {
    const parents = spec.grouping.parents;
    const groups: Lookup[] = [];
    for (let d = parents.length; d >= 1; d--) {
      groups.push({ role: `group ${d}`, parent: parents[d - 1]!, rows: await keyValues(engine, `(SELECT DISTINCT depth, group_key, bucket FROM ${fullTable(i)})`, "group_key", "bucket", `depth = ${d}`) });
    }
    return { lookups: [{ role: "level", rows: await keyValues(engine, fullTable(i), "level", "bucket") }, ...groups], fallback: spec.width, missing: null };
  }
  if (spec.encoding !== "target-kfold") return { lookups: [], fallback: null, missing: null };
  if (prior === null) throw new TailsiftError("bad_plan", "the plan target-encodes a column but has no target; rescan with --target");
  const level: Lookup = { role: "level", rows: await keyValues(engine, fullTable(i), "level", "value") };
  if (!spec.structure) return { lookups: [level], fallback: prior, missing: prior };
  if (spec.structure.kind === "hierarchical") {
    return { lookups: [level, { role: "parent", parent: spec.structure.parent, rows: await keyValues(engine, parentsTable(i), "parent", "value") }], fallback: prior, missing: prior };
  }
  const parents = spec.structure.parents;
  const groups: Lookup[] = [];
  for (let d = parents.length; d >= 1; d--) {
    groups.push({ role: `group ${d}`, parent: parents[d - 1]!, rows: await keyValues(engine, groupsTable(i), "group_key", "value", `depth = ${d}`) });
  }
  const [other] = await keyValues(engine, groupsTable(i), "group_key", "value", "depth < 0");
  return { lookups: [level, ...groups], fallback: other?.value ?? prior, missing: prior };
}

/** The plan's output items in encode's order (scoring mode, every plan column present). */
export async function scoringItems(engine: Engine, profile: Profile, levelsPath: string): Promise<ScoringItem[]> {
  const inputColumns = profile.columns.map((c) => c.name);
  const plan = planColumns(profile, inputColumns, { mode: "scoring", keep: [], keepOriginal: false, foldColumn: "fold", foldKeys: [] });
  const names = plan.encoded.map((c) => c.name);
  if (names.length > 0) {
    await loadPlanLevels(engine, levelsPath, "sql", names);
    await inputLevelsFromPlan(engine, levelsPath, []);
  }
  const prior = profile.target?.mean ?? null;
  const items: ScoringItem[] = [];
  for (const item of plan.outputs) {
    if (item.kind === "pass") { items.push({ kind: "pass", column: item.column, type: item.type }); continue; }
    if (item.kind !== "encoded") continue;
    const c = item.column;
    const encoder = encoderFor(c);
    await encoder.buildMap(engine, c, { mode: "scoring", leaveOneOut: false, folds: profile.settings.folds, targetMean: prior ?? undefined });
    items.push({ kind: "encoded", scoring: { column: c, outputs: encoder.outputNames(c), outputType: encoder.outputType, ...(await lookupsOf(engine, c, prior)) } });
  }
  return items;
}
