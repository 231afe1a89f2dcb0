/**
 * Property-based checks (fast-check, seeded; few runs because each one starts DuckDB) on random
 * small CSVs: the profile always validates against the published JSON Schema, level counts equal
 * an independent tally, shares add up to 1, coverage and rare-level figures are monotone, and a
 * row's out-of-fold m-estimate (Cestnik 1990) read from the level table does not change when
 * that row's own target is flipped. These are invariants that follow from the definitions.
 */
import fs from "node:fs";
import fc from "fast-check";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { buildLevelTable, LEVEL_TABLE } from "../../src/engine/aggregate.js";
import { rowHashFoldSql as foldSql, rowHashFolds } from "../../src/engine/folds.js";
import { withEngine } from "../../src/engine/db.js";
import { openSource } from "../../src/engine/source.js";
import { validateProfile } from "../../src/profile/schema.js";
import { mEstimate } from "../../src/stats/mEstimate.js";
import { tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("properties");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const RUNS = { seed: 20261201, numRuns: 18 };
let fileNo = 0;

/** Level values: plain, unicode, quotes, delimiters, newlines, formula-like text. */
const levelValue = fc.oneof(
  fc.constantFrom("North", "South", "Café", "a,b", 'say "hi"', "two\nlines", "=1+1", " padded ", "0", "1"),
  fc.string({ unit: fc.constantFrom("a", "b", "é", "☕", ",", '"', " ", ";"), minLength: 1, maxLength: 4 }),
);
/** A cell: undefined = missing (written as an empty unquoted field, which DuckDB reads as NULL). */
const cell = fc.option(levelValue, { nil: undefined, freq: 5 });

const dataset = fc.record({
  columns: fc.integer({ min: 1, max: 4 }),
  rows: fc.integer({ min: 4, max: 40 }),
  withTarget: fc.boolean(),
}).chain(({ columns, rows, withTarget }) => fc.record({
  cells: fc.array(fc.array(cell, { minLength: columns, maxLength: columns }), { minLength: rows, maxLength: rows }),
  y: fc.array(fc.constantFrom(0, 1), { minLength: rows - 2, maxLength: rows - 2 }).map((y) => [0, 1, ...y]),
  withTarget: fc.constant(withTarget),
}));

const quote = (v: string | undefined) => (v === undefined ? "" : `"${v.replaceAll('"', '""')}"`);

function writeCsv(cells: (string | undefined)[][], y: number[] | null): string {
  const names = (cells[0] ?? []).map((_, j) => `col ${j}`);
  const header = [...names, ...(y ? ["y"] : [])].map(quote).join(",");
  const body = cells.map((r, i) => [...r.map(quote), ...(y ? [String(y[i])] : [])].join(","));
  return writeFile(dir, `p${fileNo++}.csv`, `${header}\n${body.join("\n")}\n`);
}

describe("profiles of random small CSVs", () => {
  it("validate against the schema; counts, shares, coverage and rare figures are consistent", async () => {
    await fc.assert(fc.asyncProperty(dataset, async ({ cells, y, withTarget }) => {
      const file = writeCsv(cells, withTarget ? y : null);
      const profile = await scan([file], { threads: 1, ...(withTarget ? { target: "y" } : {}), asCategorical: (cells[0] ?? []).map((_, j) => `col ${j}`) });
      expect(() => validateProfile(JSON.parse(JSON.stringify(profile)))).not.toThrow();
      expect(profile.input.rows).toBe(cells.length);
      (cells[0] ?? []).forEach((_, j) => {
        const column = profile.columns.find((c) => c.name === `col ${j}`)!;
        const values = cells.map((r) => r[j]);
        const tally = new Map<string, number>();
        for (const v of values) if (v !== undefined) tally.set(v, (tally.get(v) ?? 0) + 1);
        expect(column.missing).toBe(values.filter((v) => v === undefined).length);
        expect(column.distinct).toBe(tally.size);
        if (column.distinct <= profile.settings.top) {
          expect(new Map(column.topLevels.map((l) => [l.value, l.rows]))).toEqual(tally);
          const shares = column.topLevels.reduce((s, l) => s + l.share, 0) + column.missing / column.rows;
          expect(shares).toBeCloseTo(1, 12);
        }
        const coverage = column.coverage.map((c) => c.levels);
        coverage.forEach((levels, i) => {
          expect(levels).toBeLessThanOrEqual(column.distinct);
          if (i > 0) expect(levels).toBeGreaterThanOrEqual(coverage[i - 1]!);
        });
        column.rare.forEach((r, i) => { if (i > 0) expect(r.rowShare).toBeGreaterThanOrEqual(column.rare[i - 1]!.rowShare); });
      });
    }), RUNS);
  });
});

interface Row { id: string; grp: string; y: number }

/** Each row's out-of-fold m-estimate from the level table: the level's sums over the OTHER folds. */
async function oofFromLevelTable(rows: Row[], folds: number, m: number): Promise<{ oof: number[]; fold: number[] }> {
  const file = writeFile(dir, `oof${fileNo++}.csv`, `id,grp,y\n${rows.map((r) => `${r.id},${r.grp},${r.y}`).join("\n")}\n`);
  return withEngine({ threads: 1 }, async (engine) => {
    const source = await openSource(engine, [file]);
    // the fold hashes the id only here, so flipping y cannot move a row to another fold
    await buildLevelTable(engine, { view: source.view, levelColumns: ["grp"], countColumns: [], target: { column: "y", kind: "binary" }, fold: rowHashFolds(["id"], folds, 7) });
    const table = await engine.rows<{ col: number; level: string | null; fold: number; n_y: number; sum_y: number }>(
      `SELECT col, level, fold, n_y::DOUBLE AS n_y, sum_y FROM ${LEVEL_TABLE}`, "reading the level table");
    const foldOf = await engine.rows<{ id: string; fold: number }>(`SELECT id, ${foldSql(["id"], 7, folds)} AS fold FROM ${source.view}`, "reading folds");
    const byId = new Map(foldOf.map((r) => [r.id, r.fold]));
    const fold = rows.map((r) => byId.get(r.id)!);
    const oof = rows.map((r, i) => {
      const others = table.filter((t) => t.fold !== fold[i]);
      const totals = others.filter((t) => t.col === -1);
      const prior = totals.reduce((s, t) => s + t.sum_y, 0) / totals.reduce((s, t) => s + t.n_y, 0);
      const level = others.filter((t) => t.col === 0 && t.level === r.grp);
      return mEstimate(level.reduce((s, t) => s + t.sum_y, 0), level.reduce((s, t) => s + t.n_y, 0), m, prior);
    });
    return { oof, fold };
  });
}

describe("out-of-fold values", () => {
  const data = fc.record({
    grp: fc.array(fc.constantFrom("a", "b", "c", "d"), { minLength: 12, maxLength: 40 }),
    seedY: fc.array(fc.constantFrom(0, 1), { minLength: 40, maxLength: 40 }),
    folds: fc.integer({ min: 2, max: 5 }),
    flip: fc.nat(),
  });
  it("equal a brute-force computation from the other folds' rows and ignore the row's own target", async () => {
    await fc.assert(fc.asyncProperty(data, async ({ grp, seedY, folds, flip }) => {
      const rows: Row[] = grp.map((g, i) => ({ id: `r${i}`, grp: g, y: seedY[i]! }));
      const m = 2;
      const before = await oofFromLevelTable(rows, folds, m);
      // brute force from the raw rows of the other folds (independent of the level table)
      rows.forEach((r, i) => {
        const others = rows.filter((_, k) => before.fold[k] !== before.fold[i]);
        if (others.length === 0) return;
        const prior = others.reduce((s, o) => s + o.y, 0) / others.length;
        const same = others.filter((o) => o.grp === r.grp);
        expect(before.oof[i]).toBeCloseTo(mEstimate(same.reduce((s, o) => s + o.y, 0), same.length, m, prior), 12);
      });
      const k = flip % rows.length;
      const flipped = rows.map((r, i) => (i === k ? { ...r, y: 1 - r.y } : r));
      const after = await oofFromLevelTable(flipped, folds, m);
      expect(after.fold).toEqual(before.fold);
      if (before.fold.some((f) => f !== before.fold[k])) expect(after.oof[k]).toBeCloseTo(before.oof[k]!, 12);
    }), { ...RUNS, numRuns: 15 });
  });
});
