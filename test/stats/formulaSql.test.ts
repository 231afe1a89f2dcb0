/**
 * The formulas that run inside DuckDB (src/engine/formulaSql.ts) checked against the stats/
 * modules they mirror, on the same data: the Mann–Whitney U sums (stats/aucFromGroups
 * mannWhitneyU, then aucFromU — the step the tool runs on the SQL's sums) and the clipped
 * log-loss sum (stats/logLossFromGroups). The Hanley & McNeil rating table anchors the AUC to a
 * published value through the SQL path the tool uses.
 */
import { describe, it, expect } from "vitest";
import { withEngine, type Engine } from "../../src/engine/db.js";
import { logLossSql, mannWhitneyUSql } from "../../src/engine/formulaSql.js";
import { aucFromGroups, aucFromU, logLossFromGroups, mannWhitneyU } from "../../src/stats/index.js";
import type { ScoreGroup } from "../../src/stats/index.js";
import { seededRandom, randomInt } from "./seededRandom.js";

// Hanley & McNeil (1982), Radiology 143:29–36, five-point rating data (table from memory;
// docs/references.md "AUC (Mann–Whitney)"): 58 normal cases and 51 abnormal cases.
const RATINGS: ScoreGroup[] = [1, 2, 3, 4, 5].map((score, i) => ({
  score, negatives: [33, 6, 6, 11, 2][i] ?? 0, positives: [3, 2, 2, 11, 33][i] ?? 0,
}));

/** A VALUES list of (part, score, pos, neg) rows; several rows may share a score, as in the level table. */
function values(parts: readonly (readonly ScoreGroup[])[]): string {
  const rows = parts.flatMap((groups, part) => groups.map((g) => `(${part}, ${g.score}::DOUBLE, ${g.positives}::DOUBLE, ${g.negatives}::DOUBLE)`));
  return `(VALUES ${rows.join(", ")}) AS t(part, score, pos, neg)`;
}

/** The U sums per part, exactly as scoreSql / leakage build them (one row per distinct score). */
async function sqlU(engine: Engine, parts: readonly (readonly ScoreGroup[])[]) {
  const grouped = `SELECT part, score, sum(pos) AS pos, sum(neg) AS neg FROM ${values(parts)} GROUP BY part, score`;
  return engine.rows<{ part: number; u: number; positives: number; negatives: number }>(
    `${mannWhitneyUSql(grouped, ["part"])} ORDER BY part`, "test");
}

function randomGroups(random: () => number): ScoreGroup[] {
  return Array.from({ length: randomInt(random, 1, 60) }, () => ({
    score: randomInt(random, 0, 12) / 4, // few distinct scores, repeated: ties and duplicate rows
    positives: randomInt(random, 0, 9),
    negatives: randomInt(random, 0, 9),
  }));
}

describe("mannWhitneyUSql (engine) against stats/aucFromGroups", () => {
  it("Hanley & McNeil 1982 rating data: the SQL path gives AUC 0.893171 (paper: 0.893)", async () => {
    await withEngine({ threads: 1 }, async (engine) => {
      const [sums] = await sqlU(engine, [RATINGS]);
      expect(sums).toMatchObject({ positives: 51, negatives: 58 });
      if (!sums) throw new Error("no row");
      expect(aucFromU(sums)).toBeCloseTo(0.893171, 6); // recomputed
      expect(aucFromU(sums)).toBeCloseTo(0.893, 3); // published
    });
  });

  it("equals mannWhitneyU per partition on seeded random tied data", async () => {
    const random = seededRandom(31);
    const parts = Array.from({ length: 12 }, () => randomGroups(random));
    await withEngine({ threads: 1 }, async (engine) => {
      const rows = await sqlU(engine, parts);
      expect(rows).toHaveLength(parts.length);
      for (const row of rows) {
        const groups = parts[row.part] ?? [];
        const js = mannWhitneyU(groups);
        expect(row.u).toBeCloseTo(js.u, 9);
        expect(row.positives).toBe(js.positives);
        expect(row.negatives).toBe(js.negatives);
        expect(aucFromU(row)).toBe(aucFromGroups(groups));
      }
    });
  });
});

describe("logLossSql (engine) against stats/logLossFromGroups", () => {
  it("sums to the same log loss, clipping included (seeded random groups, predictions 0 and 1 too)", async () => {
    const random = seededRandom(77);
    await withEngine({ threads: 1 }, async (engine) => {
      for (let trial = 0; trial < 8; trial++) {
        const groups = Array.from({ length: randomInt(random, 1, 25) }, (_, i) => ({
          prediction: i === 0 ? 0 : i === 1 ? 1 : random(),
          positives: randomInt(random, 0, 15),
          negatives: randomInt(random, 0, 15),
        }));
        const list = groups.map((g) => `(${g.prediction}::DOUBLE, ${g.positives}::DOUBLE, ${g.negatives}::DOUBLE)`).join(", ");
        const [row] = await engine.rows<{ loss: number; rows: number }>(
          `SELECT sum(${logLossSql("pos", "neg", "pred")})::DOUBLE AS loss, sum(pos + neg)::DOUBLE AS rows
           FROM (VALUES ${list}) AS t(pred, pos, neg)`, "test");
        const expected = logLossFromGroups(groups);
        if (!row || expected === null) throw new Error("no rows");
        expect(row.loss / row.rows).toBeCloseTo(expected, 10);
      }
    });
  });

  it("a positive predicted 0 costs −ln(1e-15) = 34.538776 in SQL as in stats (clipped, common practice)", async () => {
    await withEngine({ threads: 1 }, async (engine) => {
      const [row] = await engine.rows<{ loss: number }>(`SELECT ${logLossSql("1", "0", "0::DOUBLE")} AS loss`, "test");
      expect(row?.loss).toBeCloseTo(34.538776, 6);
      expect(row?.loss).toBeCloseTo(logLossFromGroups([{ prediction: 0, positives: 1, negatives: 0 }]) ?? 0, 12);
    });
  });
});
