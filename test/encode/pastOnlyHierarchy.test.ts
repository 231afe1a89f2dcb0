/**
 * Past-only training encodings over a code hierarchy (a --time plan whose column is encoded with
 * backoff groups or a hierarchical prior), row by row against plain loops built on
 * test/encode/hierarchyBruteForce.ts: a row of time block b takes its group's (or its level's and
 * parent's) m-estimate over the rows of blocks < b, with their mean as the prior; block 0 and
 * missing codes in block 0 take the training input's overall mean. The plan is the scan's with
 * the column's params set to a backoff grouping (the scan's own candidate) or a hierarchical prior.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { encode } from "../../src/commands/encode.js";
import type { EvidenceCandidate } from "../../src/evidence/types.js";
import type { Profile } from "../../src/profile/types.js";
import { tempDir, writeFile } from "../helpers/tmp.js";
import * as bf from "./hierarchyBruteForce.js";
import { codeData } from "./hierarchyData.js";
import { column, parseCsv, scanPlan } from "./helpers.js";
import { close, planWith, readRows, toRows } from "./hierarchyHelpers.js";

const dir = tempDir("pastonly-hier");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const K = 4;
// the hierarchy test data, plus a visit time: row i at hour i of 2025 (ids are in file order)
const base = codeData(600, 21, false).trimEnd().split("\n");
const withTime = [`${base[0]},t`, ...base.slice(1).map((line, i) => `${line},${new Date(Date.UTC(2025, 0, 1) + i * 3_600_000).toISOString().slice(0, 16).replace("T", " ")}`)].join("\n") + "\n";
const trainFile = writeFile(dir, "train.csv", withTime);
const train = parseCsv(withTime);
const planDir = path.join(dir, "plan");
let profile: Profile;

/** Block of each row from the recorded cut points (times are in file order, all distinct). */
const blocks = () => column(train, "t").map((t) => profile.settings.fold!.boundaries!.filter((c) => `${t}:00` > c).length);

/** Past-only values: `value(past rows, row, prior)` for rows of block ≥ 1; block 0 → the overall mean. */
function pastOnly(rows: readonly bf.Row[], value: (past: readonly bf.Row[], r: bf.Row, prior: number) => number): number[] {
  const mean = (xs: readonly bf.Row[]) => { const t = xs.filter((x) => x.y !== null); return t.reduce((s, x) => s + x.y!, 0) / t.length; };
  const overall = mean(rows);
  return rows.map((r) => {
    const past = rows.filter((o) => o.fold < r.fold);
    if (past.length === 0) return overall;
    const prior = mean(past);
    return r.level === null ? prior : value(past, r, prior);
  });
}
const sums = (rows: readonly bf.Row[], keep: (r: bf.Row) => boolean) => {
  let n = 0, s = 0;
  for (const r of rows) if (r.y !== null && keep(r)) { n++; s += r.y; }
  return { n, s };
};

beforeAll(async () => {
  profile = await scanPlan(trainFile, planDir, ["--target", "y", "--as-categorical", "code", "--min-level-rows", "10", "--time", "t", "--folds", String(K), "--exclude", "id"]);
  expect(profile.settings.fold!.kind).toBe("time-blocks");
});

describe("past-only encodings over a hierarchy", () => {
  it("backoff groups: each row's group from earlier blocks only", async () => {
    const found = profile.columns.find((c) => c.name === "code")?.evidence?.candidates.find((c) => c.candidate === "backoff-target-kfold") as EvidenceCandidate | undefined;
    if (!found) throw new Error("the scan scored no backoff candidate for 'code'");
    const parents = found.params.parents as { kind: string; length: number }[];
    const perCode = new Map<string, number>();
    for (const c of column(train, "code")) if (c !== null) perCode.set(c, (perCode.get(c) ?? 0) + 1);
    const groupOf = bf.backoffGroupOf(perCode, parents.map((p) => p.length).reverse(), found.params.minRows as number);
    const to = planWith(planDir, path.join(dir, "backoff"), "code", found.params);
    const out = path.join(dir, "backoff-train.parquet");
    await encode([trainFile], { plan: to, out, mode: "training", keep: ["id"] });
    const enc = await readRows(out);
    expect(enc.map((r) => Number(r.fold))).toEqual(blocks());
    const m = found.params.weight as number | null;
    const expected = pastOnly(toRows(train, blocks()), (past, r, prior) => {
      const g = groupOf(r.level!);
      const own = sums(past, (o) => o.level !== null && groupOf(o.level) === g);
      return bf.estimate(own.s, own.n, m, prior);
    });
    close(enc.map((r) => r.code as number), expected);
  });

  it("hierarchical prior (3-digit parent, the plan's weights): level and parent sums from earlier blocks only", async () => {
    const w = { weight: 3.5, parentWeight: 8 };
    const to = planWith(planDir, path.join(dir, "hier"), "code", { prior: "hierarchical", parent: { kind: "prefix", length: 3 }, ...w, folds: K, seed: 42 });
    const out = path.join(dir, "hier-train.parquet");
    await encode([trainFile], { plan: to, out, mode: "training", keep: ["id"] });
    const enc = await readRows(out);
    const expected = pastOnly(toRows(train, blocks()), (past, r, prior) => {
      const parent = sums(past, (o) => o.level !== null && o.level.slice(0, 3) === r.level!.slice(0, 3));
      const own = sums(past, (o) => o.level === r.level);
      return bf.estimate(own.s, own.n, w.weight, bf.estimate(parent.s, parent.n, w.parentWeight, prior));
    });
    close(enc.map((r) => r.code as number), expected);
  });
});
