/**
 * Issue 14, point 5: a prefix parent is proposed only where it groups. Invented vet-clinic data:
 * `county` — two-letter county codes whose first letter means nothing ("BA", "BE", … "SO"); the
 * no-show rate follows the second letter only, so within every first letter the same five rates
 * recur and the first letter explains none of the spread; `tier` — treatment-tier codes "B3"
 * (grade B, step 3) whose no-show rate follows the grade. With a target the data decide
 * (hierarchy/spread: nested F test and Kelley's ε² share, checked here against sums of squares
 * recomputed from the rows); without one the code shape decides (hierarchy/shapeCuts).
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { shapeSupports } from "../../src/hierarchy/shapeCuts.js";
import { fUpperTail, spreadFromSums } from "../../src/hierarchy/spread.js";
import type { Profile } from "../../src/profile/types.js";
import { scanPlan } from "../encode/helpers.js";
import { tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("hier-proposed");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const FIRST = ["B", "C", "M", "N", "S"];
const SECOND = ["A", "E", "K", "O", "T"];
const RATES = [0.1, 0.3, 0.5, 0.7, 0.9];
const PER_CODE = 40;

/**
 * Rows: the no-show rate follows b; county (a, b) = FIRST[a] SECOND[b]; tier = grade b, step a + 1
 * when `gradeMatters` (the rate follows the grade), else grade a, step b + 1 (it follows the step).
 */
function data(gradeMatters: boolean): { csv: string; rows: { county: string; tier: string; y: number }[] } {
  const rows: { county: string; tier: string; y: number }[] = [];
  for (let a = 0; a < 5; a++) {
    for (let b = 0; b < 5; b++) {
      const positives = Math.round(PER_CODE * RATES[b]!);
      const tier = gradeMatters ? `${"ABCDE"[b]}${a + 1}` : `${"ABCDE"[a]}${b + 1}`;
      for (let k = 0; k < PER_CODE; k++) rows.push({ county: `${FIRST[a]}${SECOND[b]}`, tier, y: k < positives ? 1 : 0 });
    }
  }
  return { csv: `county,tier,no_show\n${rows.map((r) => `${r.county},${r.tier},${r.y}`).join("\n")}\n`, rows };
}

/** SSL and SSP of the level means grouped by first character, recomputed from the rows. */
function sums(rows: { county: string; tier: string; y: number }[], key: "county" | "tier") {
  const mean = rows.reduce((s, r) => s + r.y, 0) / rows.length;
  const by = (f: (r: (typeof rows)[number]) => string) => {
    const m = new Map<string, { n: number; s: number }>();
    for (const r of rows) { const g = m.get(f(r)) ?? { n: 0, s: 0 }; g.n++; g.s += r.y; m.set(f(r), g); }
    return m;
  };
  const ss = (m: Map<string, { n: number; s: number }>) => [...m.values()].reduce((t, g) => t + g.n * (g.s / g.n - mean) ** 2, 0);
  const levels = by((r) => r[key]);
  const parents = by((r) => r[key].charAt(0));
  return { ssl: ss(levels), ssp: ss(parents), levels: levels.size, groups: parents.size };
}

async function scanOf(name: string, csv: string, extra: string[]): Promise<Profile> {
  return scanPlan(writeFile(dir, `${name}.csv`, csv), path.join(dir, name), extra);
}
const col = (p: Profile, name: string) => p.columns.find((c) => c.name === name)!;

describe("hierarchy only where it groups", () => {
  it("with a target: the county's first letter gets no parent; the tier's grade is its parent", async () => {
    const { csv, rows } = data(true);
    const profile = await scanOf("target", csv, ["--target", "no_show"]);
    expect(col(profile, "county").hierarchy).toBeUndefined();
    const tier = col(profile, "tier").hierarchy;
    expect(tier?.parents.map((p) => p.parent)).toEqual([{ kind: "prefix", length: 1 }]);
    // the stated figures are the sums of squares recomputed from the rows
    const s = sums(rows, "tier");
    const expected = spreadFromSums(s.ssl, s.ssp, s.levels, s.groups)!;
    expect(tier!.parents[0]!.targetSpread!.share).toBeCloseTo(expected.share, 9);
    expect(expected.share).toBeGreaterThan(0.9);
    // the county: the first letters' means are equal by construction, so SSP = 0
    const c = sums(rows, "county");
    expect(c.ssp).toBeCloseTo(0, 12);
    expect(spreadFromSums(c.ssl, c.ssp, c.levels, c.groups)!.groups).toBe(false);
  });

  it("with a target that follows the step, not the grade, the tier gets no parent either", async () => {
    const profile = await scanOf("step", data(false).csv, ["--target", "no_show"]);
    expect(col(profile, "tier").hierarchy).toBeUndefined();
  });

  it("without a target: the shape decides — no parent inside a letter run, the grade at the letter-digit boundary", async () => {
    const profile = await scanOf("none", data(true).csv.replace(/,no_show\n/, "\n").replace(/,[01]\n/g, "\n"), []);
    expect(col(profile, "county").hierarchy).toBeUndefined();
    expect(col(profile, "tier").hierarchy?.parents.map((p) => p.parent)).toEqual([{ kind: "prefix", length: 1 }]);
  });
});

describe("the criteria's parts", () => {
  it("F upper tail matches printed F tables", () => {
    // F table critical values (e.g. Sokal & Rohlf, Statistical Tables; recalled from memory):
    // F(0.05; 4, 20) = 2.87, F(0.01; 4, 20) = 4.43, F(0.05; 1, 10) = 4.96
    expect(fUpperTail(2.87, 4, 20)).toBeCloseTo(0.05, 2);
    expect(fUpperTail(4.43, 4, 20)).toBeCloseTo(0.01, 3);
    expect(fUpperTail(4.96, 1, 10)).toBeCloseTo(0.05, 3);
    expect(fUpperTail(0, 3, 9)).toBe(1);
  });

  it("shape cuts: class boundaries and digit runs, never inside letters", () => {
    const p = (length: number) => ({ kind: "prefix" as const, length });
    expect(shapeSupports("fixed-length", "LL", p(1))).toBe(false);
    expect(shapeSupports("fixed-length", "LD", p(1))).toBe(true);
    expect(shapeSupports("fixed-length", "DDDDD", p(3))).toBe(true);
    expect(shapeSupports("fixed-length", "LLDDLL", p(1))).toBe(false);
    expect(shapeSupports("fixed-length", "LLDDLL", p(2))).toBe(true);
    expect(shapeSupports("delimited", "-", { kind: "tokens", count: 1, delimiters: "-" })).toBe(true);
  });
});
