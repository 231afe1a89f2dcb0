/**
 * encode/encodingModule: what one encoding supplies to `encode` — everything about it in one
 * module under encode/encodings/ (the registry, encode/encodings/registry.ts, maps each
 * encoding to its module, as advice/recommend's RULES lists the rules):
 *  - its output columns (raw names, what level each holds, their type);
 *  - the mapping tables it builds in DuckDB (null when its parameters alone define it);
 *  - the SQL of its output columns over the source row;
 *  - the summary's fallback condition and rule in words;
 *  - its manifest parameters.
 * Reading the plan's parameters into a spec stays in encode/params.ts (one place for the
 * plan → spec conversion).
 * Adding an encoding: a spec variant in encode/types.ts, its reading in encode/params.ts, a
 * module here, one line in the registry.
 */
import type { Engine } from "../engine/db.js";
import { quoteLiteral } from "../engine/sql.js";
import type { ExprContext } from "./expressions.js";
import type { ColumnMap, EncodeMode, EncodingSpec, MapContext, OutputSqlType } from "./types.js";

/** An encoded column whose spec is of one encoding. */
export interface ColumnOf<S extends EncodingSpec> { name: string; index: number; spec: S }

/** What one output column of an encoding holds (aligned with outputNames). */
export interface OutputHolds { level?: string | null; pooled?: true; class?: string }

export interface EncodingModule<S extends EncodingSpec> {
  /** Raw output names, in output order (safe names are derived from them: encode/safeNames). */
  outputNames(column: ColumnOf<S>): string[];
  /** What each output column holds, aligned with outputNames. */
  outputHolds(column: ColumnOf<S>): OutputHolds[];
  /** The Parquet type of its output columns. */
  outputType: OutputSqlType;
  /** Builds its mapping tables; null when it needs none. */
  buildMap(engine: Engine, column: ColumnOf<S>, ctx: MapContext): Promise<ColumnMap | null>;
  /** The SQL of its output columns over the source row, aligned with outputNames. */
  columnSql(column: ColumnOf<S>, ctx: ExprContext): string[];
  /** SQL over `l` (input level row) and `m` (its mapping row): rows that got the fallback. */
  fallbackCondition(spec: S, mode: EncodeMode, leaveOneOut: boolean): string;
  /** What missing, unseen and fallback rows receive, in words. */
  fallbackRule(spec: S, mode: EncodeMode, leaveOneOut: boolean): string;
  /** Its manifest parameters; `outputs` = the written names of its output columns. */
  manifestParams(engine: Engine, column: ColumnOf<S>, outputs: readonly string[], mode: EncodeMode, leaveOneOut: boolean): Promise<Record<string, unknown>>;
}

/** ` AND l.level NOT IN (…)` for the listed non-null levels ("" when none). */
export function notInLevels(values: readonly (string | null)[]): string {
  const texts = values.filter((v): v is string => v !== null);
  return texts.length === 0 ? "" : ` AND l.level NOT IN (${texts.map(quoteLiteral).join(", ")})`;
}

/** Reads a DuckDB variable set while building the maps (the prior, the fold priors). */
export async function readVariable<T>(engine: Engine, name: string): Promise<T | null> {
  const [row] = await engine.rows<{ v: T | null }>(`SELECT getvariable(${quoteLiteral(name)}) AS v`, "reading a mapping constant");
  return row?.v ?? null;
}
