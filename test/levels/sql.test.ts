/**
 * `tailsift sql`: the printed query is portable SQL, quotes every name, maps the target as
 * documented, and — run in DuckDB on a tiny hand-made table — gives the level sums counted by
 * hand in the comments.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { scanLevels } from "../../src/commands/levels.js";
import { levelSql } from "../../src/commands/sql.js";
import { withEngine } from "../../src/engine/db.js";
import { tempDir } from "../helpers/tmp.js";
import { expectCliError } from "../helpers/cliError.js";
import { cli, writeLevels } from "./helpers.js";

const dir = tempDir("levels-sql");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const FOLD = "MOD(ABS(some_hash(id)), 5)";

/** Function names called in the query (`name(`), the user's fold expression removed. */
const calledFunctions = (sql: string, userText = "") =>
  [...new Set([...sql.replaceAll(userText, "").matchAll(/([A-Za-z_][A-Za-z0-9_]*)\s*\(/g)].map((m) => m[1]!.toUpperCase()))].sort();

// Functions and keywords of ISO/IEC 9075 (SQL:2016 core: CAST, COUNT, SUM, LOWER, TRIM, ABS, MOD; from memory),
// which DuckDB, Spark SQL and Trino all implement; "AS (", "IN (" and "FROM (" (a derived table, not a CTE) are syntax, not calls.
// NULLIF is in SQL-92 (an abbreviated <case expression>; recalled from memory); the continuous target reads blank as NULL with it
const PORTABLE = new Set(["ABS", "AS", "CAST", "COUNT", "FROM", "IN", "LOWER", "MOD", "NULLIF", "SUM", "TRIM"]);
// DuckDB-only spellings that must never appear (common practice: the functions listed in the brief).
const DUCKDB_ONLY = [/::/, /\bhash\s*\(/i, /\bmd5/i, /\blist\w*\s*\(/i, /\bstruct\w*\s*\(/i, /\bregexp_/i, /\bepoch/i,
  /\bstrftime/i, /\btry_cast/i, /\bqualify\b/i, /\bfilter\s*\(/i, /\bcolumns\s*\(/i, /\bgroup\s+by\s+all\b/i, /\bread_(csv|parquet)/i];

describe("tailsift sql prints portable SQL", () => {
  const variants: [string, string[]][] = [
    ["binary words", ["--target", "y", "--target-kind", "binary"]],
    ["binary --positive", ["--target", "y", "--positive", "yes"]],
    ["continuous", ["--target", "y", "--target-kind", "continuous"]],
    ["no target", []],
  ];
  for (const [label, extra] of variants) {
    it(`uses only portable functions (${label})`, async () => {
      const r = await cli(["sql", "--columns", "a,b", "--from", "db.s.t", "--fold-expr", FOLD, ...extra]);
      expect(r.code, r.err).toBe(0);
      for (const pattern of DUCKDB_ONLY) expect(r.out.replaceAll(FOLD, "")).not.toMatch(pattern);
      for (const f of calledFunctions(r.out, FOLD)) expect(PORTABLE.has(f), `function ${f}`).toBe(true);
      expect(r.out).toContain(FOLD); // the user's fold expression is inserted unchanged
      expect(r.out.trimEnd().endsWith(";")).toBe(true);
      expect(r.out.match(/UNION ALL/g)?.length).toBe(1); // two columns, one UNION ALL
    });
  }

  it("maps the binary target with the same words as scan, and reads continuous targets trimmed, blank as NULL", () => {
    const words = levelSql({ columns: ["a"], from: "t", target: "y", targetKind: "binary" });
    expect(words).toContain("IN ('1', '1.0', 'true', 't', 'yes', 'y') THEN CAST(1 AS DOUBLE PRECISION)");
    expect(words).toContain("IN ('0', '0.0', 'false', 'f', 'no', 'n') THEN CAST(0 AS DOUBLE PRECISION)");
    expect(levelSql({ columns: ["a"], from: "t", target: "y", targetKind: "continuous" })).toContain(`CAST(NULLIF(TRIM(CAST("y" AS VARCHAR)), '') AS DOUBLE PRECISION) AS y`);
    expect(levelSql({ columns: ["a"], from: "t" })).toContain("CAST(NULL AS DOUBLE PRECISION) AS y");
    expect(levelSql({ columns: ["a"], from: "t" })).toContain("CAST(0 AS INTEGER) AS f");
    expect(levelSql({ columns: ["a"], from: "t", foldExpr: "k % 3", folds: 3 })).toContain("CAST(MOD(ABS(k % 3), 3) AS INTEGER) AS f");
  });

  it("refuses options it cannot honour (exit 2)", async () => {
    const cases: [string[], string, RegExp][] = [
      [["--columns", "a", "--from", "t", "--target", "y"], "bad_option", /--target-kind/],
      [["--columns", "a", "--from", "t", "--folds", "5"], "bad_option", /--folds needs --fold-expr/],
      [["--columns", "a", "--from", "t", "--fold-expr", "x", "--folds", "1"], "bad_option", /--folds must be an integer from 2/],
      [["--columns", "a,y", "--from", "t", "--target", "y", "--positive", "1"], "bad_option", /includes the target/],
      [["--columns", "a", "--from", "db..t"], "bad_option", /empty name part/],
      [["--columns", "a", "--from", "t", "--target", "y", "--target-kind", "continuous", "--positive", "1"], "bad_option", /--positive applies to binary/],
    ];
    for (const [args, code, message] of cases) await expectCliError(["sql", ...args], code, message);
    await expectCliError(["sql", "--from", "t"], "bad_option", /--columns: name at least one column/); // without --plan, --columns is needed
  });
});

describe("quoting of odd names", () => {
  it('quotes a column named we"ird col, a column it\'s and a table db.sch.t, and runs in DuckDB', async () => {
    const sql = levelSql({ columns: ['we"ird col', "it's"], from: "db.sch.t", target: "y", targetKind: "binary" });
    expect(sql).toContain('CAST("we""ird col" AS VARCHAR)');
    expect(sql).toContain(`'we"ird col' AS "column"`);
    expect(sql).toContain(`'it''s' AS "column"`);
    expect(sql).toContain('FROM "db"."sch"."t"');
    const file = path.join(dir, "odd.parquet");
    const rows = await withEngine({ threads: 1 }, async (engine) => {
      await engine.run("ATTACH ':memory:' AS db; CREATE SCHEMA db.sch", "attach");
      await engine.run(`CREATE TABLE db.sch.t ("we""ird col" VARCHAR, "it's" VARCHAR, y VARCHAR)`, "create");
      await engine.run(`INSERT INTO db.sch.t VALUES ('a', 'x', '1'), ('a', 'y', '0'), ('b', 'x', 'yes'), (NULL, 'x', 'no'), ('b', NULL, ''), ('a', 'y', ' 1 ')`, "insert");
      await writeLevels(engine, sql, file);
      return engine.rows<{ column: string; level: string | null; fold: number; rows: number; n_y: number; sum_y: number | null; sum_y2: number | null }>(
        `SELECT * FROM (${sql}) ORDER BY "column", level NULLS FIRST`, "running the level query");
    });
    // Counted by hand. y → 1, 0, 1 (yes), 0 (no), missing (blank), 1 (' 1 ' trimmed).
    // it's: NULL → row 5 (y missing); x → rows 1, 3, 4 (1, 1, 0); y → rows 2, 6 (0, 1).
    // we"ird col: NULL → row 4 (0); a → rows 1, 2, 6 (1, 0, 1); b → rows 3, 5 (1, missing).
    expect(rows).toEqual([
      { column: "it's", level: null, fold: 0, rows: 1, n_y: 0, sum_y: null, sum_y2: null },
      { column: "it's", level: "x", fold: 0, rows: 3, n_y: 3, sum_y: 2, sum_y2: 2 },
      { column: "it's", level: "y", fold: 0, rows: 2, n_y: 2, sum_y: 1, sum_y2: 1 },
      { column: 'we"ird col', level: null, fold: 0, rows: 1, n_y: 1, sum_y: 0, sum_y2: 0 },
      { column: 'we"ird col', level: "a", fold: 0, rows: 3, n_y: 3, sum_y: 2, sum_y2: 2 },
      { column: 'we"ird col', level: "b", fold: 0, rows: 2, n_y: 1, sum_y: 1, sum_y2: 1 },
    ]);
    // scan --levels reads the NULL sums as 0 and keeps the names; 5 of 6 rows carry a target, 3 positive
    const p = await scanLevels([file], { target: "y", threads: 1 });
    expect(p.columns.map((c) => c.name)).toEqual(["it's", 'we"ird col', "y"]);
    expect(p.target).toMatchObject({ column: "y", kind: "binary", rows: 5, missing: 1, mean: 3 / 5 });
    expect(p.columns.find((c) => c.name === 'we"ird col')?.missing).toBe(1);
  });
});
