import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  wilsonInterval, entropyBits, coverageLevels, rareLevels, populationStabilityIndex, aucFromGroups,
  summariseCountOfCounts,
} from "../../src/stats/index.js";

// Property-based checks (fast-check). Seeded so that a failure reproduces; these are invariants
// that follow from the definitions, not reference values.
const SEED = 20240601;
const RUNS = { seed: SEED, numRuns: 300 };

const countOfCounts = fc.array(
  fc.record({ count: fc.integer({ min: 1, max: 1000 }), levels: fc.integer({ min: 1, max: 500 }) }),
  { minLength: 1, maxLength: 30 },
);

describe("properties", () => {
  it("Wilson bounds lie in [0, 1] and contain p̂", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1_000_000 }), fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 4, noNaN: true }), (n, share, z) => {
        const successes = Math.round(share * n);
        const w = wilsonInterval(successes, n, z);
        expect(w).not.toBeNull();
        if (!w) return;
        const p = successes / n;
        expect(w.low).toBeGreaterThanOrEqual(0);
        expect(w.high).toBeLessThanOrEqual(1);
        expect(w.low).toBeLessThanOrEqual(p);
        expect(w.high).toBeGreaterThanOrEqual(p);
      }),
      RUNS,
    );
  });

  it("entropyBits ≤ log2(distinct levels)", () => {
    fc.assert(
      fc.property(countOfCounts, (coc) => {
        const { distinct } = summariseCountOfCounts(coc);
        expect(entropyBits(coc)).toBeGreaterThanOrEqual(0);
        expect(entropyBits(coc)).toBeLessThanOrEqual(Math.log2(distinct) + 1e-9);
      }),
      RUNS,
    );
  });

  it("coverage levels are non-decreasing in the share and never exceed distinct", () => {
    fc.assert(
      fc.property(countOfCounts, fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 1, maxLength: 10 }), (coc, shares) => {
        const sorted = [...shares].sort((a, b) => a - b);
        const levels = coverageLevels(coc, sorted).map((c) => c.levels);
        for (let i = 1; i < levels.length; i++) expect(levels[i]).toBeGreaterThanOrEqual(levels[i - 1] ?? 0);
        expect(levels[levels.length - 1]).toBeLessThanOrEqual(summariseCountOfCounts(coc).distinct);
      }),
      RUNS,
    );
  });

  it("rare levels and their row share are non-decreasing in the threshold", () => {
    fc.assert(
      fc.property(countOfCounts, fc.array(fc.integer({ min: 0, max: 1200 }), { minLength: 1, maxLength: 10 }), (coc, thresholds) => {
        const sorted = [...thresholds].sort((a, b) => a - b);
        const rare = rareLevels(coc, sorted);
        for (let i = 1; i < rare.length; i++) {
          expect(rare[i]?.levels).toBeGreaterThanOrEqual(rare[i - 1]?.levels ?? 0);
          expect(rare[i]?.rowShare).toBeGreaterThanOrEqual(rare[i - 1]?.rowShare ?? 0);
        }
        for (const r of rare) expect(r.rowShare).toBeLessThanOrEqual(1);
      }),
      RUNS,
    );
  });

  it("PSI ≥ 0, and exactly 0 for identical inputs", () => {
    const bins = fc.integer({ min: 1, max: 12 }).chain((k) =>
      fc.tuple(
        fc.array(fc.integer({ min: 0, max: 10_000 }), { minLength: k, maxLength: k }),
        fc.array(fc.integer({ min: 0, max: 10_000 }), { minLength: k, maxLength: k }),
      ),
    );
    fc.assert(
      fc.property(bins, ([a, e]) => {
        fc.pre(a.some((x) => x > 0) && e.some((x) => x > 0));
        expect(populationStabilityIndex(a, e)).toBeGreaterThanOrEqual(0);
        expect(populationStabilityIndex(a, a)).toBe(0);
      }),
      RUNS,
    );
  });

  it("AUC lies in [0, 1], ignores group order, and reversing the scores gives 1 − AUC", () => {
    const groups = fc.array(
      fc.record({
        score: fc.integer({ min: -20, max: 20 }).map((s) => s / 4),
        positives: fc.integer({ min: 0, max: 50 }),
        negatives: fc.integer({ min: 0, max: 50 }),
      }),
      { maxLength: 40 },
    );
    fc.assert(
      fc.property(groups, (gs) => {
        const auc = aucFromGroups(gs);
        const reversed = aucFromGroups(gs.map((g) => ({ ...g, score: -g.score })));
        const shuffled = aucFromGroups([...gs].reverse());
        if (auc === null) {
          expect(reversed).toBeNull();
          return;
        }
        expect(auc).toBeGreaterThanOrEqual(0);
        expect(auc).toBeLessThanOrEqual(1);
        expect(shuffled).toBeCloseTo(auc, 12);
        expect(reversed).toBeCloseTo(1 - auc, 12);
      }),
      RUNS,
    );
  });
});
