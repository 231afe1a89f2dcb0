/**
 * The scoring case every scoring-SQL test shares: a plan with every encoding kind
 * (scoringData), a later extract, and encode --for scoring's output on it (the reference).
 */
import fs from "node:fs";
import path from "node:path";
import { expect } from "vitest";
import { withEngine, type Engine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import type { EncodeSummary } from "../../src/encode/types.js";
import { cli } from "../levels/helpers.js";
import { scoringExtract, useEveryEncoding } from "./scoringData.js";

export interface ScoringCase {
  plan: string; later: string; expected: Record<string, unknown>[]; summary: EncodeSummary;
  /** encode's output columns in order, and their types (DuckDB's DESCRIBE of the Parquet file). */
  columns: string[]; types: string[];
}

/** DuckDB's DESCRIBE of a query: its column names and types, in order. */
export async function describeQuery(e: Engine, sql: string): Promise<{ columns: string[]; types: string[] }> {
  const rows = await e.rows<{ column_name: string; column_type: string }>(`DESCRIBE ${sql}`, "describing a query");
  return { columns: rows.map((r) => r.column_name), types: rows.map((r) => r.column_type) };
}

export async function scoringCase(dir: string): Promise<ScoringCase> {
  const at = (n: string) => path.join(dir, n);
  fs.writeFileSync(at("train.csv"), scoringExtract(1500, 3, false));
  fs.writeFileSync(at("later.csv"), scoringExtract(700, 4, true));
  const scan = await cli(["scan", at("train.csv"), "--target", "no_show", "--out", at("plan"), "--as-categorical", "postcode", "--quiet", "--no-progress"]);
  expect(scan.code, scan.err).toBe(0);
  useEveryEncoding(at("plan"));
  const enc = await cli(["encode", at("later.csv"), "--plan", at("plan"), "--out", at("encoded.parquet"), "--for", "scoring", "--format", "json", "--no-progress"]);
  expect(enc.code, enc.err).toBe(0);
  const file = quoteLiteral(at("encoded.parquet"));
  return withEngine({ threads: 1 }, async (e) => ({
    plan: at("plan"), later: at("later.csv"), summary: JSON.parse(enc.out) as EncodeSummary,
    expected: await e.rows<Record<string, unknown>>(`SELECT * FROM read_parquet(${file})`, "reading encode's output"),
    ...(await describeQuery(e, `SELECT * FROM read_parquet(${file})`)),
  }));
}

/** The mapping tables a scoring query asks the user to load (its header lines). */
export const tablesToLoad = (sql: string): string[] => [...sql.matchAll(/^-- {3}(\S+): (\d+) rows/gm)].map((m) => m[1]!);
