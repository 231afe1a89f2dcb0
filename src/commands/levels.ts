/**
 * commands/levels: `tailsift scan --levels FILE...` — advice from level tables written elsewhere
 * by the query of `tailsift sql` (Parquet or CSV with columns column, level, fold, rows, n_y,
 * sum_y, sum_y2). Tables from shards are added together (GROUP BY column, level, fold, SUM), the
 * per-fold totals are taken from one column's sums after checking every column agrees, and
 * `adviseFromLevelTable` does the rest exactly as after a scan's own pass.
 *
 * Choices (documented in the CLI help and the report):
 * - Target: present when the tables carry target values (n_y > 0); `--target` names it (default
 *   "target"). Kind: `--target-kind`, else binary when every level's sum_y2 = sum_y with integer
 *   0 ≤ sum_y ≤ n_y (y ∈ {0, 1} gives y² = y), else continuous.
 * - Folds: K = largest fold + 1. With K ≥ 2 the out-of-fold figures are computed as in scan and
 *   settings.folds = K. With one fold (no --fold-expr) out-of-fold figures cannot be computed:
 *   leakage.outOfFold = null, advice is re-run on that basis, a reason says so, settings.folds
 *   keeps the --folds value (the K that target-kfold would use) and settings.levelFolds = 1.
 */
import fs from "node:fs";
import path from "node:path";
import { DEFAULT_POLICY, type AdvicePolicy } from "../advice/policy.js";
import { applyOverrides } from "../advice/overrides.js";
import { recommend } from "../advice/recommend.js";
import { LEVEL_TABLE, type PassTotals } from "../engine/aggregate.js";
import { withEngine, type Engine } from "../engine/db.js";
import { fingerprintFiles, formatOf } from "../engine/source.js";
import { quoteLiteral, sqlNumber } from "../engine/sql.js";
import { TailsiftError } from "../errors.js";
import type { Profile, ProfileTarget, TargetKind } from "../profile/types.js";
import { adviseFromLevelTable, type ScanOptions } from "./scan.js";

export type LevelScanOptions = Pick<ScanOptions,
  "target" | "positive" | "targetKind" | "columns" | "exclude" | "top" | "policy" | "decide" | "levelTableOut"
  | "onEngine" | "memoryLimit" | "threads" | "tempDir" | "delimiter">;

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
     FROM ${MERGED} GROUP BY name, fold`, "adding up the level tables by fold");
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

function chooseColumns(all: readonly string[], o: LevelScanOptions, targetName: string | undefined): string[] {
  for (const [option, names] of [["--columns", o.columns], ["--exclude", o.exclude]] as const) {
    for (const n of names ?? []) {
      if (!all.includes(n)) throw new TailsiftError("unknown_column", `${option}: column '${n}' is not in the level tables; they hold: ${all.join(", ")}`);
    }
  }
  const picked = o.columns && o.columns.length > 0 ? [...new Set(o.columns)] : [...all];
  return picked.filter((c) => !(o.exclude ?? []).includes(c) && c !== targetName);
}

/** Target kind from the sums: binary when every level looks like a 0/1 count. */
async function inferKind(engine: Engine): Promise<TargetKind> {
  const [r] = await engine.rows<{ off: number }>(
    `SELECT count(*)::DOUBLE AS off FROM ${LEVEL_TABLE} WHERE n_y > 0 AND (abs(sum_y2 - sum_y) > 1e-9 * greatest(1, abs(sum_y))
       OR sum_y < 0 OR sum_y > n_y OR sum_y <> round(sum_y))`, "checking the target kind");
  return (r?.off ?? 0) === 0 ? "binary" : "continuous";
}

async function resolveTargetFromSums(engine: Engine, o: LevelScanOptions, totals: PassTotals, name: string): Promise<ProfileTarget> {
  const binaryLike = (await inferKind(engine)) === "binary";
  const kind: TargetKind = o.targetKind ?? (o.positive !== undefined ? "binary" : binaryLike ? "binary" : "continuous");
  if (kind === "binary" && !binaryLike) {
    throw new TailsiftError("target_needs_positive", `target '${name}': the level tables' sums are not those of a 0/1 target (sum_y2 ≠ sum_y); use --target-kind continuous or write the SQL with --positive`);
  }
  const mean = totals.sumY / totals.targetRows;
  const variance = Math.max(0, totals.sumY2 / totals.targetRows - mean * mean);
  if (kind === "binary" ? totals.sumY === 0 || totals.sumY === totals.targetRows : variance <= 1e-12 * Math.max(1, mean * mean)) {
    throw new TailsiftError("target_single_value", `target '${name}' has a single value on every row with a target; a target needs at least two`);
  }
  return {
    column: name, kind, ...(o.positive !== undefined ? { positive: o.positive } : {}),
    rows: totals.targetRows, missing: totals.rows - totals.targetRows, mean,
    ...(kind === "continuous" ? { sd: Math.sqrt(variance) } : {}),
  };
}

const ONE_FOLD_REASON = "Out-of-fold figures need at least two folds; these level tables have one (fold 0 on every row), so the out-of-fold score is not measured. Write the tables with tailsift sql --fold-expr to get it.";

/**
 * Advises from level tables (Parquet or CSV) produced by the query of `tailsift sql`, summed
 * over files. Edge cases: no files, a file without the level-table columns, folds outside
 * 0..99, columns whose totals disagree, a target with one value → TailsiftError (exit 2); no
 * target values → target-free advice; one fold → out-of-fold figures null (see the header).
 */
export async function scanLevels(files: string[], options: LevelScanOptions = {}): Promise<Profile> {
  if (files.length === 0) throw new TailsiftError("bad_usage", "no level table given; name at least one file");
  return withEngine(options, async (engine) => {
    options.onEngine?.(engine);
    try {
      return await scanLevelsWith(engine, files, options);
    } finally {
      options.onEngine?.(null);
    }
  });
}

async function scanLevelsWith(engine: Engine, inputs: string[], o: LevelScanOptions): Promise<Profile> {
  const files: string[] = [];
  for (const input of inputs) files.push(...(await expand(engine, input)));
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${INPUT} (name VARCHAR, level VARCHAR, fold BIGINT, rows BIGINT, n_y BIGINT, sum_y DOUBLE, sum_y2 DOUBLE)`, "preparing the level tables");
  const formats = new Set<string>();
  for (const file of files) formats.add(await loadFile(engine, file, o.delimiter));
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

  const hasTarget = totals.targetRows > 0;
  if (o.target !== undefined && !hasTarget) {
    throw new TailsiftError("target_empty", `--target '${o.target}': the level tables carry no target values (n_y = 0 everywhere); write the SQL with --target`);
  }
  const targetName = hasTarget ? o.target ?? "target" : undefined;
  if (o.target === undefined && targetName !== undefined && tableColumns.includes(targetName)) {
    throw new TailsiftError("bad_option", "the level tables carry target sums and a column named 'target'; name the target with --target NAME");
  }
  const levelColumns = chooseColumns(tableColumns, o, targetName);
  const names = levelColumns.map((c, i) => `(${sqlNumber(i)}, ${quoteLiteral(c)})`);
  await engine.run(`CREATE OR REPLACE TEMP TABLE ${LEVEL_TABLE} AS
    SELECT n.col::INTEGER AS col, m.level, m.fold::INTEGER AS fold, m.rows, m.n_y, m.sum_y, m.sum_y2, 0::BIGINT AS bad
    FROM ${MERGED} m JOIN (VALUES ${[...names, "(-2, CAST(NULL AS VARCHAR))"].join(", ")}) n(col, name) ON m.name = n.name
    UNION ALL
    SELECT -1, NULL, fold::INTEGER, sum(rows)::BIGINT, sum(n_y)::BIGINT, sum(sum_y), sum(sum_y2), 0 FROM ${MERGED}
    WHERE name = ${quoteLiteral(tableColumns[0]!)} GROUP BY fold`, "building the level table");

  const target = targetName !== undefined ? await resolveTargetFromSums(engine, o, totals, targetName) : undefined;
  const policy: AdvicePolicy = { ...DEFAULT_POLICY, ...o.policy };
  if (folds >= 2) policy.folds = folds;
  const profile = await adviseFromLevelTable(engine, {
    levelColumns, numeric: [], allColumns: targetName !== undefined ? [...levelColumns, targetName] : levelColumns,
    totals, target, policy, top: o.top ?? 20, options: { ...o, target: targetName },
    input: { paths: files, rows: totals.rows, bytes: files.reduce((s, f) => s + fs.statSync(f).size, 0),
      fingerprint: fingerprintFiles(files), format: [...formats].join("+"), fromLevels: true },
  });
  profile.settings.levelFolds = folds;
  // the folds came from the user's --fold-expr on the cluster, not from scan's row hash: say so,
  // and claim no fold columns, so encode --for training refuses rather than assigning other folds
  profile.settings.foldHash = "the fold expression given to tailsift sql";
  delete profile.settings.foldColumns;
  if (folds < 2 && target) withoutOutOfFold(profile, levelColumns, policy, target, o);
  return profile;
}

/** One fold: out-of-fold scores are undefined, so they become null and the advice is redone. */
function withoutOutOfFold(profile: Profile, levelColumns: readonly string[], policy: AdvicePolicy, target: ProfileTarget, o: LevelScanOptions): void {
  const columns = profile.columns.filter((c) => levelColumns.includes(c.name));
  for (const column of columns) {
    if (!column.target) continue;
    column.target.leakage.outOfFold = null;
    column.recommendation = recommend(column, policy, target);
  }
  if (o.decide) applyOverrides(columns, o.decide, policy);
  for (const column of columns) if (column.target) column.recommendation.reasons.push(ONE_FOLD_REASON);
}
