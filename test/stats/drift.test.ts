import { describe, it, expect } from "vitest";
import { seededRandom } from "./seededRandom.js";
import { populationStabilityIndex, funnelLimits, funnelHalfWidth, expectedFalseFlags, wilsonInterval } from "../../src/stats/index.js";

/** KL(p‖q) = Σ p ln(p/q) in nats, written out here as the independent route to PSI. */
function kl(p: readonly number[], q: readonly number[]): number {
  return p.reduce((s, x, i) => s + (x === 0 ? 0 : x * Math.log(x / (q[i] ?? 1))), 0);
}

describe("populationStabilityIndex", () => {
  it("(.5,.5) vs (.9,.1) → 0.8788898 = KL(a‖e) + KL(e‖a)", () => {
    // docs/references.md "Population stability index" (recomputed); the symmetric KL identity is
    // the definition of PSI.
    const psi = populationStabilityIndex([0.5, 0.5], [0.9, 0.1]);
    expect(psi).toBeCloseTo(0.8788898, 7);
    // SciPy documents scipy.stats.entropy([1/2, 1/2], qk=[9/10, 1/10]) = 0.5108256237659907 (published).
    expect(kl([0.5, 0.5], [0.9, 0.1])).toBeCloseTo(0.5108256237659907, 14);
    expect(psi).toBeCloseTo(kl([0.5, 0.5], [0.9, 0.1]) + kl([0.9, 0.1], [0.5, 0.5]), 12);
  });

  it("(.1,.2,.3,.4) vs uniform → 0.2282174", () => {
    // docs/references.md "Population stability index" (recomputed).
    expect(populationStabilityIndex([0.1, 0.2, 0.3, 0.4], [0.25, 0.25, 0.25, 0.25])).toBeCloseTo(0.2282174, 7);
    // Counts give the same value.
    expect(populationStabilityIndex([10, 20, 30, 40], [5, 5, 5, 5])).toBeCloseTo(0.2282174, 7);
  });

  it("is exactly 0 for identical distributions", () => {
    expect(populationStabilityIndex([3, 0, 7], [3, 0, 7])).toBe(0);
    expect(populationStabilityIndex([0.2, 0.8], [20, 80])).toBeCloseTo(0, 15);
  });

  it("floors empty bins at epsilon and renormalises (common practice)", () => {
    // Plain computation: a = (1, 0) → (1, 1e-4)/(1 + 1e-4); e = (.5, .5).
    const a = [1 / 1.0001, 1e-4 / 1.0001];
    const expected = (a[0]! - 0.5) * Math.log(a[0]! / 0.5) + (a[1]! - 0.5) * Math.log(a[1]! / 0.5);
    expect(populationStabilityIndex([1, 0], [0.5, 0.5])).toBeCloseTo(expected, 12);
    expect(Number.isFinite(populationStabilityIndex([1, 0], [0, 1]))).toBe(true);
  });

  it("rejects mismatched bins, negative or all-zero inputs", () => {
    expect(() => populationStabilityIndex([1, 2], [1, 2, 3])).toThrow(RangeError);
    expect(() => populationStabilityIndex([1, -2], [1, 2])).toThrow(RangeError);
    expect(() => populationStabilityIndex([0, 0], [1, 2])).toThrow(RangeError);
  });
});

describe("funnelLimits", () => {
  it("p0 = 0.1, n = 100: 95 % 0.04120–0.15880, 99.8 % 0.00729–0.19271", () => {
    // Spiegelhalter (2005), Statistics in Medicine 24:1185–1202, normal approximation
    // (recomputed; docs/references.md "Funnel plot limits").
    const l95 = funnelLimits(0.1, 100, 1.959964);
    expect(l95.low).toBeCloseTo(0.0412, 5);
    expect(l95.high).toBeCloseTo(0.1588, 5);
    const l998 = funnelLimits(0.1, 100, 3.090232);
    expect(l998.low).toBeCloseTo(0.00729, 5);
    expect(l998.high).toBeCloseTo(0.19271, 5);
  });

  it("clamps to [0, 1] and rejects misuse", () => {
    expect(funnelLimits(0.01, 10, 3.090232).low).toBe(0);
    expect(funnelLimits(0.99, 10, 3.090232).high).toBe(1);
    expect(() => funnelLimits(0.1, 0, 1.96)).toThrow(RangeError);
    expect(() => funnelLimits(0.1, 10, 1.96, -1)).toThrow(RangeError);
    expect(() => funnelLimits(1.1, 10, 1.96)).toThrow(RangeError);
  });
});

describe("funnelLimits for a mean (with sd)", () => {
  it("is p0 ± z·sd/√n, not clamped: mean 10, sd 5, n = 25 → 10 ± 1.959964 (plain arithmetic)", () => {
    expect(funnelHalfWidth(10, 25, 1.959964, 5)).toBeCloseTo(1.959964, 12);
    expect(funnelLimits(10, 25, 1.959964, 5)).toEqual({ low: 10 - 1.959964, high: 10 + 1.959964 });
    expect(funnelLimits(-3, 1, 3.090232, 2).low).toBeCloseTo(-3 - 2 * 3.090232, 12);
  });

  it("the proportion form's half-width is z·√(p0(1−p0)/n)", () => {
    expect(funnelHalfWidth(0.1, 100, 1.959964)).toBeCloseTo(1.959964 * Math.sqrt(0.09 / 100), 14);
    expect(funnelHalfWidth(0, 100, 1.959964)).toBe(0);
  });
});

describe("expectedFalseFlags", () => {
  it("is levels × (1 − confidence) (definition of a confidence interval; common practice)", () => {
    expect(expectedFalseFlags(200)).toBeCloseTo(10, 12);
    expect(expectedFalseFlags(1000, 0.998)).toBeCloseTo(2, 12);
    expect(expectedFalseFlags(0)).toBe(0);
    expect(() => expectedFalseFlags(-1)).toThrow(RangeError);
  });

  it("matches the simulated share of Wilson intervals missing a true rate (seeded, loose)", () => {
    // Independent check by simulation: 2,000 levels of 400 rows at p = 0.3; the Wilson 95 %
    // interval misses p for close to 5 % of them (Newcombe 1998 reports coverage near 95 %).
    const random = seededRandom(12345);
    let misses = 0;
    for (let level = 0; level < 2000; level++) {
      let hits = 0;
      for (let row = 0; row < 400; row++) if (random() < 0.3) hits++;
      const w = wilsonInterval(hits, 400);
      if (w && (w.low > 0.3 || w.high < 0.3)) misses++;
    }
    expect(Math.abs(misses - expectedFalseFlags(2000))).toBeLessThan(40);
  });
});
