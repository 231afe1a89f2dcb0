import { describe, it, expect } from "vitest";
import {
  studentTQuantile, meanInterval, logGamma, logBeta, stirlingCorrection, regularizedIncompleteBeta,
  regularizedIncompleteGamma, normalQuantile, normalUpperTail,
} from "../../src/stats/index.js";

describe("logGamma", () => {
  it("matches ln((x−1)!) and Γ(1/2) = √π", () => {
    // Γ(n) = (n−1)! and Γ(½) = √π: standard identities (Abramowitz & Stegun 6.1.6, 6.1.8).
    let factorial = 1;
    for (let n = 1; n <= 30; n++) {
      expect(logGamma(n)).toBeCloseTo(Math.log(factorial), 10);
      factorial *= n;
    }
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 13);
    expect(logGamma(0.25) + logGamma(0.75)).toBeCloseTo(Math.log(Math.PI / Math.sin(Math.PI / 4)), 12);
    expect(() => logGamma(0)).toThrow(RangeError);
  });
});

describe("logBeta", () => {
  it("agrees with ln Γ(a) + ln Γ(b) − ln Γ(a + b) where that is accurate", () => {
    // Definition B(a, b) = Γ(a)Γ(b)/Γ(a + b) (A&S 6.2.2); plain difference is accurate for moderate a, b.
    for (const [a, b] of [[0.5, 0.5], [3, 4.5], [0.5, 12], [20, 3.5], [15, 40], [60, 0.5]] as const) {
      expect(logBeta(a, b)).toBeCloseTo(logGamma(a) + logGamma(b) - logGamma(a + b), 11);
    }
  });

  it("keeps B(a, ½) accurate for huge a: ln B(a, ½) → ½ln π − ½ln a − 1/(8a)", () => {
    // Γ(a + ½)/Γ(a) = √a·(1 − 1/(8a) + 1/(128a²) + …) (A&S 6.1.47, from memory); with
    // Γ(½) = √π this gives ln B(a, ½) = ½ln π − ½ln a − ln(1 − 1/(8a) + …).
    for (const a of [1e6, 5e8, 1e12]) {
      const expected = 0.5 * Math.log(Math.PI) - 0.5 * Math.log(a) - Math.log1p(-1 / (8 * a) + 1 / (128 * a * a));
      expect(logBeta(a, 0.5)).toBeCloseTo(expected, 13);
    }
  });

  it("stirlingCorrection matches ln Γ(x) − Stirling's leading terms (A&S 6.1.40)", () => {
    for (const x of [10, 17.5, 40]) {
      const leading = (x - 0.5) * Math.log(x) - x + 0.5 * Math.log(2 * Math.PI);
      expect(stirlingCorrection(x)).toBeCloseTo(logGamma(x) - leading, 12);
    }
  });
});

describe("regularizedIncompleteGamma", () => {
  it("matches the closed forms Q(1, x) = e^−x and Q(n, x) = e^−x Σ_{k<n} x^k/k!", () => {
    // Poisson–gamma relation (A&S 6.5.13).
    for (const x of [0.1, 1, 2.5, 7, 30]) {
      expect(regularizedIncompleteGamma(1, x).upper).toBeCloseTo(Math.exp(-x), 14);
      let sum = 0;
      let term = 1;
      for (let k = 0; k < 4; k++) {
        sum += term;
        term *= x / (k + 1);
      }
      expect(regularizedIncompleteGamma(4, x).upper / (Math.exp(-x) * sum)).toBeCloseTo(1, 12);
    }
    expect(regularizedIncompleteGamma(2, 0)).toEqual({ lower: 0, upper: 1 });
    expect(() => regularizedIncompleteGamma(0, 1)).toThrow(RangeError);
  });
});

describe("normalQuantile", () => {
  it("matches standard normal table values", () => {
    // Standard normal quantiles (e.g. NIST/SEMATECH e-Handbook §1.3.6.7.1; docs/references.md "Normal quantiles").
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6);
    expect(normalQuantile(0.999)).toBeCloseTo(3.090232, 6);
    expect(normalQuantile(0.995)).toBeCloseTo(2.575829, 6);
    expect(normalQuantile(0.025)).toBeCloseTo(-1.959964, 6);
    expect(normalQuantile(0.5)).toBe(0);
  });

  it("inverts its own tail, and the tail matches 1 − Φ(1) = 0.158655 (normal table)", () => {
    // Φ(1) = 0.841345 (standard normal table, e.g. A&S Table 26.1 — memory).
    expect(normalUpperTail(1)).toBeCloseTo(0.158655, 6);
    for (const q of [1e-12, 1e-4, 0.05, 0.3]) expect(normalUpperTail(-normalQuantile(q)) / q).toBeCloseTo(1, 10);
  });
});

describe("regularizedIncompleteBeta", () => {
  it("matches closed forms I_x(a,1) = x^a, I_x(1,b) = 1 − (1−x)^b and I_½(a,a) = ½", () => {
    // Closed forms from the definition (Abramowitz & Stegun 26.5.1; symmetry 26.5.2).
    for (const x of [0.01, 0.2, 0.5, 0.77, 0.999]) {
      for (const a of [0.5, 1, 3.5, 40]) {
        expect(regularizedIncompleteBeta(x, a, 1).lower).toBeCloseTo(x ** a, 12);
        expect(regularizedIncompleteBeta(x, 1, a).lower).toBeCloseTo(1 - (1 - x) ** a, 12);
        expect(regularizedIncompleteBeta(0.5, a, a).lower).toBeCloseTo(0.5, 12);
      }
    }
  });

  it("keeps lower + upper = 1 and handles the ends", () => {
    const r = regularizedIncompleteBeta(0.3, 2.5, 7);
    expect(r.lower + r.upper).toBeCloseTo(1, 14);
    expect(regularizedIncompleteBeta(0, 2, 3)).toEqual({ lower: 0, upper: 1 });
    expect(regularizedIncompleteBeta(1, 2, 3)).toEqual({ lower: 1, upper: 0 });
    expect(() => regularizedIncompleteBeta(0.5, 0, 1)).toThrow(RangeError);
  });
});

describe("studentTQuantile", () => {
  it.each([
    // Standard t table, e.g. NIST/SEMATECH e-Handbook of Statistical Methods §1.3.6.7.2,
    // upper critical values at 0.025 (from memory, three decimals).
    [1, 12.706],
    [10, 2.228],
    [30, 2.042],
  ])("t_0.975 with df %i ≈ %f (t table)", (df, expected) => {
    expect(studentTQuantile(0.975, df)).toBeCloseTo(expected, 3);
  });

  it("matches more table entries (NIST/SEMATECH §1.3.6.7.2, from memory)", () => {
    expect(studentTQuantile(0.995, 5)).toBeCloseTo(4.032, 3);
    expect(studentTQuantile(0.9995, 20)).toBeCloseTo(3.850, 3);
    expect(studentTQuantile(0.9, 4)).toBeCloseTo(1.533, 3);
  });

  it("matches the closed forms for df 1 (Cauchy) and df 2", () => {
    // df 1: t = tan(π(p − ½)); df 2: t = (2p − 1)/√(2p(1 − p)) — standard results, e.g.
    // Hill (1970), CACM 13:617–619 (Algorithm 396), from memory.
    for (const p of [0.0001, 0.01, 0.2, 0.6, 0.9, 0.975, 0.999999]) {
      const cauchy = Math.tan(Math.PI * (p - 0.5));
      expect(studentTQuantile(p, 1) / cauchy).toBeCloseTo(1, 10);
      const two = (2 * p - 1) / Math.sqrt(2 * p * (1 - p));
      expect(studentTQuantile(p, 2) / two).toBeCloseTo(1, 10);
    }
  });

  it("tends to the normal quantile 1.959964 for large df", () => {
    // Φ⁻¹(0.975) = 1.959964 (standard normal table); t_{0.975, ν} = z + (z³ + z)/(4ν) + … (A&S 26.7.5).
    expect(studentTQuantile(0.975, 1e7)).toBeCloseTo(1.959964, 6);
    expect(studentTQuantile(0.975, 1e12)).toBeCloseTo(1.959964, 6);
    expect(studentTQuantile(0.975, 1e5)).toBeCloseTo(1.959964 + (1.959964 ** 3 + 1.959964) / 4e5, 6);
  });

  it("gives the same answer by both routes at the switch-over df", () => {
    // Above df = 10⁴ the Cornish–Fisher series is used; just below it, the incomplete beta route.
    // t is continuous and monotone in df, so values either side must agree closely.
    for (const p of [0.9, 0.975, 0.9995, 1e-8]) {
      const below = studentTQuantile(p, 10000);
      const above = studentTQuantile(p, 10000.000001);
      expect(Math.abs(below - above)).toBeLessThan(1e-11);
    }
  });

  it("is antisymmetric, 0 at p = ½, infinite at the ends, and rejects misuse", () => {
    expect(studentTQuantile(0.025, 7)).toBeCloseTo(-studentTQuantile(0.975, 7), 12);
    expect(studentTQuantile(0.5, 3)).toBe(0);
    expect(studentTQuantile(1, 3)).toBe(Infinity);
    expect(studentTQuantile(0, 3)).toBe(-Infinity);
    expect(() => studentTQuantile(1.2, 3)).toThrow(RangeError);
    expect(() => studentTQuantile(0.9, 0)).toThrow(RangeError);
  });
});

describe("meanInterval", () => {
  // Student's sleep data (Cushny & Peebles 1905; R dataset `sleep`): paired differences.
  const differences = [1.2, 2.4, 1.3, 1.3, 0, 1.0, 1.8, 0.8, 4.6, 1.4];
  const n = differences.length;
  const sum = differences.reduce((s, d) => s + d, 0);
  const sumSquares = differences.reduce((s, d) => s + d * d, 0);

  it("reproduces R's paired t.test on the sleep data", () => {
    // R: t.test(extra ~ group, data = sleep, paired = TRUE) → mean 1.58, 95 % CI 0.7001142 to
    // 2.4598858 (published in R's documentation output; figures from memory, recomputed).
    const got = meanInterval(n, sum, sumSquares);
    expect(got?.mean).toBeCloseTo(1.58, 12);
    expect(got?.low).toBeCloseTo(0.7001142, 7);
    expect(got?.high).toBeCloseTo(2.4598858, 7);
    // Sample sd by a plain two-pass computation.
    const sd = Math.sqrt(differences.reduce((s, d) => s + (d - 1.58) ** 2, 0) / (n - 1));
    expect(got?.sd).toBeCloseTo(sd, 12);
  });

  it("is null for n < 2, zero-width for constant values, and rejects bad confidence", () => {
    expect(meanInterval(1, 3, 9)).toBeNull();
    expect(meanInterval(0, 0, 0)).toBeNull();
    // Constant 0.1 × 3: Σy² − (Σy)²/n is a tiny negative round-off, clamped to 0.
    const constant = meanInterval(3, 0.3, 0.03);
    expect(constant?.sd).toBe(0);
    expect(constant?.low).toBe(constant?.high);
    expect(() => meanInterval(5, 1, 1, 1)).toThrow(RangeError);
  });
});
