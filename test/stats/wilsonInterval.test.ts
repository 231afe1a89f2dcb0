import { describe, it, expect } from "vitest";
import { wilsonInterval } from "../../src/stats/index.js";

describe("wilsonInterval", () => {
  // Newcombe (1998), Statistics in Medicine 17:857–872, worked examples, method 3 (published to
  // 4 places; recomputed to 6 in docs/references.md "Wilson score interval").
  it.each([
    [81, 263, 0.255289, 0.366210],
    [15, 148, 0.062386, 0.160487],
    [0, 20, 0, 0.161125],
    [1, 29, 0.006113, 0.171755],
  ])("Newcombe 1998: %i/%i → %f–%f", (x, n, low, high) => {
    const got = wilsonInterval(x, n);
    expect(got?.low).toBeCloseTo(low, 6);
    expect(got?.high).toBeCloseTo(high, 6);
  });

  it("agrees with Newcombe's published four-place figures", () => {
    // Newcombe (1998) table: 81/263 → 0.2553–0.3662; 15/148 → 0.0624–0.1605 (published).
    expect(wilsonInterval(81, 263)?.low).toBeCloseTo(0.2553, 4);
    expect(wilsonInterval(81, 263)?.high).toBeCloseTo(0.3662, 4);
    expect(wilsonInterval(15, 148)?.low).toBeCloseTo(0.0624, 4);
    expect(wilsonInterval(15, 148)?.high).toBeCloseTo(0.1605, 4);
  });

  // R binom.confint(method = "wilson") values stored in the statsmodels test suite (published).
  it.each([
    [18, 20, 0.6989663548, 0.9721335188],
    [4, 20, 0.0806576626, 0.4160174323],
    [4, 200, 0.0078044264, 0.0502870869],
    [190, 200, 0.9104218519, 0.9726173544],
  ])("R binom.confint: %i/%i → %f–%f", (x, n, low, high) => {
    const got = wilsonInterval(x, n);
    // z = 1.959964 (6 decimals) limits agreement with R's qnorm(0.975) to about 1e-7.
    expect(got?.low).toBeCloseTo(low, 7);
    expect(got?.high).toBeCloseTo(high, 7);
  });

  it("R binom.confint: 0/30 and 30/30 have exact 0 and 1 ends", () => {
    // statsmodels test suite, R binom.confint wilson: 0/30 → 0–0.11351339; 30/30 → 0.8864866–1 (published).
    const none = wilsonInterval(0, 30);
    expect(none?.low).toBe(0);
    expect(none?.high).toBeCloseTo(0.11351339, 7);
    const all = wilsonInterval(30, 30);
    expect(all?.low).toBeCloseTo(0.8864866, 7);
    expect(all?.high).toBe(1);
  });

  it("centre is (p̂ + z²/2n)/(1 + z²/n) (Wilson 1927; plain computation)", () => {
    const z = 1.959964;
    expect(wilsonInterval(81, 263)?.centre).toBeCloseTo((81 / 263 + (z * z) / 526) / (1 + (z * z) / 263), 12);
  });

  it("is null for n = 0 and rejects misuse", () => {
    expect(wilsonInterval(0, 0)).toBeNull();
    expect(() => wilsonInterval(5, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(-1, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(1, Number.NaN)).toThrow(RangeError);
  });
});
