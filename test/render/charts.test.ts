import { describe, it, expect } from "vitest";
import fc from "fast-check";
import type { ColumnProfile, ProfileTarget } from "../../src/profile/types.js";
import { Z_95, Z_998, coveragePoints, evidencePoints, funnelHalfWidth, logGrid, wrapLabel } from "../../src/render/chart-data.js";
import {
  chartSvg, collisionChartSpec, coverageChartSpec, evidenceChartSpec, funnelChartSpec, funnelLimitPoints,
} from "../../src/render/charts.js";
import { loadFixture } from "./load-fixture.js";

/** A minimal column profile for chart tests. */
function column(extra: Partial<ColumnProfile>): ColumnProfile {
  return {
    name: "c", role: "categorical", rows: 0, missing: 0, distinct: 0, entropyBits: 0, effectiveLevels: 0,
    singletons: 0, unseenRate: 0, coverage: [], rare: [], topLevels: [],
    recommendation: { encoding: "drop", params: {}, reasons: [] }, ...extra,
  };
}

type Layer = { data: { values: Record<string, unknown>[] }; mark: { type: string } };
const layers = (spec: Record<string, unknown> | null): Layer[] => (spec?.layer ?? []) as Layer[];

describe("funnelLimitPoints", () => {
  // Spiegelhalter (2005), Stat. Med. 24:1185–1202, normal limits p0 ± z·√(p0(1−p0)/n);
  // docs/references.md "Funnel plot limits" (recomputed): p0 = 0.1, n = 100 → 95 % 0.04120–0.15880, 99.8 % 0.00729–0.19271.
  it("gives the published-formula limits at p0 = 0.1, n = 100", () => {
    const [p95] = funnelLimitPoints(0.1, 100, 100, 1.959964);
    expect(p95?.n).toBe(100);
    expect(p95?.low).toBeCloseTo(0.0412, 5);
    expect(p95?.high).toBeCloseTo(0.1588, 5);
    const [p998] = funnelLimitPoints(0.1, 100, 100, 3.090232);
    expect(p998?.low).toBeCloseTo(0.00729, 5);
    expect(p998?.high).toBeCloseTo(0.19271, 5);
  });
  it("uses z·sd/√n for a mean when sd is given (plain computation: 1.959964·5/√25 = 1.959964)", () => {
    const [p] = funnelLimitPoints(10, 25, 25, Z_95, 5);
    expect(p?.low).toBeCloseTo(10 - 1.959964, 6);
    expect(p?.high).toBeCloseTo(10 + 1.959964, 6);
  });
  it("is bounded, includes both ends, clips proportions to [0, 1] and narrows as n grows", () => {
    const points = funnelLimitPoints(0.1, 1, 1_000_000, Z_998);
    expect(points.length).toBeLessThanOrEqual(80);
    expect(points[0]?.n).toBe(1);
    expect(points.at(-1)?.n).toBe(1_000_000);
    expect(points[0]?.low).toBe(0); // 0.1 − 3.090232·0.3 < 0: clipped
    for (const p of points) expect(p.low >= 0 && p.high <= 1).toBe(true);
    for (let i = 1; i < points.length; i += 1) expect(points[i]!.high).toBeLessThanOrEqual(points[i - 1]!.high);
  });
  it("returns nothing for an empty range and no half-width below one row", () => {
    expect(funnelLimitPoints(0.1, 10, 5, Z_95)).toEqual([]);
    expect(funnelHalfWidth(0.1, 0, Z_95)).toBeNull();
  });
});

describe("logGrid", () => {
  it("lists every integer when the range is short, else at most `count` log-spaced values with both ends", () => {
    expect(logGrid(1, 5, 200)).toEqual([1, 2, 3, 4, 5]);
    const grid = logGrid(1, 1_000_000, 200);
    expect(grid.length).toBeLessThanOrEqual(200);
    expect(grid[0]).toBe(1);
    expect(grid.at(-1)).toBe(1_000_000);
    for (let i = 1; i < grid.length; i += 1) expect(grid[i]!).toBeGreaterThan(grid[i - 1]!);
    expect(logGrid(5, 1, 10)).toEqual([]);
  });
});

describe("coveragePoints", () => {
  it("expands the count-of-counts into the cumulative share of the top levels", () => {
    // One level with 5 rows and five with 1 row: 10 rows. Plain computation: the top r levels hold
    // 5 + (r − 1) rows, so shares 0.5, 0.6, 0.7, 0.8, 0.9, 1.0 for r = 1..6.
    const points = coveragePoints(column({ countOfCounts: [{ count: 1, levels: 5 }, { count: 5, levels: 1 }] }));
    expect(points.map((p) => p.rank)).toEqual([1, 2, 3, 4, 5, 6]);
    expect(points.map((p) => p.share)).toEqual([0.5, 0.6, 0.7, 0.8, 0.9, 1]);
  });
  it("stays bounded for a million levels and is exact at the sampled ranks", () => {
    const points = coveragePoints(column({ countOfCounts: [{ count: 1, levels: 1_000_000 }] }));
    expect(points.length).toBeLessThanOrEqual(200);
    for (const p of points) expect(p.share).toBeCloseTo(p.rank / 1_000_000, 12); // r equal levels hold r/N
    expect(points.at(-1)).toEqual({ rank: 1_000_000, share: 1 });
  });
  it("falls back to the coverage entries plus (distinct, 1) without a count-of-counts", () => {
    const points = coveragePoints(column({ distinct: 60, coverage: [{ share: 0.5, levels: 2 }, { share: 0.95, levels: 24 }] }));
    expect(points).toEqual([{ rank: 2, share: 0.5 }, { rank: 24, share: 0.95 }, { rank: 60, share: 1 }]);
    expect(coveragePoints(column({}))).toEqual([]);
  });
  it("agrees with the fixture's coverage figures (computed by the fixture generator, not this code)", () => {
    for (const c of loadFixture("binary").columns.filter((c) => c.distinct <= 200 && c.distinct >= 2)) {
      const points = coveragePoints(c, 1000); // every rank: distinct ≤ 200
      for (const entry of c.coverage) {
        const reached = points.find((p) => p.share >= entry.share - 1e-9);
        expect(reached?.rank).toBe(entry.levels);
      }
    }
  });
});

describe("chart specs", () => {
  const target: ProfileTarget = { column: "y", kind: "binary", positive: "1", rows: 500, missing: 0, mean: 0.1 };
  const funnelColumn = column({ target: {
    prior: { method: "m", weight: 10, mean: 0.1 }, flaggedLevels: 0, expectedFalseFlags: 0,
    leakage: { inSample: 0.6, outOfFold: 0.55, metric: "auc" },
    funnel: [{ value: "a", rows: 100, rate: 0.1 }, { value: "<script>alert(1)</script>", rows: 400, rate: 0.3 }],
  } });

  it("draws the funnel limits from funnelLimitPoints (Spiegelhalter 2005; docs/references.md values at n = 100)", () => {
    const limits = layers(funnelChartSpec(funnelColumn, target))[0]!.data.values;
    const at100 = (limit: string, side: string) => limits.find((v) => v.n === 100 && v.limit === limit && v.side === side)?.bound as number;
    expect(at100("95 %", "low")).toBeCloseTo(0.0412, 5);
    expect(at100("95 %", "high")).toBeCloseTo(0.1588, 5);
    expect(at100("99.8 %", "low")).toBeCloseTo(0.00729, 5);
    expect(at100("99.8 %", "high")).toBeCloseTo(0.19271, 5);
  });
  it("marks a level outside the 99.8 % limits and labels it", () => {
    // Plain computation: 0.1 + 3.090232·√(0.09/400) = 0.1464 < 0.3.
    const spec = layers(funnelChartSpec(funnelColumn, target));
    const points = spec.find((l) => l.mark.type === "point")!.data.values;
    expect(points.find((p) => p.rows === 400)?.band).toBe("outside 99.8 %");
    expect(points.find((p) => p.rows === 100)?.band).toBe("inside");
    expect(spec.find((l) => l.mark.type === "text")!.data.values.map((v) => v.level)).toEqual(["<script>alert(1)</scrip…"]);
  });
  it("draws no limits for a continuous target without sd, and sd limits with it", () => {
    const continuous: ProfileTarget = { ...target, kind: "continuous", positive: undefined, mean: 0.2 };
    expect(layers(funnelChartSpec(funnelColumn, continuous)).some((l) => "bound" in (l.data.values[0] ?? {}))).toBe(false);
    const limits = layers(funnelChartSpec(funnelColumn, { ...continuous, sd: 2 }))[0]!.data.values;
    const high = limits.find((v) => v.n === 100 && v.limit === "95 %" && v.side === "high")?.bound as number;
    expect(high).toBeCloseTo(0.2 + (1.959964 * 2) / 10, 6); // p0 + z·sd/√n
  });
  it("returns null when a chart has no data", () => {
    expect(funnelChartSpec(column({}), target)).toBeNull();
    const oneSize = { ...funnelColumn.target!, funnel: [{ value: "a", rows: 1, rate: 0 }, { value: "b", rows: 1, rate: 1 }] };
    expect(funnelChartSpec(column({ target: oneSize }), target)).toBeNull(); // identifier: all levels one row
    expect(collisionChartSpec(column({}), 0.01)).toBeNull();
    expect(coverageChartSpec(column({}))).toBeNull();
  });
  it("puts the budget line and the sorted candidate widths in the collision spec", () => {
    const spec = layers(collisionChartSpec(column({ hashing: { width: 1024, collisionRowShare: 0.008,
      candidates: [{ width: 2048, collisionRowShare: 0.004 }, { width: 1024, collisionRowShare: 0.008 }] } }), 0.01));
    expect(spec[0]!.data.values.map((v) => v.width)).toEqual([1024, 2048]);
    expect(spec[1]!.data.values).toEqual([{ width: 1024, share: 0.008, chosen: "chosen width" }]);
    expect(spec[2]!.data.values).toEqual([{ budget: 0.01 }]);
  });
});

describe("chartSvg", () => {
  it("renders a funnel plot to SVG with the level label escaped", async () => {
    const target: ProfileTarget = { column: "y", kind: "binary", rows: 500, missing: 0, mean: 0.1 };
    const svg = await chartSvg(funnelChartSpec(column({ target: {
      prior: { method: "m", weight: 10, mean: 0.1 }, flaggedLevels: 0, expectedFalseFlags: 0,
      leakage: { inSample: null, outOfFold: null, metric: "auc" },
      funnel: [{ value: "a", rows: 100, rate: 0.1 }, { value: "<script>alert(1)</script>", rows: 400, rate: 0.3 }],
    } }), target)!);
    expect(svg.startsWith("<svg")).toBe(true);
    expect(svg).not.toMatch(/<script/i);
    expect(svg).toMatch(/<text[^>]*>&lt;script&gt;alert\(1\)&lt;\/scrip…<\/text>/); // label, shortened
    expect(svg).toContain(`aria-label="&lt;script&gt;alert(1)&lt;/script&gt;: 400 rows, 30.0 % (outside 99.8 %)"`); // full value, described
  });
  it("refuses to load data from anywhere", async () => {
    await expect(chartSvg({ data: { url: "https://example.invalid/data.csv" }, mark: "point",
      encoding: { x: { field: "a", type: "quantitative" } } })).rejects.toThrow(/inline data only|chart/);
  });
});

describe("wrapLabel", () => {
  it("breaks at spaces into lines of at most the width, keeps a long word whole, and loses no text", () => {
    expect(wrapLabel("target encoding with a hierarchical prior", 22)).toEqual(["target encoding with a", "hierarchical prior"]);
    expect(wrapLabel("pooled one-hot", 22)).toEqual(["pooled one-hot"]);
    expect(wrapLabel("a supercalifragilistic b", 5)).toEqual(["a", "supercalifragilistic", "b"]);
    expect(wrapLabel("", 5)).toEqual([""]);
    fc.assert(fc.property(fc.array(fc.stringMatching(/^[a-z]{1,8}$/), { minLength: 1, maxLength: 12 }), fc.integer({ min: 1, max: 30 }), (words, width) => {
      const lines = wrapLabel(words.join(" "), width);
      return lines.join(" ") === words.join(" ") && lines.every((l) => l.length <= width || !l.includes(" "));
    }));
  });
});

describe("evidenceChartSpec", () => {
  const fixture = loadFixture("binary");
  const withEvidence = fixture.columns.filter((c) => c.evidence !== undefined);
  const postcode = fixture.columns.find((c) => c.name === "postcode_district")!;
  const byMark = (spec: Layer[], type: string) => spec.find((l) => l.mark.type === type)!.data.values;

  it("plots each candidate's loss, loss − SE and loss + SE, and the threshold, as the evidence holds them", () => {
    expect(withEvidence.length).toBe(3);
    for (const column of withEvidence) {
      const e = column.evidence!;
      const spec = layers(evidenceChartSpec(column));
      const points = byMark(spec, "point");
      const bars = byMark(spec, "errorbar");
      expect(points.map((p) => p.loss)).toEqual(e.candidates.map((c) => c.loss));
      e.candidates.forEach((c, i) => {
        // plain computation: the bar runs from loss − SE to loss + SE
        expect(bars[i]!.low).toBeCloseTo(c.loss - c.se!, 12);
        expect(bars[i]!.high).toBeCloseTo(c.loss + c.se!, 12);
      });
      expect(byMark(spec, "rule")).toEqual([{ threshold: e.threshold }]);
    }
  });
  it("draws ±1 standard error as the sample sd of the fold losses over √K (plain computation)", () => {
    const bars = byMark(layers(evidenceChartSpec(postcode)), "errorbar");
    postcode.evidence!.candidates.forEach((c, i) => {
      const k = c.foldLosses.length;
      const mean = c.foldLosses.reduce((a, b) => a + b, 0) / k;
      const sd = Math.sqrt(c.foldLosses.reduce((a, b) => a + (b - mean) ** 2, 0) / (k - 1));
      expect(((bars[i]!.high as number) - (bars[i]!.low as number)) / 2).toBeCloseTo(sd / Math.sqrt(k), 10);
    });
  });
  it("puts the threshold at the best loss plus its SE (one-SE rule, Breiman et al. 1984 §3.4.3) and marks best and chosen", () => {
    const e = postcode.evidence!;
    const best = e.candidates.reduce((a, b) => (b.loss < a.loss ? b : a));
    const spec = layers(evidenceChartSpec(postcode));
    expect(byMark(spec, "rule")[0]!.threshold).toBeCloseTo(best.loss + best.se!, 12);
    const roles = byMark(spec, "point").map((p) => p.role);
    expect(roles).toEqual(["candidate", "candidate", "candidate", "chosen", "best (lowest loss)"]); // fixture: backoff chosen, hierarchical best
    const nasty = fixture.columns[9]!;
    expect(byMark(layers(evidenceChartSpec(nasty)), "point").map((p) => p.role)).toEqual(["candidate", "candidate", "best and chosen"]);
  });
  it("keeps a candidate without a standard error as a point without a bar, drops a non-finite loss, and needs evidence", async () => {
    const e = { ...postcode.evidence!, candidates: [
      { candidate: "overall-mean" as const, params: {}, loss: 0.36, se: null, foldLosses: [0.36] },
      { candidate: "target-kfold" as const, params: {}, loss: Number.NaN, se: 0.01, foldLosses: [] },
    ], best: "overall-mean" as const, chosen: "overall-mean" as const, threshold: 0.36 };
    expect(evidencePoints(e)).toEqual([{ candidate: "overall-mean", loss: 0.36, low: null, high: null }]);
    const spec = layers(evidenceChartSpec(column({ evidence: e })));
    expect(byMark(spec, "point").length).toBe(1);
    expect(byMark(spec, "errorbar")).toEqual([]);
    expect(await chartSvg(evidenceChartSpec(column({ evidence: e }))!)).not.toMatch(/NaN/); // renders with no bars at all
    expect(evidenceChartSpec(column({}))).toBeNull();
    expect(evidenceChartSpec(column({ evidence: { ...e, candidates: [e.candidates[1]!] } }))).toBeNull();
  });
  it("renders to SVG with the candidate names wrapped onto lines and no NaN", async () => {
    const svg = await chartSvg(evidenceChartSpec(postcode)!);
    expect(svg.startsWith("<svg")).toBe(true);
    expect(svg).toContain(">backoff grouping then</tspan>");
    expect(svg).toContain(">target encoding</tspan>");
    expect(svg).not.toMatch(/NaN|undefined/);
  });
});
