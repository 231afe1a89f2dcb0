/**
 * Typed output (h2) meets the column roles of issue 14 (h6), on an invented vet-clinic log:
 * - a time column (role time) is passed through as the text it holds (VARCHAR), stray spellings
 *   included — not cast to a timestamp, which would refuse or null them;
 * - a numeric identifier (role identifier) is dropped; `--keep` passes it as VARCHAR, never a number;
 * - a small-integer column (0–4 pets, role numeric however few values) is written BIGINT, a
 *   decimal column DOUBLE, with the same sums as DuckDB reading the input (the external check).
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { encode } from "../../src/commands/encode.js";
import { withEngine } from "../../src/engine/db.js";
import type { Profile } from "../../src/profile/types.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";
import { column, parseCsv, scanPlan } from "./helpers.js";

const dir = tempDir("encode-typed-roles");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const planDir = path.join(dir, "plan");
const ROWS = 400;
const rand = mulberry32(14);
const lines = ["visit_id,visit_date,species,pets_in_household,weight_kg,no_show"];
for (let i = 0; i < ROWS; i++) {
  const day = new Date(Date.UTC(2025, 0, 1) + Math.floor(rand() * 300) * 86_400_000).toISOString().slice(0, 10);
  const date = i % 100 === 7 ? "unknown" : day; // 4 of 400 (1 %) do not read as a date
  const species = ["dog", "cat", "rabbit"][Math.floor(rand() * 3)]!;
  lines.push(`${100_000 + i * 7},${date},${species},${Math.floor(rand() * 5)},${(1 + rand() * 40).toFixed(2)},${rand() < 0.2 ? 1 : 0}`);
}
const file = writeFile(dir, "visits.csv", `${lines.join("\n")}\n`);
let profile: Profile;

const describeFile = (f: string) => withEngine({ threads: 1 }, (e) =>
  e.rows<{ column_name: string; column_type: string }>(`DESCRIBE SELECT * FROM read_parquet('${f}')`, "describe"));
const role = (name: string) => profile.columns.find((c) => c.name === name)?.role;

beforeAll(async () => {
  profile = await scanPlan(file, planDir, ["--target", "no_show"]);
}, 300_000);

describe("typed output keeps the column roles", () => {
  it("scan: roles and number types", () => {
    expect(role("visit_date")).toBe("time");
    expect(role("visit_id")).toBe("identifier");
    expect(role("pets_in_household")).toBe("numeric");
    const byName = new Map(profile.columns.map((c) => [c.name, c]));
    expect(byName.get("pets_in_household")?.numberType).toBe("integer");
    expect(byName.get("weight_kg")?.numberType).toBe("double");
    // numberType is for role numeric only: not the time column, not the identifier
    expect(byName.get("visit_date")?.numberType).toBeUndefined();
    expect(byName.get("visit_id")?.numberType).toBeUndefined();
  });

  it("Parquet: time column VARCHAR as read, identifier dropped, small integers BIGINT, decimals DOUBLE", async () => {
    const out = path.join(dir, "score.parquet");
    await encode([file], { plan: planDir, out, mode: "scoring" });
    const types = new Map((await describeFile(out)).map((r) => [r.column_name, r.column_type]));
    expect(types.get("visit_date")).toBe("VARCHAR");
    expect(types.has("visit_id")).toBe(false);
    expect(types.get("pets_in_household")).toBe("BIGINT");
    expect(types.get("weight_kg")).toBe("DOUBLE");
    const [r] = await withEngine({ threads: 1 }, (e) => e.rows<Record<string, number>>(
      `SELECT (SELECT sum(pets_in_household) FROM read_parquet('${out}'))::DOUBLE AS a,
              (SELECT sum(pets_in_household::BIGINT) FROM read_csv('${file}', all_varchar = true))::DOUBLE AS b`, "sums"));
    expect(r!.a).toBe(r!.b);
    // every time value, the stray 'unknown' included, exactly as written, in row order
    const dates = await withEngine({ threads: 1 }, (e) => e.rows<{ d: string }>(`SELECT visit_date AS d FROM read_parquet('${out}')`, "dates"));
    expect(dates.map((x) => x.d)).toEqual(lines.slice(1).map((l) => l.split(",")[1]));
  }, 300_000);

  it("--keep passes the numeric identifier through as text", async () => {
    const out = path.join(dir, "kept.csv");
    await encode([file], { plan: planDir, out, mode: "scoring", keep: ["visit_id"] });
    const pq = path.join(dir, "kept.parquet");
    await encode([file], { plan: planDir, out: pq, mode: "scoring", keep: ["visit_id"] });
    const types = new Map((await describeFile(pq)).map((r) => [r.column_name, r.column_type]));
    expect(types.get("visit_id")).toBe("VARCHAR");
    expect(column(parseCsv(fs.readFileSync(out, "utf8")), "visit_id")).toEqual(lines.slice(1).map((l) => l.split(",")[0]));
  }, 300_000);
});
