/**
 * Rules on generated columns of each shape, run through the full scan so the figures that decide
 * are the real ones. Each test asserts the encoding and that the reasons carry the deciding numbers.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { collisionTable } from "../../src/engine/hashing.js";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { expectedBucketsUsed } from "../../src/stats/expectedBucketsUsed.js";
import type { ColumnProfile, Profile } from "../../src/profile/types.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("rules");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const ROWS = 8000;
function shapesCsv(seed: number): string {
  const rand = mulberry32(seed);
  const lines = ["id,constant,binary,small,concentrated,wide_signal,wide_noise,y"];
  for (let i = 0; i < ROWS; i++) {
    const small = ["a", "b", "c", "d", "e"][Math.floor(rand() * 5)]!;
    // concentrated long tail: 8 big levels hold ~97 % of rows, 300 tiny ones the rest
    const concentrated = rand() < 0.97 ? `big${Math.floor(rand() * 8)}` : `tail${Math.floor(rand() * 300)}`;
    const signalLevel = Math.floor(rand() * 200);
    const noiseLevel = Math.floor(rand() * 400);
    const p = 0.05 + 0.4 * (signalLevel % 10) / 10;
    const y = rand() < p ? 1 : 0;
    lines.push(`${i},same,${rand() < 0.3 ? "yes" : "no"},${small},${concentrated},w${signalLevel},z${noiseLevel},${y}`);
  }
  return `${lines.join("\n")}\n`;
}

const col = (p: Profile, name: string): ColumnProfile => p.columns.find((c) => c.name === name)!;
const file = writeFile(dir, "shapes.csv", shapesCsv(3));

describe("advice with a target", () => {
  let p: Profile;
  it("drops constants and identifiers with the numbers", async () => {
    p = await scan([file], { target: "y", asCategorical: ["id"] });
    expect(col(p, "constant").recommendation.encoding).toBe("drop");
    expect(col(p, "constant").recommendation.reasons[0]).toContain("single level ('same')");
    expect(col(p, "id").recommendation.encoding).toBe("drop");
    expect(col(p, "id").recommendation.reasons[0]).toContain("8,000 distinct levels in 8,000 non-missing rows");
  });

  it("indicator for two levels, one-hot for few well-filled levels, pooled one-hot for a concentrated tail", () => {
    expect(col(p, "binary").recommendation).toMatchObject({ encoding: "indicator", params: { one: "yes", zero: "no" } });
    expect(col(p, "small").recommendation.encoding).toBe("one-hot");
    expect(col(p, "small").recommendation.reasons[0]).toMatch(/5 levels fit the one-hot width of 16/);
    const pooled = col(p, "concentrated").recommendation;
    expect(pooled.encoding).toBe("pooled-one-hot");
    expect(pooled.params.keep).toHaveLength(8);
    expect(pooled.params.pooledRowShare as number).toBeGreaterThan(0.01);
    expect(pooled.reasons.join(" ")).toMatch(/top 8 cover 9\d\.\d % of non-missing rows/);
  });

  it("target-kfold for a wide column with signal, frequency for one without", () => {
    const wide = col(p, "wide_signal").recommendation;
    expect(wide.encoding).toBe("target-kfold");
    expect(wide.params).toMatchObject({ folds: 5, seed: 42 });
    expect(wide.reasons.join(" ")).toMatch(/m = [\d,.]+ by beta-binomial moments/);
    expect(wide.reasons.join(" ")).toMatch(/out-of-fold AUC 0\.\d{3}/);
    const noise = col(p, "wide_noise").recommendation;
    expect(noise.encoding).toBe("frequency");
    expect(noise.reasons[0]).toMatch(/no detectable between-level signal|indistinguishable from no signal/);
  });
});

describe("advice without a target: hashing width from exact collisions", () => {
  it("chooses the smallest power of two within the collision budget", async () => {
    const p = await scan([file], { columns: ["wide_noise"] });
    const c = col(p, "wide_noise");
    expect(c.recommendation.encoding).toBe("hashing");
    const cands = c.hashing!.candidates;
    const chosen = cands.find((x) => x.collisionRowShare <= 0.01)!;
    expect(c.recommendation.params.width).toBe(chosen.width);
    expect(cands.filter((x) => x.width < chosen.width).every((x) => x.collisionRowShare > 0.01)).toBe(true);
    expect(c.recommendation.reasons.join(" ")).toContain(`${chosen.width.toLocaleString("en-US")} is the smallest power of two`);
  });

  it("bucket numbers equal an independent node:crypto computation, and collisions match a direct count", async () => {
    const levels = Array.from({ length: 1024 }, (_, i) => `level-${i}`);
    // each level on 3 rows, so the column is categorical (not identifier-like)
    const csv = writeFile(dir, "uniform.csv", `k\n${[...levels, ...levels, ...levels].join("\n")}\n`);
    const width = 1024;
    // independent: MD5 of UTF-8 bytes, first 8 bytes little-endian, mod width
    const buckets = levels.map((l) => Number(createHash("md5").update(l, "utf8").digest().readBigUInt64LE(0) % BigInt(width)));
    const perBucket = new Map<number, number>();
    for (const b of buckets) perBucket.set(b, (perBucket.get(b) ?? 0) + 1);
    const colliding = buckets.filter((b) => (perBucket.get(b) ?? 0) > 1).length;
    await withEngine({}, async (e) => {
      const rows = await e.rows<{ k: string; b: number }>(
        `SELECT k, (md5_number_upper(k) % ${width})::BIGINT AS b FROM read_csv(${quoteLiteral(csv)}, all_varchar = true) ORDER BY k`, "test");
      const sql = new Map(rows.map((r) => [r.k, r.b]));
      levels.forEach((l, i) => expect(sql.get(l)).toBe(buckets[i]));
    });
    const p = await scan([csv], { columns: ["k"] });
    const cand = p.columns[0]!.hashing?.candidates.find((x) => x.width === width);
    expect(cand?.collidingLevels).toBe(colliding);
    // Expected buckets used by n = w = 1024 uniform levels: 647.475 (docs/references.md "Hashing collisions", recomputed); the
    // real hash should land near it (binomial-ish spread, a few standard deviations ≈ ±40).
    expect(expectedBucketsUsed(1024, 1024)).toBeCloseTo(647.475, 3);
    expect(Math.abs(perBucket.size - 647.475)).toBeLessThan(40);
  });

  it("collisionTable is exact on a hand-made level table", async () => {
    await withEngine({}, async (e) => {
      await e.run(`CREATE TEMP TABLE tailsift_level_totals AS SELECT * FROM (VALUES (0, 'a', 5), (0, 'b', 3), (0, 'c', 2), (0, NULL, 9)) t(col, level, rows)`, "test");
      const rows = await collisionTable(e, [0], [1, 2]);
      // width 1: all three levels share bucket 0 → 10 colliding rows of 10 (missing is not hashed)
      expect(rows[0]).toMatchObject({ width: 1, collidingLevels: 3, collisionRows: 10, rows: 10 });
      const w2 = rows[1]!;
      const b = (s: string) => Number(createHash("md5").update(s).digest().readBigUInt64LE(0) % 2n);
      const groups = new Map<number, string[]>();
      for (const l of ["a", "b", "c"]) groups.set(b(l), [...(groups.get(b(l)) ?? []), l]);
      const weight: Record<string, number> = { a: 5, b: 3, c: 2 };
      const expected = [...groups.values()].filter((g) => g.length > 1).flat().reduce((s, l) => s + weight[l]!, 0);
      expect(w2.collisionRows).toBe(expected);
    });
  });
});
