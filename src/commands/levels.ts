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
import { DEFAULT_POLICY, validatePolicy, type AdvicePolicy } from "../advice/policy.js";
import { withEngine, type Engine } from "../engine/db.js";
import { levelTableFolds } from "../engine/folds.js";
import { inferKind, levelTableFromLoaded, loadLevelTables } from "../engine/levelInput.js";
import { fingerprintFiles } from "../engine/source.js";
import { TailsiftError } from "../errors.js";
import { adviseFromLevelTable } from "../pipeline/advise.js";
import { checkTarget } from "../profile/checkTarget.js";
import type { Profile, ProfileTarget, TargetKind } from "../profile/types.js";
import type { ScanOptions } from "./scan.js";
import type { PassTotals } from "../engine/aggregate.js";

export type LevelScanOptions = Pick<ScanOptions,
  "target" | "positive" | "targetKind" | "columns" | "exclude" | "top" | "policy" | "decide" | "levelTableOut" | "folds" | "seed"
  | "onEngine" | "memoryLimit" | "threads" | "tempDir" | "delimiter">;

function chooseColumns(all: readonly string[], o: LevelScanOptions, targetName: string | undefined): string[] {
  for (const [option, names] of [["--columns", o.columns], ["--exclude", o.exclude]] as const) {
    for (const n of names ?? []) {
      if (!all.includes(n)) throw new TailsiftError("unknown_column", `${option}: column '${n}' is not in the level tables; they hold: ${all.join(", ")}`);
    }
  }
  const picked = o.columns && o.columns.length > 0 ? [...new Set(o.columns)] : [...all];
  return picked.filter((c) => !(o.exclude ?? []).includes(c) && c !== targetName);
}

async function resolveTargetFromSums(engine: Engine, o: LevelScanOptions, totals: PassTotals, name: string): Promise<ProfileTarget> {
  const binaryLike = (await inferKind(engine)) === "binary";
  if (o.targetKind === "multiclass") throw new TailsiftError("bad_option", "--target-kind multiclass needs the extract: scan --levels reads one y per level table; scan the file instead");
  const kind: TargetKind = o.targetKind ?? (o.positive !== undefined ? "binary" : binaryLike ? "binary" : "continuous");
  if (kind === "binary" && !binaryLike) {
    throw new TailsiftError("target_needs_positive", `target '${name}': the level tables' sums are not those of a 0/1 target (sum_y2 ≠ sum_y); use --target-kind continuous or write the SQL with --positive`);
  }
  return checkTarget({ column: name, kind, ...(o.positive !== undefined ? { positive: o.positive } : {}) }, totals);
}

/**
 * Advises from level tables (Parquet or CSV) produced by the query of `tailsift sql`, summed
 * over files. Edge cases: no files, a file without the level-table columns, folds outside
 * 0..99, columns whose totals disagree, a target with one value → TailsiftError (exit 2); no
 * target values → target-free advice; one fold → out-of-fold figures null (see the header).
 */
export async function scanLevels(files: string[], options: LevelScanOptions = {}): Promise<Profile> {
  if (files.length === 0) throw new TailsiftError("bad_usage", "no level table given; name at least one file");
  validatePolicy({ ...DEFAULT_POLICY, ...options.policy });
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
  const { files, formats, tableColumns, totals, folds } = await loadLevelTables(engine, inputs, o.delimiter);
  const hasTarget = totals.targetRows > 0;
  if (o.target !== undefined && !hasTarget) {
    throw new TailsiftError("target_empty", `--target '${o.target}': the level tables carry no target values (n_y = 0 everywhere); write the SQL with --target`);
  }
  const targetName = hasTarget ? o.target ?? "target" : undefined;
  if (o.target === undefined && targetName !== undefined && tableColumns.includes(targetName)) {
    throw new TailsiftError("bad_option", "the level tables carry target sums and a column named 'target'; name the target with --target NAME");
  }
  const levelColumns = chooseColumns(tableColumns, o, targetName);
  await levelTableFromLoaded(engine, levelColumns, tableColumns);

  const target = targetName !== undefined ? await resolveTargetFromSums(engine, o, totals, targetName) : undefined;
  // the level tables' own folds when they have two or more; else --folds is the K target-kfold
  // records. The folds came from the user's --fold-expr on the cluster, not from scan's row hash:
  // the contract says so (external, no key columns), so encode --for training refuses it
  const fold = levelTableFolds(o, folds);
  const policy: AdvicePolicy = { ...DEFAULT_POLICY, ...o.policy, folds: fold.k, seed: fold.seed };
  const profile = await adviseFromLevelTable(engine, {
    levelColumns, numeric: [], allColumns: targetName !== undefined ? [...levelColumns, targetName] : levelColumns,
    totals, target, targetColumn: targetName, policy, top: o.top ?? 20, decide: o.decide, levelTableOut: o.levelTableOut,
    outOfFold: folds >= 2,
    input: { paths: files, rows: totals.rows, bytes: files.reduce((s, f) => s + fs.statSync(f).size, 0),
      fingerprint: fingerprintFiles(files), format: [...formats].join("+"), fromLevels: true },
  });
  profile.settings.fold = fold.contract;
  profile.settings.levelFolds = folds;
  return profile;
}
