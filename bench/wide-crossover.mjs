#!/usr/bin/env node
/**
 * Where the wide (unnest) pass overtakes the GROUPING SETS pass: times the level pass alone
 * (src/engine/aggregate.ts buildLevelTable, forced with TAILSIFT_PASS=grouping|wide) on the wide
 * table of bench/wide.mjs held in a DuckDB table, so no CSV reading or sniffing is in the figure.
 *
 *   npm run build && node bench/wide-crossover.mjs [--rows 10000,100000] [--cols 20,50,100,200,400] [--runs 2] [--threads N]
 *
 * Prints one line per shape: median ms of each pass, and grouping/wide. Runs alternate
 * (grouping, wide, grouping, …) so load from other work hits both alike.
 */
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { parseArgs } from "node:util";
import { wideName, wideSql } from "./wide.mjs";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const dist = (p) => pathToFileURL(path.join(ROOT, "dist", p)).href;
const { openEngine } = await import(dist("engine/db.js"));
const { buildLevelTable } = await import(dist("engine/aggregate.js"));

const { values } = parseArgs({ options: {
  rows: { type: "string", default: "10000,100000" }, cols: { type: "string", default: "20,50,100,200,400" },
  runs: { type: "string", default: "2" }, threads: { type: "string" }, seed: { type: "string", default: "20250630" },
} });
const list = (t) => t.split(",").map(Number);
const median = (xs) => { const v = [...xs].sort((a, b) => a - b); const m = Math.floor(v.length / 2); return v.length % 2 ? v[m] : (v[m - 1] + v[m]) / 2; };

for (const rows of list(values.rows)) {
  for (const cols of list(values.cols)) {
    const engine = await openEngine(values.threads ? { threads: Number(values.threads) } : {});
    try {
      await engine.run("SET preserve_insertion_order = false", "configuring");
      await engine.run(`CREATE TEMP TABLE wide_src AS ${wideSql(rows, cols, Number(values.seed))}`, "generating");
      await engine.run("CREATE TEMP VIEW wide_v AS SELECT * REPLACE (y::VARCHAR AS y) FROM wide_src", "view");
      const names = Array.from({ length: cols }, (_, j) => wideName(j));
      const plan = {
        view: "wide_v", identityColumns: [...names, "y"], levelColumns: names.filter((_, j) => j % 20 !== 15),
        countColumns: names.filter((_, j) => j % 20 === 15), target: { column: "y", kind: "binary" }, folds: 5, seed: 42,
      };
      const times = { grouping: [], wide: [] };
      for (let r = 0; r < Number(values.runs); r++) {
        for (const mode of ["grouping", "wide"]) {
          process.env.TAILSIFT_PASS = mode;
          const t = performance.now();
          await buildLevelTable(engine, plan);
          times[mode].push(performance.now() - t);
        }
      }
      const g = median(times.grouping);
      const w = median(times.wide);
      process.stdout.write(`rows ${rows}\tcols ${cols}\tgrouping ${Math.round(g)} ms\twide ${Math.round(w)} ms\tgrouping/wide ${(g / w).toFixed(2)}\n`);
    } finally {
      engine.close();
    }
  }
}
