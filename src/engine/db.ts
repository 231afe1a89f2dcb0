/**
 * Opens one DuckDB instance per command, with the settings every run needs: bounded threads and
 * memory, a temp directory for spilling that is not the user's working folder, no extension
 * auto-install/auto-load (there is no network, and parquet/json are built in), and, when the
 * caller names them, file access limited to the inputs, the output folder and the temp folder.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { DuckDBInstance, type DuckDBConnection, type DuckDBValue } from "@duckdb/node-api";
import { throwIfAborted } from "../runState.js";
import { TailsiftError, wrapEngineError } from "../errors.js";
import { quoteLiteral, quoteLiteralList } from "./sql.js";

export interface EngineOptions {
  /** DuckDB memory limit, e.g. "2GB". Default: defaultMemoryLimit() (a quarter of RAM, 2–16 GiB). */
  memoryLimit?: string;
  threads?: number;
  /** Where DuckDB spills; default the OS temp folder. */
  tempDir?: string;
  /**
   * Limit DuckDB's file access to these paths (plus the temp folder): input files, globs (their
   * fixed leading folder is allowed), input folders, and output FOLDERS (outputs are written to a
   * temp file beside the destination, so give the folder, not the file). After the engine opens,
   * any other path fails with code `path_not_allowed`, and extensions cannot be loaded.
   * Absent: no limit (DuckDB's default).
   */
  lockToPaths?: readonly string[];
}

export interface Engine {
  readonly connection: DuckDBConnection;
  /** Runs a statement, wrapping engine errors with `doing`. */
  run(sql: string, doing: string, params?: Record<string, DuckDBValue>): Promise<void>;
  /** Runs a query and returns rows as plain objects; BIGINT/HUGEINT become numbers. */
  rows<T = Record<string, unknown>>(sql: string, doing: string, params?: Record<string, DuckDBValue>): Promise<T[]>;
  /** Query progress 0..100, or -1 when unknown. */
  progress(): { percentage: number; rowsProcessed: number; totalRows: number };
  interrupt(): void;
  close(): void;
}

/**
 * The default memory limit: a quarter of the machine's memory (the share JVMs take for their
 * default heap: common practice), at least 2 GiB and at most 16 GiB, never more than 60 % of it
 * (nor less than 256 MiB). DuckDB spills to the temp directory beyond it; --memory-limit changes it.
 * Measured on a 24 GiB, 2-core machine (bench/README.md, 2026-12-04): the earlier 60 % kept every
 * table resident (a 30M-row CSV scan peaked at 10.4 GB); 2 GiB held that scan to 2.7 GB for 22 %
 * more time, but the 10M-row scans, which peak at 2.9–4.8 GB, spilled: scan/bare 2.91 / 3.51 /
 * 2.29 / 3.11× in the bench run with 2 GiB against 2.77 / 3.02 / 2.01 / 2.39× with a quarter (6 GiB
 * here), which leaves them resident and still bounds the largest inputs.
 */
export function defaultMemoryLimit(totalBytes = os.totalmem()): string {
  const total = totalBytes / 2 ** 20;
  const mb = Math.max(256, Math.min(0.6 * total, Math.max(2 * 1024, Math.min(16 * 1024, total / 4))));
  return `${Math.floor(mb)}MiB`;
}

const UNIT_BYTES: Record<string, number> = {
  b: 1, k: 1e3, kb: 1e3, m: 1e6, mb: 1e6, g: 1e9, gb: 1e9, t: 1e12, tb: 1e12,
  kib: 2 ** 10, mib: 2 ** 20, gib: 2 ** 30, tib: 2 ** 40,
};
/** The smallest memory limit accepted: below it DuckDB cannot even read a CSV buffer. */
export const MIN_MEMORY_BYTES = 64e6;
/** Above this DuckDB answers with its own parser error ("value is too large"). */
export const MAX_MEMORY_BYTES = 2 ** 50;

/**
 * Checks a --memory-limit text and returns it in DuckDB's form ("2GB", "512MiB"); "N%" is a
 * share of the machine's memory. DuckDB itself reads "-1GB" as no limit and "0GB" as nothing,
 * so both are refused here, as is anything below MIN_MEMORY_BYTES.
 * @throws TailsiftError `bad_option` naming --memory-limit.
 */
export function parseMemoryLimit(text: string): string {
  const bad = (why: string) => new TailsiftError("bad_option", `--memory-limit '${text}' ${why}; give a size such as 2GB, 512MB or 50%`);
  const m = /^\s*(\d+(?:\.\d+)?)\s*([a-z%]*)\s*$/i.exec(text);
  if (!m) throw bad("is not a size");
  const value = Number(m[1]);
  const unit = (m[2] ?? "").toLowerCase();
  let bytes: number;
  if (unit === "%") {
    if (!(value > 0 && value <= 100)) throw bad("is not a share from 1% to 100%");
    bytes = Math.floor((os.totalmem() * value) / 100);
  } else {
    const per = UNIT_BYTES[unit];
    if (per === undefined) throw bad(unit === "" ? "has no unit" : `has an unknown unit '${m[2]}'`);
    bytes = value * per;
  }
  if (bytes < MIN_MEMORY_BYTES) throw bad("is too small (at least 64MB)");
  if (!(bytes <= MAX_MEMORY_BYTES)) throw bad("is larger than any machine (at most 1PiB)");
  return `${Math.floor(bytes / 2 ** 20)}MiB`;
}

function checkThreads(threads: number): number {
  if (!Number.isInteger(threads) || threads < 1 || threads > 1024) {
    throw new TailsiftError("bad_option", `--threads must be a whole number from 1 to 1024 (got ${threads})`);
  }
  return threads;
}

/** The temp folder must be a writable folder, or creatable inside one: tested by making and removing a folder there. */
function checkTempDir(dir: string): void {
  let probe = path.resolve(dir);
  while (!fs.existsSync(probe) && path.dirname(probe) !== probe) probe = path.dirname(probe);
  try {
    fs.rmdirSync(fs.mkdtempSync(path.join(probe, ".tailsift-probe-")));
  } catch {
    throw new TailsiftError("bad_option", `--temp-dir '${dir}' is not a writable folder (cannot create a folder in '${probe}'); give a folder with free space`);
  }
}

const GLOB_CHARS = /[*?[{]/;

/** Folders and files DuckDB may touch for `entries`, in both the given and the real (symlink-free) spelling. */
export function allowedPaths(entries: readonly string[], tempDir: string): { directories: string[]; files: string[] } {
  const directories = new Set<string>();
  const files = new Set<string>();
  const spellings = (p: string) => {
    const abs = path.resolve(p);
    try {
      return [abs, fs.realpathSync(abs)];
    } catch {
      return [abs];
    }
  };
  const addDir = (d: string) => { for (const s of spellings(d)) directories.add(s.endsWith(path.sep) ? s : s + path.sep); };
  for (const entry of [...entries, tempDir]) {
    if (GLOB_CHARS.test(entry)) {
      const parts = path.resolve(entry).split(path.sep);
      const fixed = parts.slice(0, parts.findIndex((part) => GLOB_CHARS.test(part)));
      addDir(fixed.join(path.sep) || path.sep);
      continue;
    }
    let stat: fs.Stats | null = null;
    try { stat = fs.statSync(entry); } catch { stat = null; }
    if (stat?.isFile()) for (const s of spellings(entry)) files.add(s);
    else addDir(entry);
  }
  return { directories: [...directories], files: [...files] };
}

/** TAILSIFT_TRACE=1 prints each engine step and its wall time to stderr (for profiling). */
const trace = process.env.TAILSIFT_TRACE === "1";
function traceLine(doing: string, began: number): void {
  process.stderr.write(`[tailsift] ${String(Date.now() - began).padStart(6)} ms  ${doing}\n`);
}

function toPlain(value: unknown): unknown {
  if (typeof value === "bigint") return Number(value);
  return value;
}

function plainRow(row: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(row)) out[k] = toPlain(v);
  return out;
}

/**
 * Opens the engine. Options are checked before DuckDB starts (bad_option errors name the option).
 * @throws TailsiftError `bad_option` for a bad memory limit, thread count or temp folder.
 */
export async function openEngine(options: EngineOptions = {}): Promise<Engine> {
  const memoryLimit = options.memoryLimit === undefined ? defaultMemoryLimit() : parseMemoryLimit(options.memoryLimit);
  // below about 512 MB several threads each hold a hash table and the pass runs out of memory
  // instead of spilling; one thread spills (DESIGN engine notes; measured in bench/)
  const small = Number(/^(\d+)MiB$/.exec(memoryLimit)?.[1] ?? Infinity) < 512;
  const threads = checkThreads(options.threads ?? (small ? 1 : Math.max(1, os.availableParallelism())));
  if (options.tempDir !== undefined) checkTempDir(options.tempDir);
  const tempDir = options.tempDir ?? path.join(os.tmpdir(), `tailsift-spill-${process.pid}`);
  let instance: DuckDBInstance;
  try {
    instance = await DuckDBInstance.create(":memory:", {
      autoinstall_known_extensions: "false",
      autoload_known_extensions: "false",
    });
  } catch (err) {
    throw wrapEngineError(err, "starting DuckDB");
  }
  const connection = await instance.connect();
  const run = async (sql: string, doing: string, params?: Record<string, DuckDBValue>) => {
    throwIfAborted(doing); // a signal that came between queries (runState)
    const began = trace ? Date.now() : 0;
    try {
      await connection.run(sql, params);
    } catch (err) {
      throw wrapEngineError(err, doing);
    } finally {
      if (trace) traceLine(doing, began);
    }
  };
  try {
    await run(`SET threads = ${threads}`, "setting threads");
    await run(`SET memory_limit = ${quoteLiteral(memoryLimit)}`, `setting memory limit '${memoryLimit}'`);
    await run(`SET temp_directory = ${quoteLiteral(tempDir)}`, "setting the temp directory");
    await run("SET preserve_insertion_order = true", "setting insertion order");
    await run("SET enable_progress_bar = true; SET enable_progress_bar_print = false", "enabling progress");
    if (options.lockToPaths) {
      const allowed = allowedPaths(options.lockToPaths, tempDir);
      await run(`SET allowed_directories = ${quoteLiteralList(allowed.directories)}`, "limiting file access to the named folders");
      await run(`SET allowed_paths = ${quoteLiteralList(allowed.files)}`, "limiting file access to the named files");
      await run("SET enable_external_access = false", "turning off other file access");
    }
  } catch (err) {
    connection.closeSync();
    instance.closeSync();
    throw err;
  }

  return {
    connection,
    run,
    async rows<T>(sql: string, doing: string, params?: Record<string, DuckDBValue>): Promise<T[]> {
      throwIfAborted(doing);
      const began = trace ? Date.now() : 0;
      try {
        const reader = await connection.runAndReadAll(sql, params);
        return reader.getRowObjectsJS().map((r) => plainRow(r as Record<string, unknown>)) as T[];
      } catch (err) {
        throw wrapEngineError(err, doing);
      } finally {
        if (trace) traceLine(doing, began);
      }
    },
    progress() {
      const p = connection.progress;
      return {
        percentage: p.percentage,
        rowsProcessed: Number(p.rows_processed),
        totalRows: Number(p.total_rows_to_process),
      };
    },
    interrupt() {
      connection.interrupt();
    },
    close() {
      try {
        connection.closeSync();
      } finally {
        instance.closeSync();
      }
    },
  };
}

/** Opens an engine, runs `fn`, and always closes it. */
export async function withEngine<T>(options: EngineOptions, fn: (engine: Engine) => Promise<T>): Promise<T> {
  const engine = await openEngine(options);
  try {
    return await fn(engine);
  } finally {
    engine.close();
  }
}
