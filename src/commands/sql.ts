/**
 * commands/sql: the level-aggregation query for engines other than DuckDB (`tailsift sql`).
 * It produces the level table (column, level, fold, rows, n_y, sum_y, sum_y2) that
 * `tailsift scan --levels` advises from; tables from shards merge by addition.
 *
 * Portable SQL only: WITH, CAST, CASE, LOWER, TRIM, COUNT, SUM, GROUP BY, UNION ALL, and
 * MOD/ABS when --folds wraps the fold expression. No `::` casts and no engine-only functions;
 * identifiers are double-quoted (standard SQL; Spark needs spark.sql.ansi.doubleQuotedIdentifiers
 * and, for VARCHAR without a length, ANSI mode — see the report). The fold expression is the
 * user's own text and is inserted unchanged.
 */
import { TailsiftError } from "../errors.js";
import { ANSI_SQL, SPARK_SQL, sqlNumber, type SqlDialect } from "../engine/sql.js";
import { NEGATIVE_WORDS, POSITIVE_WORDS } from "../engine/target.js";
import { missingLikeSql, normaliseMissingLike } from "../engine/missingLike.js";
import type { TargetKind } from "../profile/types.js";

export interface LevelSqlOptions {
  /** Columns whose levels are counted (cast to VARCHAR). */
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
  /** "ansi" (default: double-quoted identifiers, VARCHAR; DuckDB, Trino, PostgreSQL) or "spark" (backticks, STRING). */
  dialect?: "ansi" | "spark";
  /** Values counted as missing (NULL) in every counted column, as scan --missing-like does. */
  missingLike?: readonly string[];
}

const bad = (message: string) => new TailsiftError("bad_option", message);

/** `a.b.c` → `"a"."b"."c"`; empty parts are rejected. */
export function qualifiedName(name: string, d: SqlDialect = ANSI_SQL): string {
  const parts = name.split(".");
  if (parts.some((p) => p.trim() === "")) throw bad(`--from '${name}' has an empty name part; give TABLE or db.schema.table`);
  return parts.map(d.ident).join(".");
}

/** The y expression: DOUBLE 0/1 (binary) or the value (continuous); NULL = no usable target. */
export function targetExpr(column: string, kind: TargetKind, positive?: string, d: SqlDialect = ANSI_SQL): string {
  const q = d.ident(column);
  if (kind === "continuous") return `CAST(${q} AS DOUBLE)`;
  const text = `TRIM(CAST(${q} AS ${d.text}))`;
  if (positive !== undefined) {
    return `CASE WHEN ${text} = ${d.literal(positive.trim())} THEN CAST(1 AS DOUBLE) WHEN ${text} <> '' THEN CAST(0 AS DOUBLE) END`;
  }
  const words = (list: readonly string[]) => list.map(d.literal).join(", ");
  return `CASE WHEN LOWER(${text}) IN (${words(POSITIVE_WORDS)}) THEN CAST(1 AS DOUBLE)`
    + ` WHEN LOWER(${text}) IN (${words(NEGATIVE_WORDS)}) THEN CAST(0 AS DOUBLE) END`;
}

function foldExpr(o: LevelSqlOptions): string {
  if (o.foldExpr === undefined) {
    if (o.folds !== undefined) throw bad("--folds needs --fold-expr: there is no portable hash, so the fold expression is yours to give");
    return "0";
  }
  if (o.foldExpr.trim() === "") throw bad("--fold-expr is empty");
  if (o.folds === undefined) return `CAST((${o.foldExpr}) AS INTEGER)`;
  if (!Number.isInteger(o.folds) || o.folds < 2 || o.folds > 100) throw bad(`--folds must be an integer from 2 to 100 (got ${o.folds})`);
  return `CAST(MOD(ABS(${o.foldExpr}), ${sqlNumber(o.folds)}) AS INTEGER)`;
}

function yExpr(o: LevelSqlOptions, d: SqlDialect): string {
  if (o.target === undefined) {
    if (o.positive !== undefined || o.targetKind !== undefined) throw bad("--positive and --target-kind need --target");
    return "CAST(NULL AS DOUBLE)";
  }
  if (o.positive !== undefined && o.targetKind === "continuous") throw bad("--positive applies to binary targets; drop it or use --target-kind binary");
  const kind = o.targetKind ?? (o.positive !== undefined ? "binary" : undefined);
  if (kind === undefined) throw bad("give --target-kind binary or continuous (or --positive VALUE): tailsift sql writes the query without reading the data");
  return targetExpr(o.target, kind, o.positive, d);
}

/**
 * The level-aggregation query: one WITH block that casts every chosen column to VARCHAR and
 * computes the fold and y once, then one GROUP BY (level, fold) per column joined by UNION ALL.
 * Output columns: column, level (NULL = missing), fold, rows = COUNT(*), n_y = COUNT(y),
 * sum_y = SUM(y), sum_y2 = SUM(y*y) — SUM over no target values is NULL, read back as 0.
 * Edge cases: no columns, duplicate columns or the target among the columns → bad_option.
 */
export function levelSql(o: LevelSqlOptions): string {
  if (o.columns.length === 0) throw bad("--columns: name at least one column");
  const dup = o.columns.find((c, i) => o.columns.indexOf(c) !== i);
  if (dup !== undefined) throw bad(`--columns names '${dup}' twice`);
  if (o.target !== undefined && o.columns.includes(o.target)) throw bad(`--columns includes the target '${o.target}'; leave it out`);
  const d = o.dialect === "spark" ? SPARK_SQL : ANSI_SQL;
  const table = qualifiedName(o.from, d);
  const inner = [
    ...o.columns.map((c, i) => `${missingLikeSql(`CAST(${d.ident(c)} AS ${d.text})`, normaliseMissingLike(o.missingLike), d.literal)} AS v${i}`),
    `${foldExpr(o)} AS fold`,
    `${yExpr(o, d)} AS y`,
  ];
  const [cColumn, cLevel, cFold, cRows, cNy, cSumY, cSumY2] = ["column", "level", "fold", "rows", "n_y", "sum_y", "sum_y2"].map(d.ident);
  const blocks = o.columns.map((c, i) =>
    `SELECT ${d.literal(c)} AS ${cColumn}, v${i} AS ${cLevel}, fold AS ${cFold}, COUNT(*) AS ${cRows}, COUNT(y) AS ${cNy}, SUM(y) AS ${cSumY}, SUM(y * y) AS ${cSumY2}\n`
    + `FROM tailsift_rows GROUP BY v${i}, fold`);
  return [
    "-- tailsift level table: (column, level, fold, rows, n_y, sum_y, sum_y2); read it with tailsift scan --levels",
    "WITH tailsift_rows AS (",
    `  SELECT ${inner.join(",\n    ")}`,
    `  FROM ${table}`,
    ")",
    blocks.join("\nUNION ALL\n"),
    "",
  ].join("\n");
}
