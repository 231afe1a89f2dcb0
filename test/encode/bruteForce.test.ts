/**
 * Every encoding against a brute-force reference computed row by row in plain TypeScript
 * (test/encode/bruteForce.ts), for training and scoring, with unseen and missing levels.
 * The folds the references use are read from encode's fold column, and that column is checked
 * separately against the fold scan assigns (foldSql run in DuckDB over the same file, joined
 * on the unique id).
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { encode } from "../../src/commands/encode.js";
import { rowHashFoldSql as foldSql } from "../../src/engine/folds.js";
import { withEngine } from "../../src/engine/db.js";
import { openSource } from "../../src/engine/source.js";
import { safeName } from "../../src/encode/safeNames.js";
import type { EncodeSummary } from "../../src/encode/types.js";
import type { Profile } from "../../src/profile/types.js";
import { tempDir, writeFile } from "../helpers/tmp.js";
import * as bf from "./bruteForce.js";
import { type Cell, type Csv, column, editParams, md5Bucket, ok, parseCsv, scanPlan, smallData } from "./helpers.js";

const dir = tempDir("encode-bf");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const trainFile = writeFile(dir, "train.csv", smallData(400, 11, false));
const laterFile = writeFile(dir, "later.csv", smallData(150, 12, true));
const train = parseCsv(fs.readFileSync(trainFile, "utf8"));
const later = parseCsv(fs.readFileSync(laterFile, "utf8"));
const planDir = path.join(dir, "plan");
const M = 7.5;
let profile: Profile;

/** The written name of a one-hot column (safe names are the default: encode/safeNames). */
const oh = (col: string, level: string) => safeName(`${col}=${level}`);
const ys = (csv: Csv) => column(csv, "y").map((v) => (v === null ? null : Number(v)));
const read = (file: string) => parseCsv(fs.readFileSync(file, "utf8"));
const params = (name: string) => profile.columns.find((c) => c.name === name)!.recommendation.params;

/** Asserts numbers equal to 12 decimals (sums taken in another order differ in the last bits). */
function close(actual: readonly Cell[], expected: readonly number[]): void {
  expect(actual.length).toBe(expected.length);
  const bad = actual.map((a, i) => ({ i, a: Number(a), e: expected[i]! })).filter(({ a, e }) => !(Math.abs(a - e) < 1e-12));
  expect(bad.slice(0, 5)).toEqual([]);
}

beforeAll(async () => {
  await scanPlan(trainFile, planDir, ["--target", "y", "--min-level-rows", "10", "--decide", "shop=target-kfold", "--decide", "colour=one-hot",
    "--decide", "size=pooled-one-hot", "--decide", "member=indicator", "--decide", "street=hashing", "--decide", "brand=frequency", "--decide", "grade=codes"]);
  editParams(planDir, "street", { width: 8, salt: "k" });
  editParams(planDir, "grade", { tableSize: 6 });
  profile = editParams(planDir, "shop", { weight: M });
});

/** Checks the encodings that do not read the target, and the pass-through columns. */
function checkCommon(enc: Csv, src: Csv): void {
  const lv = (n: string) => column(src, n);
  const colours = params("colour").levels as string[];
  bf.oneHot(lv("colour"), colours).forEach((vec, k) => expect(column(enc, oh("colour", colours[k]!)).map(Number)).toEqual(vec));
  const keep = params("size").keep as string[];
  expect(keep.length).toBeGreaterThan(1);
  bf.oneHot(lv("size"), keep).forEach((vec, k) => expect(column(enc, oh("size", keep[k]!)).map(Number)).toEqual(vec));
  expect(column(enc, oh("size", "other")).map(Number)).toEqual(bf.pooledOther(lv("size"), keep));
  expect(column(enc, "member").map(Number)).toEqual(bf.indicator(lv("member"), params("member").one as string));
  expect(column(enc, "street")).toEqual(lv("street").map((l) => (l === null ? null : String(md5Bucket(l, 8, "k")))));
  close(column(enc, "brand"), bf.frequency(column(train, "brand"), lv("brand")));
  expect(column(enc, "grade").map(Number)).toEqual(bf.codes(column(train, "grade"), lv("grade"), 6));
  for (const name of ["id", "amount"]) expect(column(enc, name)).toEqual(lv(name));
}

/** The fold scan assigns to each id: foldSql over the same file, run in DuckDB. */
async function scanFolds(file: string): Promise<Map<string, number>> {
  return withEngine({ threads: 1 }, async (engine) => {
    await openSource(engine, [file]);
    const s = profile.settings;
    const rows = await engine.rows<{ id: string; fold: number }>(
      `SELECT id, ${foldSql(s.fold!.keyColumns, s.seed, s.folds)} AS fold FROM tailsift_src`, "folds");
    return new Map(rows.map((r) => [r.id, r.fold]));
  });
}

describe("encode --for training against brute force", () => {
  const out = path.join(dir, "train-enc.csv");

  it("writes every encoding as the row-by-row reference, in input order, with scan's folds", async () => {
    const { err } = await ok(["encode", trainFile, "--plan", planDir, "--out", out, "--for", "training", "--keep", "id"]);
    expect(err).toMatch(/target-kfold/);
    const enc = read(out);
    const colours = params("colour").levels as string[];
    const keep = params("size").keep as string[];
    expect(enc.header).toEqual(["id", "shop", ...colours.map((c) => oh("colour", c)), ...keep.map((k) => oh("size", k)), oh("size", "other"),
      "member", "street", "brand", "grade", "amount", "y", "fold"]);
    checkCommon(enc, train);
    expect(column(enc, "y")).toEqual(column(train, "y"));
    const folds = column(enc, "fold").map(Number);
    expect(new Set(folds).size).toBe(5);
    close(column(enc, "shop"), bf.outOfFold(column(train, "shop"), ys(train), folds, M));
    const byScan = await scanFolds(trainFile);
    expect(column(enc, "id").map((id) => byScan.get(id ?? ""))).toEqual(folds);
  });

  it("gives the same bytes with join lookups and with a fresh pass over the input", async () => {
    const copy = writeFile(dir, "train-copy.csv", fs.readFileSync(trainFile));
    const variants: [string, Partial<Parameters<typeof encode>[1]>, string][] = [
      ["join.csv", { lookup: "join" }, "plan level table"],
      ["recount.csv", { recount: true }, "input pass"],
      ["join-recount.csv", { lookup: "join", recount: true }, "input pass"],
    ];
    for (const [name, extra, source] of variants) {
      const file = path.join(dir, name);
      const summary = await encode([name.startsWith("join-") ? copy : trainFile], { plan: planDir, out: file, mode: "training", keep: ["id"], ...extra });
      expect(summary.levelSource).toBe(source);
      expect(summary.lookup).toBe(extra.lookup ?? "enum");
      expect(fs.readFileSync(file, "utf8"), name).toBe(fs.readFileSync(out, "utf8"));
    }
  });

  it("leave-one-out follows (S − y + m·p)/(N − 1 + m)", async () => {
    const file = path.join(dir, "loo.csv");
    await ok(["encode", trainFile, "--plan", planDir, "--out", file, "--for", "training", "--leave-one-out", "--quiet"]);
    close(column(read(file), "shop"), bf.leaveOneOut(column(train, "shop"), ys(train), M));
  });

  it("m = 0 gives raw other-fold means, and the other folds' prior where a level has no other-fold rows", async () => {
    const plan0 = path.join(dir, "plan0");
    fs.cpSync(planDir, plan0, { recursive: true });
    editParams(plan0, "shop", { weight: 0 });
    const file = path.join(dir, "m0.csv");
    const summary = await encode([trainFile], { plan: plan0, out: file, mode: "training" });
    expect(summary.columns.find((c) => c.column === "shop")!.fallback).toBe(1); // the single row of 's77'
    const enc = read(file);
    close(column(enc, "shop"), bf.outOfFold(column(train, "shop"), ys(train), column(enc, "fold").map(Number), 0));
  });
});

describe("encode --for scoring against brute force", () => {
  it("uses the full-data mapping, with the documented fallbacks for unseen and missing levels", async () => {
    const file = path.join(dir, "later-enc.csv");
    const { out } = await ok(["encode", laterFile, "--plan", path.join(planDir, "profile.json"), "--out", file, "--for", "scoring", "--keep", "id", "--format", "json"]);
    const summary = JSON.parse(out) as EncodeSummary;
    const enc = read(file);
    expect(enc.header).not.toContain("fold");
    checkCommon(enc, later);
    close(column(enc, "shop"), bf.fullData(column(train, "shop"), ys(train), profile.target!.mean, M, column(later, "shop")));
    expect(summary.rows).toBe(150);
    for (const c of summary.columns) {
      const lv = column(later, c.column);
      const seen = new Set(column(train, c.column));
      expect(c.missing, c.column).toBe(lv.filter((l) => l === null).length);
      expect(c.unseen, c.column).toBe(lv.filter((l) => l !== null && !seen.has(l)).length);
      expect(c.unseen, `${c.column} has an unseen level`).toBeGreaterThan(0);
    }
    const byName = new Map(summary.columns.map((c) => [c.column, c]));
    expect(byName.get("shop")!.fallback).toBe(byName.get("shop")!.unseen);
    const codes = bf.codes(column(train, "grade"), column(later, "grade"), 6);
    expect(byName.get("grade")!.fallback).toBe(codes.filter((x) => x === 0).length);
  });

  it("does not need the target column, and writes the mappings beside the output", async () => {
    const noTarget = writeFile(dir, "later-no-y.csv", fs.readFileSync(laterFile, "utf8").replace(/,[^,\n]*\n/g, "\n"));
    const file = path.join(dir, "later-no-y.parquet");
    const summary = await encode([noTarget], { plan: planDir, out: file, mode: "scoring", keepOriginal: true });
    expect(summary.passedThrough).toEqual(["amount"]);
    const maps = `${file}.mappings`;
    const manifest = JSON.parse(fs.readFileSync(path.join(maps, "mappings.json"), "utf8")) as { columns: { column: string; file?: string; params: Record<string, unknown> }[] };
    const shop = manifest.columns.find((c) => c.column === "shop")!;
    expect(shop.params).toMatchObject({ weight: M, prior: profile.target!.mean });
    const rows = await withEngine({ threads: 1 }, (e) => e.rows<{ level: string; value: number; shop: string; shop__text: string | null; id: string | null }>(
      `SELECT level, value FROM read_parquet('${path.join(maps, shop.file!)}') ORDER BY level`, "read"));
    close(rows.map((r) => String(r.value)), bf.fullData(column(train, "shop"), ys(train), profile.target!.mean, M, rows.map((r) => r.level)));
    const texts = await withEngine({ threads: 1 }, (e) => e.rows<{ t: string | null }>(`SELECT shop__text AS t FROM read_parquet('${file}')`, "read"));
    expect(texts.map((r) => r.t)).toEqual(column(later, "shop"));
  });
});
