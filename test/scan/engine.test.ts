/**
 * Engine tests on small hand-made files whose answers are worked out by hand in the comments.
 */
import fs from "node:fs";
import path from "node:path";
import zlib from "node:zlib";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import type { ColumnProfile, Profile } from "../../src/profile/types.js";
import { tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("engine");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// 10 rows. code: 007 ×3, 07 ×2, 7 ×1, 00501 ×1, missing ×3 (empty field).
// breed: "Labrador" ×4, "labrador " ×1 (trailing space), " LABRADOR" ×1, "Poodle" ×2, "Pug" ×1, "Beagle" ×1.
const CSV = `id,code,breed,constant
1,007,Labrador,x
2,007,Labrador,x
3,007,Labrador,x
4,07,Labrador,x
5,07,labrador ,x
6,7, LABRADOR,x
7,00501,Poodle,x
8,,Poodle,x
9,,Pug,x
10,,Beagle,x
`;

const col = (p: Profile, name: string): ColumnProfile => {
  const c = p.columns.find((x) => x.name === name);
  if (!c) throw new Error(`no column ${name}`);
  return c;
};

describe("scan of a small hand-made CSV", () => {
  const file = writeFile(dir, "small.csv", CSV);
  let profile: Profile;

  it("keeps codes as text: 007, 07 and 7 are three levels and leading zeros survive", async () => {
    profile = await scan([file], { asCategorical: ["id"] });
    const code = col(profile, "code");
    expect(profile.input.rows).toBe(10);
    expect(code.missing).toBe(3);
    expect(code.distinct).toBe(4); // 007, 07, 7, 00501
    expect(code.topLevels.map((l) => [l.value, l.rows])).toEqual([["007", 3], ["07", 2], ["00501", 1], ["7", 1]]); // ties by value
    expect(code.singletons).toBe(2);
    // Good-Turing: singletons / non-missing rows = 2 / 7
    expect(code.unseenRate).toBeCloseTo(2 / 7, 12);
  });

  it("computes entropy, coverage and rare levels exactly", () => {
    const code = col(profile, "code");
    // shares 3/7, 2/7, 1/7, 1/7: H = −Σ p log2 p
    const p = [3 / 7, 2 / 7, 1 / 7, 1 / 7];
    const h = -p.reduce((s, x) => s + x * Math.log2(x), 0);
    expect(code.entropyBits).toBeCloseTo(h, 12);
    expect(code.effectiveLevels).toBeCloseTo(Math.exp(h * Math.LN2), 12);
    // 50 % of 7 rows = 3.5 → 2 levels (3 + 2); 95 % = 6.65 → 4 levels
    expect(code.coverage.find((c) => c.share === 0.5)?.levels).toBe(2);
    expect(code.coverage.find((c) => c.share === 0.95)?.levels).toBe(4);
    // at most 1 row: 2 levels, 2/7 of rows; at most 5 rows: all 4 levels
    expect(code.rare.find((r) => r.minRows === 1)).toEqual({ minRows: 1, levels: 2, rowShare: 2 / 7 });
    expect(code.rare.find((r) => r.minRows === 5)?.levels).toBe(4);
  });

  it("finds case/space variants", () => {
    const breed = col(profile, "breed");
    // "Labrador", "labrador ", " LABRADOR" collapse: 1 group, 3 levels, 6 of 10 rows
    expect(breed.variants?.groups).toBe(1);
    expect(breed.variants?.levels).toBe(3);
    expect(breed.variants?.rowShare).toBeCloseTo(0.6, 12);
    expect(breed.variants?.examples[0]).toEqual(["Labrador", " LABRADOR", "labrador "]);
  });

  it("assigns roles: constant, identifier", () => {
    expect(col(profile, "constant").role).toBe("constant");
    expect(col(profile, "constant").recommendation.encoding).toBe("drop");
    expect(col(profile, "id").role).toBe("identifier"); // 10 distinct in 10 rows
  });

  it("reads the same figures from TSV, .csv.gz, Parquet and JSON lines", async () => {
    const tsv = writeFile(dir, "small.tsv", CSV.replaceAll(",", "\t"));
    const gz = writeFile(dir, "small.csv.gz", zlib.gzipSync(CSV));
    const parquet = path.join(dir, "small.parquet");
    const jsonl = path.join(dir, "small.jsonl");
    await withEngine({}, async (e) => {
      await e.run(`COPY (SELECT * FROM read_csv(${quoteLiteral(file)}, all_varchar = true)) TO ${quoteLiteral(parquet)} (FORMAT parquet)`, "test");
      await e.run(`COPY (SELECT * FROM read_csv(${quoteLiteral(file)}, all_varchar = true)) TO ${quoteLiteral(jsonl)} (FORMAT json)`, "test");
    });
    for (const f of [tsv, gz, parquet, jsonl]) {
      const p = await scan([f], { asCategorical: ["id"] });
      const strip = (c: ColumnProfile) => ({ ...c });
      expect(p.columns.map(strip), f).toEqual(profile.columns.map(strip));
    }
  });

  it("scans several files and a glob as one extract", async () => {
    const lines = CSV.trim().split("\n");
    const a = writeFile(dir, "part-a.csv", `${lines.slice(0, 6).join("\n")}\n`);
    writeFile(dir, "part-b.csv", `${[lines[0], ...lines.slice(6)].join("\n")}\n`);
    const both = await scan([a, path.join(dir, "part-b.csv")], { asCategorical: ["id"] });
    const glob = await scan([path.join(dir, "part-*.csv")], { asCategorical: ["id"] });
    expect(both.input.rows).toBe(10);
    expect(col(both, "code")).toEqual(col(profile, "code"));
    expect(col(glob, "code")).toEqual(col(profile, "code"));
  });
});
