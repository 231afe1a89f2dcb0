/**
 * engine/source: turns the user's inputs (files, globs, hive-partitioned folders) into one DuckDB
 * view, `tailsift_src`, in which every column is text, so level identity is exactly what the file
 * holds ("00501" stays "00501"; 007, 07 and 7 are three levels).
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { TailsiftError } from "../errors.js";
import type { Engine } from "./db.js";
import { quoteIdent, quoteLiteral, quoteLiteralList } from "./sql.js";

export type InputFormat = "csv" | "tsv" | "parquet" | "jsonl";

export interface SourceOptions {
  /** Skip rows that do not parse (ragged rows, bad quoting) and count them. */
  skipBadRows?: boolean;
  /** CSV text encoding: utf-8 (default), latin-1 or utf-16. */
  encoding?: string;
  /** CSV delimiter; detected when absent (tab for .tsv). */
  delimiter?: string;
}

export interface Source {
  files: string[];
  format: InputFormat;
  bytes: number;
  columns: string[];
  fingerprint: string;
  /** The view every query reads: all columns as VARCHAR. */
  view: string;
}

const GLOB_CHARS = /[*?[]/;

/** Infers the format from a file name; .gz/.zst compression is read directly by DuckDB. */
export function formatOf(file: string): InputFormat | null {
  const lower = file.toLowerCase().replace(/\.(gz|gzip|zst)$/, "");
  if (lower.endsWith(".csv") || lower.endsWith(".txt")) return "csv";
  if (lower.endsWith(".tsv") || lower.endsWith(".tab")) return "tsv";
  if (lower.endsWith(".parquet") || lower.endsWith(".pq")) return "parquet";
  if (lower.endsWith(".jsonl") || lower.endsWith(".ndjson") || lower.endsWith(".json")) return "jsonl";
  return null;
}

async function expand(engine: Engine, input: string): Promise<string[]> {
  if (GLOB_CHARS.test(input)) {
    const rows = await engine.rows<{ file: string }>(
      "SELECT file FROM glob($pattern) ORDER BY file", `listing files matching '${input}'`, { pattern: input });
    if (rows.length === 0) {
      throw new TailsiftError("input_not_found", `no file matches '${input}'; check the pattern and quote it so the shell does not expand it`);
    }
    return rows.map((r) => r.file);
  }
  let stat: fs.Stats;
  try {
    stat = fs.statSync(input);
  } catch {
    throw new TailsiftError("input_not_found", `input '${input}' not found; give a file, a glob or a folder of Parquet files`);
  }
  if (stat.isDirectory()) {
    const rows = await engine.rows<{ file: string }>(
      "SELECT file FROM glob($pattern) ORDER BY file", `listing Parquet files under '${input}'`,
      { pattern: path.join(input, "**", "*.parquet") });
    if (rows.length === 0) {
      throw new TailsiftError("input_is_directory", `'${input}' is a folder with no .parquet files; give files or a glob such as '${path.join(input, "*.csv")}'`);
    }
    return rows.map((r) => r.file);
  }
  return [input];
}

/** A cheap identity of the inputs: SHA-256 over each file's name, size and first/last 64 KiB. */
export function fingerprintFiles(files: readonly string[]): string {
  const hash = createHash("sha256");
  for (const file of files) {
    const size = fs.statSync(file).size;
    hash.update(`${path.basename(file)}\u0000${size}\u0000`);
    const fd = fs.openSync(file, "r");
    try {
      const len = Math.min(size, 65536);
      const head = Buffer.alloc(len);
      fs.readSync(fd, head, 0, len, 0);
      hash.update(head);
      const tail = Buffer.alloc(len);
      fs.readSync(fd, tail, 0, len, Math.max(0, size - len));
      hash.update(tail);
    } finally {
      fs.closeSync(fd);
    }
  }
  return `sha256:${hash.digest("hex").slice(0, 32)}`;
}

function readerSql(format: InputFormat, files: readonly string[], options: SourceOptions): string {
  const list = quoteLiteralList(files);
  if (format === "parquet") return `read_parquet(${list}, union_by_name = true, hive_partitioning = true)`;
  if (format === "jsonl") {
    return `read_json(${list}, format = 'newline_delimited', union_by_name = true, ignore_errors = ${options.skipBadRows ? "true" : "false"})`;
  }
  const parts = [list, "header = true", "all_varchar = true", "union_by_name = true"];
  const delimiter = options.delimiter ?? (format === "tsv" ? "\t" : undefined);
  if (delimiter !== undefined) parts.push(`delim = ${quoteLiteral(delimiter)}`);
  if (options.encoding !== undefined) parts.push(`encoding = ${quoteLiteral(normaliseEncoding(options.encoding))}`);
  if (options.skipBadRows) parts.push("ignore_errors = true");
  return `read_csv(${parts.join(", ")})`;
}

function normaliseEncoding(encoding: string): string {
  const e = encoding.toLowerCase().replace(/[_\s]/g, "-");
  if (e === "utf8" || e === "utf-8") return "utf-8";
  if (e === "latin1" || e === "latin-1" || e === "iso-8859-1") return "latin-1";
  if (e === "utf16" || e === "utf-16") return "utf-16";
  throw new TailsiftError("bad_option", `--encoding '${encoding}' is not supported; use utf-8, latin-1 or utf-16`);
}

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
  let bytes = 0;
  for (const file of files) {
    const size = fs.statSync(file).size;
    if (size === 0) throw new TailsiftError("empty_input", `input '${file}' is empty`);
    bytes += size;
  }
  const reader = readerSql(format, files, options);
  const described = await engine.rows<{ column_name: string; column_type: string }>(
    `DESCRIBE SELECT * FROM ${reader}`, `reading the header of ${describeFiles(files)}`);
  const columns = described.map((r) => r.column_name);
  if (columns.length === 0) throw new TailsiftError("empty_input", `no columns found in ${describeFiles(files)}`);
  const emptyName = columns.find((c) => c.trim() === "");
  if (emptyName !== undefined) throw new TailsiftError("empty_column_name", `${describeFiles(files)} has a column with an empty name; give every column a header`);
  const select = columns.map((c) => `CAST(${quoteIdent(c)} AS VARCHAR) AS ${quoteIdent(c)}`).join(", ");
  await engine.run(`CREATE OR REPLACE TEMP VIEW tailsift_src AS SELECT ${select} FROM ${reader}`, "creating the input view");
  return { files, format, bytes, columns, fingerprint: fingerprintFiles(files), view: "tailsift_src" };
}

export function describeFiles(files: readonly string[]): string {
  if (files.length === 1) return `'${files[0]}'`;
  return `${files.length} files ('${files[0]}' …)`;
}
