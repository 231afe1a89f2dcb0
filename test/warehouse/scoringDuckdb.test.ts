/**
 * The scoring SQL (`tailsift sql --plan`) against `tailsift encode --for scoring` (differential
 * test: encode is the reference), in DuckDB with the ansi dialect, on a plan that uses every
 * encoding kind and a scoring extract with missing values, unseen levels, backoff to parents
 * and "other" in every column that has them — once with every mapping inlined, once with every
 * mapping a table loaded from the CSV files --mappings-out writes. Values must agree to 1e-12.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { withEngine, type Engine } from "../../src/engine/db.js";
import { quoteIdent, quoteLiteral } from "../../src/engine/sql.js";
import type { EncodeSummary } from "../../src/encode/types.js";
import { readPlan } from "../../src/plan/load.js";
import { ANSI, type Dialect } from "../../src/portableSql/dialects.js";
import { scoringItems } from "../../src/portableSql/planMaps.js";
import { scoringSql } from "../../src/portableSql/scoringSql.js";
import { expectCliError } from "../helpers/cliError.js";
import { tempDir } from "../helpers/tmp.js";
import { cli } from "../levels/helpers.js";
import { expectSameRows, loadExtract } from "./data.js";
import { describeQuery, scoringCase, tablesToLoad, type ScoringCase } from "./scoringCase.js";

const dir = tempDir("warehouse-scoring");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const at = (n: string) => path.join(dir, n);

let c: ScoringCase;
let expected: Record<string, unknown>[];
let outputColumns: string[];
let summary: EncodeSummary;

beforeAll(async () => {
  c = await scoringCase(dir);
  ({ expected, columns: outputColumns, summary } = c);
}, 120_000);

/** Loads the mapping tables a query asks for from the CSV files of --mappings-out `maps`. */
async function loadMappings(e: Engine, sql: string, maps: string): Promise<void> {
  for (const t of tablesToLoad(sql)) {
    await e.run(`CREATE TABLE ${quoteIdent(t)} AS SELECT * FROM read_csv(${quoteLiteral(at(`${maps}/${t}.csv`))}, header = true, columns = {'level': 'VARCHAR', 'value': 'DOUBLE'})`, "loading a mapping");
  }
}
async function runScoring(e: Engine, sql: string): Promise<Record<string, unknown>[]> {
  const later = await loadExtract(e, at("later.csv"), "later");
  expect(later.rows.length).toBe(700);
  return e.rows(sql.trim().replace(/;$/, ""), "running the scoring SQL");
}

describe("scoring SQL in DuckDB equals encode --for scoring", () => {
  it("the extract exercises every fallback: missing and unseen in every column, parents and \"other\"", () => {
    for (const c of summary.columns) {
      expect(c.missing, c.column).toBeGreaterThan(0);
      if (!["species", "vet"].includes(c.column)) expect(c.unseen, c.column).toBeGreaterThan(0);
    }
    for (const name of ["postcode", "tag", "chip"]) {
      const g = summary.columns.find((c) => c.column === name)!.grouping!;
      expect([g.own.rows > 0, g.parent.rows > 0, g.other.rows > 0, g.unseen.rows > 0], name).toEqual([true, true, true, true]);
    }
    const ward = summary.columns.find((c) => c.column === "ward")!.grouping!;
    expect([ward.parent.rows > 0, ward.other.rows > 0], "ward").toEqual([true, true]);
    expect(summary.columns.map((c) => c.encoding).sort()).toEqual(["codes", "codes", "frequency", "hashing", "hashing", "indicator", "one-hot", "pooled-one-hot", "target-kfold", "target-kfold", "target-kfold"]);
  });

  it("with every mapping inlined", async () => {
    const r = await cli(["sql", "--plan", at("plan"), "--from", "later", "--inline-max", "100000"]);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toContain("no table to load");
    const actual = await withEngine({ threads: 1 }, (e) => runScoring(e, r.out));
    expect(Object.keys(actual[0]!)).toEqual(outputColumns);
    expectSameRows(actual, expected, outputColumns, "id");
  });

  it("with every mapping a table loaded from --mappings-out", async () => {
    const r = await cli(["sql", "--plan", at("plan"), "--from", "later", "--inline-max", "0", "--mappings-out", at("maps")]);
    expect(r.code, r.err).toBe(0);
    const tables = tablesToLoad(r.out);
    expect(tables.length).toBeGreaterThanOrEqual(8);
    // backoff can reach both parent depths of postcode (first 3 characters, first character)
    expect(tables.some((t) => /postcode_group1$/.test(t)) && tables.some((t) => /postcode_group2$/.test(t))).toBe(true); // 11 lookups; empty ones (no group at some depth) stay inline
    expect(fs.readdirSync(at("maps")).sort()).toEqual(tables.map((t) => `${t}.csv`).sort());
    const actual = await withEngine({ threads: 1 }, async (e) => {
      await loadMappings(e, r.out, "maps");
      return runScoring(e, r.out);
    });
    expectSameRows(actual, expected, outputColumns, "id");
  });

  it("types every column as encode's Parquet output: DESCRIBE equal column for column, inlined or loaded", async () => {
    // the types encode writes (encode/passThrough, encode/encodings/*; issue 16): numeric
    // pass-through BIGINT (integers in scan's sample) or DOUBLE, the binary target 0/1 INTEGER,
    // one-hot and indicator INTEGER, codes and hashing BIGINT, frequency and target means DOUBLE
    const typeOf = (n: string) => c.types[c.columns.indexOf(n)];
    expect(["id", "lead_days", "fee", "no_show", "species", "channel_web", "reason_other", "clinic", "vet", "chip", "tag", "breed", "insurance", "postcode", "ward"].map(typeOf))
      .toEqual(["VARCHAR", "BIGINT", "DOUBLE", "INTEGER", "INTEGER", "INTEGER", "INTEGER", "BIGINT", "BIGINT", "BIGINT", "BIGINT", "DOUBLE", "DOUBLE", "DOUBLE", "DOUBLE"]);
    const inlined = await cli(["sql", "--plan", at("plan"), "--from", "later", "--inline-max", "100000"]);
    const loaded = await cli(["sql", "--plan", at("plan"), "--from", "later", "--inline-max", "0", "--mappings-out", at("maps-types")]);
    expect([inlined.code, loaded.code], inlined.err + loaded.err).toEqual([0, 0]);
    await withEngine({ threads: 1 }, async (e) => {
      const later = await loadExtract(e, at("later.csv"), "later");
      // the table holds text: every type below comes from the query's casts
      expect((await describeQuery(e, "SELECT lead_days, fee, no_show FROM later")).types).toEqual(["VARCHAR", "VARCHAR", "VARCHAR"]);
      expect(later.rows.length).toBe(700);
      await loadMappings(e, loaded.out, "maps-types");
      for (const r of [inlined, loaded]) {
        expect(await describeQuery(e, r.out.trim().replace(/;$/, ""))).toEqual({ columns: c.columns, types: c.types });
      }
    });
  });

  it("the type check fails without the casts: the same query untyped gives VARCHAR numbers and INTEGER codes", async () => {
    const untyped: Dialect = { ...ANSI, cast: (e) => e, parseNumber: (t) => t };
    const { levelsPath, profile } = readPlan(at("plan"), "sql", true);
    await withEngine({ threads: 1 }, async (e) => {
      const items = await scoringItems(e, profile, levelsPath);
      await loadExtract(e, at("later.csv"), "later");
      const options = { from: "later", inlineMax: 100_000, target: profile.target };
      const typed = await describeQuery(e, scoringSql(items, { ...options, dialect: ANSI }).sql);
      const plain = await describeQuery(e, scoringSql(items, { ...options, dialect: untyped }).sql);
      expect(typed).toEqual({ columns: c.columns, types: c.types });
      expect(plain.columns).toEqual(c.columns);
      const at2 = (n: string) => plain.types[c.columns.indexOf(n)];
      expect([at2("lead_days"), at2("fee"), at2("vet")]).toEqual(["VARCHAR", "VARCHAR", "INTEGER"]);
      expect(plain.types).not.toEqual(c.types);
    });
  });

  it("a continuous target passes through as DOUBLE, the same values and types as encode", async () => {
    const scan = await cli(["scan", at("train.csv"), "--target", "fee", "--target-kind", "continuous", "--out", at("plan-fee"), "--as-categorical", "postcode", "--quiet", "--no-progress"]);
    expect(scan.code, scan.err).toBe(0);
    const enc = await cli(["encode", at("later.csv"), "--plan", at("plan-fee"), "--out", at("fee.parquet"), "--for", "scoring", "--quiet", "--no-progress"]);
    expect(enc.code, enc.err).toBe(0);
    const r = await cli(["sql", "--plan", at("plan-fee"), "--from", "later", "--inline-max", "100000"]);
    expect(r.code, r.err).toBe(0);
    await withEngine({ threads: 1 }, async (e) => {
      const file = `read_parquet(${quoteLiteral(at("fee.parquet"))})`;
      const reference = await describeQuery(e, `SELECT * FROM ${file}`);
      expect(reference.types[reference.columns.indexOf("fee")]).toBe("DOUBLE");
      await loadExtract(e, at("later.csv"), "later");
      const sql = r.out.trim().replace(/;$/, "");
      expect(await describeQuery(e, sql)).toEqual(reference);
      // the plan drops the id (an identifier): rows are matched by position, both in input order
      const numbered = (q: string) => e.rows<Record<string, unknown>>(`SELECT row_number() OVER () - 1 AS __row, * FROM (${q})`, "numbering rows");
      const rows = await numbered(`SELECT * FROM ${file}`);
      expect(rows.filter((x) => x.fee === null).length).toBeGreaterThan(10); // blank fees: NULL in both
      expectSameRows(await numbered(sql), rows, reference.columns, "__row");
    });
  });

  it("reads numeric text as encode does: trimmed, blank and NULL as NULL, a non-number an error", async () => {
    await withEngine({ threads: 1 }, async (e) => {
      const cells = "(VALUES (1, '12'), (2, ''), (3, NULL), (4, ' 7 '), (5, '-3'), (6, '2.5e1')) AS t(k, v)";
      const read = async (type: "BIGINT" | "DOUBLE", where: string) =>
        (await e.rows<{ x: unknown }>(`SELECT ${ANSI.parseNumber("v", type)} AS x FROM ${cells} WHERE ${where} ORDER BY k`, "parsing")).map((r) => (r.x === null ? null : Number(r.x)));
      expect(await read("BIGINT", "k < 6")).toEqual([12, null, null, 7, -3]);
      expect(await read("DOUBLE", "k > 0")).toEqual([12, null, null, 7, -3, 25]);
      await expect(e.rows(`SELECT ${ANSI.parseNumber("'x7'", "BIGINT")} AS x`, "parsing")).rejects.toThrow();
    });
  });

  it("names its columns as encode does: safe names by default, the raw ones with --raw-names on both", async () => {
    // safe names (encode/safeNames, docs/references.md "encode output"): the one-hot and pooled columns are renamed
    expect(outputColumns.every((n) => /^[A-Za-z_][A-Za-z0-9_]*$/.test(n)), outputColumns.join(", ")).toBe(true);
    expect(outputColumns).toEqual(expect.arrayContaining(["channel_web", "reason_it_s_an_emergency", "reason_other"]));
    const enc = await cli(["encode", at("later.csv"), "--plan", at("plan"), "--out", at("encoded-raw.parquet"), "--for", "scoring", "--raw-names", "--format", "json", "--no-progress"]);
    expect(enc.code, enc.err).toBe(0);
    const r = await cli(["sql", "--plan", at("plan"), "--from", "later", "--inline-max", "100000", "--raw-names"]);
    expect(r.code, r.err).toBe(0);
    await withEngine({ threads: 1 }, async (e) => {
      const file = quoteLiteral(at("encoded-raw.parquet"));
      const rawColumns = (await e.rows<{ column_name: string }>(`DESCRIBE SELECT * FROM read_parquet(${file})`, "describe")).map((x) => x.column_name);
      expect(rawColumns).toEqual(expect.arrayContaining(["channel=web", "reason=it's an emergency", "reason=other"]));
      const actual = await runScoring(e, r.out);
      expect(Object.keys(actual[0]!)).toEqual(rawColumns);
      expectSameRows(actual, await e.rows(`SELECT * FROM read_parquet(${file})`, "reading encode's output"), rawColumns, "id");
    });
  });

  it("refuses --raw-names without --plan (exit 2, bad_option, one line)", async () => {
    await expectCliError(["sql", "--columns", "clinic", "--from", "later", "--raw-names"], "bad_option", /--raw-names apply with --plan/);
  });

  it("refuses a mapping larger than --inline-max without --mappings-out (exit 2, one line)", async () => {
    const r = await cli(["sql", "--plan", at("plan"), "--from", "later", "--inline-max", "3"]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/more than --inline-max 3; give --mappings-out/);
    expect(r.err.trim().split("\n").length).toBe(1);
  });

  it("spark spells the same query with backticks, STRING, DOUBLE and CONV over md5 hex (quoting only: no Spark here)", async () => {
    const r = await cli(["sql", "--plan", at("plan"), "--from", "lake.vet.later", "--dialect", "spark", "--inline-max", "32", "--mappings-out", at("spark-maps")]);
    expect(r.code, r.err).toBe(0);
    const body = r.out.replace(/^--.*\n/gm, "");
    expect(body).not.toContain('"');
    expect(body).toContain("FROM `lake`.`vet`.`later` AS s");
    expect(body).toContain("CAST(CONV(SUBSTRING(MD5(CONCAT('clinic-', CAST(s.`clinic` AS STRING))), 15, 2), 16, 10) AS BIGINT)");
    expect(body).toContain("'it\\'s an emergency'");
    expect(body).not.toMatch(/VARCHAR|DOUBLE PRECISION/);
  });
});
