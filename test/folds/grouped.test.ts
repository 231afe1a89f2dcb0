/**
 * Entity-grouped folds (--fold-by, engine/folds kind "grouped"), checked by brute force on a
 * generated visit log with repeated owners (test/folds/ownerVisits.ts):
 *  - no key value in two folds (recounted from the level table scan writes, and from foldSql);
 *  - encode --for training with a grouped plan gives every row the fold its owner has in the
 *    scan's level table, from the plan's table and from a fresh pass (--recount);
 *  - the nesting share (engine/keyNesting) equals a recount in JavaScript;
 *  - --fold-by owner_id makes the leakage gap (in-sample minus out-of-fold) of the owner-following
 *    pet name visibly larger than row folds do, and the record says why;
 *  - bad --fold-by values: one line, exit 2; without --fold-by the contract is the row hash.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { encode } from "../../src/commands/encode.js";
import { levelSql } from "../../src/commands/sql.js";
import { scan } from "../../src/commands/scan.js";
import { writeReportFolder } from "../../src/commands/scanCli.js";
import { withEngine } from "../../src/engine/db.js";
import { foldSql, groupedFolds, readFoldContract } from "../../src/engine/folds.js";
import { keyNestingShares, NESTING_THRESHOLD } from "../../src/engine/keyNesting.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { validateProfile } from "../../src/profile/schema.js";
import type { Profile } from "../../src/profile/types.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";
import { column, parseCsv } from "../encode/helpers.js";
import { ownerVisits } from "./ownerVisits.js";

const dir = tempDir("grouped");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const data = ownerVisits();
const file = writeFile(dir, "visits.csv", data.csv);

const groupedFoldsFor = (key: string[]) => groupedFolds(key, 5, 42);
const gap = (p: Profile, name: string): number => {
  const l = p.columns.find((c) => c.name === name)!.target!.leakage;
  return l.inSample! - l.outOfFold!;
};

describe("entity-grouped folds", () => {
  it("no owner is in two folds: the level table scan writes, and foldSql over the raw rows", async () => {
    const out = path.join(dir, "plan");
    fs.mkdirSync(out);
    const p = await scan([file], { target: "no_show", foldBy: ["owner_id"], folds: 5, seed: 7, levelTableOut: path.join(out, "..", "levels.staged.parquet") });
    await writeReportFolder(p, out, { levelTable: path.join(out, "..", "levels.staged.parquet") }); // moved in as one plan set
    expect(p.settings.fold).toEqual({ kind: "grouped", hash: "duckdb-hash-of-key-text", seed: 7, k: 5, keyColumns: ["owner_id"] });
    expect(readFoldContract(JSON.parse(fs.readFileSync(path.join(out, "profile.json"), "utf8")).settings)).toEqual(p.settings.fold);
    const [tableFolds, rowFolds] = await withEngine({ threads: 1 }, async (e) => [
      await e.rows<{ level: string; fold: number }>(
        `SELECT level, fold::INTEGER AS fold FROM read_parquet(${quoteLiteral(path.join(out, "levels.parquet"))}) WHERE "column" = 'owner_id'`, "owner folds"),
      await e.rows<{ owner_id: string; fold: number }>(
        `SELECT owner_id, ${foldSql(p.settings.fold!)} AS fold FROM read_csv(${quoteLiteral(file)}, all_varchar = true)`, "row folds"),
    ]);
    // brute force in JavaScript: collect the folds each owner was seen in
    const seen = new Map<string, Set<number>>();
    for (const r of tableFolds) seen.set(r.level, (seen.get(r.level) ?? new Set()).add(r.fold));
    expect(seen.size).toBe(240);
    expect([...seen.values()].filter((s) => s.size !== 1)).toEqual([]);
    const byRow = new Map<string, Set<number>>();
    for (const r of rowFolds) byRow.set(r.owner_id, (byRow.get(r.owner_id) ?? new Set()).add(r.fold));
    expect([...byRow.values()].every((s) => s.size === 1)).toBe(true);
    for (const [owner, folds] of byRow) expect([...folds]).toEqual([...seen.get(owner)!]);
    // every fold has owners (5 folds over 240 owners)
    expect(new Set(rowFolds.map((r) => r.fold)).size).toBe(5);
    // row folds split owners over several folds (the contrast the option exists for)
    const rowHash = await scan([file], { target: "no_show", folds: 5, seed: 7 });
    const split = await withEngine({ threads: 1 }, (e) => e.rows<{ n: number }>(
      `SELECT count(*)::DOUBLE AS n FROM (SELECT owner_id FROM read_csv(${quoteLiteral(file)}, all_varchar = true)
       GROUP BY owner_id HAVING count(DISTINCT ${foldSql(rowHash.settings.fold!)}) > 1)`, "split owners"));
    expect(split[0]!.n).toBeGreaterThan(200);
  });

  it("encode --for training with the grouped plan gives each row its owner's fold from the scan's level table", async () => {
    const plan = path.join(dir, "plan");
    const levels = await withEngine({ threads: 1 }, (e) => e.rows<{ level: string; fold: number }>(
      `SELECT level, fold::INTEGER AS fold FROM read_parquet(${quoteLiteral(path.join(plan, "levels.parquet"))}) WHERE "column" = 'owner_id'`, "owner folds"));
    const ownerFold = new Map(levels.map((r) => [r.level, r.fold]));
    for (const recount of [false, true]) {
      const out = path.join(dir, `train-${recount}.csv`);
      const summary = await encode([file], { plan, out, mode: "training", keep: ["visit_id", "owner_id"], recount });
      expect(summary.levelSource).toBe(recount ? "input pass" : "plan level table");
      const csv = parseCsv(fs.readFileSync(out, "utf8"));
      const owners = column(csv, "owner_id");
      const folds = column(csv, "fold");
      expect(owners.length).toBe(data.rows.length);
      expect(column(csv, "visit_id")).toEqual(data.rows.map((r) => r[0]));
      owners.forEach((o, i) => expect(Number(folds[i])).toBe(ownerFold.get(o!)));
      const manifest = JSON.parse(fs.readFileSync(`${out}.mappings/mappings.json`, "utf8"));
      expect(manifest.folds).toMatchObject({ kind: "grouped", hash: "duckdb-hash-of-key-text", identityColumns: ["owner_id"], k: 5, seed: 7 });
    }
  });

  it("the nesting share equals a recount, and the record says which columns follow the key", async () => {
    const p = await scan([file], { target: "no_show", foldBy: ["owner_id"] });
    const recount = (k: number): number => {
      const owners = new Map<string, Set<string>>();
      for (const r of data.rows) owners.set(r[k]!, (owners.get(r[k]!) ?? new Set()).add(r[1]!));
      return data.rows.filter((r) => owners.get(r[k]!)!.size === 1).length / data.rows.length;
    };
    const share = (name: string) => p.columns.find((c) => c.name === name)!.keyNesting!.share;
    expect(share("pet_name")).toBeCloseTo(recount(2), 12);
    expect(share("payment")).toBeCloseTo(recount(3), 12);
    expect(share("pet_name")).toBeGreaterThanOrEqual(NESTING_THRESHOLD);
    expect(share("pet_name")).toBeLessThan(1); // the shared "Bella" spans owners
    expect(share("payment")).toBe(0);
    expect(p.columns.find((c) => c.name === "owner_id")!.keyNesting).toBeUndefined();
    const cautions = (name: string) => p.columns.find((c) => c.name === name)!.recommendation.cautions ?? [];
    expect(cautions("pet_name").some((c) => /nearly a label of the entity/.test(c))).toBe(true);
    expect(cautions("payment").some((c) => /nearly a label/.test(c))).toBe(false);
    expect(() => validateProfile(JSON.parse(JSON.stringify(p)))).not.toThrow();
  });

  it("--fold-by owner_id makes the pet name's leakage gap visibly larger than row folds, and the record says why", async () => {
    const rows = await scan([file], { target: "no_show" });
    const grouped = await scan([file], { target: "no_show", foldBy: ["owner_id"] });
    // in-sample scores do not depend on the folds; the out-of-fold ones fall for new owners
    const pet = (p: Profile) => p.columns.find((c) => c.name === "pet_name")!.target!.leakage;
    expect(pet(grouped).inSample).toBeCloseTo(pet(rows).inSample!, 12);
    expect(gap(grouped, "pet_name")).toBeGreaterThan(gap(rows, "pet_name") + 0.1);
    // a column that does not follow the owner (species is drawn per visit) barely moves
    expect(Math.abs(gap(grouped, "species") - gap(rows, "species"))).toBeLessThan(0.05);
    const out = path.join(dir, "record");
    const c = collector();
    expect(await runCli(["scan", file, "--target", "no_show", "--fold-by", "owner_id", "--out", out, "--quiet"], c.io)).toBe(0);
    const md = fs.readFileSync(path.join(out, "decisions.md"), "utf8");
    // decisions.md escapes Markdown: owner\_id
    expect(md).toMatch(/Folds: entity-grouped folds by owner\\_id: every row of an entity shares one of 5 folds/);
    expect(md).toMatch(/of this column's rows carry a level that occurs with a single owner\\_id only/);
    expect(md).toContain("so its out-of-fold figures would be optimistic");
    expect(fs.readFileSync(path.join(out, "report.html"), "utf8")).toContain("entity-grouped folds by owner_id");
    const rowOut = path.join(dir, "record-rows");
    expect(await runCli(["scan", file, "--target", "no_show", "--out", rowOut, "--quiet"], c.io)).toBe(0);
    expect(fs.readFileSync(path.join(rowOut, "decisions.md"), "utf8")).not.toMatch(/entity-grouped|nearly a label/);
  });

  it("refuses a bad --fold-by with one line and exit 2, and writes nothing", async () => {
    const cases: [string[], RegExp][] = [
      [["--fold-by", "owner"], /^--fold-by: column 'owner' not found; columns are: visit_id, owner_id/],
      [["--fold-by", "no_show"], /^--fold-by: 'no_show' is the target; group folds by an entity column, not by the target$/],
      [["--fold-by", ""], /^--fold-by names nothing; give at least one name/], // the CLI refuses a blank list option first (commands/optionChecks),
      [["--fold-by", "owner_id,owner_id"], /^--fold-by names 'owner_id' twice$/],
    ];
    for (const [args, message] of cases) {
      const c = collector();
      const out = path.join(dir, "refused");
      expect(await runCli(["scan", file, "--target", "no_show", ...args, "--out", out], c.io)).toBe(2);
      const lines = c.err.trim().split("\n");
      expect(lines.length).toBe(1);
      expect(lines[0]!.replace(/^tailsift: /, "")).toMatch(message);
      expect(fs.existsSync(path.join(out, "profile.json"))).toBe(false);
    }
    await expect(scan([file], { foldBy: [] })).rejects.toThrow(/^--fold-by needs one or more column names/);
    // level tables carry their own folds
    const c = collector();
    expect(await runCli(["scan", "--levels", path.join(dir, "plan", "levels.parquet"), "--fold-by", "owner_id"], c.io)).toBe(2);
    expect(c.err.trim()).toBe("tailsift: --fold-by does not apply to --levels: level tables are already counted");
  });

  it("two key columns hash together; without --fold-by the contract is the row hash over every column", async () => {
    const p = await scan([file], { target: "no_show", foldBy: ["owner_id", "pet_name"] });
    expect(p.settings.fold!.keyColumns).toEqual(["owner_id", "pet_name"]);
    // the nesting share over a two-column key, recounted: species levels span many (owner, pet) pairs
    const pairs = new Map<string, Set<string>>();
    for (const r of data.rows) pairs.set(r[4]!, (pairs.get(r[4]!) ?? new Set()).add(`${r[1]}\u0000${r[2]}`));
    const nested = data.rows.filter((r) => pairs.get(r[4]!)!.size === 1).length / data.rows.length;
    expect(p.columns.find((c) => c.name === "species")!.keyNesting).toEqual({ keyColumns: ["owner_id", "pet_name"], share: nested });
    expect(p.columns.find((c) => c.name === "payment")!.keyNesting!.share).toBe(0);
    expect(p.columns.find((c) => c.name === "visit_id")!.keyNesting!.share).toBe(1); // one visit, one (owner, pet)
    const c = collector();
    expect(await runCli(["scan", file, "--target", "no_show", "--fold-by", "owner_id"], c.io)).toBe(0);
    expect(c.out.split("\n")[0]).toMatch(/; 5 folds, seed 42 \(grouped by owner_id\)$/);
    const plain = await scan([file], { target: "no_show" });
    expect(plain.settings.fold).toEqual({ kind: "row-hash", hash: "duckdb-hash-of-row-text", seed: 42, k: 5, keyColumns: data.header });
    expect(plain.columns.every((c) => c.keyNesting === undefined)).toBe(true);
  });

  it("tailsift sql with a fold expression over the key only (the README's DuckDB example) keeps each owner in one fold", async () => {
    const sql = levelSql({ columns: ["owner_id"], from: "visits", target: "no_show", targetKind: "binary", foldExpr: 'hash("owner_id")', folds: 5 });
    const rows = await withEngine({ threads: 1 }, async (e) => {
      await e.run(`CREATE TEMP VIEW visits AS SELECT * FROM read_csv(${quoteLiteral(file)}, all_varchar = true)`, "view");
      return e.rows<{ level: string; folds: number }>(`SELECT level, count(DISTINCT fold)::DOUBLE AS folds FROM (${sql}) GROUP BY level`, "sql folds");
    });
    expect(rows.length).toBe(240);
    expect(rows.every((r) => r.folds === 1)).toBe(true);
  });

  it("a missing key is one entity: its rows share a fold and count as one entity in the nesting share", async () => {
    // (key, x): L1 with a twice, L2 with a missing key twice, L3 with a and a missing key, L4 with b
    const small = writeFile(dir, "missing-key.csv", "k,x\na,L1\na,L1\n,L2\n,L2\na,L3\n,L3\nb,L4\n");
    const [shares, folds] = await withEngine({ threads: 1 }, async (e) => {
      await e.run(`CREATE TEMP VIEW small AS SELECT * FROM read_csv(${quoteLiteral(small)}, all_varchar = true)`, "view");
      return [await keyNestingShares(e, "small", ["x"], ["k"]),
        await e.rows<{ n: number }>(`SELECT count(DISTINCT ${foldSql(groupedFoldsFor(["k"]))})::DOUBLE AS n FROM small WHERE k IS NULL`, "missing-key folds")];
    });
    expect(shares).toEqual([5 / 7]); // L1 (2 rows) + L2 (2) + L4 (1) stay within one entity; L3 spans two
    expect(folds[0]!.n).toBe(1);
  });

  it("readFoldContract reads a grouped contract back and refuses a damaged one", () => {
    const good = { kind: "grouped", hash: "duckdb-hash-of-key-text", seed: 3, k: 4, keyColumns: ["owner_id"] };
    expect(readFoldContract({ fold: good })).toEqual(good);
    expect(() => readFoldContract({ fold: { ...good, keyColumns: [] } })).toThrow(/not a row-hash fold contract/);
    expect(() => readFoldContract({ fold: { ...good, hash: "other" } })).toThrow(/not a row-hash fold contract/);
  });
});
