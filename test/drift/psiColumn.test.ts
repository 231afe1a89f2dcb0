/**
 * PSI through drift's column path: hand-made plan and extract files whose shares are known, so
 * the value drift reports (level tables → bins → populationStabilityIndex) can be checked against
 * the reference values in docs/references.md ("Population stability index") and against a plain recomputation.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { drift, type DriftReport } from "../../src/commands/drift.js";
import { tempDir } from "../helpers/tmp.js";
import { makePlan, plainPsi } from "./helpers.js";

const dir = tempDir("drift-psi");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** Rows from per-column level lists of equal length ("" = missing). */
function csv(file: string, columns: Record<string, string[]>): string {
  const names = Object.keys(columns);
  const n = columns[names[0]!]!.length;
  const lines = [names.join(",")];
  for (let i = 0; i < n; i++) lines.push(names.map((c) => columns[c]![i]).join(","));
  fs.writeFileSync(path.join(dir, file), `${lines.join("\n")}\n`);
  return path.join(dir, file);
}
const rep = (pairs: [string, number][]) => pairs.flatMap(([v, k]) => Array<string>(k).fill(v));

let wide: DriftReport;
let narrow: DriftReport;
const col = (r: DriftReport, name: string) => r.columns.find((c) => c.name === name)!;

beforeAll(async () => {
  const planFile = csv("plan.csv", {
    channel: rep([["A", 50], ["B", 50]]),
    mix: rep([["w", 25], ["x", 25], ["y", 25], ["z", 25]]),
    tail: rep([["a", 40], ["b", 30], ["c", 10], ["d", 5], ["", 15]]),
  });
  const newFile = csv("new.csv", {
    channel: rep([["A", 90], ["B", 10]]),
    mix: rep([["w", 10], ["x", 20], ["y", 30], ["z", 40]]),
    tail: rep([["a", 30], ["b", 30], ["c", 20], ["e", 10], ["", 10]]),
  });
  const widePlan = await makePlan([planFile], path.join(dir, "wide"));
  const narrowPlan = await makePlan([planFile], path.join(dir, "narrow"), { top: 2 });
  wide = await drift([newFile], widePlan, { threads: 1 });
  narrow = await drift([newFile], narrowPlan, { threads: 1 });
});

describe("drift PSI over level shares", () => {
  it("shares (.5,.5) in the plan and (.9,.1) now give 0.8788898", () => {
    // docs/references.md "Population stability index": a = (.5,.5), e = (.9,.1) → 0.8788898 (recomputed;
    // PSI is symmetric in a and e).
    expect(col(wide, "channel").psi).toBeCloseTo(0.8788898, 7);
    expect(col(wide, "channel").psiBins).toBe(2);
    expect(col(wide, "channel").status).toBe("act");
  });

  it("a uniform plan and (.1,.2,.3,.4) now give 0.2282174", () => {
    // docs/references.md "Population stability index": a = (.1,.2,.3,.4), e = uniform → 0.2282174 (recomputed).
    expect(col(wide, "mix").psi).toBeCloseTo(0.2282174, 7);
    expect(col(wide, "mix").status).toBe("watch");
  });

  it("with the plan's top 2 levels, the rest and missing form their own bins", () => {
    // Plain recomputation: bins a, b, rest (c, d, unseen e), missing.
    // Plan a 40, b 30, rest 15, missing 15; new a 30, b 30, rest 30, missing 10.
    expect(col(narrow, "tail").psi).toBeCloseTo(plainPsi([30, 30, 30, 10], [40, 30, 15, 15]), 12);
    expect(col(narrow, "tail").psiBins).toBe(4);
    // With the default top (20) every plan level is a bin: a, b, c, d (0 now: floored), rest (e), missing.
    const floored = [30, 30, 20, 1e-4 * 100, 10, 10];
    expect(col(wide, "tail").psi).toBeCloseTo(plainPsi(floored.map((x) => x / 100 / (1 + 1e-4)), [40, 30, 10, 5, 1e-4 * 100, 15].map((x) => x / 100 / (1 + 1e-4))), 12);
  });

  it("counts rows with a level the plan never saw over the non-missing rows", () => {
    const tail = col(narrow, "tail");
    expect(tail.unseenRows).toBe(10); // the 10 'e' rows
    expect(tail.unseenShare).toBeCloseTo(10 / 90, 12);
    expect(tail.newLevels).toBe(1);
    expect(tail.distinctGrowth).toBe(1); // {a,b,c,e} against {a,b,c,d}
    expect(col(narrow, "channel").unseenShare).toBe(0);
  });
});
