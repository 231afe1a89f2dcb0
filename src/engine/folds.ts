/**
 * engine/folds: THE fold contract — how a row gets its fold, produced here, validated here once,
 * turned into SQL here, written to the profile as `settings.fold` and read back by encode through
 * `readFoldContract`. Nothing else decides a fold.
 *
 * Kinds (a union so later kinds slot in without touching the readers):
 *  - "row-hash": a seeded hash of the row's full text (every column in `keyColumns`, in file
 *    order) modulo k. Exact duplicate rows share a fold, so duplicates cannot leak across folds.
 *  - "single": every row in fold 0 (a pass that needs no folds, e.g. encode --for scoring).
 *  - "external": folds given by the user's own expression (tailsift sql --fold-expr, read back
 *    by scan --levels); tailsift cannot reproduce them, so encode --for training refuses them.
 *  - "grouped": a seeded hash of the text of the named key columns only (`--fold-by`), modulo k,
 *    so every row of an entity (an owner, a patient) shares one fold; rows whose key is missing
 *    form one entity of their own. Same formula as row-hash, over fewer columns.
 *  - "time-blocks": the rows ordered by a time column (`--time`) and cut into k consecutive blocks
 *    at k − 1 cut points, exact quantiles of the time column (quantile_disc at j/k, measured by one
 *    query before the pass, timeBlockCuts). A row's block is the number of cut points its time is
 *    strictly later than, so block 0 holds the earliest rows, block k − 1 the latest, and rows with
 *    the same time share a block. Every row must have a time that reads as a date/time: a missing
 *    or unreadable time is refused with its count (it cannot be placed in time, and putting it in
 *    any block would either score it or fit later blocks on rows of unknown time).
 */
import { TailsiftError } from "../errors.js";
import type { Engine } from "./db.js";
import { quoteIdent, quoteLiteral, sqlNumber } from "./sql.js";
import { timeValueSql } from "./timeColumns.js";

/** The hash `row-hash` folds use (DuckDB's hash() of the row's text columns, seeded). */
export const FOLD_HASH_NAME = "duckdb-hash-of-row-text";
/** The hash `grouped` folds use (the same seeded hash, of the key columns' text only). */
export const GROUPED_FOLD_HASH = "duckdb-hash-of-key-text";
/** What `time-blocks` folds record as their hash (no hash: consecutive blocks of the time order). */
export const TIME_BLOCK_HASH = "consecutive-time-blocks";
/** What `external` folds record as their hash. */
export const EXTERNAL_FOLD_HASH = "the fold expression given to tailsift sql";

export const DEFAULT_FOLD_COUNT = 5;
export const DEFAULT_FOLD_SEED = 42;
export const MAX_FOLD_COUNT = 100;

export type FoldKind = "row-hash" | "grouped" | "single" | "external" | "time-blocks";

export interface FoldContract {
  kind: FoldKind;
  /** How the fold is computed (FOLD_HASH_NAME for row-hash). */
  hash: string;
  seed: number;
  /** Number of folds. */
  k: number;
  /** The columns the fold reads, in order (row-hash: every column of the input; grouped: the key; time-blocks: the time column). */
  keyColumns: string[];
  /** time-blocks: the time column (--time). */
  timeColumn?: string;
  /** time-blocks: the k − 1 cut points, `YYYY-MM-DD HH:MM:SS[.f]`, non-decreasing; block = #cuts the time is later than. */
  boundaries?: string[];
}

const bad = (message: string) => new TailsiftError("bad_option", message);

/** The one check of a fold count (--folds): an integer from 2 to MAX_FOLD_COUNT. */
export function checkFoldCount(k: number): number {
  if (!Number.isInteger(k) || k < 2 || k > MAX_FOLD_COUNT) throw bad(`--folds must be an integer from 2 to ${MAX_FOLD_COUNT} (got ${k})`);
  return k;
}

/** The one check of a fold seed (--seed). */
export function checkFoldSeed(seed: number): number {
  if (!Number.isInteger(seed)) throw bad(`--seed must be an integer (got ${seed})`);
  return seed;
}

/** Row-hash folds over `keyColumns` (validated). */
export function rowHashFolds(keyColumns: readonly string[], k: number, seed: number): FoldContract {
  return { kind: "row-hash", hash: FOLD_HASH_NAME, seed: checkFoldSeed(seed), k: checkFoldCount(k), keyColumns: [...keyColumns] };
}

/**
 * The one check of --fold-by: at least one column, each a column of the input, none twice, not
 * the target. Returns the key columns in the order given.
 * @throws TailsiftError `bad_option` / `unknown_column` with a one-line reason.
 */
export function checkFoldBy(keyColumns: readonly string[], inputColumns: readonly string[], target?: string): string[] {
  const names = keyColumns.map((c) => c.trim());
  if (names.length === 0 || names.some((c) => c === "")) throw bad("--fold-by needs one or more column names (comma-separated)");
  for (const c of names) {
    if (!inputColumns.includes(c)) throw new TailsiftError("unknown_column", `--fold-by: column '${c}' not found; columns are: ${inputColumns.join(", ")}`);
    if (c === target) throw bad(`--fold-by: '${c}' is the target; group folds by an entity column, not by the target`);
  }
  const dup = names.find((c, i) => names.indexOf(c) !== i);
  if (dup !== undefined) throw bad(`--fold-by names '${dup}' twice`);
  return names;
}

/**
 * What the user asks for (scan's --folds, --seed, --fold-by, or the library's ScanOptions): the
 * one input from which the fold contract is made. Absent fields take the defaults.
 */
export interface FoldRequest {
  /** Number of folds (--folds), default DEFAULT_FOLD_COUNT. */
  folds?: number;
  /** Seed of the fold hash (--seed), default DEFAULT_FOLD_SEED. */
  seed?: number;
  /** Entity-grouped folds by these key columns (--fold-by); absent = row folds. */
  foldBy?: string[];
  /** Time-ordered blocks by this time column (--time); absent = row folds. Not with foldBy. */
  time?: string;
}

/** The checks of a fold request that need no input: made before anything is read or written. */
export function checkFoldRequest(request: FoldRequest): void {
  checkFoldCount(request.folds ?? DEFAULT_FOLD_COUNT);
  checkFoldSeed(request.seed ?? DEFAULT_FOLD_SEED);
  if (request.foldBy !== undefined && request.foldBy.length === 0) checkFoldBy([], []);
  if (request.time !== undefined && request.time.trim() === "") throw bad("--time needs a column name");
  if (request.time !== undefined && request.foldBy !== undefined) throw bad("--time and --fold-by cannot be combined: time-ordered blocks and entity-grouped folds are two different fold kinds; choose one");
}

/** The cut points of time-blocks folds, measured by timeBlockCuts before the pass. */
export interface TimeCuts { column: string; boundaries: string[] }

/**
 * The one cheap query behind time-blocks folds: checks that every row of `column` has a time that
 * reads as a date/time (engine/timeColumns timeValueSql), and takes the k − 1 exact quantiles
 * quantile_disc(j/k), j = 1..k−1, as cut points. Refused (one line): not a column of the input, the
 * target, a missing or unreadable time (with counts and an example), or too few distinct times for
 * k non-empty blocks.
 * @throws TailsiftError `bad_option` / `unknown_column`.
 */
export async function timeBlockCuts(engine: Engine, view: string, request: FoldRequest, inputColumns: readonly string[], target?: string): Promise<TimeCuts | undefined> {
  checkFoldRequest(request);
  if (request.time === undefined) return undefined;
  const column = request.time.trim();
  if (!inputColumns.includes(column)) throw new TailsiftError("unknown_column", `--time: column '${column}' not found; columns are: ${inputColumns.join(", ")}`);
  if (column === target) throw bad(`--time: '${column}' is the target; order the rows by a date/time column`);
  const k = request.folds ?? DEFAULT_FOLD_COUNT;
  const probs = Array.from({ length: k - 1 }, (_, j) => sqlNumber((j + 1) / k)).join(", ");
  const c = quoteIdent(column);
  const [r] = await engine.rows<{ rows: number; present: number; parsed: number; example: string | null; cuts: unknown[] | null }>(
    `SELECT count(*)::DOUBLE AS rows, count(v)::DOUBLE AS present, count(t)::DOUBLE AS parsed,
       min(v) FILTER (WHERE v IS NOT NULL AND t IS NULL) AS example,
       list_transform(quantile_disc(t, [${probs}]), x -> strftime(x, '%Y-%m-%d %H:%M:%S.%f')) AS cuts
     FROM (SELECT ${c} AS v, ${timeValueSql(c)} AS t FROM ${view})`, `measuring the time blocks of '${column}'`);
  if (!r || r.rows === 0) return { column, boundaries: [] };
  if (r.present < r.rows) throw bad(`--time: ${r.rows - r.present} of ${r.rows} rows have no '${column}'; time-ordered blocks need a time on every row (filter or fill them first)`);
  if (r.parsed < r.present) throw bad(`--time: ${r.present - r.parsed} values of '${column}' do not read as a date/time (e.g. ${JSON.stringify(r.example)}); give a date/time column (YYYY-MM-DD[ HH:MM[:SS]])`);
  const boundaries = (r.cuts ?? []).map((x) => String(x).replace(/\.0+$/, "").replace(/(\.\d*?)0+$/, "$1"));
  for (let j = 1; j < boundaries.length; j += 1) {
    if (boundaries[j] === boundaries[j - 1]) throw bad(`--time: '${column}' has too few distinct times for ${k} blocks (cut points ${j} and ${j + 1} are both ${boundaries[j]}); use fewer --folds`);
  }
  return { column, boundaries };
}

/**
 * THE fold contract of a scan over raw rows: grouped by the --fold-by key, else a row hash over
 * every column of the input in file order. Validated here, once.
 * @throws TailsiftError `bad_option` / `unknown_column` with a one-line reason.
 */
export function foldContractFor(request: FoldRequest, inputColumns: readonly string[], target?: string, timeCuts?: TimeCuts): FoldContract {
  checkFoldRequest(request);
  const k = request.folds ?? DEFAULT_FOLD_COUNT;
  const seed = request.seed ?? DEFAULT_FOLD_SEED;
  if (request.time !== undefined) {
    if (!timeCuts) throw new Error("time-blocks folds need their cut points (timeBlockCuts) before the contract is made");
    return timeBlockFolds(timeCuts.column, timeCuts.boundaries, k, seed);
  }
  if (request.foldBy !== undefined) return groupedFolds(checkFoldBy(request.foldBy, inputColumns, target), k, seed);
  return rowHashFolds(inputColumns, k, seed);
}

/** Entity-grouped folds over the key columns (validated by checkFoldBy first). */
export function groupedFolds(keyColumns: readonly string[], k: number, seed: number): FoldContract {
  if (keyColumns.length === 0) throw bad("--fold-by needs one or more column names (comma-separated)");
  return { kind: "grouped", hash: GROUPED_FOLD_HASH, seed: checkFoldSeed(seed), k: checkFoldCount(k), keyColumns: [...keyColumns] };
}

/**
 * encode --for training with a time-blocks plan: every row of the input must have a time that
 * reads as a date/time (a row without one has no block). One query; refused with the counts.
 * @throws TailsiftError `bad_input`.
 */
export async function checkTimeBlockRows(engine: Engine, view: string, fold: FoldContract): Promise<void> {
  if (fold.kind !== "time-blocks" || fold.timeColumn === undefined) return;
  const c = quoteIdent(fold.timeColumn);
  const [r] = await engine.rows<{ missing: number; unread: number; example: string | null }>(
    `SELECT count(*) FILTER (WHERE v IS NULL)::DOUBLE AS missing, count(*) FILTER (WHERE v IS NOT NULL AND t IS NULL)::DOUBLE AS unread,
       min(v) FILTER (WHERE v IS NOT NULL AND t IS NULL) AS example
     FROM (SELECT ${c} AS v, ${timeValueSql(c)} AS t FROM ${view})`, `checking the times of '${fold.timeColumn}'`);
  if (!r) return;
  if (r.missing > 0) throw new TailsiftError("bad_input", `the plan's folds are time blocks of '${fold.timeColumn}', and ${r.missing} rows of the input have no '${fold.timeColumn}'; filter or fill them first`);
  if (r.unread > 0) throw new TailsiftError("bad_input", `the plan's folds are time blocks of '${fold.timeColumn}', and ${r.unread} values of it do not read as a date/time (e.g. ${JSON.stringify(r.example)})`);
}

/** Time-ordered blocks over `timeColumn` with k − 1 cut points (validated). */
export function timeBlockFolds(timeColumn: string, boundaries: readonly string[], k: number, seed: number): FoldContract {
  checkFoldCount(k);
  if (boundaries.length !== k - 1) throw bad(`time-blocks folds need ${k - 1} cut points (got ${boundaries.length})`);
  return { kind: "time-blocks", hash: TIME_BLOCK_HASH, seed: checkFoldSeed(seed), k, keyColumns: [timeColumn], timeColumn, boundaries: [...boundaries] };
}

/** The fold kind in plain words, for the record. */
export function foldKindText(fold: FoldContract): string {
  switch (fold.kind) {
    case "row-hash": return `row folds: a seeded hash of each row's text, ${fold.k} folds`;
    case "grouped": return `entity-grouped folds by ${fold.keyColumns.join(", ")}: every row of an entity shares one of ${fold.k} folds, so out-of-fold figures are measured on entities the fit never saw`;
    case "single": return "one fold (no out-of-fold figures)";
    case "external": return `folds from the fold expression given to tailsift sql (${fold.k} folds)`;
    case "time-blocks": return `time-ordered blocks by ${fold.timeColumn}: the rows cut into ${fold.k} consecutive blocks at ${(fold.boundaries ?? []).join(", ")}; forward figures fit on earlier blocks and score the next`;
  }
}

/** Every row in fold 0. */
export function singleFold(): FoldContract {
  return { kind: "single", hash: "none", seed: 0, k: 1, keyColumns: [] };
}

/** Folds that came with level tables from the user's fold expression (k = largest fold + 1). */
export function externalFolds(k: number, seed: number): FoldContract {
  return { kind: "external", hash: EXTERNAL_FOLD_HASH, seed, k, keyColumns: [] };
}

/**
 * The folds of an advice made from level tables (`scan --levels`): the tables' own fold column
 * (external folds: the user's --fold-expr on the cluster) when it has two or more folds; else the
 * request's K, which only target-kfold's recorded K reads. Validated here, once.
 */
export function levelTableFolds(request: FoldRequest, tableFolds: number): { contract: FoldContract; k: number; seed: number } {
  checkFoldRequest(request);
  const seed = request.seed ?? DEFAULT_FOLD_SEED;
  return { contract: externalFolds(tableFolds, seed), k: tableFolds >= 2 ? tableFolds : request.folds ?? DEFAULT_FOLD_COUNT, seed };
}

/** The SQL text of a row-hash fold over `keyColumns` (the formula behind `foldSql`). */
export function rowHashFoldSql(keyColumns: readonly string[], seed: number, k: number): string {
  const cols = keyColumns.map(quoteIdent).join(", ");
  return `(hash(${sqlNumber(Math.trunc(seed))}::BIGINT, ${cols}) % ${sqlNumber(k)})::INTEGER`;
}

/**
 * The fold of a row as an SQL expression over the source view. scan's pass and encode both call
 * this, so every row gets the same fold in both. External folds cannot be computed here.
 */
export function foldSql(fold: FoldContract): string {
  switch (fold.kind) {
    case "row-hash": return rowHashFoldSql(fold.keyColumns, fold.seed, fold.k);
    case "grouped": return rowHashFoldSql(fold.keyColumns, fold.seed, fold.k);
    case "single": return "0::INTEGER";
    case "time-blocks": return timeBlockSql(fold);
    case "external": throw new TailsiftError("bad_plan", "these folds came from the fold expression given to tailsift sql and cannot be reproduced by tailsift");
  }
}

/** Block of a row: the number of cut points its time is strictly later than (NULL for a missing or unreadable time). */
function timeBlockSql(fold: FoldContract): string {
  const t = timeValueSql(quoteIdent(fold.timeColumn ?? ""));
  const cuts = fold.boundaries ?? [];
  if (cuts.length === 0) return `(CASE WHEN ${t} IS NULL THEN NULL ELSE 0 END)::INTEGER`;
  return `(${cuts.map((b) => `(${t} > ${quoteLiteral(b)}::TIMESTAMP)::INTEGER`).join(" + ")})::INTEGER`;
}

const isStringList = (x: unknown): x is string[] => Array.isArray(x) && x.every((c) => typeof c === "string");

/**
 * The fold contract of a saved profile's settings, for encode --for training: settings.fold, or
 * (profiles written before it) settings.foldColumns + folds + seed. Anything that cannot be
 * reproduced — no contract, external folds, an unknown kind — is refused.
 * @throws TailsiftError `bad_plan` with a one-line reason.
 */
export function readFoldContract(settings: { fold?: unknown; foldColumns?: unknown; folds?: unknown; seed?: unknown }): FoldContract {
  const refuse = (why: string) => new TailsiftError("bad_plan", `${why}, so training folds cannot be reproduced; rescan the training extract`);
  const f = settings.fold;
  if (f !== undefined) {
    const c = (typeof f === "object" && f !== null ? f : {}) as Record<string, unknown>;
    if (c.kind === "time-blocks" && c.hash === TIME_BLOCK_HASH && typeof c.timeColumn === "string" && isStringList(c.boundaries)
      && typeof c.k === "number" && typeof c.seed === "number") return timeBlockFolds(c.timeColumn, c.boundaries, c.k, c.seed);
    if (c.kind === "external") throw refuse("the plan's folds came from the fold expression given to tailsift sql (settings.fold.kind is external)");
    if (c.kind === "grouped" && c.hash === GROUPED_FOLD_HASH && isStringList(c.keyColumns) && c.keyColumns.length > 0
      && typeof c.k === "number" && typeof c.seed === "number") return groupedFolds(c.keyColumns, c.k, c.seed);
    if (c.kind !== "row-hash" || c.hash !== FOLD_HASH_NAME || !isStringList(c.keyColumns) || c.keyColumns.length === 0
      || typeof c.k !== "number" || typeof c.seed !== "number") {
      throw refuse("the plan's settings.fold is not a row-hash fold contract");
    }
    return rowHashFolds(c.keyColumns, c.k, c.seed);
  }
  const cols = settings.foldColumns;
  if (!isStringList(cols) || cols.length === 0 || typeof settings.folds !== "number" || typeof settings.seed !== "number") {
    throw refuse("the plan has no settings.fold (it was not made by scan over raw rows)");
  }
  return rowHashFolds(cols, settings.folds, settings.seed);
}
