/**
 * portableSql/scoringSql: the SQL that applies a plan's scoring encodings to a table in another
 * engine — the same values as `tailsift encode --for scoring` (test/warehouse/). Mappings come
 * from encode's own builders (portableSql/planMaps); small ones (≤ inlineMax rows) are inlined
 * as CASE, larger ones are tables the user loads (listed in the header, written as CSV by
 * writeMappingFiles). Per encoded column, with x = the level as text (NULL = missing):
 *  - indicator, one-hot, pooled one-hot: CASE on x (missing and unseen → 0; pooled → other);
 *  - hashing: the MD5 bucket of salt ‖ x (portableSql/dialects.md5Bucket); missing → NULL;
 *  - every mapped encoding: missing → the column's missing value, else the first of: the level's
 *    value, the deepest parent group's value (backoff) or the parent's value (hierarchical), the
 *    fallback (frequency/codes 0, target p, backoff "other", hashed groups width).
 * A plan scanned with --missing-like (settings.missingLike) reads those values as missing in every
 * column, encoded or passed through, as encode's input view does (engine/missingLike).
 * Every output column is cast to the type encode writes it as (issue 16), named per dialect
 * (portableSql/dialects TYPE_NAMES): encoded columns their encoding module's outputType; a
 * passed-through column encode/passThrough's passSqlType of its pass type — numeric columns read
 * from their text (trimmed, blank → NULL) as BIGINT or DOUBLE, the target as levelSql's
 * targetFromText (binary 0/1 INTEGER, continuous DOUBLE), other columns text.
 */
import { missingLikeSql } from "../engine/missingLike.js";
import { sqlNumber } from "../engine/sql.js";
import type { TargetSpec } from "../engine/target.js";
import { passSqlType } from "../encode/passThrough.js";
import type { OutputSqlType, PassType } from "../encode/types.js";
import type { ParentSpec } from "../hierarchy/types.js";
import type { Dialect } from "./dialects.js";
import { qualifiedName, targetFromText } from "./levelSql.js";
import { lookupSql, valueSql, type LookupTable } from "./lookupSql.js";
import { scoringOutputNames } from "./outputNames.js";
import type { ScoringColumn, ScoringItem } from "./planMaps.js";

export const DEFAULT_INLINE_MAX = 64;

export interface ScoringSqlOptions {
  from: string;
  dialect: Dialect;
  inlineMax: number;
  /** The plan's --missing-like values (normalised); absent or empty: none. */
  missingLike?: readonly string[];
  /** encode's raw output names (`encode --raw-names`) instead of its safe names. */
  rawNames?: boolean;
  /** The plan's target (profile.target): how the passed-through target becomes its 0/1 or number. */
  target?: TargetSpec;
}

export interface MappingTable extends LookupTable { column: string; role: string }

/** A delimiter set as a regular-expression class ('-' first so it is literal; as hierarchy/parent). */
function delimiterClass(delimiters: string): string {
  const chars = [...new Set(delimiters)];
  return `${chars.includes("-") ? "-" : ""}${chars.filter((c) => c !== "-").join("")}`;
}

/** The parent of text `x` (hierarchy/parent's definition: first L characters, or text before the k-th delimiter). */
export function parentExpr(d: Dialect, spec: ParentSpec, x: string): string {
  if (spec.kind === "prefix") return d.leftChars(x, Math.trunc(spec.length));
  const inner = delimiterClass(spec.delimiters);
  const head = `[^${inner}]*${`[${inner}][^${inner}]*`.repeat(Math.max(0, Math.trunc(spec.count) - 1))}`;
  return d.replaceFirstGroup(x, `(?s)^(${head})[${inner}].*$`);
}

const slug = (s: string) => s.replace(/[^A-Za-z0-9_]+/g, "_").replace(/^_+|_+$/g, "").slice(0, 40) || "col";

/** The mapping tables of a column, named tailsift_map_<index>_<column>_<role>. */
export function mappingTables(sc: ScoringColumn, inlineMax: number): MappingTable[] {
  const integer = sc.outputType !== "DOUBLE";
  return sc.lookups.map((l) => ({
    name: `tailsift_map_${sc.column.index}_${slug(sc.column.name)}_${l.role.replace(" ", "")}`,
    column: sc.column.name, role: l.role, rows: l.rows, inline: l.rows.length <= inlineMax, integer,
  }));
}

function encodedSql(d: Dialect, sc: ScoringColumn, tables: readonly MappingTable[], missingLike: readonly string[]): string[] {
  const x = missingLikeSql(d.toText(`s.${d.ident(sc.column.name)}`), missingLike, d);
  const flag = (cond: string) => `CASE WHEN ${cond} THEN 1 ELSE 0 END`;
  const spec = sc.column.spec;
  switch (spec.encoding) {
    case "indicator": return [flag(spec.one === null ? `${x} IS NULL` : `${x} = ${d.literal(spec.one)}`)];
    case "one-hot": return spec.levels.map((l) => flag(`${x} = ${d.literal(l)}`));
    case "pooled-one-hot": {
      const notKept = spec.keep.length === 0 ? "" : ` AND ${x} NOT IN (${spec.keep.map(d.literal).join(", ")})`;
      return [...spec.keep.map((l) => flag(`${x} = ${d.literal(l)}`)), flag(`${x} IS NOT NULL${notKept}`)];
    }
    case "hashing":
      if (!spec.grouping) {
        const salted = spec.salt === "" ? x : d.concat(d.literal(spec.salt), x);
        return [`CASE WHEN ${x} IS NULL THEN NULL ELSE ${d.md5Bucket(salted, spec.width)} END`];
      }
      break;
    default: break;
  }
  const integer = tables[0]?.integer ?? false;
  const chain = sc.lookups.map((l, k) => lookupSql(d, tables[k]!, l.parent ? parentExpr(d, l.parent, x) : x));
  const constant = (v: number | null) => (v === null ? "NULL" : valueSql(d, v, integer));
  return [`CASE WHEN ${x} IS NULL THEN ${constant(sc.missing)} ELSE coalesce(${[...chain, constant(sc.fallback)].join(", ")}) END`];
}

/** A passed-through column as encode writes it: its expression, already of the output type `type`. */
function passedSql(d: Dialect, column: string, type: PassType, sqlType: OutputSqlType, o: ScoringSqlOptions): string {
  const text = missingLikeSql(d.toText(`s.${d.ident(column)}`), o.missingLike ?? [], d);
  // a multi-class target passes through as its trimmed class label, as encode writes it
  const target = o.target;
  if (type === "target" && target?.kind === "multiclass") return d.trim(text);
  if (type === "target" && target !== undefined && target.kind !== "multiclass") return targetFromText(d, text, target.kind, target.positive, sqlType === "INTEGER" ? "INTEGER" : "DOUBLE");
  return sqlType === "VARCHAR" ? text : d.parseNumber(text, sqlType);
}

/** The scoring query and the tables it reads that the user must load. */
export function scoringSql(items: readonly ScoringItem[], o: ScoringSqlOptions): { sql: string; tables: MappingTable[] } {
  const d = o.dialect;
  const exprs: string[] = [];
  const raw: string[] = [];
  const all: MappingTable[] = [];
  const missingLike = o.missingLike ?? [];
  for (const item of items) {
    if (item.kind === "pass") {
      exprs.push(passedSql(d, item.column, item.type, passSqlType(item.type, o.target), o));
      raw.push(item.column);
      continue;
    }
    const tables = mappingTables(item.scoring, o.inlineMax);
    all.push(...tables);
    exprs.push(...encodedSql(d, item.scoring, tables, missingLike).map((e) => d.cast(e, item.scoring.outputType)));
    raw.push(...item.scoring.outputs);
  }
  const names = scoringOutputNames(raw, o.rawNames ?? false);
  const load = all.filter((t) => !t.inline);
  const header = [
    `-- tailsift scoring query (${d.name}): the plan's scoring encodings, as tailsift encode --for scoring applies them`,
    `-- mappings of at most ${sqlNumber(o.inlineMax)} rows are inlined (--inline-max); ${load.length === 0 ? "no table to load" : "load these tables (columns level, value) first:"}`,
    ...load.map((t) => `--   ${t.name}: ${t.rows.length} rows, '${t.column}' ${t.role}, from ${t.name}.csv (--mappings-out)`),
  ];
  const select = exprs.map((e, k) => `${e} AS ${d.ident(names[k]!)}`).join(",\n  ");
  // ClickHouse 18.16 over a Distributed table loses track of expressions holding scalar
  // subqueries ("Not found column"): read the rows in a derived table, look up on the initiator
  const from = d.name === "clickhouse" ? `(SELECT * FROM ${qualifiedName(o.from, d)})` : qualifiedName(o.from, d);
  return { sql: `${header.join("\n")}\nSELECT\n  ${select}\nFROM ${from} AS s\n`, tables: load };
}
