#!/usr/bin/env node
/**
 * Where does `tailsift scan` spend its time? (Profiling aid behind bench/README.md; not part of
 * `npm run bench`.)
 *
 *   node bench/profile.mjs FILE --target COL [--runs 3] [--report bench/results/profile.md]
 *
 * 1. Runs `node dist/cli.js scan FILE --target COL --quiet --format json` once with
 *    bench/trace-hook.mjs preloaded: the wall time of every SQL statement, split into before the
 *    level pass, the pass itself and everything after it (summaries of the level table).
 * 2. Replays the traced statements in one engine (same settings as the CLI) and measures, with
 *    DuckDB's JSON profiler and process CPU time, the level pass against trimmed copies of itself
 *    (without the numeric-column counts, the bad-target count, sum_y2, and with a plain
 *    TRY_CAST target), to attribute the pass's extra cost over the bare query (bench/bare.mjs).
 * Interleaved repeats; medians. Numbers are CPU-time and wall-time medians on a shared machine.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { parseArgs } from "node:util";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const { values, positionals } = parseArgs({
  allowPositionals: true,
  options: { target: { type: "string" }, runs: { type: "string", default: "3" }, report: { type: "string" } },
});
const file = positionals[0];
if (!file || !values.target) {
  process.stderr.write("usage: node bench/profile.mjs FILE --target COL [--runs 3] [--report FILE.md]\n");
  process.exit(2);
}
const runs = Math.max(1, Number(values.runs) || 3);
const out = [];
const say = (line = "") => { out.push(line); process.stdout.write(`${line}\n`); };
const median = (xs) => { const v = [...xs].sort((a, b) => a - b); const m = Math.floor(v.length / 2); return v.length % 2 ? v[m] : (v[m - 1] + v[m]) / 2; };
const short = (sql, n = 90) => sql.replace(/\s+/g, " ").trim().slice(0, n).replaceAll("|", "\\|");

// ---- 1. traced CLI run ---------------------------------------------------------------------------
const traceFile = path.join(os.tmpdir(), `tailsift-trace-${process.pid}.jsonl`);
fs.rmSync(traceFile, { force: true });
const started = performance.now();
const child = spawnSync(process.execPath, ["--import", "./bench/trace-hook.mjs", "dist/cli.js", "scan", file, "--target", values.target, "--quiet", "--format", "json"],
  { cwd: ROOT, env: { ...process.env, TRACE_SQL_FILE: traceFile }, stdio: ["ignore", "ignore", "pipe"], encoding: "utf8" });
const wallMs = performance.now() - started;
if (child.status !== 0) {
  process.stderr.write(child.stderr);
  process.exit(1);
}
const trace = fs.readFileSync(traceFile, "utf8").trim().split("\n").map((l) => JSON.parse(l));
fs.rmSync(traceFile, { force: true });
const passIndex = trace.findIndex((s) => /GROUPING SETS/.test(s.sql) && /tailsift_levels AS/.test(s.sql));
const sum = (list) => list.reduce((a, s) => a + s.ms, 0);
const before = sum(trace.slice(0, passIndex));
const pass = trace[passIndex]?.ms ?? 0;
const after = sum(trace.slice(passIndex + 1));
say(`## Profile of \`tailsift scan ${path.basename(file)} --target ${values.target}\``);
say();
say(`Date ${new Date().toISOString()}, load average ${os.loadavg().map((x) => x.toFixed(1)).join(" / ")} on ${os.availableParallelism()} cores.`);
say();
say(`Process wall time ${(wallMs / 1000).toFixed(2)} s: SQL before the pass ${(before / 1000).toFixed(2)} s, the level pass ${(pass / 1000).toFixed(2)} s, ` +
  `SQL after the pass ${(after / 1000).toFixed(2)} s, outside SQL (Node start-up, JavaScript, output) ${((wallMs - before - pass - after) / 1000).toFixed(2)} s.`);
say();
// Statements of the same shape (same text up to numbers) are summed: e.g. one query per column.
const kinds = new Map();
for (const s of trace) {
  const key = short(s.sql, 70).replace(/[0-9.]+/g, "#");
  const k = kinds.get(key) ?? { ms: 0, count: 0, sql: s.sql };
  k.ms += s.ms;
  k.count += 1;
  kinds.set(key, k);
}
say("| ms | share | statements | statement (first of its shape) |");
say("| ---: | ---: | ---: | --- |");
for (const k of [...kinds.values()].sort((a, b) => b.ms - a.ms).slice(0, 10)) say(`| ${k.ms} | ${((100 * k.ms) / wallMs).toFixed(0)} % | ${k.count} | \`${short(k.sql)}\` |`);
say();

// ---- 2. replay: the pass against trimmed copies --------------------------------------------------
const { openEngine } = await import(path.join(ROOT, "dist", "engine", "db.js"));
const engine = await openEngine({});
const con = engine.connection;
const passSql = trace[passIndex].sql.replace(/^CREATE OR REPLACE TEMP TABLE tailsift_levels AS\s*/, "");
// The CLI sandboxes DuckDB (enable_external_access = false, allowed paths); the replay skips that
// so that the profiler can write its JSON file.
const sandbox = /^\s*SET\s+(enable_external_access|allowed_directories|allowed_paths|lock_configuration)\b/i;
for (const s of trace.slice(0, passIndex)) if (/^\s*(SET|CREATE)/.test(s.sql) && !sandbox.test(s.sql)) await con.run(s.sql);

const trimmed = { "scan's pass": passSql };
let t = passSql.replace(/, count\(__n\d+\)::BIGINT AS __nn\d+/g, "");
if (t !== passSql) trimmed["− numeric-column counts"] = t;
const t2 = t.replace(/,\s*count\(\*\) FILTER \(WHERE __bad\)::BIGINT AS bad/, "");
if (t2 !== t) trimmed["− bad-target count"] = t = t2;
const t3 = t.replace(/, coalesce\(sum\(__y \* __y\), 0\)::DOUBLE AS sum_y2/, "");
if (t3 !== t) trimmed["− sum_y2"] = t = t3;
const target = JSON.stringify(values.target);
const t4 = t.replace(/CASE WHEN (lower\(trim\(|TRY_CAST\(trim\(|\().*? END AS __y/, `TRY_CAST(${target} AS DOUBLE) AS __y`);
if (t4 !== t) trimmed["− target parsing (TRY_CAST)"] = t4;

async function profiled(sql) {
  const prof = path.join(os.tmpdir(), `tailsift-prof-${process.pid}.json`);
  await con.run("PRAGMA enable_profiling = 'json'");
  await con.run(`SET profiling_output = '${prof}'`);
  const c0 = process.cpuUsage();
  const w0 = performance.now();
  await con.run(`CREATE OR REPLACE TEMP TABLE bench_profile_t AS ${sql}`);
  const wall = performance.now() - w0;
  const cu = process.cpuUsage(c0);
  await con.run("PRAGMA disable_profiling");
  const tree = JSON.parse(fs.readFileSync(prof, "utf8"));
  fs.rmSync(prof, { force: true });
  return { wall, cpu: (cu.user + cu.system) / 1000, tree };
}
const results = {};
let lastTree = null;
for (let r = 0; r < runs; r++) {
  for (const [name, sql] of Object.entries(trimmed)) {
    const m = await profiled(sql);
    (results[name] ??= []).push(m);
    if (name === "scan's pass") lastTree = m.tree;
  }
}
say(`### The level pass, trimmed step by step (cumulative; medians of ${runs})`);
say();
say("| variant | wall ms | CPU ms | CPU vs last row |");
say("| --- | ---: | ---: | ---: |");
const names = Object.keys(trimmed);
const cpuLast = median(results[names[names.length - 1]].map((m) => m.cpu));
for (const name of names) {
  const cpu = median(results[name].map((m) => m.cpu));
  say(`| ${name} | ${Math.round(median(results[name].map((m) => m.wall)))} | ${Math.round(cpu)} | ${(cpu / cpuLast).toFixed(2)}× |`);
}
say();
const ops = [];
const walk = (n) => { if (n.operator_type) ops.push(n); for (const c of n.children ?? []) walk(c); };
walk(lastTree);
say("Operators of the scan's pass (DuckDB JSON profile, last run; operator time is summed over threads):");
say();
say("| operator | time s | rows out |");
say("| --- | ---: | ---: |");
for (const o of ops.sort((a, b) => b.operator_timing - a.operator_timing).slice(0, 6)) say(`| ${o.operator_name} | ${o.operator_timing.toFixed(3)} | ${o.operator_cardinality} |`);
say();

engine.close();
if (values.report) {
  fs.mkdirSync(path.dirname(values.report), { recursive: true });
  fs.writeFileSync(values.report, `${out.join("\n")}\n`);
}
