/**
 * portableSql/levelSql: the level-aggregation query for engines other than DuckDB (`tailsift
 * sql`). It produces the level table (column, level, fold, rows, n_y, sum_y, sum_y2) that
 * `tailsift scan --levels` advises from; tables from shards merge by addition.
 *
 * No CTEs (ClickHouse 18.16 has none): each column's GROUP BY reads a derived table that casts the
 * column to text and computes the fold and y; the blocks are joined by UNION ALL. Casts, modulo
 * and trimming are spelled per dialect (portableSql/dialects). The fold expression is the user's
 * own text and is inserted unchanged.
 */
import { checkFoldCount } from "../engine/folds.js";
import { TailsiftError } from "../errors.js";
import { sqlNumber } from "../engine/sql.js";
import { missingLikeSql, normaliseMissingLike } from "../engine/missingLike.js";
import { NEGATIVE_WORDS, POSITIVE_WORDS } from "../engine/target.js";
import type { TargetKind } from "../profile/types.js";
import { ANSI, dialectOf, type Dialect, type DialectName } from "./dialects.js";

export interface LevelSqlOptions {
  /** Columns whose levels are counted (cast to text). */
  columns: readonly string[];
  /** Target column; without it n_y = 0 and the sums are NULL. */
  target?: string;
  /** Binary target: the exact (trimmed) text that counts as 1; anything else non-blank is 0. */
  positive?: string;
  /** Required with a target unless `positive` is given (the query is written without the data). */
  targetKind?: TargetKind;
  /** Table name, optionally qualified `db.schema.table`; every part is quoted. */
  from: string;
  /** SQL expression giving a row's fold; absent = fold 0 for every row (no out-of-fold figures). */
  foldExpr?: string;
  /** With foldExpr: the fold becomes MOD(ABS(expr), folds). */
  folds?: number;
  /** ansi (DuckDB, PostgreSQL, Trino), spark or clickhouse. */
  dialect?: DialectName;
  /** Values counted as missing (NULL) in every counted column, as scan --missing-like does (engine/missingLike). */
  missingLike?: readonly string[];
}

const bad = (message: string) => new TailsiftError("bad_option", message);

/** `a.b.c` → `"a"."b"."c"`; empty parts are rejected. */
export function qualifiedName(name: string, d: Pick<Dialect, "ident"> = ANSI): string {
  const parts = name.split(".");
  if (parts.some((p) => p.trim() === "")) throw bad(`--from '${name}' has an empty name part; give TABLE or db.schema.table`);
  return parts.map(d.ident).join(".");
}

/**
 * The target as a number, from its text `text` (NULL = missing): for a binary target the 0/1 of
 * engine/target — 1 for the exact (trimmed) positive value, 0 for any other non-blank text; without
 * one, 1/0 by the words (trimmed, any case), NULL for other text — as `type` (DOUBLE: the level
 * query's y; INTEGER: the scoring query's passed-through target, as encode writes it); for a
 * continuous target the trimmed number (blank → NULL). The one spelling of the target both queries use.
 */
export function targetFromText(d: Dialect, text: string, kind: TargetKind, positive: string | undefined, type: "DOUBLE" | "INTEGER"): string {
  if (kind === "continuous") return d.parseNumber(text, "DOUBLE");
  const t = d.trim(text);
  const [one, zero] = type === "DOUBLE" ? [d.toDouble("1"), d.toDouble("0")] : ["1", "0"];
  const binary = positive !== undefined
    ? `CASE WHEN ${t} = ${d.literal(positive.trim())} THEN ${one} WHEN ${t} <> '' THEN ${zero} END`
    : `CASE WHEN ${d.lower(t)} IN (${POSITIVE_WORDS.map(d.literal).join(", ")}) THEN ${one}`
      + ` WHEN ${d.lower(t)} IN (${NEGATIVE_WORDS.map(d.literal).join(", ")}) THEN ${zero} END`;
  return type === "DOUBLE" ? binary : d.cast(binary, type);
}

/** The y expression of column `column`: DOUBLE 0/1 (binary) or the value (continuous); NULL = no usable target. */
export function targetExpr(column: string, kind: TargetKind, positive?: string, d: Dialect = ANSI, missingLike: readonly string[] = []): string {
  return targetFromText(d, missingLikeSql(d.toText(d.ident(column)), missingLike, d), kind, positive, "DOUBLE");
}

function foldExpr(o: LevelSqlOptions, d: Dialect): string {
  if (o.foldExpr === undefined) {
    if (o.folds !== undefined) throw bad("--folds needs --fold-expr: there is no portable hash, so the fold expression is yours to give");
    return d.toInteger("0");
  }
  if (o.foldExpr.trim() === "") throw bad("--fold-expr is empty");
  if (o.folds === undefined) return d.toInteger(`(${o.foldExpr})`);
  return d.toInteger(d.mod(d.abs(o.foldExpr), sqlNumber(checkFoldCount(o.folds))));
}

function yExpr(o: LevelSqlOptions, d: Dialect, missingLike: readonly string[]): string {
  if (o.target === undefined) {
    if (o.positive !== undefined || o.targetKind !== undefined) throw bad("--positive and --target-kind need --target");
    return d.cast("NULL", "DOUBLE");
  }
  if (o.positive !== undefined && o.targetKind === "continuous") throw bad("--positive applies to binary targets; drop it or use --target-kind binary");
  const kind = o.targetKind ?? (o.positive !== undefined ? "binary" : undefined);
  if (kind === undefined) throw bad("give --target-kind binary or continuous (or --positive VALUE): tailsift sql writes the query without reading the data");
  return targetExpr(o.target, kind, o.positive, d, missingLike);
}

/**
 * The level-aggregation query: per column, one GROUP BY (level, fold) over a derived table that
 * casts the column to text and computes the fold and y; the blocks are joined by UNION ALL.
 * Output columns: column, level (NULL = missing), fold, rows = COUNT(*), n_y = COUNT(y),
 * sum_y = SUM(y), sum_y2 = SUM(y*y) — SUM over no target values is NULL, read back as 0.
 * Edge cases: no columns, duplicate columns or the target among the columns → bad_option.
 */
export function levelSql(o: LevelSqlOptions): string {
  if (o.columns.length === 0) throw bad("--columns: name at least one column");
  const dup = o.columns.find((c, i) => o.columns.indexOf(c) !== i);
  if (dup !== undefined) throw bad(`--columns names '${dup}' twice`);
  if (o.target !== undefined && o.columns.includes(o.target)) throw bad(`--columns includes the target '${o.target}'; leave it out`);
  const d = dialectOf(o.dialect);
  const table = qualifiedName(o.from, d);
  const fold = foldExpr(o, d);
  const missingLike = normaliseMissingLike(o.missingLike);
  const y = yExpr(o, d, missingLike);
  const [cColumn, cLevel, cFold, cRows, cNy, cSumY, cSumY2] = ["column", "level", "fold", "rows", "n_y", "sum_y", "sum_y2"].map(d.ident);
  const blocks = o.columns.map((c) =>
    `SELECT ${d.literal(c)} AS ${cColumn}, v AS ${cLevel}, f AS ${cFold}, COUNT(*) AS ${cRows}, COUNT(y) AS ${cNy}, SUM(y) AS ${cSumY}, SUM(y * y) AS ${cSumY2}\n`
    + `FROM (SELECT ${missingLikeSql(d.toText(d.ident(c)), missingLike, d)} AS v, ${fold} AS f, ${y} AS y FROM ${table}) AS tailsift_rows\nGROUP BY v, f`);
  return [
    "-- tailsift level table: (column, level, fold, rows, n_y, sum_y, sum_y2); read it with tailsift scan --levels",
    blocks.join("\nUNION ALL\n"),
    "",
  ].join("\n");
}
