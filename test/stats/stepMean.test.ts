/**
 * stats/stepMean: mean of the rolling-origin step figures and its standard error s/√n (sample sd,
 * n − 1), against a hand computation and a two-pass recomputation on seeded random values.
 */
import { describe, expect, it } from "vitest";
import { stepMean } from "../../src/stats/index.js";
import { seededRandom } from "./seededRandom.js";

describe("stepMean", () => {
  it("matches a hand computation", () => {
    // 1, 2, 3, 4: mean 2.5; Σ(x − 2.5)² = 5, s² = 5/3, se = √(5/3 / 4) = √(5/12)
    expect(stepMean([1, 2, 3, 4])).toEqual({ mean: 2.5, se: Math.sqrt(5 / 12), last: 4 });
  });

  it("matches a two-pass recomputation on random steps", () => {
    const random = seededRandom(7);
    for (let t = 0; t < 20; t += 1) {
      const xs = Array.from({ length: 2 + (t % 9) }, () => random());
      const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
      const s2 = xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (xs.length - 1);
      const got = stepMean(xs)!;
      expect(got.mean).toBeCloseTo(mean, 14);
      expect(got.se!).toBeCloseTo(Math.sqrt(s2 / xs.length), 14);
      expect(got.last).toBe(xs.at(-1));
    }
  });

  it("edge cases: no steps → null, one step → se null, a non-finite step throws", () => {
    expect(stepMean([])).toBeNull();
    expect(stepMean([0.3])).toEqual({ mean: 0.3, se: null, last: 0.3 });
    expect(() => stepMean([0.1, Number.NaN])).toThrow(RangeError);
  });
});
