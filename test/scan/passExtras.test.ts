/**
 * The per-fold extras (non-missing counts of numeric columns, time ranges and granularity, the
 * content fingerprint) summed apart from the GROUPING SETS pass (engine/passExtras, the default for
 * Parquet) give exactly what the pass gives with them inline, and what the wide pass gives — on
 * CSV and Parquet copies of the same rows — and both agree with a brute-force recount of the
 * generated rows. Through scan, a Parquet profile is the same whichever way the extras are summed.
 * The wide pass sums them apart when there are time columns (their FILTERed aggregates made it
 * crawl); widePassRoles checks that case against the GROUPING SETS pass and brute force as well.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { levelPassSql, type PassPlan } from "../../src/engine/aggregate.js";
import { contentFingerprintOf } from "../../src/engine/contentFingerprint.js";
import { withEngine } from "../../src/engine/db.js";
import { rowHashFolds } from "../../src/engine/folds.js";
import { extrasAggregates, extrasApart, extrasFor, INLINE_EXTRAS_MAX, PASS_EXTRAS_TABLE } from "../../src/engine/passExtras.js";
import { openSource } from "../../src/engine/source.js";
import { KEYED_TIME_SHARE, keyableTimeColumns, MASK_MAX, splitKeyed } from "../../src/engine/keyedExtras.js";
import { LEVEL_TABLE } from "../../src/engine/passPlan.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { scan } from "../../src/commands/scan.js";
import { passIn, type PassMode } from "../helpers/passModes.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("pass-extras");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** Invented vet-clinic visits: a visit number, a pet count, a visit time and day, two level columns, a no-show flag with blanks and bad values. */
function visitsCsv(rows: number, seed: number, badTargets = true): { file: string; raw: string[][]; header: string[] } {
  const rnd = mulberry32(seed);
  const header = ["visit_no", "pets", "visit_at", "visit_day", "species", "clinic", "no_show"];
  const raw: string[][] = [];
  for (let r = 0; r < rows; r++) {
    const stamp = `2025-${String(1 + Math.floor(rnd() * 6)).padStart(2, "0")}-${String(1 + Math.floor(rnd() * 28)).padStart(2, "0")}`;
    const u = rnd();
    raw.push([
      String(500_000 + r),
      rnd() < 0.07 ? "" : String(Math.floor(rnd() * 5)),
      rnd() < 0.04 ? "" : `${stamp} ${String(8 + Math.floor(rnd() * 9)).padStart(2, "0")}:${String(Math.floor(rnd() * 60)).padStart(2, "0")}:${rnd() < 0.1 ? "30" : "00"}`,
      stamp,
      ["cat", "dog", "rabbit", "ferret", ""][Math.floor(rnd() * 5)]!,
      `C${Math.floor(rnd() * 40)}`,
      u < 0.04 ? "" : u < 0.07 ? (badTargets ? "unknown" : "") : u < 0.3 ? "1" : "0",
    ]);
  }
  return { file: writeFile(dir, `visits-${seed}-${badTargets}.csv`, `${[header, ...raw].map((l) => l.join(",")).join("\n")}\n`), raw, header };
}

type Row = { col: number; level: string | null; fold: number; rows: number; n_y: number; sum_y: number; bad: number };
const COLUMNS = "col, level, fold, rows::DOUBLE AS rows, n_y::DOUBLE AS n_y, sum_y, bad::DOUBLE AS bad";

describe("pass extras summed apart equal the inline pass and a brute-force recount", () => {
  const { file: csv, raw, header } = visitsCsv(900, 11);
  const parquet = path.join(dir, "visits.parquet");

  it.each(["csv", "parquet"] as const)("%s input: apart = inline = wide, and = brute force", async (format) => {
    await withEngine({ threads: 2 }, async (engine) => {
      if (format === "parquet" && !fs.existsSync(parquet)) {
        await engine.run(`COPY (SELECT * FROM read_csv(${quoteLiteral(csv)}, header = true, all_varchar = true)) TO ${quoteLiteral(parquet)} (FORMAT parquet)`, "writing the Parquet copy");
      }
      const source = await openSource(engine, [format === "csv" ? csv : parquet]);
      const plan: PassPlan = {
        view: source.view, fold: rowHashFolds(source.columns, 5, 42), levelColumns: ["species", "clinic"],
        countColumns: ["visit_no", "pets", "visit_at", "visit_day"], timeColumns: ["visit_at", "visit_day"], distinctColumns: ["visit_no", "pets"],
        target: { column: "no_show", kind: "binary" }, contentColumns: source.columns,
      };
      const run = (mode: PassMode) => passIn<Row>(engine, plan, mode, COLUMNS);
      const apart = await run("apart");
      const inline = await run("grouping");
      const wide = await run("wide");
      // the wide pass sums the time and content totals apart too (the plan has time columns)
      expect([apart.apart, inline.apart, wide.wide, wide.apart]).toEqual([true, false, true, true]);
      expect(apart.table).toEqual(inline.table);
      expect(apart.totals).toEqual(inline.totals);
      expect(apart.totals).toEqual(wide.totals);
      const [left] = await engine.rows<{ n: number }>(`SELECT count(*)::DOUBLE AS n FROM duckdb_tables() WHERE table_name = '${PASS_EXTRAS_TABLE}'`, "test");
      expect(left?.n).toBe(0);

      // brute force over the generated rows
      const col = (name: string) => raw.map((r) => r[header.indexOf(name)]!);
      const t = apart.totals;
      expect(t.rows).toBe(900);
      for (const c of ["visit_no", "pets", "visit_at", "visit_day"]) expect(t.nonMissing.get(c)).toBe(col(c).filter((v) => v !== "").length);
      expect(t.badTargets).toBe(col("no_show").filter((v) => v === "unknown").length);
      expect(t.targetRows).toBe(col("no_show").filter((v) => v === "0" || v === "1").length);
      const at = col("visit_at").filter((v) => v !== "").sort();
      expect([t.time?.get("visit_at")?.min, t.time?.get("visit_at")?.max]).toEqual([at[0], at[at.length - 1]]);
      expect(t.time?.get("visit_at")?.offMinute).toBe(at.filter((v) => v.endsWith(":30")).length);
      expect(t.time?.get("visit_day")?.offDay).toBe(0);
      const pets = new Set(col("pets").filter((v) => v !== ""));
      expect(t.distinct?.get("pets")?.distinct).toBe(pets.size);
      // the content fingerprint equals the one encode computes by its own read
      expect(t.content).toBe(await contentFingerprintOf(engine, source.view, source.columns, "test"));
    });
  });

  it("is the default for Parquet only, and only when there are extras to sum", () => {
    const before = process.env.TAILSIFT_PASS_EXTRAS;
    delete process.env.TAILSIFT_PASS_EXTRAS;
    try {
      const base: PassPlan = { view: "v", fold: rowHashFolds(["a"], 5, 1), levelColumns: ["a"], countColumns: ["n"] };
      expect(extrasApart({ ...base, extras: "apart" })).toBe(true);
      expect(extrasApart({ ...base, extras: "inline" })).toBe(false);
      expect(extrasApart(base)).toBe(false);
      expect(extrasApart({ ...base, countColumns: [], extras: "apart" })).toBe(false);
    } finally {
      if (before !== undefined) process.env.TAILSIFT_PASS_EXTRAS = before;
    }
  });

  it("through scan: a Parquet profile is the same with the extras inline", async () => {
    // no bad target values here: with them the no-show column reads as three classes
    const clean = visitsCsv(900, 12, false).file;
    const parquetFile = path.join(dir, "visits-scan.parquet");
    await withEngine({ threads: 1 }, (engine) => engine.run(
      `COPY (SELECT * FROM read_csv(${quoteLiteral(clean)}, header = true, all_varchar = true)) TO ${quoteLiteral(parquetFile)} (FORMAT parquet)`, "writing the Parquet copy"));
    const before = process.env.TAILSIFT_PASS_EXTRAS;
    const strip = (p: Awaited<ReturnType<typeof scan>>) => ({ ...p, createdAt: "" });
    try {
      delete process.env.TAILSIFT_PASS_EXTRAS;
      const byDefault = strip(await scan([parquetFile], { target: "no_show", threads: 1 }));
      process.env.TAILSIFT_PASS_EXTRAS = "inline";
      const inline = strip(await scan([parquetFile], { target: "no_show", threads: 1 }));
      expect(byDefault).toEqual(inline);
      expect(byDefault.columns.find((c) => c.name === "visit_at")?.time?.granularity).toBe("second");
      expect(byDefault.input.contentFingerprint).toMatch(/^rows:900;sum64:[0-9a-f]{16}$/);
    } finally {
      if (before === undefined) delete process.env.TAILSIFT_PASS_EXTRAS;
      else process.env.TAILSIFT_PASS_EXTRAS = before;
    }
  });

  it("the CLI sums them apart for Parquet and for text inputs with many extras, inline for text inputs with few (TAILSIFT_TRACE names the statement)", () => {
    const parquetFile = path.join(dir, "visits-scan.parquet"); // written by the test above
    const clean = visitsCsv(900, 12, false);
    // the same rows without the visit number and the two time columns: one numeric column + the content hash = 2 extras
    const few = writeFile(dir, "visits-few.csv", `${[["pets", "species", "clinic", "no_show"], ...clean.raw.map((r) => [r[1], r[4], r[5], r[6]])].map((l) => l.join(",")).join("\n")}\n`);
    const traced = (file: string) => spawnSync(process.execPath, [path.resolve("dist/cli.js"), "scan", file, "--target", "no_show", "--quiet", "--format", "json"],
      { env: { ...process.env, TAILSIFT_TRACE: "1", TAILSIFT_PASS_EXTRAS: "" }, encoding: "utf8" });
    const p = traced(parquetFile);
    const many = traced(clean.file);
    const one = traced(few);
    expect([p.status, many.status, one.status]).toEqual([0, 0, 0]);
    expect(p.stderr).toContain("numeric, time and content totals");
    expect(many.stderr).toContain("numeric, time and content totals");
    expect(one.stderr).not.toContain("numeric, time and content totals");
    expect(JSON.parse(p.stdout).input.contentFingerprint).toBe(JSON.parse(many.stdout).input.contentFingerprint);
  });

  it("chooses by format and by the number of extras aggregates left once counts are masked (engine/keyedExtras)", () => {
    const plan = (numeric: number, time: number) => ({ countColumns: Array.from({ length: numeric + time }, (_, j) => `x${j}`), timeColumns: Array.from({ length: time }, (_, j) => `x${numeric + j}`), contentColumns: ["a"] });
    expect(extrasAggregates(plan(3, 1))).toBe(3 + 1 + 7 + 1);
    expect(extrasFor("parquet", plan(0, 0))).toBe("apart");
    expect(extrasFor("csv", plan(1, 0))).toBe("inline"); // the bench's stress table
    expect(extrasFor("csv", plan(MASK_MAX, 0))).toBe("inline"); // every count in the mask, the content hash inline
    expect(extrasFor("csv", plan(MASK_MAX + INLINE_EXTRAS_MAX, 0))).toBe("apart"); // INLINE_EXTRAS_MAX counts beyond the mask + the content hash
    expect(extrasFor("csv", plan(MASK_MAX + INLINE_EXTRAS_MAX - 1, 0))).toBe("inline");
    expect(extrasFor("csv", plan(2, 1))).toBe("inline"); // the bench's sample: 2 numeric + 1 time column, 7 + 1 aggregates
    expect(extrasFor("jsonl", plan(0, 60))).toBe("apart");
  });
});

describe("extras as grouping keys (engine/keyedExtras) equal them as aggregates", () => {
  const { file: csv, raw, header } = visitsCsv(700, 21);

  it("masked counts and a keyed time column: the same level table and totals as unkeyed, inline and apart", async () => {
    await withEngine({ threads: 2 }, async (engine) => {
      const source = await openSource(engine, [csv]);
      const plan: PassPlan = {
        view: source.view, fold: rowHashFolds(source.columns, 5, 42), levelColumns: ["species", "clinic"],
        countColumns: ["visit_no", "pets", "visit_at", "visit_day"], timeColumns: ["visit_at", "visit_day"], keyableTimeColumns: ["visit_day"],
        distinctColumns: ["pets"], target: { column: "no_show", kind: "binary" }, contentColumns: source.columns,
      };
      // the keyed pass really carries them as keys: the mask and the date's text are grouping sets,
      // and the date's seven aggregates are gone (so the equalities below compare two shapes)
      const split = splitKeyed(plan);
      expect([split.counts, split.times, split.rest.countColumns, split.rest.timeColumns]).toEqual([plan.countColumns, ["visit_day"], [], ["visit_at"]]);
      const sql = levelPassSql(split.rest, split);
      expect(sql).toContain("(__fold, __nm)");
      expect(sql).toContain("(__tk0, __fold)");
      expect(sql).not.toContain("__nn0");
      expect(sql.match(/AS __tmin\d/g)).toHaveLength(1); // visit_at's only
      const unkeyed = await passIn<Row>(engine, plan, "unkeyed", COLUMNS);
      const keyed = await passIn<Row>(engine, plan, "grouping", COLUMNS);
      const keyedApart = await passIn<Row>(engine, plan, "apart", COLUMNS);
      expect(keyed.table).toEqual(unkeyed.table);
      expect(keyedApart.table).toEqual(unkeyed.table);
      expect(keyed.totals).toEqual(unkeyed.totals);
      expect(keyedApart.totals).toEqual(unkeyed.totals);
      // no keyed entry is left behind in the level table
      const [left] = await engine.rows<{ n: number }>(`SELECT count(*)::DOUBLE AS n FROM ${LEVEL_TABLE} WHERE col < -1`, "test");
      expect(left?.n).toBe(0);
      // brute force: the keyed date column's range and the masked counts
      const col = (name: string) => raw.map((r) => r[header.indexOf(name)]!);
      const days = col("visit_day").filter((v) => v !== "").sort();
      expect(keyed.totals.time?.get("visit_day")).toEqual({ min: `${days[0]} 00:00:00`, max: `${days[days.length - 1]} 00:00:00`, parsed: days.length, offDay: 0, offHour: 0, offMinute: 0, offSecond: 0 });
      for (const c of ["visit_no", "pets", "visit_at", "visit_day"]) expect(keyed.totals.nonMissing.get(c)).toBe(col(c).filter((v) => v !== "").length);
    });
  });

  it("more count columns than the mask holds: the rest stay aggregates, the counts are the same", async () => {
    await withEngine({ threads: 1 }, async (engine) => {
      const source = await openSource(engine, [csv]);
      // MASK_MAX + 3 count columns: copies of the four numeric and time columns under new names
      const counts = Array.from({ length: MASK_MAX + 3 }, (_, j) => `n${j}`);
      const from = ["visit_no", "pets", "visit_at", "visit_day"];
      await engine.run(`CREATE TEMP VIEW many AS SELECT *, ${counts.map((c, j) => `"${from[j % 4]}" AS ${c}`).join(", ")} FROM ${source.view}`, "test");
      const plan: PassPlan = { view: "many", fold: rowHashFolds(source.columns, 3, 7), levelColumns: ["clinic"], countColumns: counts, target: { column: "no_show", kind: "binary" } };
      expect(splitKeyed(plan).counts).toHaveLength(MASK_MAX);
      expect(splitKeyed(plan).rest.countColumns).toHaveLength(3);
      const keyed = await passIn<Row>(engine, plan, "grouping", COLUMNS);
      const unkeyed = await passIn<Row>(engine, plan, "unkeyed", COLUMNS);
      expect(keyed.table).toEqual(unkeyed.table);
      expect(keyed.totals).toEqual(unkeyed.totals);
    });
  });

  it("keys a time column only when its first rows show few distinct values", () => {
    const sample = (name: string, distinct: number, sampledRows: number) => ({ name, nonMissing: sampledRows, numberLike: 0, integerLike: 0, distinct, timeLike: sampledRows, sampledRows });
    const samples = [sample("day", 700, 50_000), sample("at", 41_000, 50_000), sample("edge", 5_000, 50_000), sample("few", 3, 20)];
    expect(keyableTimeColumns(samples, ["day", "at", "edge", "few"])).toEqual(["day", "edge"]);
    expect(5_000).toBe(KEYED_TIME_SHARE * 50_000);
    // keyed extras no longer count towards the inline limit: the bench's sample (3 count columns, one few-valued date) keeps one read
    const plan = { countColumns: ["a", "b", "d", "e"], timeColumns: ["d", "e"], contentColumns: ["a"] };
    expect(extrasFor("csv", plan)).toBe("apart"); // 2 × 7 time aggregates + the content hash
    expect(extrasFor("csv", { ...plan, keyableTimeColumns: ["d", "e"] })).toBe("inline"); // the content hash alone
  });
});
