import { describe, it, expect } from "vitest";
import {
  aucFromGroups, aucFromU, mannWhitneyU, hanleyMcNeilSE, rSquaredFromGroups, rSquaredFromSums, logLossFromGroups,
} from "../../src/stats/index.js";
import { seededRandom, randomInt } from "./seededRandom.js";

// Hanley & McNeil (1982), Radiology 143:29–36, five-point rating data, ratings 1..5
// (table from memory; docs/references.md "AUC (Mann–Whitney)"): 58 normal and 51 abnormal cases.
const RATINGS = [1, 2, 3, 4, 5].map((score, i) => ({
  score,
  negatives: [33, 6, 6, 11, 2][i] ?? 0,
  positives: [3, 2, 2, 11, 33][i] ?? 0,
}));

/** Brute force: every positive row against every negative row, ties one half. */
function bruteForceAuc(rows: { score: number; positive: boolean }[]): number {
  let wins = 0;
  let pairs = 0;
  for (const p of rows) {
    if (!p.positive) continue;
    for (const n of rows) {
      if (n.positive) continue;
      pairs++;
      wins += p.score > n.score ? 1 : p.score === n.score ? 0.5 : 0;
    }
  }
  return wins / pairs;
}

describe("aucFromGroups", () => {
  it("Hanley & McNeil 1982 rating data: AUC 0.893171 (paper: 0.893)", () => {
    // docs/references.md "AUC (Mann–Whitney)": 0.893171 recomputed; 0.893 published in the paper.
    expect(aucFromGroups(RATINGS)).toBeCloseTo(0.893171, 6);
    expect(aucFromGroups(RATINGS)).toBeCloseTo(0.893, 3);
  });

  it("equals a brute-force pairwise count on random tied data (seeded)", () => {
    const random = seededRandom(2024);
    for (let trial = 0; trial < 20; trial++) {
      const rows = Array.from({ length: randomInt(random, 2, 120) }, () => ({
        score: randomInt(random, 0, 8) / 4, // few distinct scores → many ties
        positive: random() < 0.4,
      }));
      if (!rows.some((r) => r.positive) || rows.every((r) => r.positive)) continue;
      // Group rows by score in arbitrary (insertion) order, with duplicates of the same score.
      const groups = rows.map((r) => ({ score: r.score, positives: r.positive ? 1 : 0, negatives: r.positive ? 0 : 1 }));
      expect(aucFromGroups(groups)).toBeCloseTo(bruteForceAuc(rows), 12);
    }
  });

  it("is null without positives or negatives, 0.5 when all rows tie, and rejects bad input", () => {
    expect(aucFromGroups([])).toBeNull();
    expect(aucFromGroups([{ score: 1, positives: 3, negatives: 0 }])).toBeNull();
    expect(aucFromGroups([{ score: 1, positives: 3, negatives: 4 }])).toBe(0.5);
    expect(() => aucFromGroups([{ score: Number.NaN, positives: 1, negatives: 1 }])).toThrow(RangeError);
    expect(() => aucFromGroups([{ score: 1, positives: -1, negatives: 1 }])).toThrow(RangeError);
  });
});

describe("aucFromU", () => {
  it("is U/(P·N) on the Mann–Whitney sums: the Hanley & McNeil table gives U = 2642 of 51·58 = 2958 pairs", () => {
    const sums = mannWhitneyU(RATINGS);
    expect(sums).toMatchObject({ positives: 51, negatives: 58 });
    // U = Σ pos·(neg below + neg/2) over the five ratings (plain arithmetic on the table above).
    expect(sums.u).toBe(3 * 16.5 + 2 * 36 + 2 * 42 + 11 * 50.5 + 33 * 57);
    expect(aucFromU(sums)).toBeCloseTo(0.893171, 6);
  });

  it("is null without pairs and rejects sums that cannot be Mann–Whitney sums", () => {
    expect(aucFromU({ u: 0, positives: 0, negatives: 5 })).toBeNull();
    expect(aucFromU({ u: 3, positives: 2, negatives: 3 })).toBe(0.5);
    expect(() => aucFromU({ u: 7, positives: 2, negatives: 3 })).toThrow(RangeError);
    expect(() => aucFromU({ u: Number.NaN, positives: 2, negatives: 3 })).toThrow(RangeError);
  });
});

describe("hanleyMcNeilSE", () => {
  it("Hanley & McNeil 1982 rating data: SE 0.032487", () => {
    // docs/references.md "AUC (Mann–Whitney)" (recomputed) with Q1 = A/(2−A), Q2 = 2A²/(1+A).
    const auc = aucFromGroups(RATINGS) ?? 0;
    expect(hanleyMcNeilSE(auc, 51, 58)).toBeCloseTo(0.032487, 6);
  });

  it("rejects an AUC outside [0, 1] and empty classes", () => {
    expect(() => hanleyMcNeilSE(1.2, 5, 5)).toThrow(RangeError);
    expect(() => hanleyMcNeilSE(0.7, 0, 5)).toThrow(RangeError);
  });
});

describe("rSquaredFromGroups / rSquaredFromSums", () => {
  it("equal 1 − SSE/SST computed row by row (seeded random data)", () => {
    const random = seededRandom(99);
    for (let trial = 0; trial < 20; trial++) {
      const groupCount = randomInt(random, 1, 12);
      const predictions = Array.from({ length: groupCount }, () => random() * 10);
      const rows = Array.from({ length: randomInt(random, 3, 200) }, () => {
        const g = randomInt(random, 0, groupCount - 1);
        return { g, y: (predictions[g] ?? 0) + 4 * (random() - 0.5) };
      });
      const mean = rows.reduce((s, r) => s + r.y, 0) / rows.length;
      const sse = rows.reduce((s, r) => s + (r.y - (predictions[r.g] ?? 0)) ** 2, 0);
      const sst = rows.reduce((s, r) => s + (r.y - mean) ** 2, 0);
      const groups = predictions.map((prediction, g) => {
        const ys = rows.filter((r) => r.g === g).map((r) => r.y);
        return { prediction, rows: ys.length, sumY: ys.reduce((s, y) => s + y, 0), sumY2: ys.reduce((s, y) => s + y * y, 0) };
      });
      expect(rSquaredFromGroups(groups)).toBeCloseTo(1 - sse / sst, 9);
      expect(rSquaredFromGroups([...groups].reverse())).toBeCloseTo(1 - sse / sst, 9);
      expect(rSquaredFromSums(sse, sst)).toBeCloseTo(1 - sse / sst, 14);
    }
  });

  it("is null with no rows or a constant target; negative for bad predictions", () => {
    expect(rSquaredFromGroups([])).toBeNull();
    expect(rSquaredFromGroups([{ prediction: 1, rows: 3, sumY: 0.3, sumY2: 0.03 }])).toBeNull();
    // y = 0, 2 with prediction 10: SSE = 100 + 64 = 164, SST = 2 → R² = −81 (plain arithmetic).
    expect(rSquaredFromGroups([{ prediction: 10, rows: 2, sumY: 2, sumY2: 4 }])).toBeCloseTo(-81, 10);
    expect(rSquaredFromSums(5, 0)).toBeNull();
    expect(rSquaredFromSums(164, 2)).toBe(-81);
    expect(() => rSquaredFromSums(Number.NaN, 2)).toThrow(RangeError);
  });
});

describe("logLossFromGroups", () => {
  it("equals the mean of −[y ln p + (1−y) ln(1−p)] row by row (seeded random data)", () => {
    const random = seededRandom(5);
    for (let trial = 0; trial < 20; trial++) {
      const groups = Array.from({ length: randomInt(random, 1, 10) }, () => ({
        prediction: random(),
        positives: randomInt(random, 0, 20),
        negatives: randomInt(random, 0, 20),
      }));
      let loss = 0;
      let rows = 0;
      for (const g of groups) {
        for (let i = 0; i < g.positives; i++) loss -= Math.log(g.prediction);
        for (let i = 0; i < g.negatives; i++) loss -= Math.log(1 - g.prediction);
        rows += g.positives + g.negatives;
      }
      if (rows === 0) continue;
      expect(logLossFromGroups(groups)).toBeCloseTo(loss / rows, 10);
    }
  });

  it("a constant ½ prediction costs ln 2 per row; clipping keeps a wrong 0 finite", () => {
    expect(logLossFromGroups([{ prediction: 0.5, positives: 7, negatives: 3 }])).toBeCloseTo(Math.LN2, 14);
    // A positive predicted 0 costs −ln(1e-15) = 34.538776 (clipped, common practice).
    expect(logLossFromGroups([{ prediction: 0, positives: 1, negatives: 0 }])).toBeCloseTo(-Math.log(1e-15), 6);
    expect(logLossFromGroups([{ prediction: 1, positives: 5, negatives: 0 }])).toBeCloseTo(0, 12);
    expect(logLossFromGroups([])).toBeNull();
    expect(() => logLossFromGroups([{ prediction: 1.5, positives: 1, negatives: 0 }])).toThrow(RangeError);
  });
});
