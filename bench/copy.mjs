#!/usr/bin/env node
/**
 * The reference for `encode`: DuckDB's own CSV → Parquet conversion of the same file,
 *   COPY (SELECT * FROM read_csv(FILE)) TO OUT (FORMAT parquet)
 * run through @duckdb/node-api (so it pays Node's start-up like the CLI) with the CLI's default
 * engine settings (threads = cores, memory limit: the CLI's defaultMemoryLimit(), imported from dist/).
 *
 *   node bench/copy.mjs FILE OUT.parquet
 */
import os from "node:os";
import path from "node:path";
import { DuckDBInstance } from "@duckdb/node-api";
import { defaultMemoryLimit } from "../dist/engine/db.js";

const [file, out] = process.argv.slice(2);
if (!file || !out) {
  process.stderr.write("usage: node bench/copy.mjs FILE OUT.parquet\n");
  process.exit(2);
}
const lit = (text) => `'${text.replaceAll("'", "''")}'`;
const instance = await DuckDBInstance.create(":memory:", { autoinstall_known_extensions: "false", autoload_known_extensions: "false" });
const con = await instance.connect();
await con.run(`SET threads = ${os.availableParallelism()}`);
await con.run(`SET memory_limit = ${lit(defaultMemoryLimit())}`);
await con.run(`SET temp_directory = ${lit(path.join(os.tmpdir(), `bench-copy-${process.pid}`))}`);
await con.run(`COPY (SELECT * FROM read_csv(${lit(file)})) TO ${lit(out)} (FORMAT parquet)`);
con.closeSync();
instance.closeSync();
