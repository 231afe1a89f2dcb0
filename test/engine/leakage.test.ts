/**
 * engine/leakage against brute force: every row of a generated extract scored by hand — in-sample
 * with the m-estimate of its level's totals, out-of-fold with its level's sums from the other folds
 * shrunk toward the other folds' mean (Cestnik 1990 m-estimate; Micci-Barreca 2001 for the
 * out-of-fold use) — and the Mann–Whitney U (ties ½), log loss and squared error summed row by row.
 * Covered: a fitted weight, m = ∞ (null: every level scores the prior, which the SQL sums from the
 * fold totals without reading the column's levels), an identifier-like column (one level per row:
 * the single-fold tail), missing levels, binary and continuous targets.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { buildLevelTable } from "../../src/engine/aggregate.js";
import { withEngine } from "../../src/engine/db.js";
import { rowHashFolds, rowHashFoldSql } from "../../src/engine/folds.js";
import { leakageScores } from "../../src/engine/leakage.js";
import { buildLevelTotals } from "../../src/engine/levels.js";
import { openSource } from "../../src/engine/source.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { mannWhitneyU } from "../../src/stats/aucFromGroups.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("leakage");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const COLUMNS = ["visit_id", "clinic", "species"];

/** Invented visits: a unique visit id, a clinic (30 levels, 5 % missing), a species (4 levels); y binary or a bill amount in quarters. */
function visits(kind: "binary" | "continuous", rows: number, seed: number): string {
  const rnd = mulberry32(seed);
  const lines = [["visit_id", "clinic", "species", "y"].join(",")];
  for (let r = 0; r < rows; r++) {
    const clinic = Math.floor(rnd() * 30);
    const y = kind === "binary" ? (rnd() < 0.15 + clinic / 60 ? "1" : "0") : String(Math.floor(rnd() * 40 + clinic) * 0.25);
    lines.push([`V${1000 + r}`, rnd() < 0.05 ? "" : `C${clinic}`, ["cat", "dog", "hamster", "ferret"][Math.floor(rnd() * 4)]!, rnd() < 0.03 ? "" : y].join(","));
  }
  return writeFile(dir, `visits-${kind}-${seed}.csv`, `${lines.join("\n")}\n`);
}

const mEst = (s: number, n: number, m: number | null, prior: number) => (m === null || n <= 0 ? prior : (s + m * prior) / (n + m));
const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);

describe("leakage scores equal a row-by-row brute force", () => {
  it.each(["binary", "continuous"] as const)("%s target: fitted weight, m = ∞ and an identifier-like column", async (kind) => {
    const file = visits(kind, 700, kind === "binary" ? 3 : 4);
    await withEngine({ threads: 2 }, async (engine) => {
      const source = await openSource(engine, [file]);
      const K = 5;
      await buildLevelTable(engine, { view: source.view, levelColumns: COLUMNS, countColumns: [], target: { column: "y", kind }, fold: rowHashFolds(source.columns, K, 42) });
      await buildLevelTotals(engine);
      const weights = new Map<number, number | null>([[0, null], [1, 7.5], [2, null]]);
      const got = await leakageScores(engine, weights, kind);

      const raw = await engine.rows<Record<string, string | null> & { fold: number }>(
        `SELECT *, ${rowHashFoldSql(source.columns, 42, K)} AS fold FROM read_csv(${quoteLiteral(file)}, all_varchar = true, header = true)`, "reading rows back");
      type Scored = Record<string, string | null> & { fold: number; yv: number };
      const rows = raw.filter((r) => r.y !== null).map((r) => ({ ...r, yv: Number(r.y) }) as Scored);
      const total = { n: rows.length, s: sum(rows.map((r) => r.yv)) };
      const foldN = Array.from({ length: K }, (_, f) => rows.filter((r) => r.fold === f));
      const prior = (f: number) => (total.s - sum(foldN[f]!.map((r) => r.yv))) / (total.n - foldN[f]!.length);
      expect(got.priorsDefined).toBe(true);

      for (const [col, m] of weights) {
        const name = COLUMNS[col]!;
        const scoreIn = (r: Scored) => {
          if (r[name] === null) return total.s / total.n;
          const same = rows.filter((x) => x[name] === r[name]);
          return mEst(sum(same.map((x) => x.yv)), same.length, m, total.s / total.n);
        };
        const scoreOof = (r: Scored) => {
          if (r[name] === null) return prior(r.fold);
          const other = rows.filter((x) => x[name] === r[name] && x.fold !== r.fold);
          return mEst(sum(other.map((x) => x.yv)), other.length, m, prior(r.fold));
        };
        const scoredIn = rows.map((r) => ({ y: r.yv, p: scoreIn(r), fold: r.fold }));
        const scoredOof = rows.map((r) => ({ y: r.yv, p: scoreOof(r), fold: r.fold }));
        const inSums = got.sums.find((x) => x.col === col && x.mode === "in")!;
        const oofSums = got.sums.find((x) => x.col === col && x.mode === "oof")!;
        if (kind === "binary") {
          const groups = (xs: typeof scoredIn) => {
            const byScore = new Map<number, { score: number; positives: number; negatives: number }>();
            for (const x of xs) {
              const g = byScore.get(x.p) ?? { score: x.p, positives: 0, negatives: 0 };
              if (x.y === 1) g.positives += 1; else g.negatives += 1;
              byScore.set(x.p, g);
            }
            return [...byScore.values()];
          };
          const uIn = mannWhitneyU(groups(scoredIn));
          const uOof = mannWhitneyU(groups(scoredOof));
          expect(inSums.u).toBeCloseTo(uIn.u, 6);
          expect(oofSums.u).toBeCloseTo(uOof.u, 6);
          expect([oofSums.positives, oofSums.negatives]).toEqual([uOof.positives, uOof.negatives]);
        } else {
          const sse = (xs: typeof scoredIn) => sum(xs.map((x) => (x.y - x.p) ** 2));
          expect(inSums.sse).toBeCloseTo(sse(scoredIn), 6);
          expect(oofSums.sse).toBeCloseTo(sse(scoredOof), 6);
        }
        for (let f = 0; f < K; f++) {
          const inFold = scoredOof.filter((x) => x.fold === f);
          const loss = kind === "binary"
            ? sum(inFold.map((x) => -(x.y * Math.log(x.p) + (1 - x.y) * Math.log(1 - x.p))))
            : sum(inFold.map((x) => (x.y - x.p) ** 2));
          const foldRow = got.oofFolds.find((x) => x.col === col && x.fold === f)!;
          expect(foldRow.rows).toBe(inFold.length);
          expect(foldRow.loss).toBeCloseTo(loss, 6);
          expect(foldRow.sumY).toBeCloseTo(sum(inFold.map((x) => x.y)), 9);
        }
      }
      // the identifier scores every row at the overall mean in-sample: U = P·N / 2 (all ties)
      const id = got.sums.find((x) => x.col === 0 && x.mode === "in")!;
      if (kind === "binary") expect(id.u).toBeCloseTo(id.positives * id.negatives / 2, 9);
    });
  });
});
