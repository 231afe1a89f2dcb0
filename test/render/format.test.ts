import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { formatCompact, formatCount, formatNumber, formatShare } from "../../src/render/format.js";

// Oracle: the platform's own en-US number formatting (ECMA-402 Intl.NumberFormat), an
// implementation independent of ours. Comma thousands separators are common practice (en-US).
const intlCount = new Intl.NumberFormat("en-US", { maximumFractionDigits: 0 });

describe("formatCount", () => {
  it("groups thousands like Intl.NumberFormat en-US for any integer", () => {
    fc.assert(fc.property(fc.integer({ min: -1e12, max: 1e12 }), (n) => formatCount(n) === intlCount.format(n)));
  });
  it("prints n/a, never NaN, for missing or non-finite input", () => {
    for (const x of [NaN, Infinity, -Infinity, null, undefined]) expect(formatCount(x)).toBe("n/a");
  });
  it("rounds fractions to the nearest count", () => {
    expect(formatCount(1234.6)).toBe("1,235"); // plain computation: 1234.6 rounds to 1235
  });
});

describe("formatNumber", () => {
  it("matches Intl.NumberFormat en-US with fixed decimals on exact thousandths", () => {
    const intl3 = new Intl.NumberFormat("en-US", { minimumFractionDigits: 3, maximumFractionDigits: 3 });
    fc.assert(fc.property(fc.integer({ min: -1e9, max: 1e9 }), (k) => formatNumber(k / 1000, 3) === intl3.format(k / 1000)));
  });
  it("never prints a negative zero", () => {
    expect(formatNumber(-0.0001, 2)).toBe("0.00"); // rounds to zero: no sign (common practice)
    expect(formatNumber(-0, 1)).toBe("0.0");
  });
  it("prints n/a for NaN", () => {
    expect(formatNumber(NaN, 2)).toBe("n/a");
  });
});

describe("formatShare", () => {
  it("prints a fraction as a percentage with a space before % (ISO 80000-1, from memory)", () => {
    expect(formatShare(0.1234)).toBe("12.3 %"); // plain computation: 0.1234 × 100 = 12.34
    expect(formatShare(0.5, 0)).toBe("50 %");
    expect(formatShare(1)).toBe("100.0 %");
    expect(formatShare(0)).toBe("0.0 %");
    expect(formatShare(0.00123, 2)).toBe("0.12 %");
  });
  it("does not show a small non-zero share as zero, nor a near-total share as 100 %", () => {
    expect(formatShare(0.0004)).toBe("< 0.1 %"); // 0.04 % rounds to 0.0 at one decimal
    expect(formatShare(0.99996)).toBe("> 99.9 %"); // 99.996 % rounds to 100.0
    expect(formatShare(0.0005)).toBe("0.1 %"); // 0.05 % is half a step: shown, not hidden
  });
  it("prints n/a, never NaN, for missing or non-finite input", () => {
    for (const x of [NaN, Infinity, null, undefined]) expect(formatShare(x)).toBe("n/a");
  });
});

describe("formatCompact", () => {
  it("keeps four significant digits and drops trailing zeros", () => {
    expect(formatCompact(21.6412)).toBe("21.64"); // plain computation: 4 significant digits
    expect(formatCompact(0.0123456)).toBe("0.01235");
    expect(formatCompact(0.5)).toBe("0.5");
    expect(formatCompact(1024)).toBe("1,024");
    expect(formatCompact(null)).toBe("n/a");
  });
});
