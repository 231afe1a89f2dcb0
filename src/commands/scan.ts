/**
 * commands/scan: orchestration only. Opens the inputs, makes the one pass that builds the level
 * table, queries bounded summaries from it, computes the figures and asks advice/ for a
 * recommendation per column.
 */
import { createRequire } from "node:module";
import { DEFAULT_POLICY, hashWidths, type AdvicePolicy } from "../advice/policy.js";
import { recommend } from "../advice/recommend.js";
import { studentTQuantile } from "../stats/studentTQuantile.js";
import { applyEvidence } from "../evidence/applyEvidence.js";
import { evidenceFor } from "../evidence/evidenceFor.js";
import { applyHierarchy } from "../hierarchy/applyHierarchy.js";
import { hierarchyFor } from "../hierarchy/hierarchyFor.js";
import { applyOverrides } from "../advice/overrides.js";
import { buildLevelTable, FOLD_HASH_NAME, type PassTotals } from "../engine/aggregate.js";
import { withEngine, type Engine, type EngineOptions } from "../engine/db.js";
import { collisionTable, HASH_NAME } from "../engine/hashing.js";
import { sampleColumns, sampleTargetValues, type ColumnSample } from "../engine/inspect.js";
import { passThroughProfile, sampledKinds } from "../advice/passThroughColumns.js";
import { addPlaceholderFigures } from "../engine/placeholderLevels.js";
import { normaliseMissingLike } from "../engine/missingLike.js";
import { leakageSums, type LeakageSums } from "../engine/leakage.js";
import {
  binaryIntervalGroups, buildLevelTotals, continuousFlagCounts, findVariants, funnelLevels,
  summariseLevels, targetColumnSums, type IntervalGroup, type LevelRow,
} from "../engine/levels.js";
import { checkMeasuredWidth, countSkippedRows, describeFiles, openSource, type Source, type SourceOptions } from "../engine/source.js";
import { resolveTarget, type TargetSpec } from "../engine/target.js";
import { isTailsiftError, TailsiftError } from "../errors.js";
import { columnFigures, isIdentifierLike, unmeasuredColumn } from "../profile/columnFigures.js";
import { countFlags, describeLevel, fitPrior, leakageMetric, targetFigures } from "../profile/targetFigures.js";
import type { ColumnProfile, Encoding, Profile, ProfileTarget, TargetKind } from "../profile/types.js";
import { writeLevelTable } from "../engine/levelFile.js";

export interface ScanOptions extends EngineOptions, SourceOptions {
  target?: string;
  positive?: string;
  targetKind?: TargetKind;
  columns?: string[];
  exclude?: string[];
  /** Columns to profile as categorical even when they look numeric. */
  asCategorical?: string[];
  top?: number;
  policy?: Partial<AdvicePolicy>;
  decide?: Record<string, Encoding>;
  /** Write the level table (Parquet) here before the engine closes. */
  levelTableOut?: string;
  /** Called with the engine while the main pass runs (progress display, cancellation). */
  onEngine?: (engine: Engine | null) => void;
}

const FUNNEL_POINTS = 300;
export const VARIANT_MAX_LEVELS = 100_000;

export function toolVersion(): string {
  const require = createRequire(import.meta.url);
  return (require("../../package.json") as { version: string }).version;
}

function checkNames(source: Source, names: readonly string[] | undefined, option: string): void {
  for (const name of names ?? []) {
    if (!source.columns.includes(name)) {
      throw new TailsiftError("unknown_column", `${option}: column '${name}' not found; columns are: ${source.columns.join(", ")}`);
    }
  }
}

export async function scan(inputs: readonly string[], options: ScanOptions = {}): Promise<Profile> {
  const policy: AdvicePolicy = { ...DEFAULT_POLICY, ...options.policy };
  validatePolicy(policy);
  const top = options.top ?? 20;
  return withEngine(options, async (engine) => {
    options.onEngine?.(engine);
    // the level table need not keep row order; letting DuckDB drop it makes the pass ~30 % faster
    await engine.run("SET preserve_insertion_order = false", "configuring the engine");
    try {
      return await scanWith(engine, inputs, options, policy, top);
    } finally {
      options.onEngine?.(null);
    }
  });
}

async function scanWith(engine: Engine, inputs: readonly string[], options: ScanOptions, policy: AdvicePolicy, top: number): Promise<Profile> {
  {
    const source = await openSource(engine, inputs, options);
    checkNames(source, options.columns, "--columns");
    checkNames(source, options.exclude, "--exclude");
    checkNames(source, options.asCategorical, "--as-categorical");
    if (options.target !== undefined) checkNames(source, [options.target], "--target");
    for (const name of Object.keys(options.decide ?? {})) checkNames(source, [name], "--decide");

    const chosen = options.columns && options.columns.length > 0 ? new Set(options.columns) : null;
    const excluded = new Set(options.exclude ?? []);
    const forced = new Set(options.asCategorical ?? []);
    const candidates = source.columns.filter((c) => c !== options.target && !excluded.has(c) && (chosen === null || chosen.has(c)));
    checkMeasuredWidth(candidates.length, source);
    const samples = await sampleColumns(engine, source.view, candidates);
    const { numeric, time, distinct } = sampledKinds(samples, forced);
    const levelColumns = candidates.filter((c) => !numeric.includes(c) && !time.includes(c));

    let targetSpec: TargetSpec | undefined;
    if (options.target !== undefined) {
      const sampled = await sampleTargetValues(engine, source.view, options.target);
      targetSpec = resolveTarget({ column: options.target, kind: options.targetKind, positive: options.positive }, sampled);
    }

    const totals = await buildLevelTable(engine, {
      view: source.view, identityColumns: source.columns, levelColumns, countColumns: [...numeric, ...time], timeColumns: time, distinctColumns: distinct,
      target: targetSpec, folds: policy.folds, seed: policy.seed,
    }, `scanning ${source.files.length === 1 ? `'${source.files[0]}'` : `${source.files.length} files`}`);
    if (totals.rows === 0) throw new TailsiftError("empty_input", `${describeFiles(source.files)} has a header but no rows; give a file with rows`);
    const skippedRows = await countSkippedRows(engine, source);

    const target = targetSpec ? checkTarget(targetSpec, totals) : undefined;
    return adviseFromLevelTable(engine, {
      levelColumns, numeric: [...numeric, ...time], time, samples, allColumns: source.columns, totals, target, policy, top, options,
      input: {
        paths: source.files, rows: totals.rows, bytes: source.bytes, fingerprint: source.fingerprint, format: source.format,
        ...(skippedRows !== undefined ? { skippedRows } : {}),
      },
    });
  }
}

export interface LevelTableContext {
  levelColumns: string[];
  numeric: string[];
  /** Of `numeric`: the columns with the time role (engine/timeColumns). */
  time?: string[];
  /** The column sample (scan only; absent when advising from level tables). */
  samples?: ColumnSample[];
  allColumns: string[];
  totals: PassTotals;
  target: ProfileTarget | undefined;
  policy: AdvicePolicy;
  top: number;
  options: ScanOptions;
  input: Profile["input"];
}

/**
 * Everything after the pass: figures, target statistics and advice, read from the level table
 * `tailsift_levels` alone. `scan` calls it after its pass; `scan --levels` after loading tables
 * produced elsewhere.
 */
export async function adviseFromLevelTable(engine: Engine, ctx: LevelTableContext): Promise<Profile> {
  const { levelColumns, numeric, totals, target, policy, top, options } = ctx;
  await buildLevelTotals(engine);
  const summaries = await summariseLevels(engine, levelColumns.length, Math.max(top, policy.maxOneHot + 1));
  const columns: ColumnProfile[] = levelColumns.map((name, col) => {
    const s = summaries[col];
    const figures = columnFigures({
      name, rows: totals.rows, missing: s?.missing ?? 0, countOfCounts: s?.countOfCounts ?? [],
      top: (s?.top ?? []).map((t) => ({ level: t.level, rows: t.rows })),
    });
    const nonMissing = figures.rows - figures.missing;
    if (figures.distinct <= 1) figures.role = "constant";
    else if (isIdentifierLike(figures.distinct, nonMissing, figures.unseenRate)) figures.role = "identifier";
    return { ...figures, recommendation: { encoding: "drop", params: {}, reasons: [] } };
  });
  // spelling variants are looked for in columns of up to VARIANT_MAX_LEVELS levels: past that the
  // column is identifier-like and its level count would dominate the cost of the whole scan
  const variants = await findVariants(engine, columns.flatMap((c, col) => (c.distinct > 1 && c.distinct <= VARIANT_MAX_LEVELS ? [col] : [])));
  for (const [col, v] of variants) {
    const column = columns[col];
    if (column && v.groups > 0) column.variants = { groups: v.groups, levels: v.levels, rowShare: totals.rows > 0 ? v.rows / totals.rows : 0, examples: v.examples };
  }

  await addPlaceholderFigures(engine, columns);
  if (target) await addTargetFigures(engine, columns, summaries.map((s) => s.top), target, top);
  else await addHashing(engine, columns, policy);

  const hierarchy = await hierarchyFor(engine, columns, policy);
  for (const column of columns) {
    column.topLevels = column.topLevels.slice(0, top);
    column.recommendation = recommend(column, policy, target);
  }
  for (const [col, h] of hierarchy) columns[col]!.hierarchy = h;
  if (target) {
    const skipped = new Set<number>();
    const evidence = await evidenceFor(engine, columns, target, policy, hierarchy, skipped);
    for (const col of skipped) {
      const column = columns[col]!;
      column.recommendation = { ...column.recommendation, reasons: [...column.recommendation.reasons,
        "Out-of-fold evidence for this column was not computed: it ran out of memory under --memory-limit; the rules' advice stands."] };
    }
    for (const [col, e] of evidence) {
      const column = columns[col]!;
      column.evidence = e;
      column.recommendation = applyEvidence(column, e, policy);
    }
  } else {
    for (const [col, h] of hierarchy) columns[col]!.recommendation = applyHierarchy(columns[col]!, h, policy);
  }
  if (options.decide) applyOverrides(columns, options.decide, policy);
  if (options.levelTableOut) await writeLevelTable(engine, levelColumns, options.levelTableOut);

  const others: ColumnProfile[] = ctx.allColumns
    .filter((c) => !levelColumns.includes(c))
    .map((c) => c === options.target
      ? unmeasuredColumn(c, "target", totals.rows, target?.missing ?? 0, "The target: passed through unchanged.")
      : numeric.includes(c)
        ? passThroughProfile(c, totals, ctx.samples, ctx.time)
        : unmeasuredColumn(c, "excluded", totals.rows, 0, "Excluded by --columns/--exclude: not measured."));
  const order = new Map(ctx.allColumns.map((c, i) => [c, i]));
  const all = [...columns, ...others].sort((a, b) => (order.get(a.name) ?? 0) - (order.get(b.name) ?? 0));

  return {
    tool: { name: "tailsift", version: toolVersion(), engine: "duckdb" },
    createdAt: new Date().toISOString(),
    input: ctx.input,
    ...(target ? { target } : {}),
    settings: {
      folds: policy.folds, seed: policy.seed, top, foldHash: FOLD_HASH_NAME, maxOneHot: policy.maxOneHot,
      minLevelRows: policy.minLevelRows, coverage: policy.coverage, collisionBudget: policy.collisionBudget,
      foldColumns: ctx.allColumns,
      ...(normaliseMissingLike(options.missingLike).length > 0 ? { missingLike: normaliseMissingLike(options.missingLike) } : {}),
    },
    columns: all,
  };
}

function validatePolicy(p: AdvicePolicy): void {
  const bad = (what: string) => { throw new TailsiftError("bad_option", what); };
  if (!Number.isInteger(p.folds) || p.folds < 2 || p.folds > 100) bad(`--folds must be an integer from 2 to 100 (got ${p.folds})`);
  if (!Number.isInteger(p.seed)) bad(`--seed must be an integer (got ${p.seed})`);
  if (!Number.isInteger(p.maxOneHot) || p.maxOneHot < 2) bad(`--max-one-hot must be an integer of at least 2 (got ${p.maxOneHot})`);
  if (!(p.minLevelRows >= 1)) bad(`--min-level-rows must be at least 1 (got ${p.minLevelRows})`);
  if (!(p.coverage > 0 && p.coverage <= 1)) bad(`--coverage must be in (0, 1] (got ${p.coverage})`);
  if (!(p.collisionBudget >= 0 && p.collisionBudget < 1)) bad(`--collision-budget must be in [0, 1) (got ${p.collisionBudget})`);
}

function checkTarget(spec: TargetSpec, totals: { rows: number; targetRows: number; sumY: number; sumY2: number; badTargets: number }): ProfileTarget {
  if (totals.badTargets > 0) {
    const what = spec.kind === "continuous" ? "are not numbers" : "are not one of 0/1, true/false, yes/no, y/n";
    throw new TailsiftError(spec.kind === "continuous" ? "target_not_numeric" : "target_needs_positive",
      `target '${spec.column}': ${totals.badTargets} values ${what}; ${spec.kind === "continuous" ? "clean them or give --target-kind binary with --positive" : "name the positive class with --positive VALUE"}`);
  }
  if (totals.targetRows === 0) throw new TailsiftError("target_empty", `target '${spec.column}' is missing on every row`);
  const mean = totals.sumY / totals.targetRows;
  const variance = Math.max(0, totals.sumY2 / totals.targetRows - mean * mean);
  if (spec.kind === "binary" ? totals.sumY === 0 || totals.sumY === totals.targetRows : variance <= 1e-12 * Math.max(1, mean * mean)) {
    throw new TailsiftError("target_single_value", `target '${spec.column}' has a single value on every row with a target; a target needs at least two`);
  }
  return {
    column: spec.column, kind: spec.kind, ...(spec.positive !== undefined ? { positive: spec.positive } : {}),
    rows: totals.targetRows, missing: totals.rows - totals.targetRows, mean,
    ...(spec.kind === "continuous" ? { sd: Math.sqrt(variance) } : {}),
  };
}

async function addTargetFigures(
  engine: Engine, columns: ColumnProfile[], tops: LevelRow[][],
  target: ProfileTarget, top: number,
): Promise<void> {
  const kind = target.kind;
  const sums = await targetColumnSums(engine);
  const priors = columns.map((_, col) => fitPrior(kind, sums.get(col), target.mean));
  const groups: IntervalGroup[] = [];
  if (kind === "binary") groups.push(...(await binaryIntervalGroups(engine)));
  const flagsByCol = new Map<number, { flagged: number; tested: number }>();
  const addFlags = (rows: IntervalGroup[]) => {
    const byCol = new Map<number, IntervalGroup[]>();
    for (const g of rows) byCol.set(g.col, [...(byCol.get(g.col) ?? []), g]);
    for (const [col, list] of byCol) {
      const f = countFlags(kind, list, target.mean);
      const prev = flagsByCol.get(col) ?? { flagged: 0, tested: 0 };
      flagsByCol.set(col, { flagged: prev.flagged + f.flagged, tested: prev.tested + f.tested });
    }
  };
  if (kind === "binary") addFlags(groups);
  else {
    const counts = await continuousFlagCounts(engine, target.mean, (n) => studentTQuantile(0.975, n - 1) / Math.sqrt(n));
    for (const [col, f] of counts) flagsByCol.set(col, f);
  }

  const weights = new Map(priors.map((p, col) => [col, p.weight ?? 0]));
  const leak = await leakageWithinMemory(engine, weights, kind);
  const sst = target.rows * (target.sd ?? 0) ** 2;
  const funnel = await funnelLevels(engine, columns.length, FUNNEL_POINTS);
  columns.forEach((column, col) => {
    const prior = priors[col]!;
    const inSample = leakageMetric(kind, leak.find((l) => l.col === col && l.mode === "in"), sst);
    const outOfFold = leakageMetric(kind, leak.find((l) => l.col === col && l.mode === "oof"), sst);
    const points = funnel.filter((f) => f.col === col).map((f) => ({ value: f.level, rows: f.n_y, rate: f.sum_y / f.n_y }));
    column.target = targetFigures(kind, prior, flagsByCol.get(col) ?? { flagged: 0, tested: 0 }, inSample, outOfFold, prior.weight ?? 0, points);
    const rows = tops[col] ?? [];
    column.topLevels = column.topLevels.slice(0, Math.max(top, rows.length)).map((level, i) => {
      const row = rows[i];
      return row ? describeLevel(kind, level, row, prior, target.mean) : level;
    });
  });
}

/**
 * All columns' leakage sums in one query; if that runs out of memory (a tight --memory-limit and
 * columns with millions of levels), column by column, leaving a column's leakage null (and its
 * reasons saying so) when even that does not fit.
 */
async function leakageWithinMemory(engine: Engine, weights: Map<number, number>, kind: TargetKind): Promise<LeakageSums[]> {
  try {
    return await leakageSums(engine, weights, kind);
  } catch (err) {
    if (!(isTailsiftError(err) && err.code === "out_of_memory")) throw err;
  }
  const out: LeakageSums[] = [];
  for (const [col, m] of weights) {
    try {
      out.push(...(await leakageSums(engine, new Map([[col, m]]), kind)));
    } catch (err) {
      if (!(isTailsiftError(err) && err.code === "out_of_memory")) throw err;
    }
  }
  return out;
}

async function addHashing(engine: Engine, columns: ColumnProfile[], policy: AdvicePolicy): Promise<void> {
  const cols = columns.map((c, i) => ({ c, i })).filter(({ c }) => c.role === "categorical" && c.distinct > policy.maxOneHot).map(({ i }) => i);
  const table = await collisionTable(engine, cols, hashWidths(policy));
  for (const col of cols) {
    const rows = table.filter((r) => r.col === col);
    if (rows.length === 0) continue;
    const candidates = rows.map((r) => ({ width: r.width, collisionRowShare: r.rows > 0 ? r.collisionRows / r.rows : 0, collidingLevels: r.collidingLevels ?? 0 }));
    const chosen = candidates.find((c) => c.collisionRowShare <= policy.collisionBudget) ?? candidates[candidates.length - 1]!;
    const column = columns[col]!;
    column.hashing = { width: chosen.width, collisionRowShare: chosen.collisionRowShare, hash: HASH_NAME, candidates };
  }
}
