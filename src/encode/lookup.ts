/**
 * encode/lookup: how the output query reads a value from a mapping table while keeping the
 * input's row order. DuckDB's parallel hash joins do not keep row order (measured on 1.5.6: a
 * LEFT JOIN reorders blocks of rows, and unmatched rows within a block), so two strategies:
 *  - "enum" (default while every mapping has at most LOOKUP_ENUM_LIMIT levels): the mapping's
 *    levels become a DuckDB ENUM type and each mapped field a list variable in ENUM-code order;
 *    the lookup is a scalar expression `list[enum_code(TRY_CAST(level AS enum)) (·K + fold) + 1]`,
 *    so the query is a plain projection and DuckDB keeps the input order without sorting.
 *    An unseen or missing level casts to NULL and so looks up NULL.
 *  - "join" (larger mappings, where ENUM casts slow down sharply): LEFT JOINs on the level (and
 *    fold); the caller numbers the rows in input order and sorts by that number at the end.
 */
import type { Engine } from "../engine/db.js";
import { quoteIdent, quoteLiteral, sqlNumber } from "../engine/sql.js";

export type LookupKind = "enum" | "join";

/** Above this many levels in one mapping, ENUM lookups get slow: use joins. */
export const LOOKUP_ENUM_LIMIT = 100_000;

export interface LookupRef {
  /** SQL for one field of the mapping row of this query row (NULL when there is none). */
  value(field: string): string;
  /** The LEFT JOIN clause the query needs ("join" strategy), or null. */
  join: string | null;
}

export interface LookupKey {
  /** Level expression of the query row (VARCHAR, NULL = missing). */
  level: string;
  /** Fold expression when the mapping is per (level, fold) — dense over folds 0..K−1. */
  fold?: { expr: string; folds: number };
}

/** "enum" unless some mapping table has more than `limit` distinct levels. */
export async function chooseLookup(engine: Engine, tables: readonly string[], limit = LOOKUP_ENUM_LIMIT): Promise<LookupKind> {
  for (const table of tables) {
    const [row] = await engine.rows<{ n: number }>(`SELECT count(DISTINCT level)::DOUBLE AS n FROM ${table}`, "sizing a mapping");
    if ((row?.n ?? 0) > limit) return "join";
  }
  return "enum";
}

/** Prepares the lookup of `fields` from mapping `table` (number `i`) for `key`. */
export async function prepareLookup(engine: Engine, kind: LookupKind, i: number, table: string, key: LookupKey, fields: readonly string[]): Promise<LookupRef> {
  if (kind === "join") {
    const alias = `tailsift_m_${i}`;
    const foldOn = key.fold ? ` AND ${alias}.fold = ${key.fold.expr}` : "";
    return { join: `LEFT JOIN ${table} AS ${alias} ON ${alias}.level = ${key.level}${foldOn}`, value: (f) => `${alias}.${quoteIdent(f)}` };
  }
  const type = `tailsift_enc_enum_${i}`;
  await engine.run(`CREATE TYPE ${type} AS ENUM (SELECT DISTINCT level FROM ${table} WHERE level IS NOT NULL ORDER BY level)`, "preparing a lookup");
  const vars = new Map<string, string>();
  for (const f of fields) {
    const name = `tailsift_enc_v_${i}_${vars.size}`;
    const order = `enum_code(level::${type})${key.fold ? ", fold" : ""}`;
    await engine.run(`SET VARIABLE ${name} = (SELECT list(${quoteIdent(f)} ORDER BY ${order}) FROM ${table})`, "preparing a lookup");
    vars.set(f, name);
  }
  const code = `enum_code(TRY_CAST(${key.level} AS ${type}))::BIGINT`;
  const index = key.fold ? `${code} * ${sqlNumber(key.fold.folds)} + ${key.fold.expr} + 1` : `${code} + 1`;
  return {
    join: null,
    value: (f) => {
      const v = vars.get(f);
      if (v === undefined) throw new Error(`lookup field '${f}' was not prepared`);
      return `getvariable(${quoteLiteral(v)})[${index}]`;
    },
  };
}
