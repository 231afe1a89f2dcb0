/**
 * The fold contract (engine/folds): one validation of --folds / --seed shared by scan and sql,
 * the contract written to profile.json as settings.fold, read back by encode through
 * readFoldContract (profiles written before settings.fold still read), and the fold SQL equal to
 * the row hash scan assigns (checked against a brute-force recount of the level table's folds).
 */
import { describe, expect, it } from "vitest";
import { levelSql } from "../../src/commands/sql.js";
import { scan } from "../../src/commands/scan.js";
import { withEngine } from "../../src/engine/db.js";
import { checkFoldCount, externalFolds, foldSql, readFoldContract, singleFold } from "../../src/engine/folds.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { validateProfile } from "../../src/profile/schema.js";
import { TailsiftError } from "../../src/errors.js";
import { tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("folds");
const file = writeFile(dir, "f.csv", ["id,grp,y", ...Array.from({ length: 200 }, (_, i) => `${i},g${i % 7},${i % 3 === 0 ? 1 : 0}`)].join("\n") + "\n");

const thrown = (f: () => unknown): TailsiftError => {
  try { f(); } catch (err) { return err as TailsiftError; }
  throw new Error("expected a TailsiftError");
};

describe("fold contract", () => {
  it("--folds is checked by one function: scan and sql refuse 1 and 101 with the same message", async () => {
    for (const k of [1, 101, 2.5]) {
      const direct = thrown(() => checkFoldCount(k));
      expect(direct.code).toBe("bad_option");
      expect(direct.message).toBe(`--folds must be an integer from 2 to 100 (got ${k})`);
      expect(thrown(() => levelSql({ columns: ["grp"], from: "t", foldExpr: "id", folds: k })).message).toBe(direct.message);
      await expect(scan([file], { folds: k })).rejects.toThrow(direct.message);
    }
  });

  it("K and the seed are the fold request's: the advice records them, and a policy carrying them is refused", async () => {
    const p = await scan([file], { target: "y", folds: 3, seed: 5 });
    expect(p.settings.folds).toBe(3);
    expect(p.settings.fold?.k).toBe(3);
    expect(p.settings.fold?.seed).toBe(5);
    await expect(scan([file], { target: "y", policy: { folds: 3 } as never })).rejects.toThrow(/policy\.folds is no longer read/);
  });

  it("scan writes the contract as settings.fold (row hash over every column, in file order)", async () => {
    const p = await scan([file], { target: "y", folds: 4, seed: 9 });
    expect(p.settings.fold).toEqual({ kind: "row-hash", hash: "duckdb-hash-of-row-text", seed: 9, k: 4, keyColumns: ["id", "grp", "y"] });
    expect(p.settings.foldColumns).toBeUndefined();
    expect(() => validateProfile(JSON.parse(JSON.stringify(p)))).not.toThrow();
    expect(readFoldContract(p.settings)).toEqual(p.settings.fold);
  });

  it("the pass assigns exactly the folds foldSql gives (per-fold row counts of the written level table)", async () => {
    const levels = `${dir}/levels.parquet`;
    const p = await scan([file], { target: "y", folds: 4, seed: 9, levelTableOut: levels });
    const fold = readFoldContract(p.settings);
    const [direct, written] = await withEngine({ threads: 1 }, async (e) => [
      await e.rows<{ fold: number; n: number }>(
        `SELECT ${foldSql(fold)} AS fold, count(*)::DOUBLE AS n FROM read_csv(${quoteLiteral(file)}, all_varchar = true) GROUP BY 1 ORDER BY 1`, "folds"),
      await e.rows<{ fold: number; n: number }>(
        `SELECT fold::INTEGER AS fold, sum(rows)::DOUBLE AS n FROM read_parquet(${quoteLiteral(levels)}) WHERE "column" = 'grp' GROUP BY 1 ORDER BY 1`, "level table folds"),
    ]);
    expect(direct.reduce((s, r) => s + r.n, 0)).toBe(200);
    expect(direct.length).toBe(4);
    expect(written).toEqual(direct);
  });

  it("reads a profile written before settings.fold (settings.foldColumns + folds + seed)", () => {
    const old = { folds: 5, seed: 42, foldHash: "duckdb-hash-of-row-text", foldColumns: ["a", "b"] };
    expect(readFoldContract(old)).toEqual({ kind: "row-hash", hash: "duckdb-hash-of-row-text", seed: 42, k: 5, keyColumns: ["a", "b"] });
  });

  it("refuses what it cannot reproduce, with one line", () => {
    const external = thrown(() => readFoldContract({ folds: 5, seed: 42, fold: externalFolds(5, 42) }));
    expect(external.code).toBe("bad_plan");
    expect(external.message).toMatch(/^the plan's folds came from the fold expression given to tailsift sql .*; rescan the training extract$/);
    expect(thrown(() => readFoldContract({ folds: 5, seed: 42 })).message).toMatch(/no settings\.fold/);
    expect(thrown(() => readFoldContract({ fold: { kind: "entity-hash", k: 5 } })).message).toMatch(/not a row-hash fold contract/);
    expect(foldSql(singleFold())).toBe("0::INTEGER");
  });
});
