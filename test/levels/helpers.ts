/**
 * Helpers for the level-table tests: an in-process CLI runner, a tolerant deep comparison, and a
 * DuckDB copy of a CSV made through the same text view scan reads.
 */
import { execFileSync } from "node:child_process";
import path from "node:path";
import { expect } from "vitest";
import { runCli } from "../../src/cli.js";
import type { Engine } from "../../src/engine/db.js";
import { openSource } from "../../src/engine/source.js";
import { quoteIdent, quoteLiteral } from "../../src/engine/sql.js";
import { collector } from "../helpers/tmp.js";

export interface CliResult { code: number; out: string; err: string }

/** Runs the CLI in-process (runCli) and returns the exit code and what it printed. */
export async function cli(argv: string[]): Promise<CliResult> {
  const c = collector();
  const code = await runCli(argv, c.io);
  return { code, out: c.out, err: c.err };
}

/** The invented appointment log (sample-data/generate.mjs), small. */
export function generateAppointments(file: string, rows: number, seed: number): string {
  execFileSync(process.execPath, [path.resolve("sample-data/generate.mjs"), "--rows", String(rows), "--seed", String(seed), "--out", file]);
  return file;
}

/** Loads a CSV into a DuckDB table through scan's own text view, so levels are the same text. */
export async function loadAsTable(engine: Engine, csv: string, table: string): Promise<string[]> {
  const source = await openSource(engine, [csv]);
  await engine.run(`CREATE OR REPLACE TABLE ${quoteIdent(table)} AS SELECT * FROM ${source.view}`, "loading the test table");
  return source.columns;
}

/** Runs a level query in DuckDB and writes the result (Parquet, or CSV with a header). */
export async function writeLevels(engine: Engine, sql: string, file: string): Promise<void> {
  const format = file.endsWith(".csv") ? "FORMAT csv, HEADER true" : "FORMAT parquet";
  await engine.run(`COPY (${sql.trim().replace(/;$/, "")}) TO ${quoteLiteral(file)} (${format})`, "writing the level table");
}

/**
 * Deep equality where numbers may differ by floating-point summation order only (relative
 * 1e-9): DuckDB adds per-level sums in an unspecified order, so the last bits can differ.
 */
export function expectSame(actual: unknown, expected: unknown, where = "$"): void {
  if (typeof expected === "number" && typeof actual === "number") {
    const ok = Math.abs(actual - expected) <= 1e-9 * Math.max(1, Math.abs(actual), Math.abs(expected));
    expect(ok, `${where}: ${actual} vs ${expected}`).toBe(true);
    return;
  }
  if (Array.isArray(expected)) {
    expect(Array.isArray(actual), `${where} is not an array`).toBe(true);
    const a = actual as unknown[];
    expect(a.length, `${where}.length`).toBe(expected.length);
    expected.forEach((e, i) => expectSame(a[i], e, `${where}[${i}]`));
    return;
  }
  if (expected !== null && typeof expected === "object") {
    expect(actual !== null && typeof actual === "object", `${where} is not an object`).toBe(true);
    const a = actual as Record<string, unknown>;
    const e = expected as Record<string, unknown>;
    expect(Object.keys(a).sort(), `${where} keys`).toEqual(Object.keys(e).sort());
    for (const k of Object.keys(e)) expectSame(a[k], e[k], `${where}.${k}`);
    return;
  }
  if (typeof expected === "string" && typeof actual === "string" && actual !== expected) {
    // reasons quote rounded figures: a sum added in another order may differ in the last digit
    const split = (t: string) => t.split(/(-?\d[\d,]*\.?\d*)/);
    const a = split(actual);
    const e = split(expected);
    expect(a.length, `${where}: ${actual} vs ${expected}`).toBe(e.length);
    e.forEach((part, i) => {
      if (i % 2 === 0) { expect(a[i], where).toBe(part); return; }
      const decimals = part.includes(".") ? part.length - part.indexOf(".") - 1 : 0;
      const diff = Math.abs(Number(a[i]!.replaceAll(",", "")) - Number(part.replaceAll(",", "")));
      expect(diff <= 1.01 * 10 ** -decimals, `${where}: ${actual} vs ${expected}`).toBe(true);
    });
    return;
  }
  expect(actual, where).toEqual(expected);
}
