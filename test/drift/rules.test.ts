import { describe, it, expect } from "vitest";
import { cohensD, cohensH } from "../../src/stats/effectSize.js";
import { psiCheck } from "../../src/drift/psiRule.js";
import { rateShift } from "../../src/drift/rateShift.js";
import { columnStatus, worst } from "../../src/drift/status.js";
import { levelShiftVerdict, overallTargetVerdict } from "../../src/drift/targetRule.js";
import { DEFAULT_THRESHOLDS, resolveThresholds } from "../../src/drift/thresholds.js";
import type { ColumnTargetShift, LevelShift } from "../../src/drift/types.js";
import { unseenCheck } from "../../src/drift/unseenRule.js";
import { isTailsiftError } from "../../src/errors.js";

const T = DEFAULT_THRESHOLDS;
const noRest = { planRest: 0, newRest: 0, planMissing: 0, newMissing: 0 };

describe("psiCheck", () => {
  it("(.5,.5) expected vs (.9,.1) actual gives 0.8788898: act", () => {
    // docs/references.md "Population stability index": a = (.5,.5), e = (.9,.1) → 0.8788898 (recomputed);
    // PSI is symmetric, so swapping actual and expected gives the same value.
    const r = psiCheck({ planTop: [50, 50], newTop: [90, 10], ...noRest }, T);
    expect(r.psi).toBeCloseTo(0.8788898, 7);
    expect(r.bins).toBe(2); // rest and missing are empty on both sides and left out
    expect(r.verdict.status).toBe("act");
  });

  it("(.1,.2,.3,.4) vs uniform gives 0.2282174: watch (between 0.10 and 0.25)", () => {
    // docs/references.md "Population stability index": a = (.1,.2,.3,.4), e = uniform → 0.2282174 (recomputed).
    const r = psiCheck({ planTop: [25, 25, 25, 25], newTop: [10, 20, 30, 40], ...noRest }, T);
    expect(r.psi).toBeCloseTo(0.2282174, 7);
    expect(r.verdict.status).toBe("watch");
    expect(r.verdict.reason).toContain("0.228");
  });

  it("uses the rest and missing bins, and is 0 for identical counts", () => {
    const b = { planTop: [40, 30], newTop: [30, 30], planRest: 15, newRest: 30, planMissing: 15, newMissing: 10 };
    // Independent plain computation: Σ (a − e)·ln(a/e) over the four shares.
    const a = [30, 30, 30, 10].map((x) => x / 100);
    const e = [40, 30, 15, 15].map((x) => x / 100);
    const plain = a.reduce((s, ai, i) => s + (ai - e[i]!) * Math.log(ai / e[i]!), 0);
    expect(psiCheck(b, T).psi).toBeCloseTo(plain, 12);
    expect(psiCheck({ ...b, newTop: b.planTop, newRest: b.planRest, newMissing: b.planMissing }, T).psi).toBe(0);
  });

  it("floors a bin empty on one side at 1e-4 and renormalises", () => {
    // Plain computation of the floored shares: a = (1, 1e-4)/1.0001, e = (.5, .5).
    const a = [1 / 1.0001, 1e-4 / 1.0001];
    const plain = (a[0]! - 0.5) * Math.log(a[0]! / 0.5) + (a[1]! - 0.5) * Math.log(a[1]! / 0.5);
    expect(psiCheck({ planTop: [50, 50], newTop: [100, 0], ...noRest }, T).psi).toBeCloseTo(plain, 12);
  });

  it("sets the bands from the thresholds (at the threshold counts as crossed)", () => {
    const b = { planTop: [25, 25, 25, 25], newTop: [10, 20, 30, 40], ...noRest };
    expect(psiCheck(b, { ...T, psiWatch: 0.3, psiAct: 0.5 }).verdict.status).toBe("ok");
    expect(psiCheck(b, { ...T, psiAct: 0.2 }).verdict.status).toBe("act");
  });

  it("returns null with fewer than two bins with rows", () => {
    const r = psiCheck({ planTop: [], newTop: [], planRest: 0, newRest: 0, planMissing: 10, newMissing: 10 }, T);
    expect(r.psi).toBeNull();
    expect(r.verdict.status).toBe("ok");
  });
});

describe("unseenCheck", () => {
  const band = { low: 0.04, high: 0.06 };
  it("is ok when the observed share agrees with the forecast", () => {
    expect(unseenCheck(520, 10_000, 0.05, band, T).verdict.status).toBe("ok");
  });
  it("allows for the new sample's own noise: 1 of 10 rows unseen is not well above 5 %", () => {
    // Wilson 95 % for 1/10 has lower bound ≈ 0.018 (Wilson 1927 formula), below the band's 0.06.
    const r = unseenCheck(1, 10, 0.05, band, T);
    expect(r.interval!.low).toBeLessThan(0.06);
    expect(r.verdict.status).toBe("ok");
  });
  it("is watch when well above but under 3× the forecast", () => {
    const r = unseenCheck(1000, 10_000, 0.05, band, T);
    expect(r.share).toBe(0.1);
    expect(r.interval!.low).toBeGreaterThan(0.06);
    expect(r.verdict.status).toBe("watch");
    expect(r.verdict.reason).toContain("2×");
  });
  it("is act at 3× the forecast and above 1 %", () => {
    expect(unseenCheck(1600, 10_000, 0.05, band, T).verdict.status).toBe("act");
    expect(unseenCheck(1600, 10_000, 0.05, band, { ...T, unseenActRatio: 4 }).verdict.status).toBe("watch");
  });
  it("is only watch for a tiny forecast while the share is not above 1 %", () => {
    // 0.5 % is 5× a 0.1 % forecast, but below the 1 % floor.
    expect(unseenCheck(50, 10_000, 0.001, { low: 0.0005, high: 0.0015 }, T).verdict.status).toBe("watch");
    expect(unseenCheck(50, 10_000, 0.001, { low: 0.0005, high: 0.0015 }, { ...T, unseenActMin: 0.004 }).verdict.status).toBe("act");
  });
  it("takes a missing forecast as 0", () => {
    expect(unseenCheck(10, 1000, null, null, T).verdict.status).toBe("watch"); // 1 % is not above 1 %
    expect(unseenCheck(20, 1000, null, null, T).verdict.status).toBe("act");
  });
  it("never raises for an identifier", () => {
    const r = unseenCheck(1600, 10_000, 0.05, band, T, true);
    expect(r.verdict.status).toBe("ok");
    expect(r.verdict.reason).toContain("identifier");
  });
  it("has no share without non-missing rows", () => {
    const r = unseenCheck(0, 0, 0.05, band, T);
    expect(r.share).toBeNull();
    expect(r.verdict.status).toBe("ok");
  });
});

describe("effect sizes", () => {
  it("Cohen's h for .50 vs .25 is π/2 − π/3 = π/6", () => {
    // Cohen (1988), Table 6.2.1: φ(.50) = 1.571, φ(.25) = 1.047 (from memory); exactly
    // 2·asin(√.5) = π/2 and 2·asin(√.25) = π/3.
    expect(cohensH(0.5, 0.25)).toBeCloseTo(Math.PI / 6, 12);
    expect(cohensH(0.25, 0.5)).toBeCloseTo(-Math.PI / 6, 12);
    expect(cohensH(0, 1)).toBeCloseTo(-Math.PI, 12);
    expect(() => cohensH(1.2, 0.5)).toThrow(RangeError);
  });
  it("Cohen's d is the difference in plan standard deviations; null without a scale", () => {
    expect(cohensD(12, 10, 4)).toBe(0.5);
    expect(cohensD(12, 10, 0)).toBeNull();
  });
});

describe("rateShift", () => {
  it("binary: Wilson intervals of both sides, separated when they do not overlap", () => {
    // Newcombe (1998) worked examples: 81/263 → 0.255289–0.366210; 15/148 → 0.062386–0.160487.
    const s = rateShift("binary", { n: 263, sum: 81, sum2: 81 }, { n: 148, sum: 15, sum2: 15 }, null);
    expect(s.planInterval!.low).toBeCloseTo(0.255289, 6);
    expect(s.planInterval!.high).toBeCloseTo(0.36621, 6);
    expect(s.interval!.low).toBeCloseTo(0.062386, 6);
    expect(s.interval!.high).toBeCloseTo(0.160487, 6);
    expect(s.separated).toBe(true);
    expect(s.effect).toBeCloseTo(2 * Math.asin(Math.sqrt(15 / 148)) - 2 * Math.asin(Math.sqrt(81 / 263)), 12);
  });
  it("binary: a lower error rate widens the intervals (Wilson with z for 1 − 0.05/20)", () => {
    const s = rateShift("binary", { n: 263, sum: 81, sum2: 81 }, { n: 148, sum: 15, sum2: 15 }, null, 1 - 0.05 / 20);
    // Wilson (1927) written out with z = Φ⁻¹(1 − 0.00125) = 3.023341 (Python statistics.NormalDist().inv_cdf(0.99875)).
    const z = 3.023341; const p = 81 / 263; const n = 263;
    const centre = (p + z * z / (2 * n)) / (1 + z * z / n);
    const half = z * Math.sqrt(p * (1 - p) / n + z * z / (4 * n * n)) / (1 + z * z / n);
    expect(s.planInterval!.low).toBeCloseTo(centre - half, 5);
    expect(s.planInterval!.high).toBeCloseTo(centre + half, 5);
  });
  it("continuous: mean ± t·s/√n and Cohen's d on the plan's sd", () => {
    // Values 1..10: mean 5.5, s = 3.0276504; t(0.975, 9) = 2.262157 (published t tables).
    const sum = 55; const sum2 = 385;
    const s = rateShift("continuous", { n: 10, sum, sum2 }, { n: 10, sum: 65, sum2: 385 + 2 * 55 + 10 }, 2);
    expect(s.planInterval!.low).toBeCloseTo(5.5 - 2.262157 * 3.0276504 / Math.sqrt(10), 5);
    expect(s.rate).toBe(6.5);
    expect(s.effect).toBe(0.5);
    expect(s.separated).toBe(false);
  });
  it("no target rows on a side: rate and interval null, not separated", () => {
    const s = rateShift("binary", { n: 10, sum: 5, sum2: 5 }, { n: 0, sum: 0, sum2: 0 }, null);
    expect(s.rate).toBeNull();
    expect(s.effect).toBeNull();
    expect(s.separated).toBe(false);
  });
});

describe("target verdicts", () => {
  const level = (value: string, effect: number, separated: boolean): LevelShift => ({
    value, planRows: 100, planRate: 0.1, planInterval: { low: 0.05, high: 0.15 }, rows: 100, rate: 0.3,
    interval: { low: 0.2, high: 0.4 }, effect, separated, excludesPlanRate: separated,
  });
  const shift = (levels: LevelShift[]): ColumnTargetShift => ({
    confidence: 1 - 0.05 / levels.length, tested: levels.length, flagged: levels.filter((l) => l.excludesPlanRate).length,
    separated: levels.filter((l) => l.separated).length, levels,
  });
  it("separated is watch, separated with effect ≥ 0.5 is act, none is ok", () => {
    expect(levelShiftVerdict(shift([level("a", 0.3, true), level("b", 0.9, false)]), "y", "binary", T).status).toBe("watch");
    const act = levelShiftVerdict(shift([level("a", 0.3, true), level("b", -0.6, true)]), "y", "binary", T);
    expect(act.status).toBe("act");
    expect(act.reason).toMatch(/'b'.*'a'/); // larger effect first
    expect(levelShiftVerdict(shift([level("a", 0.9, false)]), "y", "binary", T).status).toBe("ok");
  });
  it("the overall rate is at most watch", () => {
    const s = rateShift("binary", { n: 10_000, sum: 1000, sum2: 1000 }, { n: 10_000, sum: 3000, sum2: 3000 }, null);
    expect(overallTargetVerdict(s, "y", "binary").status).toBe("watch");
  });
});

describe("status", () => {
  it("is the worst check; reasons are those of the raised checks", () => {
    const s = columnStatus([{ status: "ok", reason: "fine" }, { status: "watch", reason: "moved" }], "one-hot");
    expect(s).toEqual({ status: "watch", reasons: ["moved"] });
    expect(columnStatus([{ status: "ok", reason: "a" }, { status: "ok", reason: "b" }], "one-hot").reasons).toEqual(["a", "b"]);
    expect(worst([])).toBe("ok");
  });
  it("caps a column the plan drops at watch", () => {
    const s = columnStatus([{ status: "act", reason: "gone" }], "drop");
    expect(s.status).toBe("watch");
    expect(s.reasons[0]).toBe("gone");
    expect(s.reasons[1]).toContain("capped at watch");
  });
});

describe("resolveThresholds", () => {
  it("defaults and overrides", () => {
    expect(resolveThresholds()).toEqual({ psiWatch: 0.1, psiAct: 0.25, unseenActRatio: 3, unseenActMin: 0.01, effectAct: 0.5 });
    expect(resolveThresholds({ psiWatch: 0.05, psiAct: undefined }).psiWatch).toBe(0.05);
  });
  it("rejects an act band below the watch band with a bad_option error", () => {
    try {
      resolveThresholds({ psiWatch: 0.3, psiAct: 0.2 });
      expect.unreachable();
    } catch (err) {
      expect(isTailsiftError(err) && err.code).toBe("bad_option");
    }
  });
});
