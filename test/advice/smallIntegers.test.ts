/**
 * Issue 14, point 10: numeric columns with few values (counts such as visits last year, 0–5)
 * stay numeric unless --as-categorical names them, and the record says how many values they
 * have (exact: counted in the pass; checked against a brute-force count). Invented vet-clinic
 * data. On the old code a numeric column with at most 20 distinct values was profiled as levels.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { renderDecisionRecord } from "../../src/render/markdown.js";
import type { ColumnProfile, Profile } from "../../src/profile/types.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("smallint");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const rand = mulberry32(5);
const rows = Array.from({ length: 500 }, () => [
  String(Math.floor(rand() * rand() * 6)),               // prior_visits: 0–5, skewed
  rand() < 0.5 ? "1" : "2",                              // litter_size_code: two values
  rand() < 0.1 ? "" : String(Math.floor(rand() * 15)),   // teeth_cleaned: 0–14, some missing
  ["cat", "dog", "rabbit"][Math.floor(rand() * 3)]!,
]);
const file = writeFile(dir, "pets.csv", ["prior_visits,litter_size_code,teeth_cleaned,species", ...rows.map((r) => r.join(","))].join("\n") + "\n");
const distinct = (k: number) => new Set(rows.map((r) => r[k]).filter((v) => v !== "")).size;
const col = (p: Profile, name: string): ColumnProfile => {
  const c = p.columns.find((x) => x.name === name);
  if (!c) throw new Error(`no column ${name}`);
  return c;
};

describe("small-integer numeric columns", () => {
  it("stay numeric with their exact number of values", async () => {
    const p = await scan([file]);
    for (const [name, k] of [["prior_visits", 0], ["litter_size_code", 1], ["teeth_cleaned", 2]] as const) {
      const c = col(p, name);
      expect(c.role).toBe("numeric");
      expect(c.recommendation.encoding).toBe("keep");
      expect(c.numericValues).toMatchObject({ distinct: distinct(k), exact: true, integer: true });
      expect(c.recommendation.reasons[0]).toContain(`${distinct(k)} distinct value${distinct(k) === 1 ? "" : "s"} (exact)`);
    }
    expect(col(p, "teeth_cleaned").missing).toBe(rows.filter((r) => r[2] === "").length);
    expect(col(p, "species").role).toBe("categorical");
    expect(renderDecisionRecord(p)).toContain(`${distinct(0)} (exact)`);
  }, 120_000);

  it("are profiled as levels when --as-categorical names them", async () => {
    const p = await scan([file], { asCategorical: ["prior_visits"] });
    const c = col(p, "prior_visits");
    expect(c.role).toBe("categorical");
    expect(c.distinct).toBe(distinct(0));
    expect(c.numericValues).toBeUndefined();
    expect(col(p, "litter_size_code").role).toBe("numeric");
  }, 120_000);
});
