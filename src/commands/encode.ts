/**
 * commands/encode: applies a plan's encodings to an extract — orchestration only.
 *
 * 1. Read the plan (profile.json + levels.parquet), open the input, decide the output columns.
 * 2. The input's level table: the plan's levels.parquet when the input IS the scanned extract
 *    (same fingerprint, no --skip-bad-rows; `recount` forces a pass), otherwise one GROUP BY
 *    pass over the input.
 *    A training run's target sums come from this table, i.e. from the training input itself;
 *    frequency and codes always come from the plan's level table, in both modes.
 * 3. Small mapping tables per column (per level, or per level and fold) inside DuckDB.
 * 4. ONE `COPY (SELECT …) TO` writes the output in input order (encode/lookup explains how),
 *    to a temporary file that is renamed into place with the mappings folder beside it.
 * Folds are the scan's: the plan's fold contract (engine/folds, readFoldContract) over the same text view.
 */
import path from "node:path";
import { checkTimeBlockRows, foldSql, readFoldContract, singleFold } from "../engine/folds.js";
import { contentFingerprintOf } from "../engine/contentFingerprint.js";
import { withEngine, type Engine, type EngineOptions } from "../engine/db.js";
import { describeFiles, openSource, type SourceOptions } from "../engine/source.js";
import { planMissingLike } from "../engine/missingLike.js";
import { TailsiftError } from "../errors.js";
import { writeOutput } from "../encode/writeOutput.js";
import { mappingsDirFor, outputFormat } from "../encode/outputFile.js";
import { encoderFor } from "../encode/encodings/registry.js";
import { inputLevelsFromPass, inputLevelsFromPlan } from "../encode/levelTables.js";
import { chooseLookup, prepareLookup, type LookupKind, type LookupRef } from "../encode/lookup.js";
import { planColumns } from "../encode/planColumns.js";
import { FOLD_FIELD, ref } from "../encode/expressions.js";
import type { ColumnMap, EncodeMode, EncodeSummary } from "../encode/types.js";
import type { Profile } from "../profile/types.js";
import { loadPlanLevels, readPlan } from "../plan/load.js";
import { ensureOutputDir, refuseInputAsOutput, removeStaleTemps } from "./output.js";

export type { EncodeSummary } from "../encode/types.js";

export interface EncodeOptions extends EngineOptions, SourceOptions {
  /** The plan: a profile.json written by scan --out (levels.parquet beside it), or its folder. */
  plan: string;
  /** The output file: .parquet, .csv, .tsv, .csv.gz or .tsv.gz. */
  out: string;
  mode: EncodeMode;
  /** Name of the fold column written in training mode (default "fold"). */
  foldColumn?: string;
  /** Columns passed through untouched, whatever the plan says. */
  keep?: string[];
  /** Also write each encoded column's text as `<column>__text`. */
  keepOriginal?: boolean;
  /** Training only: leave-one-out target encoding instead of out-of-fold. */
  leaveOneOut?: boolean;
  /** A multi-class target's encoding: write all K class columns (default K − 1, the largest class dropped). */
  allClasses?: boolean;
  /** Training only: count level sums from the input even when it is the scanned extract. */
  recount?: boolean;
  /** Keep today's raw output names (`clinic=Yarrowby Vets 24`) instead of safe ones (encode/safeNames). */
  rawNames?: boolean;
  /** CSV/TSV output: prefix text cells that a spreadsheet would run as a formula (default true; encode/cellGuard). */
  cellGuard?: boolean;
  /** How mapped values are looked up (default auto: enum unless a mapping is very large). */
  lookup?: LookupKind | "auto";
  onEngine?: (engine: Engine | null) => void;
}

/**
 * Encodes `inputs` with the plan and writes `options.out` plus `options.out + ".mappings/"`.
 * @throws TailsiftError (exit 2) for a missing or invalid plan, a plan made from other columns,
 *   training input without the target, leave-one-out when scoring, a bad output path; exit 130
 *   when interrupted (nothing is left behind).
 */
export async function encode(inputs: readonly string[], options: EncodeOptions): Promise<EncodeSummary> {
  if (options.leaveOneOut && options.mode !== "training") throw new TailsiftError("bad_option", "--leave-one-out applies to --for training only");
  const foldColumn = options.foldColumn ?? "fold";
  if (foldColumn.trim() === "") throw new TailsiftError("bad_option", "--fold-column needs a name");
  const { profilePath, levelsPath, profile } = readPlan(options.plan, "encode", true);
  const mapsDir = mappingsDirFor(options.out);
  refuseInputAsOutput(options.out, [...inputs, profilePath, levelsPath], [mapsDir]);
  outputFormat(options.out);
  ensureOutputDir(path.dirname(path.resolve(options.out)));
  removeStaleTemps(path.dirname(path.resolve(options.out)), path.basename(options.out)); // left by a killed run
  // DuckDB may only touch the inputs, the plan's folder and the output's folder (plus its temp dir)
  const lockToPaths = options.lockToPaths ?? [...inputs, path.dirname(path.resolve(options.out)), path.dirname(path.resolve(profilePath))];
  return withEngine({ ...options, lockToPaths }, async (engine) => {
    options.onEngine?.(engine);
    try {
      return await encodeWith(engine, inputs, profile, levelsPath, { ...options, foldColumn });
    } finally {
      options.onEngine?.(null);
    }
  });
}

async function encodeWith(engine: Engine, inputs: readonly string[], profile: Profile, levelsPath: string, o: EncodeOptions & { foldColumn: string }): Promise<EncodeSummary> {
  const source = await openSource(engine, inputs, { ...o, missingLike: planMissingLike(profile.settings.missingLike, o.missingLike, true) });
  // globs and Parquet folders are expanded now: compare every file read with what is written
  refuseInputAsOutput(o.out, source.files, [mappingsDirFor(o.out)]);
  const training = o.mode === "training";
  // the plan's fold contract, read once: the pass, the fold column and the manifest all use it
  const folding = training ? readFoldContract(profile.settings) : singleFold();
  // a time-blocks plan: past-only encodings (each block from the earlier ones), every row needs a time
  const pastOnly = folding.kind === "time-blocks";
  if (pastOnly && o.leaveOneOut) throw new TailsiftError("bad_option", "--leave-one-out does not apply to a plan scanned with --time: its training encodings are past-only (each time block encoded from the earlier blocks); drop --leave-one-out");
  const plan = planColumns(profile, source.columns, {
    mode: o.mode, keep: o.keep ?? [], keepOriginal: o.keepOriginal ?? false, foldColumn: o.foldColumn, foldKeys: training ? folding.keyColumns : [],
    allClasses: o.allClasses ?? false,
  });
  if (o.leaveOneOut && plan.encoded.some((c) => c.spec.encoding === "target-kfold" && c.spec.classes)) {
    throw new TailsiftError("bad_option", "--leave-one-out has no multi-class form: the plan's target has several classes; drop --leave-one-out (training encodings are out-of-fold)");
  }
  if (plan.names.length === 0) throw new TailsiftError("nothing_to_write", "the plan drops every column of the input; nothing to write (use --keep to pass columns through)");
  const names = plan.encoded.map((c) => c.name);
  if (pastOnly) await checkTimeBlockRows(engine, source.view, folding);
  const folds = training ? folding.k : profile.settings.folds;
  const pt = profile.target;
  const target = pt === undefined ? undefined
    : pt.kind === "multiclass" ? { column: pt.column, kind: pt.kind, classes: pt.classes.map((c) => c.value) }
    : { column: pt.column, kind: pt.kind, ...(pt.positive !== undefined ? { positive: pt.positive } : {}) };
  const targetEncoded = plan.encoded.some((c) => c.spec.encoding === "target-kfold");
  if (targetEncoded && !target) throw new TailsiftError("bad_plan", "the plan target-encodes a column but has no target; rescan with --target");
  const needsTarget = training && targetEncoded;

  let levelSource: EncodeSummary["levelSource"] = "none";
  if (names.length > 0) {
    await loadPlanLevels(engine, levelsPath, "encode", names);
    // The scanned extract itself (and read the same way): its level table is the plan's.
    // The cheap fingerprint is the first screen; the content fingerprint (when the plan has one)
    // decides: changed content is recounted by a pass, and the summary says so.
    const sameFile = source.fingerprint === profile.input.fingerprint && !o.recount && !o.skipBadRows;
    const sameContent = sameFile && await sameContentAsPlan(engine, source, profile);
    if (sameFile && !sameContent) levelSource = "input pass (content differs from the plan's scan)";
    if (sameContent) {
      await inputLevelsFromPlan(engine, levelsPath, names, pt?.kind === "multiclass" ? pt.classes.length : 0);
      levelSource = "plan level table";
    } else {
      await inputLevelsFromPass(engine, names, {
        view: source.view, fold: folding, ...(needsTarget && target ? { target } : {}),
      }, `reading ${describeFiles(source.files)}`);
      if (levelSource === "none") levelSource = "input pass";
    }
  }

  const maps = new Map<number, ColumnMap>();
  for (const column of plan.encoded) {
    const map = await encoderFor(column).buildMap(engine, column, { mode: o.mode, leaveOneOut: o.leaveOneOut ?? false, folds, targetMean: profile.target?.mean, ...(pastOnly ? { pastOnly } : {}) });
    if (map) maps.set(column.index, map);
  }
  const lookup = o.lookup === undefined || o.lookup === "auto" ? await chooseLookup(engine, [...maps.values()].map((m) => m.table)) : o.lookup;
  const lookups = new Map<number, LookupRef>();
  for (const [i, map] of maps) {
    const column = plan.encoded[i]!;
    const fold = map.perFold ? { expr: ref(FOLD_FIELD), folds } : undefined;
    lookups.set(i, await prepareLookup(engine, lookup, i, map.table, { level: ref(column.name), ...(fold ? { fold } : {}) }, map.fields));
  }

  return writeOutput(engine, {
    plan, maps, lookups, lookup, levelSource, source, profile, options: o, target,
    folds: training ? { contract: folding, expr: foldSql(folding) } : null,
    looTarget: o.leaveOneOut && target ? target : undefined,
  });
}

/** True when the input's content fingerprint is the plan's (or the plan predates content fingerprints). */
async function sameContentAsPlan(engine: Engine, source: { view: string; columns: string[]; files: string[] }, profile: Profile): Promise<boolean> {
  const recorded = profile.input.contentFingerprint;
  if (recorded === undefined) return true;
  return (await contentFingerprintOf(engine, source.view, source.columns, `checking the content of ${describeFiles(source.files)}`)) === recorded;
}
