/**
 * The one quoting helper for SQL text that comes from outside (column names, file paths, level
 * values, user options). Identifiers cannot be bound as parameters in DuckDB, so they go through
 * `quoteIdent`; values are bound as parameters wherever the statement allows it and otherwise
 * through `quoteLiteral`.
 */
import { TailsiftError } from "../errors.js";

/** A value with a NUL byte cannot be written as SQL text: one clear line (value shortened, NUL shown as \0). */
function nulInValue(value: string): TailsiftError {
  const shown = value.replaceAll("\u0000", "\\0");
  return new TailsiftError("nul_in_value",
    `the value '${shown.length > 60 ? `${shown.slice(0, 60)}…` : shown}' holds a NUL byte, which tailsift cannot write into SQL; remove the NUL bytes from the input (e.g. tr -d '\\000')`);
}

/** Quotes an identifier: "a""b". NUL cannot appear in a DuckDB identifier and is rejected. */
export function quoteIdent(name: string): string {
  if (name.includes("\u0000")) throw new RangeError("identifier contains a NUL character");
  return `"${name.replaceAll('"', '""')}"`;
}

/** Quotes a string literal: 'it''s'. NUL is rejected (DuckDB strings cannot hold it). */
export function quoteLiteral(value: string): string {
  if (value.includes("\u0000")) throw nulInValue(value);
  return `'${value.replaceAll("'", "''")}'`;
}

/** A list of string literals for IN (...) or list_value(...). */
export function quoteLiteralList(values: readonly string[]): string {
  return `[${values.map(quoteLiteral).join(", ")}]`;
}

/** A finite number as SQL text; throws on NaN/Infinity rather than emitting invalid SQL. */
export function sqlNumber(value: number): string {
  if (!Number.isFinite(value)) throw new RangeError(`not a finite number: ${value}`);
  return String(value);
}

/** Spark SQL: identifiers in backticks (`a``b`). */
export function quoteIdentBacktick(name: string): string {
  if (name.includes("\u0000")) throw new RangeError("identifier contains a NUL character");
  return `\`${name.replaceAll("`", "``")}\``;
}

/** Spark SQL: string literals escape quotes and backslashes with a backslash. */
export function quoteLiteralBackslash(value: string): string {
  if (value.includes("\u0000")) throw nulInValue(value);
  return `'${value.replaceAll("\\", "\\\\").replaceAll("'", "\\'")}'`;
}
