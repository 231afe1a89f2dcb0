import { describe, it, expect } from "vitest";
import {
  summariseCountOfCounts, normaliseCountOfCounts, coverageLevels, rareLevels, goodTuringUnseen,
  goodTuringUnseenInterval,
} from "../../src/stats/index.js";
import type { CountOfCounts } from "../../src/stats/index.js";
import { seededRandom, randomInt } from "./seededRandom.js";

/** Builds a count-of-counts table from raw per-level counts (zeros dropped), independently. */
function fromCounts(counts: readonly number[]): CountOfCounts[] {
  const table = new Map<number, number>();
  for (const c of counts) if (c > 0) table.set(c, (table.get(c) ?? 0) + 1);
  return [...table].map(([count, levels]) => ({ count, levels }));
}

// Gale & Sampson (1995), "Good-Turing frequency estimation without tears", J. Quantitative
// Linguistics 2:217–237, prosody data, frequency-of-frequencies table (table from memory; its
// totals reproduce the published 309 types and N = 30,902).
const PROSODY = "1 120,2 40,3 24,4 13,5 15,6 5,7 11,8 2,9 2,10 1,12 3,14 2,15 1,16 1,17 3,19 1,20 3,21 2,23 3,24 3,25 3,26 2,27 2,28 1,31 2,32 2,33 1,34 2,36 2,41 3,43 1,45 3,46 1,47 1,50 1,71 1,84 1,101 1,105 1,121 1,124 1,146 1,162 1,193 1,199 1,224 1,226 1,254 1,257 1,339 1,421 1,456 1,481 1,483 1,1140 1,1256 1,1322 1,1530 1,2131 1,2395 1,6925 1,7846 1"
  .split(",")
  .map((pair) => {
    const [count, levels] = pair.split(" ").map(Number);
    return { count: count ?? 0, levels: levels ?? 0 };
  });

describe("summariseCountOfCounts", () => {
  it("reads rows, distinct, f1 and f2 off the prosody table", () => {
    // Gale & Sampson (1995): 309 types, N = 30,902, n1 = 120, n2 = 40 (published totals).
    expect(summariseCountOfCounts(PROSODY)).toEqual({ rows: 30902, distinct: 309, singletons: 120, doubletons: 40 });
  });

  it("merges repeated counts, ignores zero rows, gives zeros when empty", () => {
    expect(summariseCountOfCounts([{ count: 1, levels: 2 }, { count: 1, levels: 3 }, { count: 0, levels: 9 }]))
      .toEqual({ rows: 5, distinct: 5, singletons: 5, doubletons: 0 });
    expect(summariseCountOfCounts([])).toEqual({ rows: 0, distinct: 0, singletons: 0, doubletons: 0 });
  });

  it("rejects negative or non-finite entries", () => {
    expect(() => summariseCountOfCounts([{ count: -1, levels: 1 }])).toThrow(RangeError);
    expect(() => summariseCountOfCounts([{ count: 1, levels: Number.NaN }])).toThrow(RangeError);
  });

  it("normaliseCountOfCounts sorts most frequent first without mutating the input", () => {
    const input = [{ count: 1, levels: 2 }, { count: 5, levels: 1 }, { count: 1, levels: 1 }];
    const copy = structuredClone(input);
    expect(normaliseCountOfCounts(input)).toEqual([{ count: 5, levels: 1 }, { count: 1, levels: 3 }]);
    expect(input).toEqual(copy);
  });
});

describe("goodTuringUnseen", () => {
  it("gives n1/N on the full prosody table", () => {
    // Gale & Sampson (1995) prosody data: 120/30,902 = 0.0038832 (recomputed; docs/references.md "Unseen levels").
    expect(goodTuringUnseen(PROSODY)).toBeCloseTo(0.0038832, 7);
  });

  it("gives n1/N on the table restricted to r = 1..12", () => {
    // Prosody table, r = 1..12: N = 586 → 0.2047782 (published in a reference test suite; recomputed).
    const restricted = PROSODY.filter((r) => r.count <= 12);
    expect(summariseCountOfCounts(restricted).rows).toBe(586);
    expect(goodTuringUnseen(restricted)).toBeCloseTo(0.2047782, 7);
  });

  it("is null with no rows, 1 for an identifier-like column", () => {
    expect(goodTuringUnseen([])).toBeNull();
    expect(goodTuringUnseen([{ count: 1, levels: 50 }])).toBe(1);
  });
});

describe("goodTuringUnseenInterval", () => {
  it("uses Esty's variance (n1(1 − n1/N) + 2 n2)/N², clamped to [0, 1]", () => {
    // Independent plain computation of Esty (1983) (variance formula from memory).
    const n1 = 120, n2 = 40, n = 30902;
    const half = 1.959964 * Math.sqrt((n1 * (1 - n1 / n) + 2 * n2) / (n * n));
    const got = goodTuringUnseenInterval(PROSODY);
    expect(got?.rate).toBeCloseTo(n1 / n, 12);
    expect(got?.low).toBeCloseTo(n1 / n - half, 12);
    expect(got?.high).toBeCloseTo(n1 / n + half, 12);
    expect(got?.low).toBeGreaterThan(0);
  });

  it("clamps at 1 for all singletons and is null for no rows", () => {
    const got = goodTuringUnseenInterval([{ count: 1, levels: 3 }, { count: 2, levels: 1 }]);
    expect(got?.rate).toBeCloseTo(0.6, 12);
    expect(got?.high).toBeLessThanOrEqual(1);
    expect(goodTuringUnseenInterval([{ count: 1, levels: 4 }])).toEqual({ rate: 1, low: 1, high: 1 });
    expect(goodTuringUnseenInterval([])).toBeNull();
  });
});

describe("coverageLevels", () => {
  it("needs ceil(remaining / count) levels inside a bucket", () => {
    // 1 level × 50 rows, 10 × 4 rows, 10 × 1 row: N = 100 (plain counting by hand).
    const coc = [{ count: 50, levels: 1 }, { count: 4, levels: 10 }, { count: 1, levels: 10 }];
    expect(coverageLevels(coc, [0, 0.5, 0.51, 0.9, 0.91, 1])).toEqual([
      { share: 0, levels: 0 },
      { share: 0.5, levels: 1 },
      { share: 0.51, levels: 2 },
      { share: 0.9, levels: 11 },
      { share: 0.91, levels: 12 },
      { share: 1, levels: 21 },
    ]);
  });

  it("is not fooled by floating-point noise in s·N", () => {
    // 0.3 · 10 = 3.0000000000000004 in floating point; three 1-row levels are enough.
    expect(coverageLevels([{ count: 1, levels: 10 }], [0.3])[0]?.levels).toBe(3);
  });

  it("matches a brute-force walk over sorted raw counts", () => {
    const random = seededRandom(42);
    for (let trial = 0; trial < 30; trial++) {
      const counts = Array.from({ length: randomInt(random, 1, 60) }, () => randomInt(random, 1, 20));
      const sorted = [...counts].sort((a, b) => b - a);
      const total = counts.reduce((s, c) => s + c, 0);
      for (const share of [0.25, 0.5, 0.8, 0.95, 1]) {
        let covered = 0;
        let levels = 0;
        while (covered < share * total - 1e-9) covered += sorted[levels++] ?? 0;
        expect(coverageLevels(fromCounts(counts), [share])[0]?.levels).toBe(levels);
      }
    }
  });

  it("gives 0 levels when there are no rows and rejects shares outside [0, 1]", () => {
    expect(coverageLevels([], [0.5])).toEqual([{ share: 0.5, levels: 0 }]);
    expect(() => coverageLevels([], [1.5])).toThrow(RangeError);
  });
});

describe("rareLevels", () => {
  it("counts levels with AT MOST minRows rows and their row share", () => {
    // 3 singletons, 2 doubletons, 1 level of 13 rows: N = 20 (plain counting by hand).
    const coc = [{ count: 1, levels: 3 }, { count: 2, levels: 2 }, { count: 13, levels: 1 }];
    expect(rareLevels(coc, [1, 2, 5, 13])).toEqual([
      { minRows: 1, levels: 3, rowShare: 3 / 20 },
      { minRows: 2, levels: 5, rowShare: 7 / 20 },
      { minRows: 5, levels: 5, rowShare: 7 / 20 },
      { minRows: 13, levels: 6, rowShare: 1 },
    ]);
  });

  it("is all zeros with no rows", () => {
    expect(rareLevels([], [1, 5])).toEqual([{ minRows: 1, levels: 0, rowShare: 0 }, { minRows: 5, levels: 0, rowShare: 0 }]);
  });
});
