/**
 * portableSql/lookupSql: how the scoring SQL reads a key → value mapping for one row.
 *  - inlined (at most `inlineMax` rows): a searched CASE over the keys (every engine has it);
 *  - a table loaded by the user, (level, value): in ansi and spark a correlated scalar subquery
 *    `(SELECT MAX(value) FROM t WHERE level = key)` (Spark wants correlated scalar subqueries
 *    aggregated); in clickhouse 18.16 — at most one JOIN per SELECT — the table as two arrays
 *    (scalar subqueries, both ordered by the unique level, so aligned) and transform(); a tuple of
 *    both arrays fails on 18.16 once the initiator forwards the query to the shards.
 * A key found nowhere (or NULL) gives NULL; the caller applies the fallback.
 */
import { sqlNumber } from "../engine/sql.js";
import type { Dialect } from "./dialects.js";
import type { KeyValue } from "./planMaps.js";

export interface LookupTable { name: string; rows: readonly KeyValue[]; inline: boolean; integer: boolean }

/** A mapped value as SQL: an integer literal, or a DOUBLE that parses back exactly. */
export const valueSql = (d: Dialect, v: number, integer: boolean): string => (integer ? sqlNumber(v) : d.double(v));

/** The NULL of the value's type (a CASE with no branch). */
const typedNull = (d: Dialect, integer: boolean) => d.cast("NULL", integer ? "BIGINT" : "DOUBLE");

/** SQL for the value of `key` (a text expression) in `t`, NULL when absent. */
export function lookupSql(d: Dialect, t: LookupTable, key: string): string {
  if (t.inline) {
    if (t.rows.length === 0) return typedNull(d, t.integer);
    return `CASE ${t.rows.map((r) => `WHEN ${key} = ${d.literal(r.key)} THEN ${valueSql(d, r.value, t.integer)}`).join(" ")} END`;
  }
  const table = d.ident(t.name);
  const [level, value] = [d.ident("level"), d.ident("value")];
  if (d.name !== "clickhouse") return `(SELECT MAX(m.${value}) FROM ${table} AS m WHERE m.${level} = ${key})`;
  const sorted = `(SELECT ${level}, ${value} FROM ${table} ORDER BY ${level})`;
  const keys = `(SELECT groupArray(${level}) FROM ${sorted})`;
  const cast = t.integer ? "toInt64" : "toFloat64";
  const values = `(SELECT groupArray(toFloat64(${value})) FROM ${sorted})`;
  // transform() looks up in a hash table (indexOf scans the array: 44.5 s instead of 2.7 s on the sample, measured);
  // NaN marks "absent" (mapped values are finite)
  const found = `transform(assumeNotNull(${key}), ${keys}, ${values}, nan)`;
  return `if(${key} IS NULL OR isNaN(${found}), ${typedNull(d, t.integer)}, ${cast}(${found}))`;
}
