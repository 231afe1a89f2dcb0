/**
 * engine/levelInput: level tables written elsewhere (the query of `tailsift sql`, Parquet or CSV
 * with columns column, level, fold, rows, n_y, sum_y, sum_y2) loaded into the level table
 * `tailsift_levels`, exactly as a scan's own pass leaves it. Tables from shards are added together
 * (GROUP BY column, level, fold, SUM); the per-fold totals are taken from one column's sums after
 * checking every column agrees (each column's levels partition the same rows).
 */
import fs from "node:fs";
import path from "node:path";
import { TailsiftError } from "../errors.js";
import { LEVEL_TABLE, type PassTotals } from "./aggregate.js";
import type { Engine } from "./db.js";
import { formatOf } from "./source.js";
import { quoteLiteral, sqlNumber } from "./sql.js";
import type { TargetKind } from "./target.js";

const INPUT = "tailsift_level_input";
const MERGED = "tailsift_level_merged";
const REQUIRED = ["column", "level", "fold", "rows", "n_y", "sum_y", "sum_y2"] as const;
const MAX_FOLDS = 100;

const badTable = (message: string) => new TailsiftError("bad_level_table", message);

async function expand(engine: Engine, input: string): Promise<string[]> {
  const list = async (pattern: string) => (await engine.rows<{ file: string }>(
    "SELECT file FROM glob($pattern) ORDER BY file", `listing files matching '${pattern}'`, { pattern })).map((r) => r.file);
  if (/[*?[]/.test(input)) {
    const files = await list(input);
    if (files.length === 0) throw new TailsiftError("input_not_found", `no level table matches '${input}'`);
    return files;
  }
  let stat: fs.Stats;
  try {
    stat = fs.statSync(input);
  } catch {
    throw new TailsiftError("input_not_found", `level table '${input}' not found`);
  }
  if (!stat.isDirectory()) return [input];
  const files = await list(path.join(input, "**", "*.parquet"));
  if (files.length === 0) throw new TailsiftError("input_is_directory", `'${input}' is a folder with no .parquet files`);
  return files;
}

/** Loads one file into the input table after checking it has the level-table columns. */
async function loadFile(engine: Engine, file: string, delimiter: string | undefined): Promise<string> {
  const format = formatOf(file);
  if (format !== "parquet" && format !== "csv" && format !== "tsv") {
    throw new TailsiftError("unsupported_format", `cannot read level table '${file}': use .parquet or .csv`);
  }
  const delim = delimiter ?? (format === "tsv" ? "\t" : undefined);
  const reader = format === "parquet"
    ? `read_parquet(${quoteLiteral(file)})`
    : `read_csv(${quoteLiteral(file)}, header = true, all_varchar = true${delim !== undefined ? `, delim = ${quoteLiteral(delim)}` : ""})`;
  const described = await engine.rows<{ column_name: string }>(`DESCRIBE SELECT * FROM ${reader}`, `reading level table '${file}'`);
  const names = new Set(described.map((d) => d.column_name.toLowerCase()));
  const missing = REQUIRED.filter((c) => !names.has(c));
  if (missing.length > 0) {
    throw badTable(`'${file}' is not a level table: missing column${missing.length > 1 ? "s" : ""} ${missing.join(", ")}; expected ${REQUIRED.join(", ")} (the output of the query printed by tailsift sql)`);
  }
  await engine.run(`INSERT INTO ${INPUT} SELECT CAST("column" AS VARCHAR), CAST(level AS VARCHAR), CAST(fold AS BIGINT),
      CAST(rows AS BIGINT), CAST(n_y AS BIGINT), CAST(sum_y AS DOUBLE), CAST(sum_y2 AS DOUBLE) FROM ${reader}`, `reading level table '${file}'`);
  return format === "tsv" ? "csv" : format;
}

/** Checks the merged rows: names and folds present, counts sane, folds 0..99. */
async function checkMerged(engine: Engine): Promise<void> {
  const [c] = await engine.rows<Record<string, number | null>>(
    `SELECT count(*)::DOUBLE AS n, count(*) FILTER (WHERE name IS NULL)::DOUBLE AS no_name,
       count(*) FILTER (WHERE fold IS NULL OR fold < 0 OR fold >= ${MAX_FOLDS})::DOUBLE AS bad_fold,
       count(*) FILTER (WHERE rows IS NULL OR rows < 1 OR n_y < 0 OR n_y > rows)::DOUBLE AS bad_count,
       count(*) FILTER (WHERE NOT isfinite(sum_y) OR NOT isfinite(sum_y2) OR sum_y2 < 0)::DOUBLE AS bad_sum
     FROM ${MERGED}`, "checking the level tables");
  if (!c || c.n === 0) throw badTable("the level tables have no rows");
  if (c.no_name) throw badTable(`${c.no_name} rows of the level tables have no column name`);
  if (c.bad_fold) throw badTable(`${c.bad_fold} rows of the level tables have a fold outside 0..${MAX_FOLDS - 1}; the fold expression must give 0..K-1 (use --folds K to wrap it)`);
  if (c.bad_count) throw badTable(`${c.bad_count} rows of the level tables have rows < 1 or n_y outside 0..rows`);
  if (c.bad_sum) throw badTable(`${c.bad_sum} rows of the level tables have a sum that is not a finite number (or a negative sum_y2)`);
}

interface FoldSums { rows: number; n_y: number; sum_y: number; sum_y2: number }

/** Per-fold totals of every column; they must agree (each column's levels partition the rows). */
async function foldTotals(engine: Engine, names: readonly string[]): Promise<Map<number, FoldSums>> {
  const rows = await engine.rows<FoldSums & { name: string; fold: number }>(
    `SELECT name, fold::INTEGER AS fold, sum(rows)::DOUBLE AS rows, sum(n_y)::DOUBLE AS n_y, sum(sum_y) AS sum_y, sum(sum_y2) AS sum_y2
     FROM ${MERGED} GROUP BY name, fold ORDER BY fold, name`, "adding up the level tables by fold");
  const byName = new Map<string, Map<number, FoldSums>>(names.map((n) => [n, new Map()]));
  const folds = new Set<number>();
  for (const r of rows) { byName.get(r.name)?.set(r.fold, r); folds.add(r.fold); }
  const first = names[0]!;
  const reference = byName.get(first)!;
  const zero: FoldSums = { rows: 0, n_y: 0, sum_y: 0, sum_y2: 0 };
  const close = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
  for (const [name, sums] of byName) {
    for (const fold of folds) {
      const a = reference.get(fold) ?? zero;
      const b = sums.get(fold) ?? zero;
      if (a.rows !== b.rows || a.n_y !== b.n_y || !close(a.sum_y, b.sum_y) || !close(a.sum_y2, b.sum_y2)) {
        throw new TailsiftError("level_totals_disagree",
          `level tables disagree on row totals: in fold ${fold} column '${first}' has ${a.rows} rows (${a.n_y} with a target, sum ${a.sum_y}) but column '${name}' has ${b.rows} (${b.n_y}, sum ${b.sum_y}); every column must come from the same rows`);
      }
    }
  }
  return reference;
}


export interface LoadedLevelTables {
  files: string[];
  /** Formats read ("parquet", "csv"). */
  formats: Set<string>;
  /** Every column name in the tables, sorted. */
  tableColumns: string[];
  totals: PassTotals;
  /** K = largest fold + 1. */
  folds: number;
}

/** Expands, loads, adds up and checks the level tables. Edge cases: see commands/levels. */
export async function loadLevelTables(engine: Engine, inputs: readonly string[], delimiter: string | undefined): Promise<LoadedLevelTables> {
  const files: string[] = [];
  for (const input of inputs) files.push(...(await expand(engine, input)));
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${INPUT} (name VARCHAR, level VARCHAR, fold BIGINT, rows BIGINT, n_y BIGINT, sum_y DOUBLE, sum_y2 DOUBLE)`, "preparing the level tables");
  const formats = new Set<string>();
  for (const file of files) formats.add(await loadFile(engine, file, delimiter));
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${MERGED} AS
    SELECT name, level, fold, sum(rows)::BIGINT AS rows, sum(coalesce(n_y, 0))::BIGINT AS n_y,
           sum(coalesce(sum_y, 0))::DOUBLE AS sum_y, sum(coalesce(sum_y2, 0))::DOUBLE AS sum_y2
    FROM ${INPUT} GROUP BY name, level, fold`, "adding the level tables together");
  await checkMerged(engine);

  const tableColumns = (await engine.rows<{ name: string }>(`SELECT DISTINCT name FROM ${MERGED} ORDER BY name`, "listing the columns")).map((r) => r.name);
  const byFold = await foldTotals(engine, tableColumns);
  const folds = Math.max(...byFold.keys()) + 1;
  const totals: PassTotals = { rows: 0, foldRows: Array.from({ length: folds }, () => 0), targetRows: 0, sumY: 0, sumY2: 0, badTargets: 0, nonMissing: new Map() };
  for (const [fold, s] of byFold) {
    totals.foldRows[fold] = s.rows;
    totals.rows += s.rows; totals.targetRows += s.n_y; totals.sumY += s.sum_y; totals.sumY2 += s.sum_y2;
  }
  return { files, formats, tableColumns, totals, folds };
}

/** Builds `tailsift_levels` for `levelColumns` (col = their index) plus the fold totals (col = −1). */
export async function levelTableFromLoaded(engine: Engine, levelColumns: readonly string[], tableColumns: readonly string[]): Promise<void> {
  const names = levelColumns.map((c, i) => `(${sqlNumber(i)}, ${quoteLiteral(c)})`);
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${LEVEL_TABLE} AS
    SELECT n.col::INTEGER AS col, m.level, m.fold::INTEGER AS fold, m.rows, m.n_y, m.sum_y, m.sum_y2, 0::BIGINT AS bad
    FROM ${MERGED} m JOIN (VALUES ${[...names, "(-2, CAST(NULL AS VARCHAR))"].join(", ")}) n(col, name) ON m.name = n.name
    UNION ALL
    SELECT -1, NULL, fold::INTEGER, sum(rows)::BIGINT, sum(n_y)::BIGINT, sum(sum_y), sum(sum_y2), 0 FROM ${MERGED}
    WHERE name = ${quoteLiteral(tableColumns[0]!)} GROUP BY fold`, "building the level table");
}

/** Target kind from the sums: binary when every level looks like a 0/1 count. */
export async function inferKind(engine: Engine): Promise<TargetKind> {
  const [r] = await engine.rows<{ off: number }>(
    `SELECT count(*)::DOUBLE AS off FROM ${LEVEL_TABLE} WHERE n_y > 0 AND (abs(sum_y2 - sum_y) > 1e-9 * greatest(1, abs(sum_y))
       OR sum_y < 0 OR sum_y > n_y OR sum_y <> round(sum_y))`, "checking the target kind");
  return (r?.off ?? 0) === 0 ? "binary" : "continuous";
}

