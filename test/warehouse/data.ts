/**
 * Extracts for the warehouse tests, as every engine receives them: the invented appointment
 * log read through scan's own text view (so levels are the same text), numbered by an integer
 * `row_id` (the fold expression every engine computes identically: row_id mod K), written as
 * tab-separated text with \N for missing — the format ClickHouse's TabSeparated and
 * PostgreSQL's COPY … (FORMAT text) both read.
 */
import { expect } from "vitest";
import type { Engine } from "../../src/engine/db.js";
import { openSource } from "../../src/engine/source.js";
import { quoteIdent, quoteLiteral } from "../../src/engine/sql.js";

export interface Extract { columns: string[]; rows: (string | null)[][] }

/** Loads `file` as DuckDB table `table`(row_id BIGINT, every column VARCHAR) and returns its rows. */
export async function loadExtract(engine: Engine, file: string, table: string): Promise<Extract> {
  const source = await openSource(engine, [file]);
  await engine.run(`CREATE OR REPLACE TABLE ${quoteIdent(table)} AS SELECT (row_number() OVER () - 1)::BIGINT AS row_id, * FROM ${source.view}`, "loading the test table");
  const rows = await engine.rows<Record<string, unknown>>(`SELECT * FROM ${quoteIdent(table)} ORDER BY row_id`, "reading the test table");
  const columns = ["row_id", ...source.columns];
  return { columns, rows: rows.map((r) => columns.map((c) => (r[c] === null || r[c] === undefined ? null : String(r[c])))) };
}

const escapeTsv = (v: string | null) => (v === null ? "\\N" : v.replaceAll("\\", "\\\\").replaceAll("\t", "\\t").replaceAll("\n", "\\n").replaceAll("\r", "\\r"));

/** The rows (optionally only those `keep` accepts) as tab-separated text. */
export function toTsv(x: Extract, keep: (rowId: number) => boolean = () => true): string {
  return x.rows.filter((r) => keep(Number(r[0]))).map((r) => `${r.map(escapeTsv).join("\t")}\n`).join("");
}

/** JSON lines (one object per row) as a DuckDB table with the given column types. */
export async function jsonLinesTable(engine: Engine, file: string, table: string, types: Record<string, string>): Promise<void> {
  const cols = `{${Object.entries(types).map(([k, t]) => `${quoteLiteral(k)}: ${quoteLiteral(t)}`).join(", ")}}`;
  await engine.run(`CREATE OR REPLACE TABLE ${quoteIdent(table)} AS SELECT * FROM read_json(${quoteLiteral(file)}, format = 'newline_delimited', columns = ${cols})`, "reading an engine's result");
}

export const LEVEL_TYPES = { column: "VARCHAR", level: "VARCHAR", fold: "INTEGER", rows: "BIGINT", n_y: "BIGINT", sum_y: "DOUBLE", sum_y2: "DOUBLE" };

/** Row-for-row equality of two result sets keyed by row_id; numbers to 1e-12 (relative above 1). */
export function expectSameRows(actual: Record<string, unknown>[], expected: Record<string, unknown>[], columns: readonly string[], key = "row_id"): void {
  expect(actual.length).toBe(expected.length);
  const byId = new Map(actual.map((r) => [String(r[key]), r]));
  for (const e of expected) {
    const a = byId.get(String(e[key]));
    expect(a, `row ${String(e[key])}`).toBeDefined();
    for (const c of columns) {
      const ev = e[c] ?? null;
      const av = a![c] ?? null;
      const where = `row ${String(e[key])} column ${c}: ${String(av)} vs ${String(ev)}`;
      if (ev === null || av === null) { expect(av, where).toBe(ev); continue; }
      const en = Number(ev);
      if (typeof ev === "number" || typeof ev === "bigint") {
        expect(Math.abs(Number(av) - en) <= 1e-12 * Math.max(1, Math.abs(en)), where).toBe(true);
      } else {
        expect(String(av), where).toBe(ev);
      }
    }
  }
}
