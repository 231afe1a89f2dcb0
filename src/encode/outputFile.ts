/**
 * encode/outputFile: the output's format (chosen by the file extension) and the atomic commit of
 * a folder. Files are written to a temporary path beside the destination and renamed into place
 * (commands/output.ts); an interrupted run removes its temporaries and leaves nothing behind.
 */
import fs from "node:fs";
import { TailsiftError } from "../errors.js";

export interface OutputFormat {
  format: "parquet" | "csv";
  /** The options of DuckDB's COPY … TO (explicit: the temporary file has no telling extension). */
  copyOptions: string;
}

/**
 * Parquet for .parquet/.pq (zstd), CSV with a header for .csv, tab-separated for .tsv; a further
 * .gz compresses CSV/TSV with gzip.
 * @throws TailsiftError `bad_output` for any other extension.
 */
export function outputFormat(out: string): OutputFormat {
  const lower = out.toLowerCase();
  if (lower.endsWith(".parquet") || lower.endsWith(".pq")) return { format: "parquet", copyOptions: "FORMAT parquet, COMPRESSION zstd" };
  const gz = lower.endsWith(".gz");
  const base = gz ? lower.slice(0, -3) : lower;
  const compression = gz ? ", COMPRESSION gzip" : "";
  if (base.endsWith(".csv")) return { format: "csv", copyOptions: `FORMAT csv, HEADER true${compression}` };
  if (base.endsWith(".tsv")) return { format: "csv", copyOptions: `FORMAT csv, HEADER true, DELIMITER '\t'${compression}` };
  throw new TailsiftError("bad_output", `--out '${out}': the extension decides the format — use .parquet, .csv, .tsv, .csv.gz or .tsv.gz`);
}

/** The folder of mapping files written beside `out`. */
export const mappingsDirFor = (out: string): string => `${out}.mappings`;

/**
 * Renames the finished folder `tmpDir` to `dest`, replacing an older `dest` (moved aside first,
 * then removed), so `dest` is never a mix of two runs.
 */
export function commitDir(tmpDir: string, dest: string): void {
  const old = `${tmpDir}.old`;
  const hadOld = fs.existsSync(dest);
  try {
    if (hadOld) fs.renameSync(dest, old);
    fs.renameSync(tmpDir, dest);
  } catch (err) {
    throw new TailsiftError("output_unwritable", `cannot write '${dest}': ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
  } finally {
    fs.rmSync(old, { recursive: true, force: true });
  }
}

/** Renames a finished temporary file into place, as a TailsiftError when it cannot. */
export function commitFile(tmp: string, dest: string): void {
  try {
    fs.renameSync(tmp, dest);
  } catch (err) {
    throw new TailsiftError("output_unwritable", `cannot write '${dest}': ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
  }
}
