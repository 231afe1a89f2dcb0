/**
 * The cluster path end to end: load a CSV into a DuckDB table, run the query `tailsift sql`
 * prints, save its result, run `scan --levels` on it and compare every figure with a direct
 * `scan` of the same CSV (differential testing: the direct scan is the reference, and the two
 * paths build the same (column, level, fold) sums, so every figure must agree; only the input
 * record and the fold-column list may differ).
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { scanLevels } from "../../src/commands/levels.js";
import { levelSql } from "../../src/commands/sql.js";
import { rowHashFoldSql as foldSql } from "../../src/engine/folds.js";
import { withEngine } from "../../src/engine/db.js";
import { validateProfile } from "../../src/profile/schema.js";
import type { ColumnProfile, Profile } from "../../src/profile/types.js";
import { tempDir } from "../helpers/tmp.js";
import { expectCliError } from "../helpers/cliError.js";
import { cli, expectSame, generateAppointments, loadAsTable, writeLevels } from "./helpers.js";

const dir = tempDir("levels");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const at = (name: string) => path.join(dir, name);

/** Level columns of a direct profile: everything scan counted levels for. */
// (time columns, such as appointment_date, and numeric identifiers are not counted as levels by a direct scan)
const levelColumns = (p: Profile) => p.columns.filter((c) => !["numeric", "time", "target", "excluded"].includes(c.role) && c.numericValues === undefined).map((c) => c.name);

/** Compares the figures of `levels` with the direct profile: columns by name, target, settings. */
function expectSameFigures(levels: Profile, direct: Profile): void {
  const measured = levels.columns.map((c) => c.name);
  const reference: ColumnProfile[] = direct.columns.filter((c) => measured.includes(c.name));
  expect(measured.sort()).toEqual(reference.map((c) => c.name).sort());
  for (const column of reference) expectSame(levels.columns.find((c) => c.name === column.name), column, column.name);
  expectSame(levels.target, direct.target, "target");
  const { fold, levelFolds: _b, ...settings } = levels.settings;
  const { fold: directFold, ...expected } = direct.settings;
  // folds of a level table come from the user's fold expression: no row-hash fold columns are claimed
  expect(fold).toEqual({ kind: "external", hash: "the fold expression given to tailsift sql", seed: directFold!.seed, k: directFold!.k, keyColumns: [] });
  expect(levels.settings.foldColumns).toBeUndefined();
  expectSame(settings, expected, "settings");
  expect(levels.input.rows).toBe(direct.input.rows);
}

const csv = at("appointments.csv");
let direct: Profile;
let names: string[];
let columns: string[];
let fold: string;

beforeAll(async () => {
  generateAppointments(csv, 20000, 5);
  const r = await cli(["scan", csv, "--target", "no_show", "--format", "json", "--no-progress"]);
  expect(r.code, r.err).toBe(0);
  direct = JSON.parse(r.out) as Profile;
  names = levelColumns(direct);
  await withEngine({ threads: 1 }, async (engine) => {
    columns = await loadAsTable(engine, csv, "appointments");
    // scan's own fold: hash(seed, every column) % K — DuckDB-only, but the user may give any expression
    fold = foldSql(columns, direct.settings.seed, direct.settings.folds);
    const sql = levelSql({ columns: names, target: "no_show", targetKind: "binary", from: "appointments", foldExpr: fold });
    await writeLevels(engine, sql, at("levels.parquet"));
    // two shards: alternate rows; the second shard saved as CSV
    await engine.run("CREATE TABLE shard_a AS SELECT * FROM appointments WHERE rowid % 2 = 0", "shard a");
    await engine.run("CREATE TABLE shard_b AS SELECT * FROM appointments WHERE rowid % 2 = 1", "shard b");
    // shard a also goes through --folds (MOD(ABS(fold), K) leaves 0..K-1 unchanged)
    await writeLevels(engine, levelSql({ columns: names, target: "no_show", targetKind: "binary", from: "shard_a", foldExpr: fold, folds: 5 }), at("shard-a.parquet"));
    await writeLevels(engine, levelSql({ columns: names, target: "no_show", targetKind: "binary", from: "shard_b", foldExpr: fold }), at("shard-b.csv"));
    // no fold expression: fold 0 everywhere
    await writeLevels(engine, levelSql({ columns: names, target: "no_show", targetKind: "binary", from: "appointments" }), at("one-fold.parquet"));
    // a shard that lacks one column: its rows cannot add up with the full shard's
    await writeLevels(engine, levelSql({ columns: names.slice(1), target: "no_show", targetKind: "binary", from: "shard_b", foldExpr: fold }), at("short.parquet"));
  });
});

describe("scan --levels against a direct scan", () => {
  it("gives every column figure, target figure and recommendation of the direct scan", async () => {
    const r = await cli(["scan", "--levels", at("levels.parquet"), "--target", "no_show", "--format", "json", "--no-progress"]);
    expect(r.code, r.err).toBe(0);
    const levels = JSON.parse(r.out) as Profile;
    expect(names.length).toBeGreaterThan(5); // the sample has many categorical columns
    expectSameFigures(levels, direct);
    expect(levels.target?.kind).toBe("binary"); // inferred: every level has sum_y2 = sum_y
    expect(levels.input.fromLevels).toBe(true);
    expect(levels.input.paths).toEqual([at("levels.parquet")]);
    expect(levels.settings.levelFolds).toBe(5);
    expect(() => validateProfile(levels)).not.toThrow();
  });

  it("adds two shards (Parquet + CSV) into the same figures as one table", async () => {
    const one = await scanLevels([at("levels.parquet")], { target: "no_show", threads: 1 });
    const two = await scanLevels([at("shard-a.parquet"), at("shard-b.csv")], { target: "no_show", threads: 1 });
    expectSameFigures(two, direct);
    expectSame(two.columns, one.columns, "columns");
    expect(two.input.paths).toEqual([at("shard-a.parquet"), at("shard-b.csv")]);
  });

  it("with one fold: out-of-fold null, no target-kfold, a reason says why; in-sample figures unchanged", async () => {
    const p = await scanLevels([at("one-fold.parquet")], { target: "no_show", threads: 1 });
    expect(() => validateProfile(p)).not.toThrow();
    expect(p.settings.levelFolds).toBe(1);
    expect(p.settings.folds).toBe(5); // the --folds default, kept for target-kfold
    const withTarget = p.columns.filter((c) => c.target);
    expect(withTarget.length).toBe(names.length);
    for (const c of withTarget) {
      const d = direct.columns.find((x) => x.name === c.name)!;
      expect(c.target?.leakage.outOfFold).toBeNull();
      // in-sample AUC uses no folds, so it equals the direct scan's
      expectSame(c.target?.leakage.inSample, d.target?.leakage.inSample, `${c.name} inSample`);
      expect(c.recommendation.encoding).not.toBe("target-kfold");
      expect(c.recommendation.reasons.join(" ")).toMatch(/need at least two folds/);
    }
    // the direct scan does advise target-kfold for some column, so the rule had something to withhold
    expect(direct.columns.some((c) => c.recommendation.encoding === "target-kfold")).toBe(true);
  });

  it("--out writes a level table that scan --levels reads back to the same figures", async () => {
    const out = at("plan");
    const r = await cli(["scan", "--levels", at("shard-a.parquet"), at("shard-b.csv"), "--target", "no_show", "--out", out, "--quiet", "--no-progress"]);
    expect(r.code, r.err).toBe(0);
    const saved = JSON.parse(fs.readFileSync(path.join(out, "profile.json"), "utf8")) as Profile;
    const again = await scanLevels([path.join(out, "levels.parquet")], { target: "no_show", threads: 1 });
    expectSameFigures(again, direct);
    expectSame(again.columns, saved.columns, "columns");
  });

  it("refuses tables whose columns disagree on the row totals (exit 2)", async () => {
    await expectCliError(["scan", "--levels", at("shard-a.parquet"), at("short.parquet"), "--no-progress"], "level_totals_disagree", /level tables disagree on row totals/);
  });
});

describe("a continuous target", () => {
  it("round-trips invoice_amount with the kind inferred as continuous", async () => {
    const r = await cli(["scan", csv, "--target", "invoice_amount", "--format", "json", "--no-progress"]);
    expect(r.code, r.err).toBe(0);
    const reference = JSON.parse(r.out) as Profile;
    const cols = levelColumns(reference);
    const file = at("invoice.parquet");
    await withEngine({ threads: 1 }, async (engine) => {
      await loadAsTable(engine, csv, "appointments");
      const sql = levelSql({ columns: cols, target: "invoice_amount", targetKind: "continuous", from: "appointments",
        foldExpr: foldSql(columns, reference.settings.seed, reference.settings.folds) });
      await writeLevels(engine, sql, file);
    });
    const p = await scanLevels([file], { target: "invoice_amount", threads: 1 });
    expect(p.target?.kind).toBe("continuous");
    expectSameFigures(p, reference);
  });
});

describe("a plan advised from level tables", () => {
  it("cannot make training folds: encode --for training refuses it with one line, scoring works", async () => {
    const out = at("levels-plan");
    const made = await cli(["scan", "--levels", at("levels.parquet"), "--target", "no_show", "--out", out, "--quiet", "--no-progress",
      "--decide", "owner_postcode=target-kfold"]);
    expect(made.code, made.err).toBe(0);
    await expectCliError(["encode", csv, "--plan", out, "--out", at("train.parquet"), "--for", "training", "--quiet"], "bad_plan", /settings\.fold\.kind is external/);
    expect(fs.existsSync(at("train.parquet"))).toBe(false);
    const scoring = await cli(["encode", csv, "--plan", out, "--out", at("score.parquet"), "--for", "scoring", "--quiet"]);
    expect(scoring.code, scoring.err).toBe(0);
  });
});
