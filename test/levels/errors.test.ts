/**
 * `scan --levels` on tables it must refuse (exit 2 with a message naming the problem), and the
 * documented choices: column selection, target-free tables, the kind check.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { scanLevels } from "../../src/commands/levels.js";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { expectCliError } from "../helpers/cliError.js";
import { tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("levels-errors");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const at = (name: string) => path.join(dir, name);

const HEADER = "column,level,fold,rows,n_y,sum_y,sum_y2";
// Hand-made level table: 10 rows in two folds (6 + 4), a binary target with 4 positives.
// colour: red 5 rows (3 positive), blue 5 rows (1 positive); size: S 4 (2), M 6 (2).
const GOOD = [HEADER,
  "colour,red,0,3,3,2,2", "colour,red,1,2,2,1,1", "colour,blue,0,3,3,1,1", "colour,blue,1,2,2,0,0",
  "size,S,0,2,2,1,1", "size,S,1,2,2,1,1", "size,M,0,4,4,2,2", "size,M,1,2,2,0,0"].join("\n");

beforeAll(async () => {
  writeFile(dir, "good.csv", `${GOOD}\n`);
  // same rows without target sums (the SQL written without --target): n_y 0, sums empty (NULL)
  writeFile(dir, "no-target.csv", `${GOOD.split("\n").map((l, i) => i === 0 ? l : l.replace(/,\d+,\d+,\d+$/, ",0,,")).join("\n")}\n`);
  // continuous sums: sum_y2 ≠ sum_y
  writeFile(dir, "continuous.csv", `${GOOD.split("\n").map((l, i) => i === 0 ? l : l.replace(/,(\d+)$/, (_, s: string) => `,${Number(s) * 3 + 1}`)).join("\n")}\n`);
  writeFile(dir, "bad-fold.csv", `${HEADER}\ncolour,red,-1,3,3,2,2\n`);
  writeFile(dir, "bad-counts.csv", `${HEADER}\ncolour,red,0,3,4,2,2\n`);
  await withEngine({ threads: 1 }, async (engine) => {
    await engine.run(`COPY (SELECT 'colour' AS "column", 'red' AS level, 3 AS rows) TO ${quoteLiteral(at("missing.parquet"))} (FORMAT parquet)`, "write");
  });
});

describe("scan --levels refuses what it cannot read (exit 2)", () => {
  const cases: [string, string[], string, RegExp][] = [
    ["a file without the level-table columns", ["missing.parquet"], "bad_level_table", /not a level table: missing columns fold, n_y, sum_y, sum_y2/],
    ["a file that does not exist", ["nowhere.parquet"], "input_not_found", /not found/],
    ["a negative fold", ["bad-fold.csv"], "bad_level_table", /fold outside 0\.\.99/],
    ["n_y larger than rows", ["bad-counts.csv"], "bad_level_table", /n_y outside 0\.\.rows/],
  ];
  for (const [label, files, code, message] of cases) {
    it(label, async () => {
      await expectCliError(["scan", "--levels", ...files.map(at), "--no-progress"], code, message);
    });
  }

  it("options that read raw rows", async () => {
    await expectCliError(["scan", "--levels", at("good.csv"), "--as-categorical", "colour", "--no-progress"], "bad_option", /--as-categorical does not apply to --levels/);
  });

  it("--target on a table without target sums, and --target-kind binary on continuous sums", async () => {
    await expect(scanLevels([at("no-target.csv")], { target: "y" })).rejects.toMatchObject({ code: "target_empty", exitCode: 2, message: expect.stringMatching(/carry no target values/) });
    await expect(scanLevels([at("continuous.csv")], { target: "y", targetKind: "binary" })).rejects.toMatchObject({ code: "target_needs_positive", exitCode: 2, message: expect.stringMatching(/not those of a 0\/1 target/) });
    await expect(scanLevels([at("good.csv")], { columns: ["weight"] })).rejects.toMatchObject({ code: "unknown_column", exitCode: 2, message: expect.stringMatching(/'weight' is not in the level tables/) });
    const renamed = writeFile(dir, "named-target.csv", `${GOOD.replaceAll("size,", "target,")}\n`);
    await expect(scanLevels([renamed])).rejects.toMatchObject({ code: "bad_option", exitCode: 2, message: expect.stringMatching(/name the target with --target NAME/) });
  });
});

describe("documented choices", () => {
  it("reads a hand-made CSV table: totals, folds, binary kind and the named target", async () => {
    const p = await scanLevels([at("good.csv")], { target: "returned", threads: 1 });
    expect(p.input.rows).toBe(10);
    expect(p.settings.folds).toBe(2); // folds 0 and 1 in the table
    expect(p.target).toMatchObject({ column: "returned", kind: "binary", rows: 10, missing: 0, mean: 0.4 });
    const colour = p.columns.find((c) => c.name === "colour");
    expect(colour?.topLevels.map((l) => [l.value, l.rows, l.targetMean])).toEqual([["blue", 5, 0.2], ["red", 5, 0.6]]); // ties by value
    expect(p.columns.map((c) => c.role)).toEqual(["categorical", "categorical", "target"]);
  });

  it("infers a continuous target and names it 'target' when --target is absent", async () => {
    const p = await scanLevels([at("continuous.csv")], { threads: 1 });
    expect(p.target?.kind).toBe("continuous");
    expect(p.target?.column).toBe("target");
    // totals come from one column: sum_y = 4 (unchanged), sum_y2 = Σ(3·s + 1) over its 4 rows = 3·4 + 4 = 16
    // → mean 0.4, population sd = √(16/10 − 0.4²) = √1.44 = 1.2
    expect(p.target?.mean).toBeCloseTo(0.4, 12);
    expect(p.target?.sd).toBeCloseTo(1.2, 12);
  });

  it("without target sums gives target-free advice; --columns picks and orders the columns", async () => {
    const p = await scanLevels([at("no-target.csv")], { columns: ["size", "colour"], threads: 1 });
    expect(p.target).toBeUndefined();
    expect(p.columns.map((c) => c.name)).toEqual(["size", "colour"]);
    expect(p.columns.every((c) => c.target === undefined)).toBe(true);
    const q = await scanLevels([at("no-target.csv")], { exclude: ["size"], threads: 1 });
    expect(q.columns.map((c) => c.name)).toEqual(["colour"]);
  });
});
