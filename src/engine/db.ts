/**
 * Opens one DuckDB instance per command, with the settings every run needs: bounded threads and
 * memory, a temp directory for spilling that is not the user's working folder, and no extension
 * auto-install/auto-load (there is no network, and parquet/json are built in).
 */
import os from "node:os";
import path from "node:path";
import { DuckDBInstance, type DuckDBConnection, type DuckDBValue } from "@duckdb/node-api";
import { wrapEngineError } from "../errors.js";
import { quoteLiteral } from "./sql.js";

export interface EngineOptions {
  /** DuckDB memory limit, e.g. "2GB". Default: 60 % of the machine's memory, capped at 16 GB. */
  memoryLimit?: string;
  threads?: number;
  /** Where DuckDB spills; default the OS temp folder. */
  tempDir?: string;
}

export interface Engine {
  readonly connection: DuckDBConnection;
  /** Runs a statement, wrapping engine errors with `doing`. */
  run(sql: string, doing: string, params?: Record<string, DuckDBValue>): Promise<void>;
  /** Runs a query and returns rows as plain objects; BIGINT/HUGEINT become numbers. */
  rows<T = Record<string, unknown>>(sql: string, doing: string, params?: Record<string, DuckDBValue>): Promise<T[]>;
  /** Streams a query chunk by chunk (bounded memory). */
  stream(sql: string, doing: string, onRows: (rows: Record<string, unknown>[]) => void): Promise<void>;
  /** Query progress 0..100, or -1 when unknown. */
  progress(): { percentage: number; rowsProcessed: number; totalRows: number };
  interrupt(): void;
  close(): void;
}

/** The default memory limit: a safe share of the machine (60 %, at most 16 GB, at least 256 MB). */
export function defaultMemoryLimit(): string {
  const mb = Math.max(256, Math.min(16 * 1024, Math.floor((os.totalmem() / 2 ** 20) * 0.6)));
  return `${mb}MB`;
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

export async function openEngine(options: EngineOptions = {}): Promise<Engine> {
  const threads = options.threads ?? Math.max(1, os.availableParallelism());
  const memoryLimit = options.memoryLimit ?? defaultMemoryLimit();
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
    try {
      await connection.run(sql, params);
    } catch (err) {
      throw wrapEngineError(err, doing);
    }
  };
  await run(`SET threads = ${Math.max(1, Math.floor(threads))}`, "setting threads");
  await run(`SET memory_limit = ${quoteLiteral(memoryLimit)}`, `setting memory limit '${memoryLimit}'`);
  await run(`SET temp_directory = ${quoteLiteral(tempDir)}`, "setting the temp directory");
  await run("SET preserve_insertion_order = true", "setting insertion order");
  await run("SET enable_progress_bar = true; SET enable_progress_bar_print = false", "enabling progress");

  return {
    connection,
    run,
    async rows<T>(sql: string, doing: string, params?: Record<string, DuckDBValue>): Promise<T[]> {
      try {
        const reader = await connection.runAndReadAll(sql, params);
        return reader.getRowObjectsJS().map((r) => plainRow(r as Record<string, unknown>)) as T[];
      } catch (err) {
        throw wrapEngineError(err, doing);
      }
    },
    async stream(sql, doing, onRows) {
      try {
        const result = await connection.stream(sql);
        for await (const batch of result.yieldRowObjectJs()) {
          onRows(batch.map((r) => plainRow(r as Record<string, unknown>)));
        }
      } catch (err) {
        throw wrapEngineError(err, doing);
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
