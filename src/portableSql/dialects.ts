/**
 * portableSql/dialects: how the printed SQL is spelled for each target engine. Differences found
 * by running the queries (test/warehouse/):
 *  - ansi (DuckDB, PostgreSQL 15, Trino): double-quoted identifiers, VARCHAR, DOUBLE PRECISION
 *    (PostgreSQL has no type DOUBLE), MOD(), TRIM(), md5() as 32 hex digits;
 *  - spark: backtick identifiers, STRING, DOUBLE, backslash-escaped literals, md5() hex and conv();
 *  - clickhouse (checked on Debian's 18.16): no WITH … AS (subquery) CTEs, no MOD (modulo()), no
 *    TRIM (replaceRegexpAll), Float64 casts, Nullable(String) so NULL levels survive the cast,
 *    substringUTF8 (substring counts bytes), MD5() as 16 raw bytes read by reinterpretAsUInt64
 *    (the first 8 bytes, little-endian — exactly engine/hashing's bucket integer), and at most one
 *    JOIN per SELECT, so mapping lookups are scalar subqueries over arrays; over a Distributed
 *    table such expressions fail ("Not found column"), so the scoring query reads the rows in a
 *    derived table and looks up on the initiator.
 */
import { quoteIdent, quoteIdentBacktick, quoteLiteral, quoteLiteralBackslash, sqlNumber } from "../engine/sql.js";
import type { OutputSqlType } from "../encode/types.js";

export type DialectName = "ansi" | "spark" | "clickhouse";
export const DIALECTS: readonly DialectName[] = ["ansi", "spark", "clickhouse"];

/** A numeric output type (what parseNumber reads text as). */
export type NumberSqlType = Exclude<OutputSqlType, "VARCHAR">;

/**
 * encode's output types (encode/types OutputSqlType: INTEGER = 32-bit, BIGINT = 64-bit, DOUBLE =
 * binary64, VARCHAR = text) as each dialect names them. ClickHouse columns are Nullable: encode's
 * Parquet columns may hold NULL (a missing pass-through value, a hashed missing level).
 */
export const TYPE_NAMES: Readonly<Record<DialectName, Readonly<Record<OutputSqlType, string>>>> = {
  ansi: { INTEGER: "INTEGER", BIGINT: "BIGINT", DOUBLE: "DOUBLE PRECISION", VARCHAR: "VARCHAR" },
  spark: { INTEGER: "INT", BIGINT: "BIGINT", DOUBLE: "DOUBLE", VARCHAR: "STRING" },
  clickhouse: { INTEGER: "Nullable(Int32)", BIGINT: "Nullable(Int64)", DOUBLE: "Nullable(Float64)", VARCHAR: "Nullable(String)" },
};

export interface Dialect {
  name: DialectName;
  ident(s: string): string;
  literal(s: string): string;
  /** The text type of CAST (TYPE_NAMES' VARCHAR). */
  text: string;
  /** This dialect's name of each output type (TYPE_NAMES). */
  types: Readonly<Record<OutputSqlType, string>>;
  /** `expr` (a number, or NULL) as output type `type`: CAST(expr AS <type's name>). */
  cast(expr: string, type: OutputSqlType): string;
  /** Text `t` read as a number of type `type`: trimmed; empty or NULL → NULL; not a number → the engine's error. */
  parseNumber(t: string, type: NumberSqlType): string;
  toText(expr: string): string;
  toDouble(expr: string): string;
  toInteger(expr: string): string;
  /** A DOUBLE constant, written so that it parses back to the same binary64 value. */
  double(value: number): string;
  mod(a: string, b: string): string;
  abs(expr: string): string;
  trim(expr: string): string;
  lower(expr: string): string;
  concat(a: string, b: string): string;
  /** `text` with the first match of the anchored pattern `^(head)tail` replaced by group 1. */
  replaceFirstGroup(text: string, pattern: string): string;
  /** The first `n` characters. */
  leftChars(text: string, n: number): string;
  /** (unsigned LE 64-bit integer of the first 8 bytes of MD5(text)) mod width, as a BIGINT. */
  md5Bucket(text: string, width: number): string;
}

/** Shortest round-trip text of a finite double (JavaScript's Number → String is exact on parse). */
const doubleText = (v: number): string => sqlNumber(v);

/**
 * The bucket from md5 hex text without 64-bit unsigned arithmetic: Horner's rule over the 8 bytes
 * from the most significant (byte 7) down, reducing mod width at each step, so every intermediate
 * stays below 256·width (exact in BIGINT for width < 2^55).
 */
function hornerBucket(byteAt: (j: number) => string, width: number, mod: (a: string, b: string) => string): string {
  const w = sqlNumber(width);
  let r = mod(byteAt(7), w);
  for (let j = 6; j >= 0; j--) r = mod(`${r} * 256 + ${byteAt(j)}`, w);
  return r;
}

const HEX = "'0123456789abcdef'";

const castTo = (names: Readonly<Record<OutputSqlType, string>>) => (e: string, t: OutputSqlType) => `CAST(${e} AS ${names[t]})`;
const castAnsi = castTo(TYPE_NAMES.ansi);
const castSpark = castTo(TYPE_NAMES.spark);
const castClickHouse = castTo(TYPE_NAMES.clickhouse);
const CLICKHOUSE_READ: Record<NumberSqlType, string> = { INTEGER: "toInt32", BIGINT: "toInt64", DOUBLE: "toFloat64" };
const clickhouseTrim = (e: string) => `replaceRegexpAll(${e}, '^ +| +$', '')`;

export const ANSI: Dialect = {
  name: "ansi", ident: quoteIdent, literal: quoteLiteral, text: TYPE_NAMES.ansi.VARCHAR, types: TYPE_NAMES.ansi, cast: castAnsi,
  parseNumber: (t, type) => castAnsi(`NULLIF(TRIM(${t}), '')`, type),
  toText: (e) => castAnsi(e, "VARCHAR"),
  toDouble: (e) => castAnsi(e, "DOUBLE"),
  toInteger: (e) => castAnsi(e, "INTEGER"),
  double: (v) => castAnsi(doubleText(v), "DOUBLE"),
  mod: (a, b) => `MOD(${a}, ${b})`,
  abs: (e) => `ABS(${e})`,
  trim: (e) => `TRIM(${e})`,
  lower: (e) => `LOWER(${e})`,
  concat: (a, b) => `(${a} || ${b})`,
  replaceFirstGroup: (t, p) => `REGEXP_REPLACE(${t}, ${quoteLiteral(p)}, '\\1')`,
  leftChars: (t, n) => `SUBSTRING(${t} FROM 1 FOR ${sqlNumber(n)})`,
  md5Bucket: (t, width) => {
    const hex = (k: number) => `(POSITION(SUBSTRING(MD5(${t}) FROM ${k} FOR 1) IN ${HEX}) - 1)`;
    return `CAST(${hornerBucket((j) => `(16 * ${hex(2 * j + 1)} + ${hex(2 * j + 2)})`, width, ANSI.mod)} AS BIGINT)`;
  },
};

export const SPARK: Dialect = {
  name: "spark", ident: quoteIdentBacktick, literal: quoteLiteralBackslash, text: TYPE_NAMES.spark.VARCHAR, types: TYPE_NAMES.spark, cast: castSpark,
  parseNumber: (t, type) => castSpark(`NULLIF(TRIM(${t}), '')`, type),
  toText: (e) => castSpark(e, "VARCHAR"),
  toDouble: (e) => castSpark(e, "DOUBLE"),
  toInteger: (e) => castSpark(e, "INTEGER"),
  double: (v) => castSpark(doubleText(v), "DOUBLE"),
  mod: (a, b) => `MOD(${a}, ${b})`,
  abs: (e) => `ABS(${e})`,
  trim: (e) => `TRIM(${e})`,
  lower: (e) => `LOWER(${e})`,
  concat: (a, b) => `CONCAT(${a}, ${b})`,
  replaceFirstGroup: (t, p) => `REGEXP_REPLACE(${t}, ${quoteLiteralBackslash(p)}, '$1')`,
  leftChars: (t, n) => `SUBSTRING(${t}, 1, ${sqlNumber(n)})`,
  md5Bucket: (t, width) =>
    `CAST(${hornerBucket((j) => `CAST(CONV(SUBSTRING(MD5(${t}), ${2 * j + 1}, 2), 16, 10) AS BIGINT)`, width, SPARK.mod)} AS BIGINT)`,
};

export const CLICKHOUSE: Dialect = {
  name: "clickhouse", ident: quoteIdent, literal: quoteLiteralBackslash, text: TYPE_NAMES.clickhouse.VARCHAR, types: TYPE_NAMES.clickhouse, cast: castClickHouse,
  parseNumber: (t, type) => {
    const value = `nullIf(${clickhouseTrim(t)}, '')`;
    return `if(isNull(${value}), ${castClickHouse("NULL", type)}, ${CLICKHOUSE_READ[type]}(ifNull(${value}, '0')))`;
  },
  toText: (e) => castClickHouse(e, "VARCHAR"),
  toDouble: (e) => `toFloat64(${e})`,
  toInteger: (e) => `toInt32(${e})`,
  double: (v) => `toFloat64(${doubleText(v)})`,
  mod: (a, b) => `modulo(${a}, ${b})`,
  abs: (e) => `abs(${e})`,
  trim: clickhouseTrim,
  lower: (e) => `lower(${e})`,
  concat: (a, b) => `concat(${a}, ${b})`,
  replaceFirstGroup: (t, p) => `replaceRegexpOne(${t}, ${quoteLiteralBackslash(p)}, '\\\\1')`,
  leftChars: (t, n) => `substringUTF8(${t}, 1, ${sqlNumber(n)})`,
  md5Bucket: (t, width) => `toInt64(modulo(reinterpretAsUInt64(MD5(${t})), ${sqlNumber(width)}))`,
};

export function dialectOf(name: DialectName | undefined): Dialect {
  return name === "spark" ? SPARK : name === "clickhouse" ? CLICKHOUSE : ANSI;
}
