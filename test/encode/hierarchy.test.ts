/**
 * Backoff and hierarchical target encoding against row-by-row references (test/encode/
 * hierarchyBruteForce.ts) on 5-digit codes (parent = prefix) with rare, unseen and missing
 * levels, for training (folds read back and checked against foldSql in DuckDB) and scoring;
 * and against the evidence scorer: encode's out-of-fold log loss equals the loss scan reports.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { encode } from "../../src/commands/encode.js";
import type { EncodeSummary } from "../../src/encode/types.js";
import { hierarchicalScoredSql } from "../../src/evidence/hierarchicalSql.js";
import { scorePredictions } from "../../src/evidence/scoreSql.js";
import type { EvidenceCandidate } from "../../src/evidence/types.js";
import type { Profile } from "../../src/profile/types.js";
import { withLevelTable } from "../evidence/helpers.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";
import * as bf from "./hierarchyBruteForce.js";
import { codeData } from "./hierarchyData.js";
import { column, ok, parseCsv, runEncodeCli, scanPlan, type Csv } from "./helpers.js";
import { close, groupCounts, planWith, readRows, scanFolds, toRows } from "./hierarchyHelpers.js";

const dir = tempDir("encode-hier");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const trainFile = writeFile(dir, "train.csv", codeData(600, 21, false));
const laterFile = writeFile(dir, "later.csv", codeData(250, 22, true));
const train = parseCsv(fs.readFileSync(trainFile, "utf8"));
const later = parseCsv(fs.readFileSync(laterFile, "utf8"));
const planDir = path.join(dir, "plan");
let profile: Profile;
let candidate: EvidenceCandidate;
let groupOf: bf.GroupOf;
let backoffDir: string;

/** Training rows per code (all rows, target or not): what the backoff grouping counts. */
function rowsPerCode(csv: Csv): Map<string, number> {
  const out = new Map<string, number>();
  for (const c of column(csv, "code")) if (c !== null) out.set(c, (out.get(c) ?? 0) + 1);
  return out;
}

beforeAll(async () => {
  profile = await scanPlan(trainFile, planDir, ["--target", "y", "--as-categorical", "code", "--min-level-rows", "10"]);
  const found = profile.columns.find((c) => c.name === "code")?.evidence?.candidates.find((c) => c.candidate === "backoff-target-kfold");
  if (!found) throw new Error("the scan scored no backoff candidate for 'code'");
  candidate = found;
  const parents = candidate.params.parents as { kind: string; length: number }[];
  expect(parents.every((p) => p.kind === "prefix")).toBe(true);
  groupOf = bf.backoffGroupOf(rowsPerCode(train), parents.map((p) => p.length).reverse(), candidate.params.minRows as number);
  backoffDir = planWith(planDir, path.join(dir, "backoff"), "code", candidate.params);
});

describe("backoff grouping, then target encoding", () => {
  it("the test data exercises own groups, parent groups and \"other\"", () => {
    const depths = new Set([...rowsPerCode(train).keys()].map((l) => Number(groupOf(l).split("|")[0])));
    expect(depths.has(0)).toBe(true);
    expect(depths.has(-1)).toBe(true);
    expect([...depths].some((d) => d > 0)).toBe(true);
  });

  it("training: the out-of-fold group m-estimate row by row, with scan's folds, and the scorer's log loss", async () => {
    const out = path.join(dir, "backoff-train.parquet");
    const { out: json } = await ok(["encode", trainFile, "--plan", backoffDir, "--out", out, "--for", "training", "--keep", "id", "--format", "json"]);
    const enc = await readRows(out);
    expect(enc.map((r) => r.id)).toEqual(column(train, "id"));
    const folds = enc.map((r) => Number(r.fold));
    const byScan = await scanFolds(trainFile, profile);
    expect(enc.map((r) => byScan.get(String(r.id)))).toEqual(folds);
    const rows = toRows(train, folds);
    const expected = bf.groupedOutOfFold(rows, groupOf, candidate.params.weight as number | null);
    close(enc.map((r) => r.code as number), expected);
    // the agreement: the loss of encode's training output is the loss scan's evidence reported
    // for backoff-target-kfold (evidence/groupedSql), to 1e-9
    expect(Math.abs(bf.logLoss(rows, enc.map((r) => r.code as number)) - candidate.loss)).toBeLessThan(1e-9);
    const summary = JSON.parse(json) as EncodeSummary;
    expect(summary.columns[0]!.grouping).toEqual({ kind: "backoff", ...groupCounts(column(train, "code"), groupOf, new Set(column(train, "code"))) });
    expect([groupOf("86001"), groupOf("86002")]).toEqual(["-1|", "-1|"]); // the rare parent's codes pool too few rows
  });

  it("scoring a later file: the full-data group m-estimate; unseen levels back off; missing → p", async () => {
    const out = path.join(dir, "backoff-later.parquet");
    const { out: json } = await ok(["encode", laterFile, "--plan", backoffDir, "--out", out, "--for", "scoring", "--keep", "id", "--format", "json"]);
    const enc = await readRows(out);
    const p = profile.target!.mean;
    const ys = toRows(train, train.rows.map(() => 0)).map((r) => r.y).filter((y): y is number => y !== null);
    expect(p).toBeCloseTo(ys.reduce((a, b) => a + b, 0) / ys.length, 14); // the plan's mean is the training mean
    close(enc.map((r) => r.code as number), bf.groupedFull(toRows(train, []), groupOf, candidate.params.weight as number | null, p, column(later, "code")));
    const summary = JSON.parse(json) as EncodeSummary;
    const seen = new Set(column(train, "code"));
    const codes = column(later, "code");
    const c = summary.columns[0]!;
    expect(c.missing).toBe(codes.filter((l) => l === null).length);
    expect(c.unseen).toBe(codes.filter((l) => l !== null && !seen.has(l)).length);
    expect(c.grouping).toEqual({ kind: "backoff", ...groupCounts(codes, groupOf, seen) });
    expect(groupOf("44401")).toBe("-1|"); // the unseen parent goes to "other"
    // unseen leaves back off to the deepest parent group: 4 digits where one exists, else 3
    const unseenDepths = new Set(codes.filter((l): l is string => l !== null && !seen.has(l)).map((l) => groupOf(l).split("|")[0]));
    expect([unseenDepths.has("4"), unseenDepths.has("3"), unseenDepths.has("-1")]).toEqual([true, true, true]);
  });

  it("the mapping files alone reproduce the scoring output (level map, group table, manifest rule)", async () => {
    const out = path.join(dir, "backoff-later.parquet");
    const maps = `${out}.mappings`;
    const manifest = JSON.parse(fs.readFileSync(path.join(maps, "mappings.json"), "utf8")) as { columns: { file: string; groupFile: string; params: { prior: number; depths: { depth: number; parent: { length: number } }[] } }[] };
    const entry = manifest.columns[0]!;
    const levelMap = await readRows(path.join(maps, entry.file));
    const groups = await readRows(path.join(maps, entry.groupFile));
    const byLevel = new Map(levelMap.filter((r) => r.seen).map((r) => [String(r.level), `${String(r.depth)}|${String(r.group_key)}`]));
    const valueOf = new Map(groups.map((g) => [`${String(g.depth)}|${String(g.group_key)}`, g.value as number]));
    const served = column(later, "code").map((level) => {
      if (level === null) return entry.params.prior;
      let key = byLevel.get(level);
      for (const d of [...entry.params.depths].reverse()) if (key === undefined && valueOf.has(`${d.depth}|${level.slice(0, d.parent.length)}`)) key = `${d.depth}|${level.slice(0, d.parent.length)}`;
      return valueOf.get(key ?? "-1|")!;
    });
    expect((await readRows(out)).map((r) => r.code)).toEqual(served);
    for (const [level, key] of byLevel) expect(key, level).toBe(groupOf(level));
  });

  it("training on another file (an input pass): the plan's grouping, the input's sums; join lookups give the same bytes", async () => {
    const out = path.join(dir, "backoff-train-later.csv");
    await ok(["encode", laterFile, "--plan", backoffDir, "--out", out, "--for", "training", "--keep", "id", "--quiet"]);
    const enc = parseCsv(fs.readFileSync(out, "utf8"));
    const folds = column(enc, "fold").map(Number);
    const byScan = await scanFolds(laterFile, profile);
    expect(column(enc, "id").map((id) => byScan.get(id ?? ""))).toEqual(folds);
    close(column(enc, "code").map(Number), bf.groupedOutOfFold(toRows(later, folds), groupOf, candidate.params.weight as number | null));
    const joined = path.join(dir, "backoff-train-later-join.csv");
    await encode([laterFile], { plan: backoffDir, out: joined, mode: "training", keep: ["id"], lookup: "join" });
    expect(fs.readFileSync(joined, "utf8")).toBe(fs.readFileSync(out, "utf8"));
  });

  it("a null weight (no detectable spread between groups) gives every row the other folds' mean", async () => {
    const nullDir = planWith(planDir, path.join(dir, "backoff-null"), "code", { ...candidate.params, weight: null });
    const out = path.join(dir, "backoff-null.parquet");
    const summary = await encode([trainFile], { plan: nullDir, out, mode: "training" });
    const enc = await readRows(out);
    const rows = toRows(train, enc.map((r) => Number(r.fold)));
    close(enc.map((r) => r.code as number), bf.groupedOutOfFold(rows, groupOf, null));
    expect(summary.columns[0]!.fallback).toBe(rows.filter((r) => r.level !== null).length);
  });
});

describe("hierarchical prior (3-digit parent, the plan's weights)", () => {
  const w = { weight: 3.5, parentWeight: 8 };
  let hierDir: string;
  beforeAll(() => {
    hierDir = planWith(planDir, path.join(dir, "hier"), "code", { prior: "hierarchical", parent: { kind: "prefix", length: 3 }, ...w, folds: 5, seed: 42 });
  });

  it("training: every sum out-of-fold, row by row", async () => {
    const out = path.join(dir, "hier-train.parquet");
    await encode([trainFile], { plan: hierDir, out, mode: "training", keep: ["id"] });
    const enc = await readRows(out);
    const folds = enc.map((r) => Number(r.fold));
    const byScan = await scanFolds(trainFile, profile);
    expect(enc.map((r) => byScan.get(String(r.id)))).toEqual(folds);
    close(enc.map((r) => r.code as number), bf.hierarchicalOutOfFold(toRows(train, folds), 3, w));
  });

  it("scoring: unseen leaves take their parent's mean, the unseen parent and missing codes p", async () => {
    const out = path.join(dir, "hier-later.parquet");
    const summary = await encode([laterFile], { plan: hierDir, out, mode: "scoring", keep: ["id"] });
    const enc = await readRows(out);
    const p = profile.target!.mean;
    const codes = column(later, "code");
    close(enc.map((r) => r.code as number), bf.hierarchicalFull(toRows(train, []), 3, w, p, codes));
    expect(enc[codes.indexOf("44401")]!.code).toBe(p);
    const g = summary.columns[0]!.grouping!;
    const seen = new Set(column(train, "code"));
    const unseen = codes.filter((l): l is string => l !== null && !seen.has(l));
    expect(g.unseen).toEqual({ levels: new Set(unseen).size, rows: unseen.length });
    expect(g.other).toEqual({ levels: 1, rows: codes.filter((l) => l === "44401").length }); // only the unseen parent takes p
    const parents = await readRows(path.join(`${out}.mappings`, "code.parents.parquet"));
    const trainParents = new Set([...seen].filter((l): l is string => l !== null).map((l) => l.slice(0, 3)));
    expect(parents.filter((r) => Number(r.levels) > 0).map((r) => r.parent).sort()).toEqual([...trainParents].sort());
  });

  it("null and zero weights: the level takes its parent's mean; the parent its raw mean", async () => {
    const nw = { weight: null, parentWeight: 0 };
    const plan = planWith(planDir, path.join(dir, "hier-null"), "code", { prior: "hierarchical", parent: { kind: "prefix", length: 3 }, ...nw });
    const out = path.join(dir, "hier-null.parquet");
    await encode([trainFile], { plan, out, mode: "training" });
    const enc = await readRows(out);
    close(enc.map((r) => r.code as number), bf.hierarchicalOutOfFold(toRows(train, enc.map((r) => Number(r.fold))), 3, nw));
  });
});

describe("agreement with the evidence scorer's hierarchical candidate", () => {
  it("with the plan's weights in every fold, scan's own SQL (evidence/hierarchicalSql) gives encode's out-of-fold loss", async () => {
    // The scorer refits both weights on each fold's other folds (evidence/hierarchicalWeights);
    // the plan carries the all-rows fit (fold −1) and encode uses it, so the reported loss of
    // hierarchical-target-kfold is not encode's. Fed the plan's weights for every fold, the
    // scorer's query must reproduce encode's output loss exactly.
    const hc = profile.columns.find((c) => c.name === "code")!.evidence!.candidates.find((c) => c.candidate === "hierarchical-target-kfold")!;
    const plan = planWith(planDir, path.join(dir, "hier-candidate"), "code", hc.params);
    const out = path.join(dir, "hier-candidate.parquet");
    await encode([trainFile], { plan, out, mode: "training" });
    const enc = await readRows(out);
    const rows = toRows(train, enc.map((r) => Number(r.fold)));
    const encoded = enc.map((r) => r.code as number);
    const parent = hc.params.parent as { kind: "prefix"; length: number };
    const w = { weight: hc.params.weight as number | null, parentWeight: hc.params.parentWeight as number | null };
    close(encoded, bf.hierarchicalOutOfFold(rows, parent.length, w));
    const scored = await withLevelTable(trainFile, ["code"], { column: "y", kind: "binary" }, ({ engine }) => {
      const fixed = [0, 1, 2, 3, 4].map((fold) => ({ fold, parentWeight: w.parentWeight, levelWeight: w.weight, method: "the plan's" }));
      return scorePredictions(engine, hierarchicalScoredSql(0, parent, fixed), "binary", "hierarchical prior with the plan's weights");
    });
    expect(Math.abs(bf.logLoss(rows, encoded) - scored!.loss)).toBeLessThan(1e-9);
  });
});

describe("a continuous target", () => {
  it("backoff: encode's out-of-fold squared error equals the scorer's loss", async () => {
    const contDir = path.join(dir, "plan-cont");
    const cont = await scanPlan(trainFile, contDir, ["--target", "y", "--target-kind", "continuous", "--as-categorical", "code", "--min-level-rows", "10"]);
    const cc = cont.columns.find((c) => c.name === "code")!.evidence!.candidates.find((c) => c.candidate === "backoff-target-kfold")!;
    const plan = planWith(contDir, path.join(dir, "backoff-cont"), "code", cc.params);
    const out = path.join(dir, "backoff-cont.parquet");
    await encode([trainFile], { plan, out, mode: "training" });
    const enc = await readRows(out);
    const rows = toRows(train, enc.map((r) => Number(r.fold)));
    const lengths = (cc.params.parents as { length: number }[]).map((p) => p.length).reverse();
    const contGroupOf = bf.backoffGroupOf(rowsPerCode(train), lengths, cc.params.minRows as number);
    close(enc.map((r) => r.code as number), bf.groupedOutOfFold(rows, contGroupOf, cc.params.weight as number | null));
    let sse = 0, n = 0;
    rows.forEach((r, k) => { if (r.y !== null) { sse += (r.y - (enc[k]!.code as number)) ** 2; n++; } });
    expect(Math.abs(sse / n - cc.loss)).toBeLessThan(1e-9); // evidence/scoreSql: Σ(y − pred)² per row
  });
});

describe("plans encode refuses", () => {
  it.each([
    ["leave-one-out with backoff", () => backoffDir, ["--for", "training", "--leave-one-out"], "bad_option", /--leave-one-out applies to flat target encoding; the plan encodes 'code' with backoff grouping/],
    ["a malformed parent", () => planWith(planDir, path.join(dir, "bad-parent"), "code", { ...candidate.params, parents: [{ kind: "prefix", length: 0 }] }), ["--for", "scoring"], "bad_plan", /params.parents\[0\] must be/],
    ["an unknown grouping", () => planWith(planDir, path.join(dir, "bad-grouping"), "code", { ...candidate.params, grouping: "clusters" }), ["--for", "scoring"], "bad_plan", /unknown params.grouping 'clusters'/],
    ["a hierarchical prior on hashing", () => planWith(planDir, path.join(dir, "hash-prior"), "code", { width: 64, hash: "md5-first8-le", salt: "", prior: "hierarchical" }, "hashing"), ["--for", "scoring"], "unsupported_plan", /a hierarchical prior only with target-kfold, not with hashing/],
  ])("%s", async (_name, plan, args, code, message) => {
    const out = path.join(dir, `refused-${code}.parquet`);
    const c = collector();
    expect(await runEncodeCli(["encode", trainFile, "--plan", plan(), "--out", out, ...args], c.io)).toBe(2);
    expect(c.err).toMatch(message);
    expect(c.err.trim().split("\n")).toHaveLength(1);
    expect(fs.existsSync(out)).toBe(false);
    await expect(encode([trainFile], { plan: plan(), out, mode: args[1] === "training" ? "training" : "scoring", leaveOneOut: args.includes("--leave-one-out") })).rejects.toMatchObject({ code });
  });
});
