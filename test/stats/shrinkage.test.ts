import { describe, it, expect } from "vitest";
import { betaBinomialPriorWeight, mEstimate } from "../../src/stats/index.js";
import { betaBinomialSums } from "./betaBinomialSums.js";

// Efron & Morris (1975), JASA 70:311–319: 18 players, 45 at-bats each (published dataset).
const EM_HITS = [18, 17, 16, 15, 14, 14, 13, 12, 11, 11, 10, 10, 10, 10, 10, 9, 8, 7];
// Rest-of-season batting averages, same order (published).
const EM_TRUTH = [0.346, 0.298, 0.276, 0.222, 0.273, 0.27, 0.263, 0.21, 0.269, 0.23, 0.264, 0.256, 0.303, 0.264, 0.226, 0.285, 0.316, 0.2];

// Rat tumour data (Gelman et al., Bayesian Data Analysis 3rd ed., ch. 5, from Tarone 1982):
// the 70 historical experiments, copied from docs/references.md "Shrinkage of level means" (published dataset).
const rep = (value: number, times: number): number[] => Array.from({ length: times }, () => value);
const RAT_Y = [
  ...rep(0, 14), ...rep(1, 8), ...rep(2, 9), 1, 5, 2, 5, 3, 2, 7, 7, 3, 3, 2, 9, 10, ...rep(4, 7),
  10, 4, 4, 4, 5, 11, 12, 5, 5, 6, 5, 6, 6, 6, 6, 16, 15, 15, 9,
];
const RAT_N = [
  ...rep(20, 7), ...rep(19, 4), 18, 18, 17, 20, 20, 20, 20, 19, 19, 18, 18, 25, 24, 23, ...rep(20, 6),
  10, 49, 19, 46, 27, 17, 49, 47, 20, 20, 13, 48, 50, ...rep(20, 7),
  48, 19, 19, 19, 22, 46, 49, 20, 20, 23, 19, 22, 20, 20, 20, 52, 46, 47, 24,
];

describe("betaBinomialPriorWeight (moment estimator, k − 1 form)", () => {
  it("Efron–Morris data: S = 3.709877, ρ̂ = 0.0027101, m = 368.0", () => {
    // docs/references.md "Shrinkage of level means", beta-binomial moment estimator on Efron & Morris (1975) (recomputed).
    const sums = betaBinomialSums(EM_HITS.map((positives) => ({ rows: 45, positives })));
    expect(sums.rows).toBe(810);
    expect(sums.positives).toBe(215);
    const fit = betaBinomialPriorWeight(sums);
    expect(fit.mean).toBeCloseTo(0.265432, 6); // 215/810 (published grand mean)
    expect(fit.S).toBeCloseTo(3.709877, 6);
    expect(fit.rho).toBeCloseTo(0.0027101, 7);
    expect(fit.weight).toBeCloseTo(368.0, 1);
  });

  it("rat tumour data: totals 263/1725, p̂ = 0.152464, S = 18.1988, ρ̂ = 0.044166, m = 21.64", () => {
    // Gelman et al. BDA3 ch. 5 / Tarone (1982): 70 experiments, totals 263/1725 (published).
    expect(RAT_Y).toHaveLength(70);
    expect(RAT_N).toHaveLength(70);
    const levels = RAT_Y.map((positives, i) => ({ positives, rows: RAT_N[i] ?? 0 }));
    const sums = betaBinomialSums(levels);
    expect(sums.positives).toBe(263);
    expect(sums.rows).toBe(1725);
    // Moment estimator figures: docs/references.md "Shrinkage of level means" (recomputed; Kleinman 1973 tradition — memory).
    const fit = betaBinomialPriorWeight(sums);
    expect(fit.mean).toBeCloseTo(0.152464, 6);
    expect(fit.S).toBeCloseTo(18.1988, 4);
    expect(fit.rho).toBeCloseTo(0.044166, 6);
    expect(fit.weight).toBeCloseTo(21.64, 2);
  });

  it("simple moments on the rat rates give the book's mean 0.136 and sd 0.103", () => {
    // BDA3 ch. 5: sample mean 0.136 and sd 0.103 of the 70 raw rates (published); plain computation.
    const rates = RAT_Y.map((y, i) => y / (RAT_N[i] ?? 1));
    const mean = rates.reduce((s, r) => s + r, 0) / rates.length;
    const sd = Math.sqrt(rates.reduce((s, r) => s + (r - mean) ** 2, 0) / (rates.length - 1));
    expect(mean).toBeCloseTo(0.136, 3);
    expect(sd).toBeCloseTo(0.103, 3);
  });

  it("S from sums equals Σnᵢ(yᵢ/nᵢ − p̂)² computed directly", () => {
    const p = 263 / 1725;
    const direct = RAT_Y.reduce((s, y, i) => s + (RAT_N[i] ?? 1) * (y / (RAT_N[i] ?? 1) - p) ** 2, 0);
    const fit = betaBinomialPriorWeight(betaBinomialSums(RAT_Y.map((positives, i) => ({ positives, rows: RAT_N[i] ?? 0 }))));
    expect(fit.S).toBeCloseTo(direct, 10);
  });

  it("documents the null cases: one level, all one value, no signal, no rows", () => {
    const oneLevel = betaBinomialPriorWeight(betaBinomialSums([{ rows: 50, positives: 10 }]));
    expect(oneLevel).toEqual({ mean: 0.2, S: 0, rho: null, weight: null });
    const allZero = betaBinomialPriorWeight(betaBinomialSums([{ rows: 50, positives: 0 }, { rows: 30, positives: 0 }]));
    expect(allZero.rho).toBeNull();
    expect(allZero.weight).toBeNull();
    // Identical rates: S = 0, so ρ̂ < 0 → no detectable between-level signal.
    const flat = betaBinomialPriorWeight(betaBinomialSums([{ rows: 40, positives: 10 }, { rows: 80, positives: 20 }]));
    expect(flat.S).toBeCloseTo(0, 12);
    expect(flat.weight).toBeNull();
    expect(betaBinomialPriorWeight(betaBinomialSums([]))).toEqual({ mean: 0, S: 0, rho: null, weight: null });
  });

  it("levels that perfectly separate the target get rho 1 and weight 0", () => {
    const pure = betaBinomialSums([{ rows: 40, positives: 40 }, { rows: 60, positives: 0 }, { rows: 30, positives: 30 }]);
    expect(betaBinomialPriorWeight(pure)).toMatchObject({ rho: 1, weight: 0 });
  });

  it("rejects misuse", () => {
    expect(() => betaBinomialSums([{ rows: 3, positives: 4 }])).toThrow(RangeError);
    expect(() => betaBinomialPriorWeight({ levels: 2, rows: 5, positives: 6, sumPositivesSqOverRows: 0, sumRowsSq: 13 })).toThrow(RangeError);
  });
});

describe("mEstimate", () => {
  // Efron & Morris (1975): the James–Stein constant on these data is c = 0.212 (published),
  // 0.211653 recomputed from c = 1 − (k−3)σ²/Σ(y−ȳ)² with σ² = ȳ(1−ȳ)/45 (docs/references.md
  // "Shrinkage"). With equal n = 45 that is an m-estimate with m = 45(1 − c)/c ≈ 167.6.
  const grand = 215 / 810;
  const rates = EM_HITS.map((h) => h / 45);
  const sigma2 = (grand * (1 - grand)) / 45;
  const c = 1 - ((rates.length - 3) * sigma2) / rates.reduce((s, y) => s + (y - grand) ** 2, 0);
  const m = (45 * (1 - c)) / c;

  it("is (sum + m·prior)/(n + m) (Cestnik 1990); m = 45(1−c)/c reproduces James–Stein", () => {
    expect(sigma2).toBeCloseTo(0.0043328, 7); // recomputed
    expect(c).toBeCloseTo(0.212, 3); // published
    expect(c).toBeCloseTo(0.211653, 6); // recomputed
    expect(m).toBeCloseTo(167.6, 1); // recomputed
    expect(mEstimate(18, 45, m, grand)).toBeCloseTo(grand + c * (18 / 45 - grand), 10);
    // Shrunken values for the extremes: .294 (18 of 45) and .242 (7 of 45) (memory of the table).
    expect(mEstimate(18, 45, m, grand)).toBeCloseTo(0.294, 3);
    expect(mEstimate(7, 45, m, grand)).toBeCloseTo(0.242, 3);
    expect(mEstimate(3, 10, 5, 0.5)).toBeCloseTo((3 + 2.5) / 15, 14);
  });

  it("cuts the total squared error against the rest-of-season rates: 0.07532 → 0.02131", () => {
    // docs/references.md "Shrinkage of level means": raw 0.07532, shrunken 0.02131 (recomputed from Efron &
    // Morris's published data and truth).
    const raw = rates.reduce((s, y, i) => s + (y - (EM_TRUTH[i] ?? 0)) ** 2, 0);
    const shrunk = EM_HITS.reduce((s, h, i) => s + (mEstimate(h, 45, m, grand) - (EM_TRUTH[i] ?? 0)) ** 2, 0);
    expect(raw).toBeCloseTo(0.07532, 5);
    expect(shrunk).toBeCloseTo(0.02131, 4);
  });

  it("returns the prior when n + m = 0, the raw mean when m = 0, and rejects negatives", () => {
    expect(mEstimate(0, 0, 0, 0.3)).toBe(0.3);
    expect(mEstimate(0, 0, 20, 0.3)).toBe(0.3);
    expect(mEstimate(4, 8, 0, 0.3)).toBe(0.5);
    expect(() => mEstimate(1, -1, 2, 0.3)).toThrow(RangeError);
    expect(() => mEstimate(1, 1, -2, 0.3)).toThrow(RangeError);
  });
});
