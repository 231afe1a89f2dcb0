/**
 * engine/source: turns the user's inputs (files, globs, hive-partitioned folders) into one DuckDB
 * view, `tailsift_src`, in which every column is text, so level identity is exactly what the file
 * holds ("00501" stays "00501"; 007, 07 and 7 are three levels).
 *
 * Bad input is refused here with one line naming the file, the line and what to do (see
 * docs/bad-input.md): binary data, rows with the wrong number of fields (unless --skip-bad-rows,
 * which skips and counts them), headers with empty or repeated names. Inputs are only read.
 */
import fs from "node:fs";
import { isTailsiftError, TailsiftError, wrapEngineError } from "../errors.js";
import { checkCompressedWhole } from "./compressed.js";
import { dialectOptions, sniffDialect, type CsvDialect } from "./csvDialect.js";
import type { Engine } from "./db.js";
import { quoteIdent, quoteLiteral, quoteLiteralList } from "./sql.js";
import { missingLikeSql, normaliseMissingLike } from "./missingLike.js";

import { expand, fingerprintFiles, formatOf, type InputFormat } from "./inputFiles.js";

export { fingerprintFiles, formatOf, type InputFormat };

export interface SourceOptions {
  /** CSV/TSV: skip rows that do not parse (ragged rows, bad quoting) and count them (countSkippedRows). */
  skipBadRows?: boolean;
  /** CSV text encoding: utf-8 (default), latin-1 or utf-16. */
  encoding?: string;
  /** CSV delimiter; detected when absent (tab for .tsv). */
  delimiter?: string;
  /** Values read as missing in every column (engine/missingLike: trimmed, case-insensitive). */
  missingLike?: readonly string[];
}

export interface Source {
  files: string[];
  format: InputFormat;
  bytes: number;
  columns: string[];
  fingerprint: string;
  /** The view every query reads: all columns as VARCHAR. */
  view: string;
  /** True when bad rows are skipped and recorded (CSV/TSV with --skip-bad-rows). */
  skipBadRows: boolean;
}

/** The longest CSV line read (a field of 10 MB fits); longer lines fail with code line_too_long. */
export const MAX_LINE_BYTES = 16 * 2 ** 20;
/** DuckDB's read buffer; it must exceed MAX_LINE_BYTES. 32 MiB keeps memory at DuckDB's default. */
const BUFFER_BYTES = 32 * 2 ** 20;
/**
 * The most columns one scan measures at once. Memory of the one-pass GROUPING SETS query and
 * of the column sample grows faster than linearly with the number of columns (measured, 50 rows,
 * 2 threads: 250 columns 0.9 GB, 1,000 columns 4.9 GB, 2,000 columns 10 GB at one thread;
 * 10,000 columns exceed 23 GB, beyond DuckDB's memory limit).
 */
export const MAX_MEASURED_COLUMNS = 100_000;

interface ReadMode {
  /** Skip rows that do not parse. */
  ignoreErrors: boolean;
  /** Record skipped rows in reject_errors / reject_scans (DuckDB refuses it with union_by_name). */
  storeRejects: boolean;
  header: boolean;
  /** Read with one thread in file order (the raw header: with several threads LIMIT 1 may return any row). */
  serial?: boolean;
  /** The layout detected once (engine/csvDialect), pinned so DuckDB does not detect it again; only for the default mode. */
  dialect?: CsvDialect | null;
}

function readerSql(format: InputFormat, files: readonly string[], options: SourceOptions, mode?: Partial<ReadMode>): string {
  const list = quoteLiteralList(files);
  if (format === "parquet") return `read_parquet(${list}, union_by_name = true, hive_partitioning = true)`;
  if (format === "jsonl") return `read_json(${list}, format = 'newline_delimited', union_by_name = true)`;
  return `read_csv(${[list, ...csvOptions(format, options, mode)].join(", ")})`;
}

/** The read_csv options of `mode` after the file list (also those the layout is sniffed with). */
function csvOptions(format: InputFormat, options: SourceOptions, mode?: Partial<ReadMode>): string[] {
  const m: ReadMode = { ignoreErrors: options.skipBadRows ?? false, storeRejects: options.skipBadRows ?? false, header: true, ...mode };
  const parts = [`header = ${m.header}`, "all_varchar = true", `union_by_name = ${!m.storeRejects}`,
    `max_line_size = ${MAX_LINE_BYTES}`, `buffer_size = ${BUFFER_BYTES}`];
  const delimiter = options.delimiter ?? (format === "tsv" ? "\t" : undefined);
  if (m.dialect) parts.push(...dialectOptions(m.dialect, delimiter));
  else if (delimiter !== undefined) parts.push(`delim = ${quoteLiteral(delimiter)}`);
  if (options.encoding !== undefined) parts.push(`encoding = ${quoteLiteral(normaliseEncoding(options.encoding))}`);
  if (m.ignoreErrors) parts.push("ignore_errors = true");
  if (m.storeRejects) parts.push("store_rejects = true");
  if (m.serial) parts.push("parallel = false");
  return parts;
}

function normaliseEncoding(encoding: string): string {
  const e = encoding.toLowerCase().replace(/[_\s]/g, "-");
  if (e === "utf8" || e === "utf-8") return "utf-8";
  if (e === "latin1" || e === "latin-1" || e === "iso-8859-1") return "latin-1";
  if (e === "utf16" || e === "utf-16") return "utf-16";
  throw new TailsiftError("bad_option", `--encoding '${encoding}' is not supported; use utf-8, latin-1 or utf-16`);
}

const isInterrupt = (err: unknown) => isTailsiftError(err) && err.code === "interrupted";

/** Runs `work`, re-reading an engine error with the input named (DuckDB leaves it out while sniffing). */
async function reading<T>(files: readonly string[], doing: string, work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    if (isTailsiftError(err) && !isInterrupt(err) && err.cause !== undefined) throw wrapEngineError(err.cause, doing, describeFiles(files));
    throw err;
  }
}

async function describe(engine: Engine, reader: string, files: readonly string[]): Promise<string[]> {
  const doing = `reading the header of ${describeFiles(files)}`;
  const rows = await reading(files, doing, () => engine.rows<{ column_name: string }>(`DESCRIBE SELECT * FROM ${reader}`, doing));
  return rows.map((r) => r.column_name);
}

/**
 * Refuses binary data named .csv before DuckDB guesses a layout for it: more than 5 % control
 * bytes (other than tab, CR, LF, ESC), and at least 8 of them, in the first 8 KiB. UTF-16 text
 * has NUL in every other byte, so the message suggests --encoding utf-16 unless it was given.
 * Compressed files are not checked (DuckDB reports a bad .gz itself).
 */
function refuseBinary(file: string, options: SourceOptions): void {
  if (/\.(gz|gzip|zst)$/i.test(file) || normaliseEncoding(options.encoding ?? "utf-8") === "utf-16") return;
  const head = Buffer.alloc(8192);
  const fd = fs.openSync(file, "r");
  let n: number;
  try {
    n = fs.readSync(fd, head, 0, head.length, 0);
  } finally {
    fs.closeSync(fd);
  }
  let control = 0;
  for (let i = 0; i < n; i++) {
    const b = head[i] ?? 0;
    if (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x1b) control += 1;
  }
  if (control >= 8 && control / n > 0.05) {
    throw new TailsiftError("binary_input", `cannot read '${file}': it holds binary data, not CSV text; check the file (pass --encoding utf-16 if it is UTF-16 text; compressed files need a .gz or .zst extension)`);
  }
}

/**
 * The first row DuckDB rejects in `files`, read one file at a time with ignore_errors and
 * store_rejects (an error path only: it reads each file in full). Null when none is rejected.
 */
async function firstRejectedRow(engine: Engine, format: InputFormat, files: readonly string[], options: SourceOptions): Promise<TailsiftError | null> {
  for (const file of files) {
    try {
      await engine.rows(`SELECT count(*) AS n FROM ${readerSql(format, [file], options, { ignoreErrors: true, storeRejects: true })}`, `looking for bad rows in '${file}'`);
      const [row] = await engine.rows<{ line: number; message: string }>(
        `SELECT e.line, e.error_message AS message FROM reject_errors e
         WHERE e.scan_id = (SELECT max(scan_id) FROM reject_scans) ORDER BY e.line LIMIT 1`, "reading the first bad row");
      if (row) return wrapEngineError(new Error(`CSV Error on Line: ${row.line}\n${row.message}\n  file = ${file}`), `reading '${file}'`);
    } catch (err) {
      if (isInterrupt(err)) throw err;
      return null;
    }
  }
  return null;
}

/**
 * Reads the header row of each file as data (header = false) to see the names as written:
 * DuckDB renames an empty name to "columnN" and a repeated one to "name_1", which would make
 * the profile name columns the file does not have. Only run when a name looks renamed.
 */
async function checkRawHeaders(engine: Engine, format: InputFormat, files: readonly string[], options: SourceOptions): Promise<void> {
  for (const file of files) {
    const [row] = await reading([file], `reading the header of '${file}'`, () => engine.rows<Record<string, string | null>>(
      `SELECT * FROM ${readerSql(format, [file], options, { header: false, ignoreErrors: true, storeRejects: false, serial: true })} LIMIT 1`, `reading the header of '${file}'`));
    const names = Object.values(row ?? {}).map((v) => v ?? "");
    const blank = names.findIndex((n) => n.trim() === "");
    if (blank >= 0) throw new TailsiftError("empty_column_name", `column ${blank + 1} of '${file}' has no name in the header; give every column a name`);
    const seen = new Map<string, number>();
    names.forEach((name, i) => {
      const first = seen.get(name);
      if (first !== undefined) {
        throw new TailsiftError("duplicate_column", `'${file}' names column '${name}' twice (columns ${first + 1} and ${i + 1}); rename one — tailsift reads columns by name`);
      }
      seen.set(name, i);
    });
  }
}

const RENAMED = /^column\d+$|_\d+$/;
const DELIMITERS = /[,;|\t]/;

/** Resolves the inputs and creates the text view `tailsift_src` over them. */
export async function openSource(engine: Engine, inputs: readonly string[], options: SourceOptions = {}): Promise<Source> {
  if (inputs.length === 0) throw new TailsiftError("bad_usage", "no input given; name at least one file, glob or folder");
  const files: string[] = [];
  for (const input of inputs) files.push(...(await expand(engine, input)));
  const formats = new Set(files.map((f) => formatOf(f)));
  if (formats.has(null)) {
    const bad = files.find((f) => formatOf(f) === null) ?? "";
    throw new TailsiftError("unsupported_format", `cannot read '${bad}': use .csv, .tsv, .csv.gz, .parquet or .jsonl`);
  }
  if (formats.size > 1) throw new TailsiftError("mixed_formats", `inputs mix formats (${[...formats].join(", ")}); scan one format at a time`);
  const format = [...formats][0] as InputFormat;
  const csv = format === "csv" || format === "tsv";
  if (options.skipBadRows && !csv) {
    throw new TailsiftError("bad_option", "--skip-bad-rows applies to CSV and TSV input; fix the malformed lines of JSON or Parquet input");
  }
  let bytes = 0;
  for (const file of files) {
    const size = fs.statSync(file).size;
    if (size === 0) throw new TailsiftError("empty_input", `input '${file}' is empty; give a file with a header and rows`);
    bytes += size;
    if (csv) refuseBinary(file, options);
  }
  const whole = checkCompressedWhole(files);
  whole.catch(() => undefined); // awaited below; a truncated file explains a failed header read too
  // CSV: the layout is detected once, with the options of the view's read (store_rejects aside:
  // it records rows, and implies the ignore_errors that is given), and pinned in that read
  const dialect = csv ? await sniffDialect(engine, files, csvOptions(format, options, { storeRejects: false })) : null;
  const reader = readerSql(format, files, options, { dialect });
  const columns = await (csv ? describeCsv(engine, format, reader, files, options, dialect) : describe(engine, reader, files))
    .catch(async (err: unknown) => { await whole; throw err; });
  await whole;
  if (columns.length === 0) throw new TailsiftError("empty_input", `no columns found in ${describeFiles(files)}`);
  const emptyName = columns.find((c) => c.trim() === "");
  if (emptyName !== undefined) throw new TailsiftError("empty_column_name", `${describeFiles(files)} has a column with an empty name; give every column a header`);
  const withNul = columns.find((c) => c.includes("\u0000"));
  if (withNul !== undefined) throw new TailsiftError("bad_column_name", `${describeFiles(files)} has a column name with a NUL byte ('${withNul.replaceAll("\u0000", "\\0")}'); rename it`);
  if (csv && columns.some((c) => RENAMED.test(c))) await checkRawHeaders(engine, format, files, options);
  const missingLike = normaliseMissingLike(options.missingLike);
  const select = columns.map((c) => `${missingLikeSql(`CAST(${quoteIdent(c)} AS VARCHAR)`, missingLike)} AS ${quoteIdent(c)}`).join(", ");
  await engine.run(`CREATE OR REPLACE TEMP VIEW tailsift_src AS SELECT ${select} FROM ${reader}`, "creating the input view");
  return { files, format, bytes, columns, fingerprint: fingerprintFiles(files), view: "tailsift_src", skipBadRows: csv && (options.skipBadRows ?? false) };
}

/**
 * The CSV header, with two DuckDB behaviours turned into errors that name the bad line: when the
 * rows within its sample do not all have the same number of fields, DuckDB's layout detection
 * either fails or settles on reading each line as ONE column (a header such as "a,b,c"). Both
 * are re-read skipping bad rows; if that gives more columns, the first skipped row is reported.
 * With --skip-bad-rows over several files every file must have the same columns (DuckDB records
 * skipped rows only when it reads the files by position).
 */
async function describeCsv(engine: Engine, format: InputFormat, reader: string, files: readonly string[], options: SourceOptions, dialect: CsvDialect | null): Promise<string[]> {
  let columns: string[] | null = null;
  let failure: unknown = null;
  try {
    columns = await describe(engine, reader, files);
  } catch (err) {
    if (!(isTailsiftError(err) && err.code === "unreadable_csv")) throw err;
    failure = err;
  }
  if (!options.skipBadRows && (columns === null || (columns.length === 1 && DELIMITERS.test(columns[0] ?? "")))) {
    const lenient = await describe(engine, readerSql(format, files, options, { ignoreErrors: true, storeRejects: false }), files)
      .catch((err: unknown) => { if (isInterrupt(err)) throw err; return null; });
    if (lenient && lenient.length > (columns?.length ?? 0)) {
      const bad = await firstRejectedRow(engine, format, files, options);
      if (bad) throw bad;
    }
  }
  if (columns === null) throw failure;
  if (options.skipBadRows && files.length > 1) {
    const union = await describe(engine, readerSql(format, files, options, { ignoreErrors: true, storeRejects: false, dialect }), files);
    const missing = union.filter((c) => !columns.includes(c));
    if (missing.length > 0) {
      throw new TailsiftError("skip_bad_rows_headers", `--skip-bad-rows needs every file to have the same columns, but only some of ${describeFiles(files)} have ${missing.slice(0, 3).map((c) => `'${c}'`).join(", ")}; scan those files separately`);
    }
  }
  return columns;
}

/**
 * Rows skipped as unreadable (CSV/TSV with --skip-bad-rows): distinct (file, line) pairs DuckDB
 * recorded while reading the view. Call it after the full pass (queries with LIMIT record only
 * what they read). Undefined when bad rows were not being skipped (then none were).
 */
export async function countSkippedRows(engine: Engine, source: Source): Promise<number | undefined> {
  if (!source.skipBadRows) return undefined;
  const [exists] = await engine.rows<{ n: number }>(
    "SELECT count(*) AS n FROM duckdb_tables() WHERE table_name = 'reject_errors'", "counting skipped rows");
  if (!exists || exists.n === 0) return 0;
  const [row] = await engine.rows<{ n: number }>(
    `SELECT count(*) AS n FROM (SELECT DISTINCT s.file_path, e.line FROM reject_errors e
       JOIN reject_scans s ON e.scan_id = s.scan_id AND e.file_id = s.file_id)`, "counting skipped rows");
  return row?.n ?? 0;
}

/**
 * Refuses a scan that would measure more than MAX_MEASURED_COLUMNS columns at once (see there
 * for the memory measured), before any heavy query runs.
 * @param measured the number of columns the scan will sample and count.
 */
export function checkMeasuredWidth(measured: number, source: Source): void {
  if (measured <= MAX_MEASURED_COLUMNS) return;
  throw new TailsiftError("too_many_columns",
    `${describeFiles(source.files)} has ${source.columns.length} columns; tailsift measures at most ${MAX_MEASURED_COLUMNS} at once (memory grows with each column): choose some with --columns or leave some out with --exclude, and scan the rest in another run`);
}

export function describeFiles(files: readonly string[]): string {
  if (files.length === 1) return `'${files[0]}'`;
  return `${files.length} files ('${files[0]}' …)`;
}
