/**
 * The scoring SQL on real engines against `tailsift encode --for scoring` (differential test:
 * encode is the reference): on two ClickHouse 18.16 shards through a Distributed table
 * (clickhouse dialect; the mapping tables loaded on both shards, from --mappings-out's CSV),
 * and on PostgreSQL 15 (ansi dialect). --inline-max 32 mixes inlined and loaded mappings.
 * Every encoding kind and fallback (see scoringDuckdb.test.ts); values agree to 1e-12.
 * Without the engine binaries the tests say why and skip; with CI=true they fail instead.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { withEngine } from "../../src/engine/db.js";
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

const columnsOf = (type: string, idType: string) => later.columns.map((n) => `"${n}" ${n === "row_id" ? idType : type}`).join(", ");
const parseLines = (out: string) => out.split("\n").filter((l) => l.trim() !== "").map((l) => JSON.parse(l) as Record<string, unknown>);

describe("scoring SQL on two ClickHouse shards equals encode --for scoring", () => {
  const missing = clickhouseMissing();
  it.runIf(missing !== null)(`skipped: ${missing ?? ""}`, () => {
    if (CI) expect.fail(`CI=true but ${missing}`);
  });
  it.runIf(missing === null)("through a Distributed table, row for row", async () => {
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
    const actual = parseLines(a!.query(`${sql}\nFORMAT JSONEachRow`));
    expect(Object.keys(actual[0]!)).toEqual(c.columns);
    expectSameRows(actual, c.expected, c.columns, "id");
  }, 300_000);
});

describe("scoring SQL on PostgreSQL 15 equals encode --for scoring", () => {
  const missing = postgresMissing();
  it.runIf(missing !== null)(`skipped: ${missing ?? ""}`, () => {
    if (CI) expect.fail(`CI=true but ${missing}`);
  });
  it.runIf(missing === null)("ansi dialect, row for row", async () => {
    const { sql, tables } = await printed("ansi", "pg-maps");
    const pg = await startPostgres((s) => stops.push(s));
    pg.query(`CREATE TABLE later (${columnsOf("TEXT", "BIGINT")})`);
    pg.query("COPY later FROM STDIN (FORMAT text)", toTsv(later));
    for (const t of tables) {
      pg.query(`CREATE TABLE "${t}" (level TEXT, value DOUBLE PRECISION)`);
      pg.query(`COPY "${t}" FROM STDIN (FORMAT csv, HEADER true)`, fs.readFileSync(at(`pg-maps/${t}.csv`), "utf8"));
    }
    const actual = parseLines(pg.query(`SELECT row_to_json(t) FROM (${sql.replace(/^--.*\n/gm, "")}) AS t`));
    expect(Object.keys(actual[0]!)).toEqual(c.columns);
    expectSameRows(actual, c.expected, c.columns, "id");
  }, 300_000);
});
