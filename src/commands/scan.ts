/**
 * commands/scan: orchestration only. Opens the inputs, makes the one pass that builds the level
 * table with the fold contract (engine/folds), checks the target, and hands the level table to
 * the decision pipeline (pipeline/advise), which measures and advises every column.
 */
import { DEFAULT_POLICY, validatePolicy, type AdvicePolicy } from "../advice/policy.js";
import { buildLevelTable } from "../engine/aggregate.js";
import { extrasFor } from "../engine/passExtras.js";
import { keyableTimeColumns } from "../engine/keyedExtras.js";
import { withEngine, type Engine, type EngineOptions } from "../engine/db.js";
import { checkFoldRequest, foldContractFor, timeBlockCuts, type FoldRequest } from "../engine/folds.js";
import { numberTypeOf, sampleColumns, sampleTargetValues } from "../engine/inspect.js";
import { normaliseMissingLike } from "../engine/missingLike.js";
import { checkMeasuredWidth, countSkippedRows, describeFiles, openSource, type Source, type SourceOptions } from "../engine/source.js";
import { classesSql, DEFAULT_MAX_CLASSES, readClasses, resolveTarget, type ScanTargetKind, type TargetSpec } from "../engine/target.js";
import { TailsiftError } from "../errors.js";
import { adviseFromLevelTable } from "../pipeline/advise.js";
import { planColumnKinds } from "../pipeline/columnKinds.js";
import { addFoldNotes } from "../pipeline/foldNotes.js";
import { addForwardFigures } from "../pipeline/forwardFigures.js";
import { adviseMulticlassAndWrite, multiclassTarget } from "../pipeline/multiclass.js";
import { checkTarget } from "../profile/checkTarget.js";
import type { Encoding, Profile } from "../profile/types.js";

export { toolVersion } from "../version.js";
export { adviseFromLevelTable } from "../pipeline/advise.js";
export { VARIANT_MAX_LEVELS } from "../pipeline/columns.js";

export interface ScanOptions extends EngineOptions, SourceOptions, FoldRequest {
  target?: string;
  positive?: string;
  /** multiclass: automatic for a text target of 3 to maxClasses values (pipeline/multiclass). */
  targetKind?: ScanTargetKind;
  /** The most classes of a multi-class target (default engine/target DEFAULT_MAX_CLASSES). */
  maxClasses?: number;
  columns?: string[];
  exclude?: string[];
  /** Columns to profile as categorical even when they look numeric. */
  asCategorical?: string[];
  /** Top levels listed per column (display only: the advice reads the full data). */
  top?: number;
  /** The advice options; K and the seed come from the fold request (folds, seed, foldBy). */
  policy?: Partial<Omit<AdvicePolicy, "folds" | "seed">>;
  decide?: Record<string, Encoding>;
  /** Write the level table (Parquet) here before the engine closes. */
  levelTableOut?: string;
  /** Called with the engine while the main pass runs (progress display, cancellation). */
  onEngine?: (engine: Engine | null) => void;
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
  checkFoldRequest(options); // the fold options are checked before anything is read
  for (const key of ["folds", "seed"]) {
    // a library caller of an earlier version may still pass them in the policy: say where they went
    if (options.policy && key in options.policy) throw new TailsiftError("bad_option", `policy.${key} is no longer read: pass ${key} as a scan option (the fold request)`);
  }
  validatePolicy(policy);
  return withEngine(options, async (engine) => {
    options.onEngine?.(engine);
    try {
      return await scanWith(engine, inputs, options, policy);
    } finally {
      options.onEngine?.(null);
    }
  });
}

async function scanWith(engine: Engine, inputs: readonly string[], options: ScanOptions, basePolicy: AdvicePolicy): Promise<Profile> {
  const source = await openSource(engine, inputs, options);
  checkNames(source, options.columns, "--columns");
  checkNames(source, options.exclude, "--exclude");
  checkNames(source, options.asCategorical, "--as-categorical");
  if (options.target !== undefined) checkNames(source, [options.target], "--target");
  // the fold of a row reads every column of the input, in file order (or, with --fold-by, the key);
  // the advice's K (target-kfold, evidence) is the contract's
  // with --time, one cheap query first: the time column's cut points (engine/folds timeBlockCuts)
  const fold = foldContractFor(options, source.columns, options.target, await timeBlockCuts(engine, source.view, options, source.columns, options.target));
  const policy: AdvicePolicy = { ...basePolicy, folds: fold.k, seed: fold.seed, ...(fold.kind === "time-blocks" ? { forward: true } : {}) };
  for (const name of Object.keys(options.decide ?? {})) checkNames(source, [name], "--decide");

  const chosen = options.columns && options.columns.length > 0 ? new Set(options.columns) : null;
  const excluded = new Set(options.exclude ?? []);
  const forced = new Set(options.asCategorical ?? []);
  const candidates = source.columns.filter((c) => c !== options.target && !excluded.has(c) && (chosen === null || chosen.has(c)));
  checkMeasuredWidth(candidates.length, source);
  const samples = await sampleColumns(engine, source.view, candidates);
  const { levelColumns, numeric, time, distinct } = planColumnKinds(candidates, samples, forced);

  let targetSpec: TargetSpec | undefined;
  if (options.target !== undefined) {
    const sampled = await sampleTargetValues(engine, source.view, options.target);
    const maxClasses = options.maxClasses ?? DEFAULT_MAX_CLASSES;
    targetSpec = resolveTarget({ column: options.target, kind: options.targetKind, positive: options.positive, maxClasses }, sampled);
    if (targetSpec.kind === "multiclass") {
      // the sample saw the first rows only: one query over the target column finds every class
      const found = await engine.rows<{ v: string; n: number }>(classesSql(source.view, options.target, maxClasses), `listing the classes of '${options.target}'`);
      targetSpec.classes = readClasses(options.target, found, maxClasses).map((c) => c.value);
    }
  }

  // the level table need not keep row order; letting DuckDB drop it makes the pass ~30 % faster.
  // Only from here: the samples above read the FIRST rows (LIMIT), which without order are any rows
  await engine.run("SET preserve_insertion_order = false", "configuring the engine");
  const extrasOf = { countColumns: [...numeric, ...time], timeColumns: time, contentColumns: source.columns, keyableTimeColumns: keyableTimeColumns(samples, time) };
  const totals = await buildLevelTable(engine, {
    view: source.view, levelColumns, distinctColumns: distinct, target: targetSpec, fold, ...extrasOf,
    // a second read can be cheaper than carrying these sums in every grouping set (engine/passExtras)
    extras: extrasFor(source.format, extrasOf),
  },
    `scanning ${source.files.length === 1 ? `'${source.files[0]}'` : `${source.files.length} files`}`);
  if (totals.rows === 0) throw new TailsiftError("empty_input", `${describeFiles(source.files)} has a header but no rows; give a file with rows`);
  const skippedRows = await countSkippedRows(engine, source);

  const advise = targetSpec?.kind === "multiclass"
    ? (ctx: Parameters<typeof adviseFromLevelTable>[1]) => adviseMulticlassAndWrite(engine, { ...ctx, target: multiclassTarget(targetSpec.column, targetSpec.classes ?? [], totals) })
    : (ctx: Parameters<typeof adviseFromLevelTable>[1]) => adviseFromLevelTable(engine, ctx);
  const profile = await advise({
    levelColumns, numeric: [...numeric, ...time], time, samples, allColumns: source.columns, totals, policy, top: options.top ?? 20, outOfFold: true,
    missingLike: normaliseMissingLike(options.missingLike),
    target: targetSpec && targetSpec.kind !== "multiclass" ? checkTarget({ ...targetSpec, kind: targetSpec.kind }, totals) : undefined, targetColumn: options.target,
    decide: options.decide, levelTableOut: options.levelTableOut,
    input: {
      paths: source.files, rows: totals.rows, bytes: source.bytes, fingerprint: source.fingerprint, format: source.format,
      ...(totals.content !== undefined ? { contentFingerprint: totals.content } : {}),
      ...(skippedRows !== undefined ? { skippedRows } : {}),
    },
  });
  // the type encode writes each numeric column as (typed output, encode/passThrough)
  for (const c of profile.columns) {
    const sample = c.role === "numeric" ? samples.find((x) => x.name === c.name) : undefined;
    if (sample) c.numberType = numberTypeOf(sample);
  }
  await addFoldNotes(engine, source.view, profile, levelColumns, fold);
  await addForwardFigures(engine, profile, levelColumns, fold);
  profile.settings.fold = fold; // the contract encode reads back (engine/folds readFoldContract)
  return profile;
}
