#!/usr/bin/env node
/**
 * The synthetic stress table of the benchmark, generated inside DuckDB from range(N) with a seeded
 * hash (no JavaScript per row, so 10M rows take seconds, not minutes):
 *
 *   node bench/stress.mjs --rows N --seed S --out FILE.csv|FILE.parquet [--threads T]
 *
 * Columns (all levels are text such as "L417", so none looks numeric):
 *   c01 … c11  uniform categorical columns whose level counts grow geometrically from 3 to N/2
 *              (3, 9, 27, … for 1M rows: 3 … 500,000); c05 is missing (NULL) on ~3 % of rows.
 *   tail       a Zipf-skewed long tail: rank k = floor((1 + u·((M+1)^(1−s) − 1))^(1/(1−s))), the
 *              inverse CDF of the continuous power law on [1, M+1) with s = 1.1 and M = N/2 —
 *              a few levels hold most rows and most levels are seen once or twice.
 *   y          binary target, Bernoulli(sigmoid(−1.5 + 1.2·e(c01) + 0.8·e(c03) + 0.6·e(tail))),
 *              where e(·) is a fixed per-level effect in [−1, 1) drawn from the same seeded hash.
 *   y_cont     continuous target: 10 + 3·e(c02) + 2·e(c04) + N(0, 1) noise (Box–Muller), 2 decimals.
 * Every uniform u is (hash(seed, row, tag) >> 11) / 2^53: DuckDB's 64-bit hash, top 53 bits.
 * The same arguments give the same rows (the row order is range order). The Parquet file keeps
 * y as INTEGER and y_cont as DOUBLE; the CSV is the same rows as text.
 * The file is written to FILE.tmp-PID and renamed into place when complete.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { parseArgs } from "node:util";
import { DuckDBInstance } from "@duckdb/node-api";

/** Level counts of c01 … c11: geometric from 3 to N/2 (at least 3 each). */
export function stressLevelCounts(rows) {
  const top = Math.max(3, Math.floor(rows / 2));
  return Array.from({ length: 11 }, (_, k) => Math.max(3, Math.round(3 * (top / 3) ** (k / 10))));
}

/** The SELECT that produces the stress table for `rows` rows and `seed`. */
export function stressSql(rows, seed) {
  const s = Math.trunc(seed);
  const u = (tag) => `((hash(${s}::BIGINT, i, '${tag}') >> 11)::DOUBLE / 9007199254740992.0)`;
  const effect = (col) => `((hash(${s}::BIGINT, 'effect-${col}', ${col}) >> 11)::DOUBLE / 4503599627370496.0 - 1.0)`;
  const counts = stressLevelCounts(rows);
  const m = Math.max(3, Math.floor(rows / 2));
  const zipf = `floor(pow(1 + ${u("tail")} * (pow(${m + 1}::DOUBLE, -0.1) - 1), -10.0))::BIGINT`;
  const cols = counts.map((n, k) => {
    const name = `c${String(k + 1).padStart(2, "0")}`;
    const value = `'L' || (hash(${s}::BIGINT, i, '${name}') % ${n})::VARCHAR`;
    return name === "c05" ? `CASE WHEN ${u("miss")} < 0.03 THEN NULL ELSE ${value} END AS ${name}` : `${value} AS ${name}`;
  });
  return `WITH base AS (
  SELECT i, ${cols.join(",\n    ")},
    'L' || least(${zipf}, ${m})::VARCHAR AS tail,
    ${u("y")} AS uy, ${u("n1")} AS un1, ${u("n2")} AS un2
  FROM range(${Math.trunc(rows)}) t(i))
SELECT c01, c02, c03, c04, c05, c06, c07, c08, c09, c10, c11, tail,
  (uy < 1 / (1 + exp(-(-1.5 + 1.2 * ${effect("c01")} + 0.8 * ${effect("c03")} + 0.6 * ${effect("tail")}))))::INTEGER AS y,
  round(10 + 3 * ${effect("c02")} + 2 * ${effect("c04")}
        + sqrt(-2 * ln(greatest(un1, 1e-300))) * cos(2 * pi() * un2), 2) AS y_cont
FROM base ORDER BY i`;
}

async function main() {
  const { values } = parseArgs({
    options: { rows: { type: "string" }, seed: { type: "string", default: "20250630" }, out: { type: "string" }, threads: { type: "string" } },
  });
  const rows = Number(values.rows);
  const seed = Number(values.seed);
  if (!Number.isInteger(rows) || rows < 10 || !Number.isInteger(seed) || !values.out || !/\.(csv|parquet)$/.test(values.out)) {
    process.stderr.write("usage: node bench/stress.mjs --rows N (>= 10) --seed S --out FILE.csv|FILE.parquet\n");
    process.exit(2);
  }
  const out = path.resolve(values.out);
  const tmp = `${out}.tmp-${process.pid}`;
  const instance = await DuckDBInstance.create(":memory:", { autoinstall_known_extensions: "false", autoload_known_extensions: "false" });
  const con = await instance.connect();
  await con.run(`SET threads = ${Number(values.threads ?? os.availableParallelism())}`);
  await con.run(`SET temp_directory = '${path.join(os.tmpdir(), `bench-stress-${process.pid}`)}'`);
  const format = out.endsWith(".csv") ? "FORMAT csv, HEADER true" : "FORMAT parquet";
  try {
    await con.run(`COPY (${stressSql(rows, seed)}) TO '${tmp.replaceAll("'", "''")}' (${format})`);
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
