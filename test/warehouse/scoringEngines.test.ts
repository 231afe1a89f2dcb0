/**
 * The scoring SQL on real engines against `tailsift encode --for scoring` (differential test:
 * encode is the reference): on two ClickHouse 18.16 shards through a Distributed table
 * (clickhouse dialect; the mapping tables loaded on both shards, from --mappings-out's CSV),
 * and on PostgreSQL 15 (ansi dialect). --inline-max 32 mixes inlined and loaded mappings.
 * Every encoding kind and fallback (see scoringDuckdb.test.ts); values agree to 1e-12, and each
 * engine reports every result column with the type encode's Parquet has (DuckDB's DESCRIBE of it,
 * scoringCase), under that engine's name for the type (the tables below).
 * Without the engine binaries the tests say why and skip; with CI=true they fail instead.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { withEngine } from "../../src/engine/db.js";
import { ANSI, CLICKHOUSE, type Dialect } from "../../src/portableSql/dialects.js";
import { tempDir } from "../helpers/tmp.js";
import { cli } from "../levels/helpers.js";
import { expectSameRows, loadExtract, toTsv, type Extract } from "./data.js";
import { scoringCase, tablesToLoad, type ScoringCase } from "./scoringCase.js";
import { clickhouseMissing, postgresMissing, startClickHouse, startPostgres } from "./servers.js";

const CI = process.env.CI === "true";
const dir = tempDir("warehouse-scoring-engines");
const at = (n: string) => path.join(dir, n);
const stops: { stop(): Promise<void> }[] = [];
afterAll(async () => {
  for (const s of stops.reverse()) await s.stop();
  fs.rmSync(dir, { recursive: true, force: true });
});

let c: ScoringCase;
let later: Extract;

beforeAll(async () => {
  c = await scoringCase(dir);
  later = await withEngine({ threads: 1 }, (e) => loadExtract(e, c.later, "later"));
}, 120_000);

async function printed(dialect: string, maps: string): Promise<{ sql: string; tables: string[] }> {
  const r = await cli(["sql", "--plan", c.plan, "--from", "later", "--dialect", dialect, "--inline-max", "32", "--mappings-out", at(maps)]);
  expect(r.code, r.err).toBe(0);
  const tables = tablesToLoad(r.out);
  expect(tables.length).toBeGreaterThan(2); // some mappings are tables…
  expect(r.out).toMatch(/WHEN .* THEN/); // …and some are inlined
  return { sql: r.out.trim().replace(/;$/, ""), tables };
}

/**
 * encode's Parquet types (as DuckDB's DESCRIBE names them) under each engine's own names: the type
 * names of ClickHouse's data-type reference (Int32, Int64, Float64, String; Nullable(T) may hold
 * NULL), and the `data_type` PostgreSQL's information_schema.columns reports (PostgreSQL 15 docs,
 * table 8.1 and section 37.17: integer, bigint, double precision, character varying).
 */
const CLICKHOUSE_TYPES: Record<string, string> = { INTEGER: "Nullable(Int32)", BIGINT: "Nullable(Int64)", DOUBLE: "Nullable(Float64)", VARCHAR: "Nullable(String)" };
const POSTGRES_TYPES: Record<string, string> = { INTEGER: "integer", BIGINT: "bigint", DOUBLE: "double precision", VARCHAR: "character varying" };
const expectedTypes = (names: Record<string, string>) => c.columns.map((n, k) => `${n} ${names[c.types[k]!] ?? `(no name for ${c.types[k]})`}`);

/** Text cells as the engine reads them with `d.parseNumber`: blank and NULL → NULL, spaces trimmed, and a cell that is no number stops the query. */
function checkParseNumber(d: Dialect, query: (sql: string) => string, table: string): void {
  query(`INSERT INTO ${table} VALUES (1, '12'), (2, ''), (3, NULL), (4, ' 7 '), (5, '-3'), (6, '2.5e1')`);
  const read = (type: "BIGINT" | "DOUBLE", where = "k > 0") =>
    query(`SELECT ${d.parseNumber("v", type)} FROM ${table} WHERE ${where} ORDER BY k`).trim().split("\n").map((l) => (l === "\\N" || l === "" ? null : Number(l)));
  expect(read("BIGINT", "k < 6")).toEqual([12, null, null, 7, -3]);
  expect(read("DOUBLE")).toEqual([12, null, null, 7, -3, 25]);
  query(`INSERT INTO ${table} VALUES (7, 'x7')`);
  expect(() => read("BIGINT", "k = 7")).toThrow();
}

const columnsOf = (type: string, idType: string) => later.columns.map((n) => `"${n}" ${n === "row_id" ? idType : type}`).join(", ");
const parseLines = (out: string) => out.split("\n").filter((l) => l.trim() !== "").map((l) => JSON.parse(l) as Record<string, unknown>);

describe("scoring SQL on two ClickHouse shards equals encode --for scoring", () => {
  const missing = clickhouseMissing();
  it.runIf(missing !== null)(`skipped: ${missing ?? ""}`, () => {
    if (CI) expect.fail(`CI=true but ${missing}`);
  });
  it.runIf(missing === null)("through a Distributed table, row for row, every column typed as encode writes it", async () => {
    const { sql, tables } = await printed("clickhouse", "ch-maps");
    const [a, b] = await startClickHouse(2, (s) => stops.push(s));
    for (const s of [a!, b!]) {
      s.query(`CREATE TABLE later_local (${columnsOf("Nullable(String)", "Int64")}) ENGINE = Log`);
      for (const t of tables) {
        s.query(`CREATE TABLE "${t}" (level String, value Float64) ENGINE = Log`);
        s.query(`INSERT INTO "${t}" FORMAT CSVWithNames`, fs.readFileSync(at(`ch-maps/${t}.csv`), "utf8"));
      }
    }
    a!.query("CREATE TABLE later AS later_local ENGINE = Distributed(tailsift_test, default, later_local)");
    a!.query("INSERT INTO later_local FORMAT TabSeparated", toTsv(later, (id) => id % 2 === 0));
    b!.query("INSERT INTO later_local FORMAT TabSeparated", toTsv(later, (id) => id % 2 === 1));
    // FORMAT JSON: the rows and the result's column types (meta)
    const result = JSON.parse(a!.query(`${sql}\nFORMAT JSON`)) as { meta: { name: string; type: string }[]; data: Record<string, unknown>[] };
    expect(Object.keys(result.data[0]!)).toEqual(c.columns);
    expectSameRows(result.data, c.expected, c.columns, "id");
    expect(result.meta.map((m) => `${m.name} ${m.type}`)).toEqual(expectedTypes(CLICKHOUSE_TYPES));
    // the shards hold text: the numeric types come from the query's casts
    expect(a!.query("SELECT toTypeName(lead_days), toTypeName(no_show) FROM later LIMIT 1").trim()).toBe("Nullable(String)\tNullable(String)");
    // 18.16's CAST(Nullable(String) AS Nullable(Int64)) turns ' 3' into NULL silently, and `if` evaluates both branches: parseNumber's form
    a!.query("CREATE TABLE cells (k Int64, v Nullable(String)) ENGINE = Log");
    checkParseNumber(CLICKHOUSE, a!.query, "cells");
  }, 300_000);
});

describe("scoring SQL on PostgreSQL 15 equals encode --for scoring", () => {
  const missing = postgresMissing();
  it.runIf(missing !== null)(`skipped: ${missing ?? ""}`, () => {
    if (CI) expect.fail(`CI=true but ${missing}`);
  });
  it.runIf(missing === null)("ansi dialect, row for row, every column of a table made from it typed as encode writes it", async () => {
    const { sql, tables } = await printed("ansi", "pg-maps");
    const pg = await startPostgres((s) => stops.push(s));
    pg.query(`CREATE TABLE later (${columnsOf("TEXT", "BIGINT")})`);
    pg.query("COPY later FROM STDIN (FORMAT text)", toTsv(later));
    for (const t of tables) {
      pg.query(`CREATE TABLE "${t}" (level TEXT, value DOUBLE PRECISION)`);
      pg.query(`COPY "${t}" FROM STDIN (FORMAT csv, HEADER true)`, fs.readFileSync(at(`pg-maps/${t}.csv`), "utf8"));
    }
    const body = sql.replace(/^--.*\n/gm, "");
    const actual = parseLines(pg.query(`SELECT row_to_json(t) FROM (${body}) AS t`));
    expect(Object.keys(actual[0]!)).toEqual(c.columns);
    expectSameRows(actual, c.expected, c.columns, "id");
    pg.query(`CREATE TABLE scored AS ${body}`);
    const described = (table: string) => pg.query(`SELECT column_name || ' ' || data_type FROM information_schema.columns WHERE table_name = '${table}' ORDER BY ordinal_position`).trim().split("\n");
    expect(described("scored")).toEqual(expectedTypes(POSTGRES_TYPES));
    // the table holds text: the numeric types come from the query's casts
    expect(described("later").filter((l) => /^(lead_days|no_show) /.test(l))).toEqual(["lead_days text", "no_show text"]);
    pg.query("CREATE TABLE cells (k BIGINT, v TEXT)");
    checkParseNumber(ANSI, pg.query, "cells");
  }, 300_000);
});
