/**
 * engine/inputFiles: the user's inputs as a list of files — a file, a glob (expanded by DuckDB's
 * glob(), sorted) or a folder of Parquet files (hive-partitioned folders included) — the format
 * each file name implies, and the cheap fingerprint of the files that encode compares with the
 * plan's first (the content fingerprint, engine/contentFingerprint, decides).
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { TailsiftError } from "../errors.js";
import type { Engine } from "./db.js";

export type InputFormat = "csv" | "tsv" | "parquet" | "jsonl";

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

/** One input → its files (a glob or a Parquet folder expanded, sorted); refuses what matches nothing. */
export async function expand(engine: Engine, input: string): Promise<string[]> {
  if (GLOB_CHARS.test(input) && !fs.existsSync(input)) {
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
