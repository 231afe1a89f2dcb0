import { describe, it, expect } from "vitest";
import {
  entropyNats, entropyBits, effectiveLevels,
} from "../../src/stats/index.js";
import type { CountOfCounts } from "../../src/stats/index.js";
import { seededRandom, randomInt } from "./seededRandom.js";

function fromCounts(counts: readonly number[]): CountOfCounts[] {
  const table = new Map<number, number>();
  for (const c of counts) if (c > 0) table.set(c, (table.get(c) ?? 0) + 1);
  return [...table].map(([count, levels]) => ({ count, levels }));
}

describe("entropy from count-of-counts", () => {
  it("entropyBits reproduces the SciPy examples from a count-of-counts table", () => {
    // SciPy docs (docs/references.md "Entropy and effective number of levels"): entropy([1/2, 1/2], base=2) = 1.0 (published);
    // two levels of one row each.
    expect(entropyBits([{ count: 1, levels: 2 }])).toBeCloseTo(1.0, 14);
    // SciPy docs: entropy([9/10, 1/10], base=2) = 0.46899559358928117 (published); levels of 9 and 1 rows.
    expect(entropyBits([{ count: 9, levels: 1 }, { count: 1, levels: 1 }])).toBeCloseTo(0.46899559358928117, 14);
  });

  it("uniform over k levels gives ln k nats, log2 k bits and exp(H) = k", () => {
    // Jost (2006), Oikos 113:363–375: Hill numbers of every order equal k for k equal levels (published).
    for (const k of [1, 2, 7, 1000]) {
      const coc = [{ count: 3, levels: k }];
      expect(entropyNats(coc)).toBeCloseTo(Math.log(k), 12);
      expect(entropyBits(coc)).toBeCloseTo(Math.log2(k), 12);
      expect(effectiveLevels(coc)).toBeCloseTo(k, 9);
    }
  });

  it("agrees with a plain computation from raw level counts", () => {
    const random = seededRandom(7);
    for (let trial = 0; trial < 25; trial++) {
      const counts = Array.from({ length: randomInt(random, 1, 80) }, () => randomInt(random, 1, 30));
      const total = counts.reduce((s, c) => s + c, 0);
      let h = 0;
      for (const c of counts) {
        h -= (c / total) * Math.log(c / total);
      }
      const coc = fromCounts(counts);
      expect(entropyNats(coc)).toBeCloseTo(h, 12);
      expect(effectiveLevels(coc)).toBeCloseTo(Math.exp(h), 9);
      // The Hill number of order 1 never exceeds the distinct levels (Jost 2006).
      expect(effectiveLevels(coc)).toBeLessThanOrEqual(counts.length + 1e-9);
    }
  });

  it("documents the empty and single-level policy: 0 for empty, 1 level for one level", () => {
    expect(entropyNats([])).toBe(0);
    expect(entropyBits([])).toBe(0);
    expect(effectiveLevels([])).toBe(0);
    expect(entropyNats([{ count: 40, levels: 1 }])).toBe(0);
    expect(effectiveLevels([{ count: 40, levels: 1 }])).toBe(1);
  });
});
