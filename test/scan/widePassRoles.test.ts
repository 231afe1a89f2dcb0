/**
 * The wide (unnest) pass honours the time role and the exact distinct counts of numeric columns
 * as the GROUPING SETS pass does (issue 14 points 1, 2, 10): the same level table, the same time
 * range and granularity counts, the same exact distinct values — checked against each other and
 * against a brute-force recount of the generated rows. Also through scan: a 210-column input
 * (the wide pass and the wide sample are chosen by width) gives the time role, the numeric
 * identifier and the small-count column as a narrow input of the same columns does.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import type { PassPlan } from "../../src/engine/aggregate.js";
import { withEngine, type Engine } from "../../src/engine/db.js";
import { rowHashFolds } from "../../src/engine/folds.js";
import { openSource } from "../../src/engine/source.js";
import { WIDE_PASS_MIN_COLUMNS } from "../../src/engine/widePass.js";
import { scan } from "../../src/commands/scan.js";
import { passIn } from "../helpers/passModes.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("widepass-roles");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** Invented vet-clinic rows: a visit number (row key), a small count, a visit time, a visit date and level columns. */
function rolesCsv(levelCols: number, rows: number, seed: number): { file: string; raw: string[][]; header: string[] } {
  const rnd = mulberry32(seed);
  const rndLevels = mulberry32(seed + 1000); // a stream of its own, so the other columns do not depend on the width
  const levels = Array.from({ length: levelCols }, (_, j) => `c${j}`);
  const header = ["visit_no", "pets", "visit_at", "visit_day", ...levels, "y"];
  const raw: string[][] = [];
  for (let r = 0; r < rows; r++) {
    const day = 1 + Math.floor(rnd() * 28);
    const month = 1 + Math.floor(rnd() * 6);
    const stamp = `2025-${String(month).padStart(2, "0")}-${String(day).padStart(2, "0")}`;
    const minute = Math.floor(rnd() * 4) * 15;
    raw.push([
      String(100_000 + r), // a unique integer per row
      rnd() < 0.05 ? "" : String(Math.floor(rnd() * 4)), // 0–3 pets, some missing
      rnd() < 0.03 ? "" : `${stamp} ${String(8 + Math.floor(rnd() * 9)).padStart(2, "0")}:${String(minute).padStart(2, "0")}`,
      stamp,
      ...levels.map((_, j) => (j % 3 === 0 ? `K${Math.floor(rndLevels() * 12)}` : rndLevels() < 0.5 ? "a" : "b")),
      rnd() < 0.2 ? "1" : "0",
    ]);
  }
  return { file: writeFile(dir, `roles-${levelCols}.csv`, `${[header, ...raw].map((l) => l.join(",")).join("\n")}\n`), raw, header };
}

type Row = { col: number; level: string | null; fold: number; rows: number; n_y: number; sum_y: number };

const pass = (engine: Engine, plan: PassPlan, mode: "wide" | "grouping") =>
  passIn<Row>(engine, plan, mode, "col, level, fold, rows::DOUBLE AS rows, n_y::DOUBLE AS n_y, sum_y");

describe("the wide pass keeps the time ranges and exact distinct counts of the GROUPING SETS pass", () => {
  it("same level table and totals, and both equal a brute-force recount", async () => {
    const { file, raw, header } = rolesCsv(8, 600, 5);
    const levelColumns = header.filter((h) => /^c\d+$/.test(h));
    await withEngine({ threads: 2 }, async (engine) => {
      const source = await openSource(engine, [file]);
      const plan: PassPlan = {
        view: source.view, fold: rowHashFolds(source.columns, 5, 42), levelColumns, target: { column: "y", kind: "binary" },
        countColumns: ["visit_no", "pets", "visit_at", "visit_day"], timeColumns: ["visit_at", "visit_day"], distinctColumns: ["visit_no", "pets"],
      };
      const grouping = await pass(engine, plan, "grouping");
      const wide = await pass(engine, plan, "wide");
      expect([grouping.wide, wide.wide]).toEqual([false, true]);
      expect(wide.table).toEqual(grouping.table);
      expect(wide.totals).toEqual(grouping.totals);
      // no distinct-count or marker rows are left in either level table
      expect(wide.table.every((r) => r.col >= -1)).toBe(true);

      // brute force over the generated rows
      const col = (name: string) => raw.map((r) => r[header.indexOf(name)]!).filter((v) => v !== "");
      const tally = (vs: string[]) => { const m = new Map<string, number>(); for (const v of vs) m.set(v, (m.get(v) ?? 0) + 1); return m; };
      const pets = tally(col("pets"));
      expect(wide.totals.distinct?.get("pets")).toEqual({ distinct: pets.size, maxRows: Math.max(...pets.values()) });
      expect(wide.totals.distinct?.get("visit_no")).toEqual({ distinct: 600, maxRows: 1 });
      const at = col("visit_at").sort();
      const t = wide.totals.time?.get("visit_at");
      expect(t?.min).toBe(`${at[0]}:00`);
      expect(t?.max).toBe(`${at[at.length - 1]}:00`);
      expect(t?.parsed).toBe(at.length);
      expect(t?.offDay).toBe(at.length); // every visit is at 08:00 or later
      expect(t?.offHour).toBe(at.filter((v) => !v.endsWith(":00")).length);
      expect(t?.offMinute).toBe(0);
      const day = wide.totals.time?.get("visit_day");
      expect([day?.parsed, day?.offDay]).toEqual([600, 0]);
    });
  });

  it(`through scan: ${WIDE_PASS_MIN_COLUMNS + 10} columns (wide pass, wide sample) give the roles a narrow input gives`, async () => {
    const wideInput = rolesCsv(WIDE_PASS_MIN_COLUMNS + 6, 300, 7);
    const narrowInput = rolesCsv(6, 300, 7);
    const pick = (p: Awaited<ReturnType<typeof scan>>) => ["visit_no", "pets", "visit_at", "visit_day"].map((n) => {
      const c = p.columns.find((x) => x.name === n)!;
      return { name: n, role: c.role, encoding: c.recommendation.encoding, numericValues: c.numericValues, time: c.time };
    });
    const wide = pick(await scan([wideInput.file], { target: "y" }));
    const narrow = pick(await scan([narrowInput.file], { target: "y" }));
    expect(wide).toEqual(narrow);
    expect(wide.map((c) => [c.role, c.encoding])).toEqual([["identifier", "drop"], ["numeric", "keep"], ["time", "keep"], ["time", "keep"]]);
    expect(wide[1]!.numericValues).toMatchObject({ distinct: 4, exact: true, integer: true });
    expect(wide[2]!.time?.granularity).toBe("minute");
    expect(wide[3]!.time?.granularity).toBe("day");
  });
});
