/**
 * The wide (unnest) pass must build exactly the level table of the GROUPING SETS pass: every
 * (col, level, fold) row with rows, n_y, sum_y, sum_y2, the per-fold totals (rows, target sums,
 * bad targets, numeric non-missing counts). Checked on generated shapes with NULLs/empty fields,
 * bad target values, numeric columns and several fold counts, and once against a brute-force
 * recount in JavaScript. Continuous targets are multiples of 0.25 so that every sum is exact in
 * binary floating point whatever the order of addition (the two passes add in different orders).
 */
import { rowHashFolds, rowHashFoldSql } from "../../src/engine/folds.js";
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import type { PassPlan } from "../../src/engine/aggregate.js";
import { withEngine, type Engine } from "../../src/engine/db.js";
import { openSource } from "../../src/engine/source.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import type { TargetSpec } from "../../src/engine/target.js";
import { useWidePass, WIDE_PASS_MIN_COLUMNS } from "../../src/engine/widePass.js";
import { sampleColumns } from "../../src/engine/inspect.js";
import { passIn } from "../helpers/passModes.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("widepass");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

interface Shape { name: string; levelCols: number; numericCols: number; rows: number; target?: "binary" | "continuous"; folds: number; seed: number }

/** A CSV mixing constants, indicators, small counts, hundred-level codes, empty fields and a target with missing and bad values. */
function shapeCsv(shape: Shape): { file: string; levelColumns: string[]; countColumns: string[] } {
  const rnd = mulberry32(shape.seed);
  const levelColumns = Array.from({ length: shape.levelCols }, (_, j) => `c${j}`);
  const countColumns = Array.from({ length: shape.numericCols }, (_, j) => `x${j}`);
  const header = [...levelColumns, ...countColumns, ...(shape.target ? ["y"] : [])];
  const lines = [header.join(",")];
  for (let r = 0; r < shape.rows; r++) {
    const cells = levelColumns.map((_, j) => {
      const u = rnd();
      if (j % 7 === 3 && u < 0.15) return ""; // empty field = missing
      switch (j % 5) {
        case 0: return "same";
        case 1: return u < 0.3 ? "1" : "0";
        case 2: return String(Math.floor(u * u * 6));
        case 3: return `K${Math.floor(u * 120)}`;
        default: return u < 0.5 ? "a" : u < 0.8 ? "b" : "c,d"; // a quoted field
      }
    }).map((v) => (v.includes(",") ? `"${v}"` : v));
    for (let j = 0; j < shape.numericCols; j++) cells.push(rnd() < 0.1 ? "" : (rnd() * 1000).toFixed(2));
    if (shape.target === "binary") {
      const u = rnd();
      cells.push(u < 0.05 ? "" : u < 0.08 ? "maybe" : u < 0.5 ? "1" : "0");
    } else if (shape.target === "continuous") {
      const u = rnd();
      cells.push(u < 0.05 ? "" : u < 0.07 ? "n/a" : String(Math.floor(rnd() * 40) * 0.25));
    }
    lines.push(cells.join(","));
  }
  return { file: writeFile(dir, `${shape.name}.csv`, `${lines.join("\n")}\n`), levelColumns, countColumns };
}

type Row = { col: number; level: string | null; fold: number; rows: number; n_y: number; sum_y: number; sum_y2: number; bad: number | null };

const pass = (engine: Engine, plan: PassPlan, mode: "wide" | "grouping") =>
  passIn<Row>(engine, plan, mode, "col, level, fold, rows::DOUBLE AS rows, n_y::DOUBLE AS n_y, sum_y, sum_y2, CASE WHEN col = -1 THEN bad::DOUBLE END AS bad");

const SHAPES: Shape[] = [
  { name: "wide-binary", levelCols: 230, numericCols: 3, rows: 400, target: "binary", folds: 5, seed: 1 },
  { name: "narrow-continuous", levelCols: 12, numericCols: 2, rows: 1500, target: "continuous", folds: 3, seed: 2 },
  { name: "no-target", levelCols: 40, numericCols: 0, rows: 300, folds: 10, seed: 3 },
  { name: "numeric-only", levelCols: 0, numericCols: 4, rows: 200, target: "binary", folds: 5, seed: 4 },
];

describe("the wide pass builds the same level table as the GROUPING SETS pass", () => {
  it.each(SHAPES)("$name: $levelCols level columns, $numericCols numeric, $rows rows, $folds folds", async (shape) => {
    const { file, levelColumns, countColumns } = shapeCsv(shape);
    await withEngine({ threads: 2 }, async (engine) => {
      const source = await openSource(engine, [file]);
      const target: TargetSpec | undefined = shape.target ? { column: "y", kind: shape.target } : undefined;
      const plan: PassPlan = { view: source.view, fold: rowHashFolds(source.columns, shape.folds, 42), levelColumns, countColumns, target };
      const grouping = await pass(engine, plan, "grouping");
      const wide = await pass(engine, plan, "wide");
      expect([grouping.wide, wide.wide]).toEqual([false, true]);
      expect(wide.table.length).toBeGreaterThanOrEqual(shape.folds);
      expect(wide.table).toEqual(grouping.table);
      expect(wide.totals).toEqual(grouping.totals);
      // the totals are not trivially zero: bad targets and numeric non-missing counts are present
      if (shape.target) expect(wide.totals.badTargets).toBeGreaterThan(0);
      for (const c of countColumns) expect(wide.totals.nonMissing.get(c)).toBeGreaterThan(0);
    });
  });

  it("matches a brute-force recount of the generated rows (levels, folds, target sums)", async () => {
    const shape = SHAPES[0]!;
    const { file, levelColumns, countColumns } = shapeCsv({ ...shape, name: "brute", levelCols: 25, rows: 250 });
    await withEngine({ threads: 1 }, async (engine) => {
      const source = await openSource(engine, [file]);
      const plan: PassPlan = { view: source.view, fold: rowHashFolds(source.columns, 5, 42), levelColumns, countColumns, target: { column: "y", kind: "binary" } };
      const { table } = await pass(engine, plan, "wide");
      const raw = await engine.rows<Record<string, string | null> & { __fold: number }>(
        `SELECT *, ${rowHashFoldSql(source.columns, 42, 5)} AS __fold FROM read_csv(${quoteLiteral(file)}, all_varchar = true, header = true)`, "reading rows back");
      const expected = new Map<string, { rows: number; n_y: number; sum_y: number }>();
      for (const r of raw) {
        const y = r.y === "1" ? 1 : r.y === "0" ? 0 : null;
        levelColumns.forEach((c, col) => {
          const key = JSON.stringify([col, r[c] ?? null, r.__fold]);
          const e = expected.get(key) ?? { rows: 0, n_y: 0, sum_y: 0 };
          e.rows += 1;
          if (y !== null) { e.n_y += 1; e.sum_y += y; }
          expected.set(key, e);
        });
      }
      const got = new Map(table.filter((t) => t.col >= 0).map((t) => [JSON.stringify([t.col, t.level, t.fold]), { rows: t.rows, n_y: t.n_y, sum_y: t.sum_y }]));
      expect(got).toEqual(expected);
    });
  });

  it(`is chosen by shape: from ${WIDE_PASS_MIN_COLUMNS} measured columns on`, () => {
    const plan = (n: number): PassPlan => ({ view: "v", fold: rowHashFolds([], 5, 1), levelColumns: Array.from({ length: n }, (_, j) => `c${j}`), countColumns: [] });
    const before = process.env.TAILSIFT_PASS;
    delete process.env.TAILSIFT_PASS;
    try {
      expect(useWidePass(plan(WIDE_PASS_MIN_COLUMNS - 1))).toBe(false);
      expect(useWidePass(plan(WIDE_PASS_MIN_COLUMNS))).toBe(true);
    } finally {
      if (before !== undefined) process.env.TAILSIFT_PASS = before;
    }
  });
});

describe("the wide sample (one unnested query) counts what the batched sample counts", () => {
  it("250 columns: the same non-missing, number-like, integer and distinct counts as batches of 125 columns", async () => {
    const { file, levelColumns, countColumns } = shapeCsv({ name: "sample", levelCols: 240, numericCols: 10, rows: 300, target: "binary", folds: 5, seed: 9 });
    const columns = [...levelColumns, ...countColumns];
    await withEngine({ threads: 1 }, async (engine) => {
      const source = await openSource(engine, [file]);
      const wide = await sampleColumns(engine, source.view, columns);
      const batched = [...await sampleColumns(engine, source.view, columns.slice(0, 125)), ...await sampleColumns(engine, source.view, columns.slice(125))];
      expect(wide).toEqual(batched);
      // brute force for the non-missing counts (empty fields are missing)
      const raw = fs.readFileSync(file, "utf8").trimEnd().split("\n").slice(1).map((l) => l.replace(/"c,d"/g, "cd").split(","));
      expect(wide.map((w) => w.nonMissing)).toEqual(columns.map((_, j) => raw.filter((r) => r[j] !== "").length));
      expect(wide.filter((w) => w.numberLike === w.nonMissing && w.distinct > 20).map((w) => w.name)).toEqual(countColumns);
      // the one integer count (numeric identifiers and encode's BIGINT both read it): plain integers of ≤ 18 digits
      expect(wide.map((w) => w.integerLike)).toEqual(columns.map((_, j) => raw.filter((r) => /^-?(0|[1-9][0-9]{0,17})$/.test(r[j]!)).length));
    });
  });
});
