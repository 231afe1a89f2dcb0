/**
 * Hashing of backoff groups (scan's advice for identifier-like nesting codes without a target)
 * against a row-by-row reference (test/encode/hashedGroupsReference.ts: groups re-derived by
 * hand-coded loops from the training counts, buckets by node:crypto MD5), on seeded 5-digit
 * postcodes mostly seen once under 3-digit districts (test/encode/postcodeData.ts). The plan is
 * a real `scan --out` of the training file; encode's output must reproduce the collision share
 * that scan measured for the width it chose.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { encode } from "../../src/commands/encode.js";
import type { EncodeSummary } from "../../src/encode/types.js";
import type { Profile } from "../../src/profile/types.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";
import { backoffGroupOf, type GroupOf } from "./hierarchyBruteForce.js";
import { collisionRowShare, hashedGroups, keyBucket, splitGroup } from "./hashedGroupsReference.js";
import { column, parseCsv, type Cell } from "./helpers.js";
import { groupCounts, planWith, readRows } from "./hierarchyHelpers.js";
import { postcodeData } from "./postcodeData.js";

const dir = tempDir("encode-hashgroups");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const trainFile = writeFile(dir, "train.csv", postcodeData(1500, 7, false));
const laterFile = writeFile(dir, "later.csv", postcodeData(600, 8, true));
const train = column(parseCsv(fs.readFileSync(trainFile, "utf8")), "postcode");
const later = column(parseCsv(fs.readFileSync(laterFile, "utf8")), "postcode");
const planDir = path.join(dir, "plan");
let params: Record<string, unknown>;
let width: number;
let groupOf: GroupOf;

/** The CLI in-process (src/cli.ts), failing the test with stderr on a non-zero exit. */
async function cli(argv: string[]): Promise<string> {
  const c = collector();
  const code = await runCli(argv, c.io);
  if (code !== 0) throw new Error(`exit ${code}: ${c.err}`);
  return c.out;
}

/** Rows per code in the training file: the counts the backoff grouping reads. */
function rowsPerCode(codes: readonly Cell[]): Map<string, number> {
  const out = new Map<string, number>();
  for (const c of codes) if (c !== null) out.set(c, (out.get(c) ?? 0) + 1);
  return out;
}

async function encodeRows(file: string, mode: "training" | "scoring", name: string, plan = planDir): Promise<{ rows: Record<string, unknown>[]; summary: EncodeSummary; out: string }> {
  const out = path.join(dir, `${name}.parquet`);
  const json = await cli(["encode", file, "--plan", plan, "--out", out, "--for", mode, "--keep", "id", "--format", "json"]);
  return { rows: await readRows(out), summary: JSON.parse(json) as EncodeSummary, out };
}

beforeAll(async () => {
  // --collision-budget 0.2: the chosen width has colliding groups, so the share check below can fail
  // --max-hash-bits 4: more groups than 16 buckets, so the groups are hashed rather than indexed (advice/hashWidth)
  await cli(["scan", trainFile, "--out", planDir, "--as-categorical", "postcode", "--collision-budget", "0.2", "--max-hash-bits", "4", "--quiet"]);
  const profile = JSON.parse(fs.readFileSync(path.join(planDir, "profile.json"), "utf8")) as Profile;
  const rec = profile.columns.find((c) => c.name === "postcode")!.recommendation;
  expect(rec.encoding).toBe("hashing");
  expect(rec.params.grouping).toBe("backoff");
  params = rec.params;
  width = params.width as number;
  const parents = params.parents as { kind: string; length: number }[];
  expect(parents.every((p) => p.kind === "prefix")).toBe(true);
  groupOf = backoffGroupOf(rowsPerCode(train), parents.map((p) => p.length).reverse(), params.minRows as number);
});

describe("hashing of backoff groups", () => {
  it("scan's plan: hashing with grouping \"backoff\"; the data has own groups, parent groups, \"other\" and colliding buckets", () => {
    expect(profileTarget()).toBeUndefined();
    const depths = new Set([...rowsPerCode(train).keys()].map((l) => splitGroup(groupOf(l)).depth));
    expect([depths.has(0), [...depths].some((d) => d > 0), depths.has(-1)]).toEqual([true, true, true]);
    expect(params.collisionRowShare as number).toBeGreaterThan(0);
    expect(params.salt).toBe("");
  });

  it("training on the scanned file: every row's bucket as the reference computes it; scoring gives the same values", async () => {
    const trained = await encodeRows(trainFile, "training", "train-training");
    const expected = hashedGroups(train, groupOf, width);
    expect(trained.rows.map((r) => r.postcode)).toEqual(expected);
    expect(trained.rows.map((r) => r.id)).toEqual(column(parseCsv(fs.readFileSync(trainFile, "utf8")), "id"));
    expect(trained.rows.every((r) => typeof r.fold === "number")).toBe(true);
    const scored = await encodeRows(trainFile, "scoring", "train-scoring");
    expect(scored.rows.map((r) => r.postcode)).toEqual(expected);
    const c = trained.summary.columns[0]!;
    expect(c).toMatchObject({ column: "postcode", encoding: "hashing", missing: train.filter((l) => l === null).length, unseen: 0 });
    expect(c.fallback).toBe(expected.filter((b) => b === width).length);
    expect(c.grouping).toEqual({ kind: "backoff", ...groupCounts(train, groupOf, new Set(train)) });
    expect(scored.summary.columns[0]).toEqual(c);
  });

  it("the share of rows whose group shares a bucket with another group, from encode's output, is scan's collisionRowShare", async () => {
    const { rows } = await encodeRows(trainFile, "scoring", "train-collisions");
    const groups = train.map((l) => (l === null ? null : groupOf(l)));
    // exact: the same integer counts divided once, here and in hierarchy/backoffHashing
    expect(collisionRowShare(groups, rows.map((r) => r.postcode), width)).toBe(params.collisionRowShare);
  });

  it("a later file: unseen codes take their deepest parent group's bucket, an unseen district \"other\" (width), missing NULL", async () => {
    const scored = await encodeRows(laterFile, "scoring", "later-scoring");
    const expected = hashedGroups(later, groupOf, width);
    expect(scored.rows.map((r) => r.postcode)).toEqual(expected);
    expect(expected[later.findIndex((l) => l?.startsWith("444"))]).toBe(width); // no training code starts with "4"
    const seen = new Set(train);
    const unseen = later.filter((l): l is string => l !== null && !seen.has(l));
    expect(unseen.filter((l) => splitGroup(groupOf(l)).depth > 0).length).toBeGreaterThan(0);
    const c = scored.summary.columns[0]!;
    expect(c.missing).toBe(later.filter((l) => l === null).length);
    expect(c.unseen).toBe(unseen.length);
    expect(c.fallback).toBe(expected.filter((b) => b === width).length);
    expect(c.grouping).toEqual({ kind: "backoff", ...groupCounts(later, groupOf, seen) });
    const trained = await encodeRows(laterFile, "training", "later-training"); // an input pass; no target involved
    expect(trained.rows.map((r) => r.postcode)).toEqual(expected);
    expect(trained.summary.levelSource).toBe("input pass");
  });

  it("the mapping file and manifest alone reproduce the later output", async () => {
    const { out, rows } = await encodeRows(laterFile, "scoring", "later-maps");
    const maps = `${out}.mappings`;
    const manifest = JSON.parse(fs.readFileSync(path.join(maps, "mappings.json"), "utf8")) as { columns: { file: string; params: { width: number; otherIndex: number; depths: { depth: number; parent: { length: number } }[] } }[] };
    const entry = manifest.columns[0]!;
    expect([entry.file, entry.params.width, entry.params.otherIndex]).toEqual(["postcode.parquet", width, width]);
    const file = await readRows(path.join(maps, entry.file));
    expect(Object.keys(file[0]!)).toEqual(["level", "seen", "rows", "depth", "group_key", "bucket"]);
    for (const r of file) {
      if (r.seen) expect(`${String(r.depth)}|${String(r.group_key)}`, String(r.level)).toBe(groupOf(String(r.level)));
      expect(r.bucket, String(r.level)).toBe(Number(r.depth) < 0 ? width : keyBucket(String(r.group_key), width));
    }
    const bySeen = new Map(file.filter((r) => r.seen).map((r) => [String(r.level), Number(r.bucket)]));
    const groupBucket = new Map(file.map((r) => [`${String(r.depth)}|${String(r.group_key)}`, Number(r.bucket)]));
    const served = later.map((level) => {
      if (level === null) return null;
      const own = bySeen.get(level);
      if (own !== undefined) return own;
      for (const d of [...entry.params.depths].reverse()) {
        const b = groupBucket.get(`${d.depth}|${level.slice(0, d.parent.length)}`);
        if (b !== undefined) return b;
      }
      return entry.params.otherIndex;
    });
    expect(rows.map((r) => r.postcode)).toEqual(served);
  });

  it("a salt is prefixed to the group key; join lookups give the same bytes as ENUM lookups", async () => {
    const salted = planWith(planDir, path.join(dir, "plan-salt"), "postcode", { ...params, salt: "clinic-" }, "hashing");
    const { rows } = await encodeRows(laterFile, "scoring", "later-salt", salted);
    expect(rows.map((r) => r.postcode)).toEqual(hashedGroups(later, groupOf, width, "clinic-"));
    const viaEnum = path.join(dir, "later-enum.csv");
    const viaJoin = path.join(dir, "later-join.csv");
    await encode([laterFile], { plan: planDir, out: viaEnum, mode: "scoring", keep: ["id"], lookup: "enum" });
    await encode([laterFile], { plan: planDir, out: viaJoin, mode: "scoring", keep: ["id"], lookup: "join" });
    expect(fs.readFileSync(viaJoin, "utf8")).toBe(fs.readFileSync(viaEnum, "utf8"));
  });
});

describe("plans encode refuses", () => {
  it.each([
    ["a grouping on frequency", { grouping: "backoff" }, "frequency", "unsupported_plan", /a grouping only with target-kfold, hashing or codes/],
    ["an unknown grouping on hashing", { grouping: "clusters" }, "hashing", "bad_plan", /unknown params.grouping 'clusters'/],
    ["hashing with malformed parents", { parents: [] }, "hashing", "bad_plan", /params.parents must be a non-empty list/],
  ] as const)("%s", async (name, change, encoding, code, message) => {
    const plan = planWith(planDir, path.join(dir, `refused-${name.replace(/\W+/g, "-")}`), "postcode", { ...params, ...change }, encoding);
    const out = path.join(dir, "refused.parquet");
    const c = collector();
    expect(await runCli(["encode", trainFile, "--plan", plan, "--out", out, "--for", "scoring"], c.io)).toBe(2);
    expect(c.err).toMatch(message);
    expect(fs.existsSync(out)).toBe(false);
    await expect(encode([trainFile], { plan, out, mode: "scoring" })).rejects.toMatchObject({ code });
  });
});

function profileTarget(): unknown {
  return (JSON.parse(fs.readFileSync(path.join(planDir, "profile.json"), "utf8")) as Profile).target;
}
