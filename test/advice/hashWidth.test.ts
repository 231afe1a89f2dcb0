/**
 * Issue 14, point 9: hashing widths a model can take. (1) The done-when check on an open data
 * set, vega-datasets zipcodes.csv (no target): no hashing width above the cap 2^20, `state` not
 * hashed, the zip backoff groups indexed — with the frequent-level counts recomputed
 * independently with d3-dsv. (2) Invented vet-clinic data: a handful of busy clinics plus a long
 * uniform tail of one-visit referrers — the budget is judged on the busy levels' rows, so the
 * vocabulary is indexed, and with a cap smaller than the vocabulary it is hashed at the cap with
 * the colliding share stated (recomputed with node:crypto MD5). (3) The option is validated.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { csvParse } from "d3-dsv";
import { afterAll, describe, expect, it } from "vitest";
import { chooseHashWidth, levelsThatMatter } from "../../src/advice/hashWidth.js";
import { DEFAULT_POLICY } from "../../src/advice/policy.js";
import { runCli } from "../../src/cli.js";
import { scan } from "../../src/commands/scan.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("hash-width");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const zipFile = path.join(process.cwd(), "node_modules", "vega-datasets", "data", "zipcodes.csv");

describe("vega-datasets zipcodes.csv without a target", () => {
  it("no width above the cap; state, city and county indexed; zip backoff groups indexed", async () => {
    const profile = await scan([zipFile], { asCategorical: ["zip_code"] });
    for (const c of profile.columns) {
      if (c.recommendation.encoding === "hashing") expect(c.recommendation.params.width as number, c.name).toBeLessThanOrEqual(2 ** 20);
      if (c.hashing) expect(c.hashing.width, c.name).toBeLessThanOrEqual(2 ** 20);
    }
    const rows = csvParse(fs.readFileSync(zipFile, "utf8"));
    const byName = (n: string) => profile.columns.find((c) => c.name === n)!;
    for (const name of ["state", "city", "county"]) {
      const rec = byName(name).recommendation;
      expect(rec.encoding, name).toBe("codes");
      // the table holds exactly the levels with at least 30 rows (minLevelRows) when they hold half
      // the rows, else those seen more than once — counted here independently
      const counts = new Map<string, number>();
      for (const r of rows) if (r[name]) counts.set(r[name]!, (counts.get(r[name]!) ?? 0) + 1);
      const total = [...counts.values()].reduce((a, b) => a + b, 0);
      const busy = [...counts.values()].filter((n) => n >= 30);
      const bar = busy.reduce((a, b) => a + b, 0) >= 0.5 * total ? 30 : 2;
      expect(rec.params.tableSize, name).toBe([...counts.values()].filter((n) => n >= bar).length);
      expect(byName(name).hashing?.frequent?.minRows, name).toBe(bar);
    }
    const zip = byName("zip_code").recommendation;
    expect(zip.encoding).toBe("codes");
    expect(zip.params.grouping).toBe("backoff");
    expect(zip.params.tableSize).toBe(zip.params.groups);
    expect(zip.params.tableSize as number).toBeLessThanOrEqual(2 ** 20);
  }, 120_000);
});

/** Bucket of the hashing trick in Node (MD5 first 8 bytes, little-endian, mod width; engine/hashing). */
const bucket = (level: string, width: number) => Number(createHash("md5").update(level, "utf8").digest().readBigUInt64LE(0) % BigInt(width));

describe("invented referrers: busy clinics and a uniform tail of 1,000 one-visit referrers (42 % of rows: categorical, not identifier-like)", () => {
  // no delimiters and mixed letter/digit positions in the tail, so no hierarchy is detected
  const busy = Array.from({ length: 40 }, (_, k) => `clinic${String(k).padStart(2, "0")}`);
  const lines = ["referrer"];
  for (const b of busy) for (let k = 0; k < 35; k++) lines.push(b);
  for (let k = 0; k < 1000; k++) lines.push(`w${createHash("md5").update(String(k)).digest("hex").slice(0, 10)}`);
  const file = writeFile(dir, "referrers.csv", `${lines.join("\n")}\n`);

  it("the busy clinics are indexed, however long the tail", async () => {
    const profile = await scan([file], {});
    const c = profile.columns[0]!;
    expect(c.recommendation.encoding).toBe("codes");
    expect(c.recommendation.params.tableSize).toBe(busy.length);
    expect(c.hashing?.frequent).toEqual({ minRows: 30, levels: busy.length, rowShare: (busy.length * 35) / (lines.length - 1) });
  });

  it("a cap below the vocabulary: hashed at the cap, the colliding share of the busy rows stated", async () => {
    const profile = await scan([file], { policy: { hashMaxBits: 5 } });
    const c = profile.columns[0]!;
    expect(c.recommendation.encoding).toBe("hashing");
    expect(c.recommendation.params.width).toBe(32);
    // brute force: rows of busy clinics whose bucket holds another busy clinic, over busy rows
    const per = new Map<number, number>();
    for (const b of busy) per.set(bucket(b, 32), (per.get(bucket(b, 32)) ?? 0) + 1);
    const colliding = busy.filter((b) => per.get(bucket(b, 32))! > 1).length;
    expect(c.recommendation.params.collisionRowShare).toBeCloseTo(colliding / busy.length, 12);
    expect(c.recommendation.reasons.join(" ")).toContain("--max-hash-bits 5");
  });

  it("pure choice: widths past the cap are never taken; no frequent level → smallest width", () => {
    const policy = { ...DEFAULT_POLICY, hashMaxBits: 6 };
    const cands = [16, 32, 64, 128].map((width) => ({ width, collisionRowShare: width >= 128 ? 0 : 0.5 }));
    expect(chooseHashWidth(cands, 100, 0.9, policy)).toMatchObject({ kind: "hashing", width: 64, atCap: true, collisionRowShare: 0.5 });
    expect(chooseHashWidth(cands, 50, 0.9, policy).kind).toBe("codes");
    expect(chooseHashWidth([], 0, 0, policy)).toMatchObject({ kind: "hashing", width: 16, collisionRowShare: 0 });
    expect(levelsThatMatter([{ count: 1, levels: 10 }, { count: 30, levels: 2 }], 30)).toEqual({ minRows: 30, levels: 2, rowShare: 60 / 70 });
    // the frequent levels hold under half the rows: the bar drops to levels seen more than once
    expect(levelsThatMatter([{ count: 1, levels: 10 }, { count: 3, levels: 4 }, { count: 30, levels: 0 }], 30)).toEqual({ minRows: 2, levels: 4, rowShare: 12 / 22 });
    expect(levelsThatMatter([{ count: 1, levels: 10 }], 30)).toEqual({ minRows: 1, levels: 10, rowShare: 1 });
  });

  it("--max-hash-bits out of range: one-line error, exit 2", async () => {
    const c = collector();
    expect(await runCli(["scan", file, "--max-hash-bits", "31"], c.io)).toBe(2);
    expect(c.err.trim().split("\n")).toHaveLength(1);
    expect(c.err).toContain("--max-hash-bits");
  });
});
