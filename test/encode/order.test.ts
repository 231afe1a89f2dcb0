/**
 * Row count and row order are preserved on an input large enough for DuckDB to read in many
 * chunks on two threads (where a plain hash join would reorder rows), with both lookup
 * strategies; the fold column equals scan's fold assignment (foldSql over the same view) row by
 * row. Data: the invented vet-clinic generator (sample-data/generate.mjs), 60,000 rows.
 */
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { encode } from "../../src/commands/encode.js";
import { rowHashFoldSql as foldSql } from "../../src/engine/folds.js";
import { withEngine } from "../../src/engine/db.js";
import { openSource } from "../../src/engine/source.js";
import type { Profile } from "../../src/profile/types.js";
import { tempDir } from "../helpers/tmp.js";
import { column, parseCsv, scanPlan } from "./helpers.js";

const dir = tempDir("encode-order");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const trainFile = path.join(dir, "train.csv");
const laterFile = path.join(dir, "later.csv");
const planDir = path.join(dir, "plan");
let profile: Profile;

beforeAll(() => {
  execFileSync("node", ["sample-data/generate.mjs", "--rows", "60000", "--seed", "3", "--out", trainFile]);
  execFileSync("node", ["sample-data/generate.mjs", "--rows", "20000", "--seed", "4", "--shift", "--out", laterFile]);
});

/** Input order of a column and scan's fold per row, read in DuckDB over the same text view. */
async function inputOrder(file: string, withFolds: boolean): Promise<{ ids: string[]; folds: number[] }> {
  return withEngine({ threads: 1 }, async (engine) => {
    await openSource(engine, [file]);
    const s = profile.settings;
    const fold = withFolds ? foldSql(s.fold!.keyColumns, s.seed, s.folds) : "0";
    const rows = await engine.rows<{ id: string; fold: number }>(`SELECT appointment_id AS id, ${fold} AS fold FROM tailsift_src`, "order");
    return { ids: rows.map((r) => r.id), folds: rows.map((r) => r.fold) };
  });
}

describe("encode keeps rows and their order", () => {
  beforeAll(async () => {
    profile = await scanPlan(trainFile, planDir, ["--target", "no_show", "--threads", "2"]);
    expect(profile.columns.some((c) => c.recommendation.encoding === "target-kfold")).toBe(true);
  });

  it("training: same order with enum and join lookups, folds equal scan's row by row", async () => {
    const texts: string[] = [];
    for (const lookup of ["enum", "join"] as const) {
      const out = path.join(dir, `train-${lookup}.csv`);
      const summary = await encode([trainFile], { plan: planDir, out, mode: "training", keep: ["appointment_id"], lookup, threads: 2 });
      expect(summary.rows).toBe(60000);
      texts.push(fs.readFileSync(out, "utf8"));
    }
    expect(texts[1] === texts[0]).toBe(true);
    const enc = parseCsv(texts[0]!);
    const want = await inputOrder(trainFile, true);
    expect(column(enc, "appointment_id")).toEqual(want.ids);
    expect(column(enc, "fold").map(Number)).toEqual(want.folds);
  });

  it("scoring a later extract with unseen levels: same order with enum and join lookups", async () => {
    const texts: string[] = [];
    for (const lookup of ["enum", "join"] as const) {
      const out = path.join(dir, `later-${lookup}.csv`);
      const summary = await encode([laterFile], { plan: planDir, out, mode: "scoring", keep: ["appointment_id"], lookup, threads: 2 });
      expect(summary.rows).toBe(20000);
      expect(summary.columns.some((c) => c.unseen > 0)).toBe(true);
      texts.push(fs.readFileSync(out, "utf8"));
    }
    expect(texts[1] === texts[0]).toBe(true);
    expect(column(parseCsv(texts[0]!), "appointment_id")).toEqual((await inputOrder(laterFile, false)).ids);
  });
});
