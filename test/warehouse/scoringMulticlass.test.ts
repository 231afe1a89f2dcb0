/**
 * A plan made with a multi-class target: the scoring SQL (`tailsift sql --plan`) refuses its
 * class encodings in one line, and once those columns are decided otherwise, its result in DuckDB
 * equals `encode --for scoring` (differential test: encode is the reference) — values and types,
 * the target passed through as its trimmed class label (VARCHAR), not read as a 0/1 or a number.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { tempDir } from "../helpers/tmp.js";
import { cli } from "../levels/helpers.js";
import { visitOutcomes } from "../fixtures/visitOutcomes.js";
import { expectSameRows } from "./data.js";
import { describeQuery } from "./scoringCase.js";

const dir = tempDir("warehouse-multiclass");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const at = (n: string) => path.join(dir, n);

describe("scoring SQL of a plan with a multi-class target", () => {
  it("refuses the class encodings, then equals encode --for scoring once they are decided otherwise", async () => {
    fs.writeFileSync(at("train.csv"), visitOutcomes(3000, 21).csv);
    // the later extract: padded class labels, as an export may write them
    const later = visitOutcomes(400, 22);
    fs.writeFileSync(at("later.csv"), [later.header.join(","), ...later.rows.map((r, i) => r.map((v, j) => (j === 5 && i % 7 === 0 ? ` ${v} ` : v)).join(","))].join("\n") + "\n");
    const plain = await cli(["scan", at("train.csv"), "--target", "visit_outcome", "--out", at("plan"), "--quiet", "--no-progress"]);
    expect(plain.code, plain.err).toBe(0);
    const profile = JSON.parse(fs.readFileSync(at("plan/profile.json"), "utf8")) as { target: { kind: string }; columns: { name: string; recommendation: { encoding: string } }[] };
    expect(profile.target.kind).toBe("multiclass");
    const targetEncoded = profile.columns.filter((c) => c.recommendation.encoding === "target-kfold").map((c) => c.name);
    expect(targetEncoded.length).toBeGreaterThan(0);
    const refused = await cli(["sql", "--plan", at("plan"), "--from", "later"]);
    expect(refused.code).toBe(2);
    expect(refused.err.trim().split("\n")).toHaveLength(1);
    expect(refused.err).toMatch(/multi-class target encoding/);

    const decide = targetEncoded.flatMap((c) => ["--decide", `${c}=frequency`]);
    const scan = await cli(["scan", at("train.csv"), "--target", "visit_outcome", "--out", at("plan2"), "--quiet", "--no-progress", ...decide]);
    expect(scan.code, scan.err).toBe(0);
    const enc = await cli(["encode", at("later.csv"), "--plan", at("plan2"), "--out", at("encoded.parquet"), "--for", "scoring", "--no-progress"]);
    expect(enc.code, enc.err).toBe(0);
    const sql = await cli(["sql", "--plan", at("plan2"), "--from", "later", "--inline-max", "100000"]);
    expect(sql.code, sql.err).toBe(0);
    await withEngine({ threads: 1 }, async (e) => {
      await e.run(`CREATE TABLE later AS SELECT * FROM read_csv(${quoteLiteral(at("later.csv"))}, all_varchar = true)`, "loading the later extract");
      const query = sql.out.trim().replace(/;$/, "");
      const file = `SELECT * FROM read_parquet(${quoteLiteral(at("encoded.parquet"))})`;
      const [got, want] = [await describeQuery(e, query), await describeQuery(e, file)];
      expect(got).toEqual(want);
      expect(want.types[want.columns.indexOf("visit_outcome")]).toBe("VARCHAR");
      const expected = await e.rows<Record<string, unknown>>(file, "reading encode's output");
      expect(new Set(expected.map((r) => r.visit_outcome))).toEqual(new Set(["attended", "no_show", "cancelled_late"]));
      // the identifier is not written: rows are matched after sorting both sides by every value
      const keyed = (rows: Record<string, unknown>[]) => rows.map((r) => JSON.stringify(want.columns.map((c) => r[c] ?? null), (_, v: unknown) => (typeof v === "bigint" ? String(v) : v)))
        .sort().map((k, i) => ({ ...Object.fromEntries(want.columns.map((c, j) => [c, (JSON.parse(k) as unknown[])[j]])), __row: i }));
      const actual = await e.rows<Record<string, unknown>>(query, "running the scoring SQL");
      expect(actual).toHaveLength(400);
      expectSameRows(keyed(actual), keyed(expected), want.columns, "__row");
    });
  }, 120_000);
});
