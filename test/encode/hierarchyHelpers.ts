/**
 * Helpers of the hierarchy encode tests: a plan folder with one column's recommendation
 * replaced (a user editing the plan, or the evidence choosing another candidate), Parquet read
 * back through DuckDB, the folds scan assigns, and plain counts of where levels went.
 */
import fs from "node:fs";
import path from "node:path";
import { expect } from "vitest";
import { rowHashFoldSql as foldSql } from "../../src/engine/folds.js";
import { withEngine } from "../../src/engine/db.js";
import { openSource } from "../../src/engine/source.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import type { Encoding, Profile } from "../../src/profile/types.js";
import type { GroupOf, Row } from "./hierarchyBruteForce.js";
import { type Cell, type Csv, column } from "./helpers.js";

/** Copies plan folder `from` to `to` with column `name` recommended `encoding` (target-kfold) with `params`. */
export function planWith(from: string, to: string, name: string, params: Record<string, unknown>, encoding: Encoding = "target-kfold"): string {
  fs.rmSync(to, { recursive: true, force: true });
  fs.cpSync(from, to, { recursive: true });
  const file = path.join(to, "profile.json");
  const profile = JSON.parse(fs.readFileSync(file, "utf8")) as Profile;
  const col = profile.columns.find((c) => c.name === name);
  if (!col) throw new Error(`no column ${name}`);
  col.recommendation = { ...col.recommendation, encoding, params };
  fs.writeFileSync(file, JSON.stringify(profile));
  return to;
}

/** Every row of a Parquet file, in file order. */
export async function readRows(file: string): Promise<Record<string, unknown>[]> {
  return withEngine({ threads: 1 }, (e) => e.rows(`SELECT * FROM read_parquet(${quoteLiteral(file)})`, "reading back"));
}

/** The fold scan assigns to each id: foldSql over the same file, run in DuckDB. */
export async function scanFolds(file: string, profile: Profile): Promise<Map<string, number>> {
  return withEngine({ threads: 1 }, async (engine) => {
    await openSource(engine, [file]);
    const s = profile.settings;
    const rows = await engine.rows<{ id: string; fold: number }>(`SELECT id, ${foldSql(s.fold!.keyColumns, s.seed, s.folds)} AS fold FROM tailsift_src`, "folds");
    return new Map(rows.map((r) => [r.id, r.fold]));
  });
}

/** The rows of a parsed id,code,y file with the given folds (0 where none is given). */
export function toRows(csv: Csv, folds: readonly number[]): Row[] {
  const ys = column(csv, "y");
  return column(csv, "code").map((level, k) => ({ level, y: ys[k] === null ? null : Number(ys[k]), fold: folds[k] ?? 0 }));
}

/** Asserts numbers equal to 12 decimals (sums taken in another order differ in the last bits). */
export function close(actual: readonly number[], expected: readonly number[]): void {
  expect(actual.length).toBe(expected.length);
  const bad = actual.map((a, i) => ({ i, a, e: expected[i]! })).filter(({ a, e }) => !(Math.abs(a - e) < 1e-12));
  expect(bad.slice(0, 5)).toEqual([]);
}

/** Distinct non-missing levels and their rows: own group, parent group, "other", unseen (not in `seen`). */
export function groupCounts(codes: readonly Cell[], groupOf: GroupOf, seen: ReadonlySet<Cell>) {
  const rows = new Map<string, number>();
  for (const c of codes) if (c !== null) rows.set(c, (rows.get(c) ?? 0) + 1);
  const count = (keep: (level: string) => boolean) => {
    const levels = [...rows.keys()].filter(keep);
    return { levels: levels.length, rows: levels.reduce((a, l) => a + rows.get(l)!, 0) };
  };
  const depth = (l: string) => Number(groupOf(l).split("|")[0]);
  return { own: count((l) => depth(l) === 0), parent: count((l) => depth(l) > 0), other: count((l) => depth(l) < 0), unseen: count((l) => !seen.has(l)) };
}
