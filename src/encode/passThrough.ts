/**
 * encode/passThrough: the SQL of the columns encode writes without encoding them — typed, so the
 * model-ready file loads with numbers as numbers (issue 16):
 *  - the plan's numeric columns: BIGINT when scan's sample saw only integers (profile
 *    `numberType: "integer"`), else DOUBLE (also for plans made before numberType existed);
 *  - the target: 0/1 INTEGER for a binary target (1 = the plan's positive value), DOUBLE for a
 *    continuous one — the same y the scan and the target encoding read (engine/target);
 *  - everything else (`--keep` columns, `--keep-original` text copies, text the plan keeps): VARCHAR
 *    exactly as read.
 * CSV has no types: a numeric column keeps the input's text when it is a plain number (so
 * `123.40` stays `123.40`), else the number's own text; the target is written as its y.
 * Numeric detection looks at a sample, so a value that does not fit the planned type stops the
 * run with one line naming the column and the value (never a silent NULL).
 */
import { PLAIN_NUMBER_RE } from "../engine/inspect.js";
import { quoteLiteral } from "../engine/sql.js";
import { targetSql, type TargetSpec } from "../engine/target.js";
import { TailsiftError } from "../errors.js";
import { guardCellSql } from "./cellGuard.js";
import { ref } from "./expressions.js";
import type { OutputSqlType, PassType } from "./types.js";


/** The SQL type a passed-through column has in Parquet. */
export function passSqlType(type: PassType, target: TargetSpec | undefined): OutputSqlType {
  if (type === "integer") return "BIGINT";
  if (type === "double") return "DOUBLE";
  if (type === "target") return target?.kind === "binary" ? "INTEGER" : target?.kind === "multiclass" ? "VARCHAR" : "DOUBLE";
  return "VARCHAR";
}

/** Marks the engine error raised by a value that does not fit (see valueErrorOf). */
const MARK = "tailsift-value-does-not-fit: ";

const plain = (v: string) => `regexp_full_match(${v}, ${quoteLiteral(PLAIN_NUMBER_RE)})`;

function fail(what: string, v: string, hint: string): string {
  return `error(${quoteLiteral(`${MARK}${what} '`)} || left(${v}, 60) || ${quoteLiteral(`'${hint}`)})`;
}

export interface PassContext {
  csv: boolean;
  cellGuard: boolean;
  target: TargetSpec | undefined;
}

/** The SQL of one passed-through column. */
export function passSql(column: string, type: PassType, ctx: PassContext): string {
  const raw = ref(column);
  if (type === "text") return ctx.csv && ctx.cellGuard ? guardCellSql(raw) : raw;
  const keepHint = `; fix the value, pass the column as text with --keep ${column}, or rescan`;
  if (type === "target") {
    const t = ctx.target;
    if (!t) return raw;
    // a multi-class target is its class's text, trimmed as the scan read it (engine/target)
    if (t.kind === "multiclass") return ctx.csv && ctx.cellGuard ? guardCellSql(`trim(${raw})`) : `trim(${raw})`;
    const y = targetSql(t);
    const bad = fail(`target '${column}' is ${t.kind} in the plan${t.positive !== undefined ? ` (positive '${t.positive}')` : ""}, but the input holds`, raw, keepHint);
    if (t.kind === "binary") return `(CASE WHEN ${y.bad} THEN ${bad} ELSE CAST(${y.y} AS INTEGER) END)`;
    const text = ctx.csv ? `CASE WHEN ${plain(`trim(${raw})`)} THEN trim(${raw}) ELSE CAST(${y.y} AS VARCHAR) END` : y.y;
    return `(CASE WHEN ${y.bad} THEN ${bad} WHEN ${y.y} IS NULL THEN NULL ELSE ${text} END)`;
  }
  const v = `nullif(${raw}, '')`;
  const typed = type === "integer" ? `TRY_CAST(${v} AS BIGINT)` : `TRY_CAST(${v} AS DOUBLE)`;
  const valid = type === "integer" ? `regexp_full_match(${v}, '^[-+]?[0-9]+$') AND ${typed} IS NOT NULL` : `isfinite(${typed})`;
  const value = ctx.csv ? `CASE WHEN ${plain(v)} THEN ${v} ELSE CAST(${typed} AS VARCHAR) END` : typed;
  const bad = fail(`column '${column}' is ${type === "integer" ? "an integer" : "a number"} in the plan (scan's sample), but the input holds`, v, keepHint);
  return `(CASE WHEN ${v} IS NULL THEN NULL WHEN ${valid} THEN ${value} ELSE ${bad} END)`;
}

/** The one-line TailsiftError for an engine error raised by `passSql`'s check, or null. */
export function valueErrorOf(err: unknown): TailsiftError | null {
  const text = err instanceof Error ? err.message : String(err);
  const at = text.indexOf(MARK);
  if (at < 0) return null;
  const line = text.slice(at + MARK.length).split("\n")[0] ?? "";
  return new TailsiftError("value_does_not_fit", line, 2, { cause: err });
}
