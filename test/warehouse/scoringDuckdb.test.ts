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
import { expectCliError } from "../helpers/cliError.js";
import { tempDir } from "../helpers/tmp.js";
import { cli } from "../levels/helpers.js";
import { expectSameRows, loadExtract } from "./data.js";
import { scoringExtract, useEveryEncoding } from "./scoringData.js";

const dir = tempDir("warehouse-scoring");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const at = (n: string) => path.join(dir, n);

let expected: Record<string, unknown>[];
let outputColumns: string[];
let summary: EncodeSummary;

beforeAll(async () => {
  fs.writeFileSync(at("train.csv"), scoringExtract(1500, 3, false));
  fs.writeFileSync(at("later.csv"), scoringExtract(700, 4, true));
  const scan = await cli(["scan", at("train.csv"), "--target", "no_show", "--out", at("plan"), "--as-categorical", "postcode", "--quiet", "--no-progress"]);
  expect(scan.code, scan.err).toBe(0);
  useEveryEncoding(at("plan"));
  const enc = await cli(["encode", at("later.csv"), "--plan", at("plan"), "--out", at("encoded.parquet"), "--for", "scoring", "--format", "json", "--no-progress"]);
  expect(enc.code, enc.err).toBe(0);
  summary = JSON.parse(enc.out) as EncodeSummary;
  await withEngine({ threads: 1 }, async (e) => {
    expected = await e.rows(`SELECT * FROM read_parquet(${quoteLiteral(at("encoded.parquet"))})`, "reading encode's output");
    outputColumns = (await e.rows<{ column_name: string }>(`DESCRIBE SELECT * FROM read_parquet(${quoteLiteral(at("encoded.parquet"))})`, "describe")).map((r) => r.column_name);
  });
}, 120_000);

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
    for (const name of ["postcode", "tag"]) {
      const g = summary.columns.find((c) => c.column === name)!.grouping!;
      expect([g.own.rows > 0, g.parent.rows > 0, g.other.rows > 0, g.unseen.rows > 0], name).toEqual([true, true, true, true]);
    }
    const ward = summary.columns.find((c) => c.column === "ward")!.grouping!;
    expect([ward.parent.rows > 0, ward.other.rows > 0], "ward").toEqual([true, true]);
    expect(summary.columns.map((c) => c.encoding).sort()).toEqual(["codes", "frequency", "hashing", "hashing", "indicator", "one-hot", "pooled-one-hot", "target-kfold", "target-kfold", "target-kfold"]);
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
    const tables = [...r.out.matchAll(/^-- {3}(\S+): (\d+) rows/gm)].map((m) => m[1]!);
    expect(tables.length).toBeGreaterThanOrEqual(8);
    // backoff can reach both parent depths of postcode (first 3 characters, first character)
    expect(tables.some((t) => /postcode_group1$/.test(t)) && tables.some((t) => /postcode_group2$/.test(t))).toBe(true); // 11 lookups; empty ones (no group at some depth) stay inline
    expect(fs.readdirSync(at("maps")).sort()).toEqual(tables.map((t) => `${t}.csv`).sort());
    const actual = await withEngine({ threads: 1 }, async (e) => {
      for (const t of tables) {
        await e.run(`CREATE TABLE ${quoteIdent(t)} AS SELECT * FROM read_csv(${quoteLiteral(at(`maps/${t}.csv`))}, header = true, columns = {'level': 'VARCHAR', 'value': 'DOUBLE'})`, "loading a mapping");
      }
      return runScoring(e, r.out);
    });
    expectSameRows(actual, expected, outputColumns, "id");
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
