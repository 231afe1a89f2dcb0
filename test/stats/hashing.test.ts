import { describe, it, expect } from "vitest";
import { expectedBucketsUsed, expectedCollidingLevels } from "../../src/stats/index.js";
import { seededRandom } from "./seededRandom.js";

describe("expectedBucketsUsed / expectedCollidingLevels", () => {
  it("w = n = 1024 → 647.475 buckets used; w = 2¹⁸, n = 10,000 → 9,811.686", () => {
    // docs/references.md "Hashing collisions" (recomputed from w(1 − (1 − 1/w)ⁿ)).
    expect(expectedBucketsUsed(1024, 1024)).toBeCloseTo(647.475, 3);
    expect(expectedBucketsUsed(10000, 2 ** 18)).toBeCloseTo(9811.686, 3);
    expect(expectedCollidingLevels(1024, 1024)).toBeCloseTo(1024 - 647.475, 3);
    expect(expectedCollidingLevels(10000, 2 ** 18)).toBeCloseTo(188.314, 3);
  });

  it("agrees with the plain power formula and with a seeded simulation", () => {
    // Plain formula with Math.pow (independent of the log1p/expm1 route).
    for (const [n, w] of [[10, 16], [500, 64], [3000, 4096]] as const) {
      expect(expectedBucketsUsed(n, w)).toBeCloseTo(w * (1 - Math.pow(1 - 1 / w, n)), 9);
    }
    // Simulation: 200 rounds of 1,024 levels into 1,024 buckets; mean occupancy near 647.5.
    const random = seededRandom(11);
    let used = 0;
    for (let round = 0; round < 200; round++) {
      const buckets = new Set<number>();
      for (let i = 0; i < 1024; i++) buckets.add(Math.floor(random() * 1024));
      used += buckets.size;
    }
    expect(Math.abs(used / 200 - expectedBucketsUsed(1024, 1024))).toBeLessThan(2);
  });

  it("documents edge cases and rejects bad widths", () => {
    expect(expectedBucketsUsed(0, 8)).toBe(0);
    expect(expectedBucketsUsed(5, 1)).toBe(1);
    expect(expectedCollidingLevels(0, 8)).toBe(0);
    expect(expectedBucketsUsed(14.5, 1e6)).toBeCloseTo(14.5, 3); // fractional (estimated) level counts allowed
    expect(() => expectedBucketsUsed(5, 0)).toThrow(RangeError);
    expect(() => expectedBucketsUsed(5, 2.5)).toThrow(RangeError);
    expect(() => expectedBucketsUsed(-1, 8)).toThrow(RangeError);
  });
});

