#!/usr/bin/env node
/**
 * The "bare engine" side of the benchmark: the query a DuckDB expert would hand-write to get what
 * the scan's pass gets — per categorical column, per level and per fold: rows, rows with a target
 * and the target sum — run through @duckdb/node-api so that it pays Node's start-up like the CLI.
 *
 *   node bench/bare.mjs FILE --target COL --columns a,b,c [--identity all,cols,in,file,order]
 *        [--mode grouping|percolumn] [--seed 42] [--folds 5] [--memory-limit 14GB] [--threads N]
 *
 * --mode grouping  : one GROUP BY GROUPING SETS ((c1, fold), …, (fold)) reading the file once.
 * --mode percolumn : one GROUP BY (level, fold) per column, each reading the file (for Parquet,
 *                    whose column reader makes re-reads cheap).
 * --mode unpivot   : for wide files: UNPIVOT INCLUDE NULLS every column but the target into
 *                    (column, level) and one GROUP BY (column, level) with count and target sum —
 *                    no fold (what a DuckDB user types to count every column's levels).
 *                    `--columns '*'` means every column except the target.
 * The fold is DuckDB's hash(seed, every column of the row) % folds, like the scan's fold, so both
 * sides do the same hashing work. The result is kept in a temp table (as the scan keeps its level
 * table) and only its row count crosses into JavaScript; it is printed on stdout as JSON.
 * Engine settings mirror the CLI's defaults (threads = cores, the memory limit of the CLI's
 * defaultMemoryLimit(), imported from dist/, a temp directory, no extension auto-loading) plus preserve_insertion_order = false, which
 * an expert sets for an aggregate whose row order means nothing (--keep-order leaves it on).
 */
import os from "node:os";
import path from "node:path";
import { parseArgs } from "node:util";
import { DuckDBInstance } from "@duckdb/node-api";
import { defaultMemoryLimit } from "../dist/engine/db.js";

const { values, positionals } = parseArgs({
  allowPositionals: true,
  options: {
    target: { type: "string" },
    columns: { type: "string" },
    identity: { type: "string" },
    mode: { type: "string", default: "grouping" },
    seed: { type: "string", default: "42" },
    folds: { type: "string", default: "5" },
    "memory-limit": { type: "string" },
    threads: { type: "string" },
    "temp-dir": { type: "string" },
    "keep-order": { type: "boolean", default: false },
  },
});

const file = positionals[0];
if (!file || !values.target || !values.columns) {
  process.stderr.write("usage: node bench/bare.mjs FILE --target COL --columns a,b,c [--mode grouping|percolumn]\n");
  process.exit(2);
}
const q = (name) => `"${name.replaceAll('"', '""')}"`;
const lit = (text) => `'${text.replaceAll("'", "''")}'`;
const columns = values.columns.split(",");
const isParquet = /\.(parquet|pq)$/i.test(file);
const reader = isParquet ? `read_parquet(${lit(file)})` : `read_csv(${lit(file)}, header = true, all_varchar = true)`;

const instance = await DuckDBInstance.create(":memory:", {
  autoinstall_known_extensions: "false",
  autoload_known_extensions: "false",
});
const con = await instance.connect();
await con.run(`SET threads = ${Number(values.threads ?? os.availableParallelism())}`);
await con.run(`SET memory_limit = ${lit(values["memory-limit"] ?? defaultMemoryLimit())}`);
await con.run(`SET temp_directory = ${lit(values["temp-dir"] ?? path.join(os.tmpdir(), `bench-bare-${process.pid}`))}`);
// An expert lets DuckDB drop row order: the level table has no meaningful order (--keep-order to compare).
await con.run(`SET preserve_insertion_order = ${values["keep-order"] ? "true" : "false"}`);

// The row identity for the fold hash: every column in file order (the expert would spell them out).
let identity = values.identity?.split(",");
if (!identity) {
  const described = await con.runAndReadAll(`DESCRIBE SELECT * FROM ${reader}`);
  identity = described.getRowObjectsJS().map((r) => String(r.column_name));
}
const fold = `hash(${Number(values.seed)}::BIGINT, ${identity.map(q).join(", ")}) % ${Number(values.folds)}`;
const y = `TRY_CAST(${q(values.target)} AS DOUBLE)`;

const started = performance.now();
if (values.mode === "unpivot") {
  const all = values.columns === "*" ? identity.filter((c) => c !== values.target) : columns;
  await con.run(`CREATE TEMP TABLE bare_levels AS
    SELECT name AS col, value AS level, count(*) AS rows, count(__y) AS n_y, sum(__y) AS sum_y
    FROM (SELECT ${y} AS __y, ${all.map((c) => `${q(c)}::VARCHAR AS ${q(c)}`).join(", ")} FROM ${reader})
      UNPIVOT INCLUDE NULLS (value FOR name IN (${all.map(q).join(", ")}))
    GROUP BY name, value`);
} else if (values.mode === "percolumn") {
  await con.run(`CREATE TEMP TABLE bare_levels (col INTEGER, level VARCHAR, fold INTEGER, rows BIGINT, n_y BIGINT, sum_y DOUBLE)`);
  for (const [i, c] of columns.entries()) {
    await con.run(`INSERT INTO bare_levels
      SELECT ${i}, level, fold, count(*), count(y), sum(y)
      FROM (SELECT ${q(c)}::VARCHAR AS level, (${fold})::INTEGER AS fold, ${y} AS y FROM ${reader})
      GROUP BY level, fold`);
  }
} else {
  const inner = columns.map((c, i) => `${q(c)}::VARCHAR AS v${i}`).join(", ");
  const sets = [...columns.map((_, i) => `(v${i}, fold)`), "(fold)"].join(", ");
  const which = `CASE ${columns.map((_, i) => `WHEN GROUPING(v${i}) = 0 THEN ${i}`).join(" ")} ELSE -1 END`;
  await con.run(`CREATE TEMP TABLE bare_levels AS
    SELECT (${which})::INTEGER AS col, COALESCE(${columns.map((_, i) => `v${i}`).join(", ")}) AS level, fold,
           count(*) AS rows, count(y) AS n_y, sum(y) AS sum_y
    FROM (SELECT (${fold})::INTEGER AS fold, ${y} AS y, ${inner} FROM ${reader})
    GROUP BY GROUPING SETS (${sets})`);
}
const first = values.mode === "unpivot" ? "(SELECT min(col) FROM bare_levels)" : "0";
const reader2 = await con.runAndReadAll(`SELECT count(*)::DOUBLE AS n, sum(rows) FILTER (WHERE col = ${first})::DOUBLE AS total FROM bare_levels`);
const [row] = reader2.getRowObjectsJS();
process.stdout.write(`${JSON.stringify({ mode: values.mode, levelRows: row?.n, rows: row?.total, queryMs: Math.round(performance.now() - started) })}\n`);
con.closeSync();
instance.closeSync();
