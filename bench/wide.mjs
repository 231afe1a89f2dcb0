#!/usr/bin/env node
/**
 * The wide table of the benchmark (invented data), generated inside DuckDB from range(N):
 *
 *   node bench/wide.mjs --rows 10000 --cols 1500 --seed S --out FILE.csv [--threads T]
 *
 * Columns f0000 … f(C-1), by j mod 20 (every value from DuckDB's seeded 64-bit hash of (seed, row, j)):
 *   0, 10            constants ('on')
 *   1–6              indicators '0'/'1', share of ones 2 %–50 % depending on j
 *   7–9, 11–13       small counts 0 … 2 + j mod 6, skewed towards 0
 *   14               hundred-level codes 'R0' … 'R(99 + j mod 400)', uniform
 *   15               a numeric measurement (two decimals; the scan counts it as numeric)
 *   16, 17           indicators with 5 % empty fields (missing)
 *   18, 19           short text codes 'A' … 'E'
 * and a binary target y = Bernoulli(0.2 + 0.3·[f0001 = '1'] + 0.2·[f0014 in the first 20 codes]).
 * The same arguments give the same file; it is written to FILE.tmp-PID and renamed when complete.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { parseArgs } from "node:util";
import { DuckDBInstance } from "@duckdb/node-api";

export const wideName = (j) => `f${String(j).padStart(4, "0")}`;

/** The SELECT that produces the wide table. */
export function wideSql(rows, cols, seed) {
  const s = Math.trunc(seed);
  const u = (j) => `((hash(${s}::BIGINT, i, ${j}) >> 11)::DOUBLE / 9007199254740992.0)`;
  const expr = (j) => {
    switch (j % 20) {
      case 0: case 10: return `'on'`;
      case 1: case 2: case 3: case 4: case 5: case 6: return `(${u(j)} < ${(0.02 + 0.48 * ((j * 7919) % 97) / 96).toFixed(4)})::INTEGER::VARCHAR`;
      case 7: case 8: case 9: case 11: case 12: case 13: return `floor(pow(${u(j)}, 2) * ${3 + (j % 6)})::INTEGER::VARCHAR`;
      case 14: return `'R' || floor(${u(j)} * ${100 + (j % 400)})::INTEGER::VARCHAR`;
      case 15: return `round(${u(j)} * 1000, 2)::VARCHAR`;
      case 16: case 17: return `CASE WHEN ${u(j + 100000)} < 0.05 THEN NULL ELSE (${u(j)} < 0.3)::INTEGER::VARCHAR END`;
      default: return `chr(65 + floor(${u(j)} * 5)::INTEGER)`;
    }
  };
  const list = Array.from({ length: cols }, (_, j) => `${expr(j)} AS ${wideName(j)}`);
  return `SELECT ${list.join(",\n  ")},
  (${u(-1)} < 0.2 + 0.3 * ((${u(1)} < ${(0.02 + 0.48 * ((7919) % 97) / 96).toFixed(4)})::INTEGER)
     + 0.2 * (floor(${u(14)} * ${100 + 14})::INTEGER < 20)::INTEGER)::INTEGER AS y
FROM range(${Math.trunc(rows)}) t(i) ORDER BY i`;
}

async function main() {
  const { values } = parseArgs({
    options: { rows: { type: "string", default: "10000" }, cols: { type: "string", default: "1500" }, seed: { type: "string", default: "20250630" },
      out: { type: "string" }, threads: { type: "string" } },
  });
  const rows = Number(values.rows);
  const cols = Number(values.cols);
  const seed = Number(values.seed);
  if (!Number.isInteger(rows) || rows < 10 || !Number.isInteger(cols) || cols < 20 || !Number.isInteger(seed) || !values.out?.endsWith(".csv")) {
    process.stderr.write("usage: node bench/wide.mjs --rows N (>= 10) --cols C (>= 20) --seed S --out FILE.csv\n");
    process.exit(2);
  }
  const out = path.resolve(values.out);
  const tmp = `${out}.tmp-${process.pid}`;
  const instance = await DuckDBInstance.create(":memory:", { autoinstall_known_extensions: "false", autoload_known_extensions: "false" });
  const con = await instance.connect();
  await con.run(`SET threads = ${Number(values.threads ?? os.availableParallelism())}`);
  try {
    await con.run(`COPY (${wideSql(rows, cols, seed)}) TO '${tmp.replaceAll("'", "''")}' (FORMAT csv, HEADER true)`);
    fs.renameSync(tmp, out);
  } catch (err) {
    fs.rmSync(tmp, { force: true });
    throw err;
  } finally {
    con.closeSync();
    instance.closeSync();
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(new URL(import.meta.url).pathname)) {
  await main();
}
