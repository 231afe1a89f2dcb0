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

export type DialectName = "ansi" | "spark" | "clickhouse";
export const DIALECTS: readonly DialectName[] = ["ansi", "spark", "clickhouse"];

export interface Dialect {
  name: DialectName;
  ident(s: string): string;
  literal(s: string): string;
  /** The text type of CAST (kept for the level query's documented form). */
  text: string;
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

export const ANSI: Dialect = {
  name: "ansi", ident: quoteIdent, literal: quoteLiteral, text: "VARCHAR",
  toText: (e) => `CAST(${e} AS VARCHAR)`,
  toDouble: (e) => `CAST(${e} AS DOUBLE PRECISION)`,
  toInteger: (e) => `CAST(${e} AS INTEGER)`,
  double: (v) => `CAST(${doubleText(v)} AS DOUBLE PRECISION)`,
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
  name: "spark", ident: quoteIdentBacktick, literal: quoteLiteralBackslash, text: "STRING",
  toText: (e) => `CAST(${e} AS STRING)`,
  toDouble: (e) => `CAST(${e} AS DOUBLE)`,
  toInteger: (e) => `CAST(${e} AS INTEGER)`,
  double: (v) => `CAST(${doubleText(v)} AS DOUBLE)`,
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
  name: "clickhouse", ident: quoteIdent, literal: quoteLiteralBackslash, text: "Nullable(String)",
  toText: (e) => `CAST(${e} AS Nullable(String))`,
  toDouble: (e) => `toFloat64(${e})`,
  toInteger: (e) => `toInt32(${e})`,
  double: (v) => `toFloat64(${doubleText(v)})`,
  mod: (a, b) => `modulo(${a}, ${b})`,
  abs: (e) => `abs(${e})`,
  trim: (e) => `replaceRegexpAll(${e}, '^ +| +$', '')`,
  lower: (e) => `lower(${e})`,
  concat: (a, b) => `concat(${a}, ${b})`,
  replaceFirstGroup: (t, p) => `replaceRegexpOne(${t}, ${quoteLiteralBackslash(p)}, '\\\\1')`,
  leftChars: (t, n) => `substringUTF8(${t}, 1, ${sqlNumber(n)})`,
  md5Bucket: (t, width) => `toInt64(modulo(reinterpretAsUInt64(MD5(${t})), ${sqlNumber(width)}))`,
};

export function dialectOf(name: DialectName | undefined): Dialect {
  return name === "spark" ? SPARK : name === "clickhouse" ? CLICKHOUSE : ANSI;
}
