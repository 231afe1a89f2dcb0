/**
 * The one error type tailsift raises for problems a user can fix: bad options, unreadable or
 * unusable input, a plan that does not match the data. `code` is stable (tests and scripts may
 * match on it); `exitCode` is what the CLI exits with (2 for bad usage or input).
 * Only src/cli.ts prints these and exits.
 */
export class TailsiftError extends Error {
  readonly code: string;
  readonly exitCode: number;

  constructor(code: string, message: string, exitCode = 2, options?: { cause?: unknown }) {
    super(message, options);
    this.name = "TailsiftError";
    this.code = code;
    this.exitCode = exitCode;
  }
}

/** True when `err` is a TailsiftError (also across module copies). */
export function isTailsiftError(err: unknown): err is TailsiftError {
  return err instanceof TailsiftError || (err instanceof Error && err.name === "TailsiftError" && "code" in err);
}

/** The first line of an engine error, without DuckDB's multi-line context (at most 300 characters). */
export function firstLine(err: unknown): string {
  const text = err instanceof Error ? err.message : String(err);
  const line = (text.split("\n").find((l) => l.trim() !== "") ?? text).trim();
  return line.length > 300 ? `${line.slice(0, 299)}…` : line;
}

/** What went wrong, read from a DuckDB message: a stable code and the user-facing line. */
interface Diagnosis { code: string; message: string }

const MiB = 2 ** 20;

/**
 * Reads a DuckDB error message and says what happened in one line: which file, which line (as
 * DuckDB counts it: the header is line 1, a quoted newline does not start a new line) and what
 * to do. `where` names the input when DuckDB does not ("'x.csv'"). Null when the message is
 * not one we recognise. Never copies DuckDB's "Original Line" (it may be megabytes long).
 */
export function diagnoseEngineMessage(text: string, where?: string): Diagnosis | null {
  const detailFile = /^\s*file = (.+)$/m.exec(text)?.[1]?.trim();
  const quotedFile = /(?:in file|file) "([^"]+)"/.exec(text)?.[1];
  const file = detailFile ? `'${detailFile}'` : quotedFile ? `'${quotedFile}'` : where ?? "the input";
  const csvLine = /CSV Error on Line: (\d+)/.exec(text)?.[1];
  const at = csvLine !== undefined ? ` line ${csvLine}` : "";
  const fields = /Expected Number of Columns: (\d+) Found: (\d+)/.exec(text);
  if (fields) {
    return { code: "bad_row", message: `cannot read ${file}${at}: expected ${fields[1]} fields, found ${fields[2]}; fix the row or pass --skip-bad-rows` };
  }
  if (/unterminated quote/i.test(text)) {
    return { code: "bad_row", message: `cannot read ${file}${at}: a quoted field is never closed; fix the quoting or pass --skip-bad-rows` };
  }
  if (/Invalid unicode|not utf-8 encoded/i.test(text)) {
    return { code: "bad_encoding", message: `cannot read ${file}: it is not UTF-8 text (invalid bytes near${at || " the start"}); pass --encoding latin-1 (or utf-16) if the file uses that encoding` };
  }
  const notEncoded = /File is not ([\w-]+) encoded/i.exec(text);
  if (notEncoded) {
    return { code: "bad_encoding", message: `cannot read ${file}: it is not ${notEncoded[1]} text; give the file's encoding with --encoding (utf-8, latin-1 or utf-16)` };
  }
  const long = /Maximum line size of (\d+) bytes exceeded\. Actual Size:\s*(\d+)/.exec(text);
  if (long) {
    const mib = (n: string) => `${(Number(n) / MiB).toFixed(1)} MiB`;
    return { code: "line_too_long", message: `cannot read ${file} near${at || " the start"}: a line of ${mib(long[2] ?? "0")} is longer than the ${mib(long[1] ?? "0")} tailsift reads; shorten or split that field` };
  }
  if (/Error when sniffing file|not possible to automatically detect the CSV/i.test(text)) {
    return { code: "unreadable_csv", message: `cannot read ${file}: no consistent CSV layout found (lines differ in delimiter, quoting, field count or line ending, or it is not CSV text); check the file, or give --delimiter` };
  }
  const json = /Malformed JSON in file "[^"]*", at byte \d+ in line (\d+): ([^\n.]*)/.exec(text);
  if (json) {
    return { code: "bad_row", message: `cannot read ${file} line ${json[1]}: malformed JSON (${json[2]}); fix that line` };
  }
  if (/No magic bytes found at end of file/.test(text)) {
    const parquet = /end of file '([^']+)'/.exec(text)?.[1];
    return { code: "unreadable_parquet", message: `cannot read ${parquet ? `'${parquet}'` : file}: not a Parquet file (no Parquet footer); check the file and its extension` };
  }
  const denied = /Permission Error: Cannot access (?:file|directory) "([^"]*)"/.exec(text);
  if (denied) {
    return { code: "path_not_allowed", message: `'${denied[1]}' is outside the files and folders this command may use (DuckDB is limited to the inputs, the output folder and the temp folder)` };
  }
  const io = /IO Error: (?:Cannot open file|Could not open file) "([^"]+)": (.*)/.exec(text);
  if (io) return { code: "input_unreadable", message: `cannot open '${io[1]}': ${(io[2] ?? "").trim().toLowerCase()}; check that it exists and is readable` };
  if (/Out of Memory Error/.test(text)) {
    const limit = /\(([^/()]+)\/([^/()]+) used\)/.exec(text)?.[2];
    return { code: "out_of_memory", message: `ran out of memory${limit ? ` (limit ${limit.trim()})` : ""}; raise --memory-limit, use --threads 1, give --temp-dir a folder with free space, or measure fewer columns with --columns` };
  }
  return null;
}

/**
 * Wraps an engine (DuckDB) error with what we were doing, keeping the original as `cause`.
 * Interrupts pass through as `interrupted` so the CLI can exit 130/143. Input errors DuckDB
 * reports (bad rows, encodings, line sizes, file formats) become one line naming the file,
 * the line where DuckDB gives one, and what to do; `where` names the input for messages in
 * which DuckDB leaves the file out.
 */
export function wrapEngineError(err: unknown, doing: string, where?: string): TailsiftError {
  if (isTailsiftError(err)) return err;
  const text = err instanceof Error ? err.message : String(err);
  const line = firstLine(err);
  if (/INTERRUPT/i.test(line)) {
    return new TailsiftError("interrupted", `interrupted while ${doing}`, 130, { cause: err });
  }
  const diagnosis = diagnoseEngineMessage(text, where);
  if (diagnosis) {
    const message = diagnosis.code === "out_of_memory" ? `${doing}: ${diagnosis.message}` : diagnosis.message;
    return new TailsiftError(diagnosis.code, message, 2, { cause: err });
  }
  return new TailsiftError("engine", `${doing} failed: ${line}`, 2, { cause: err });
}
