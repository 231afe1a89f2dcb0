/**
 * Profiling aid (not used by the timed runs): preload with
 *   node --import ./bench/trace-hook.mjs dist/cli.js scan FILE ...
 * to print, on stderr, the wall time of every SQL statement the CLI sends to DuckDB (the first
 * 160 characters of each). It wraps DuckDBConnection.run / runAndReadAll / stream and logs only
 * the outermost call (runAndReadAll goes through run). With TRACE_SQL_FILE=FILE every statement
 * is also appended to FILE as one JSON line {ms, call, sql}, which bench/profile.mjs replays.
 */
import fs from "node:fs";
import { DuckDBConnection } from "@duckdb/node-api";

const sqlFile = process.env.TRACE_SQL_FILE;
const t0 = performance.now();
let depth = 0;

const wrap = (name) => {
  const original = DuckDBConnection.prototype[name];
  DuckDBConnection.prototype[name] = async function traced(sql, ...rest) {
    const start = performance.now();
    depth += 1;
    try {
      return await original.call(this, sql, ...rest);
    } finally {
      depth -= 1;
      if (depth === 0) {
        const ms = performance.now() - start;
        const text = String(sql).replace(/\s+/g, " ").slice(0, 160);
        process.stderr.write(`[trace] +${(start - t0).toFixed(0).padStart(6)} ms ${ms.toFixed(0).padStart(6)} ms ${name}: ${text}\n`);
        if (sqlFile) fs.appendFileSync(sqlFile, `${JSON.stringify({ ms: Math.round(ms), call: name, sql: String(sql) })}\n`);
      }
    }
  };
};
for (const name of ["run", "runAndReadAll", "stream"]) wrap(name);
process.on("exit", () => process.stderr.write(`[trace] exit at ${(performance.now() - t0).toFixed(0)} ms, maxRSS ${process.resourceUsage().maxRSS} KB\n`));
