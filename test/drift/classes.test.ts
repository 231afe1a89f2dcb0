/**
 * Drift of a multi-class target (drift/classDrift): the class mix of a new extract against the
 * plan's, PSI over the plan's classes plus one bin for unknown classes, recomputed here by hand
 * from the raw rows: shares, an empty bin raised to ε = 1e-4 and the shares renormalised, then
 * Σ(a − e)·ln(a/e) (the definition in stats/populationStabilityIndex, written out again).
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import type { DriftReport } from "../../src/drift/types.js";
import { visitOutcomes } from "../fixtures/visitOutcomes.js";
import { tempDir, writeFile } from "../helpers/tmp.js";
import { cli, makePlan } from "./helpers.js";

const dir = tempDir("drift-classes");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const train = visitOutcomes(3000, 15);
const planFile = writeFile(dir, "train.csv", train.csv);

function byHand(planCounts: number[], newCounts: number[]): number {
  const floor = (xs: number[]) => {
    const t = xs.reduce((a, b) => a + b, 0);
    const s = xs.map((x) => x / t).map((x) => (x === 0 ? 1e-4 : x));
    const u = s.reduce((a, b) => a + b, 0);
    return s.map((x) => x / u);
  };
  const a = floor(newCounts), e = floor(planCounts);
  return a.reduce((sum, ai, i) => sum + (ai - e[i]!) * Math.log(ai / e[i]!), 0);
}

const count = (rows: string[][], value: string) => rows.filter((r) => r[5] === value).length;
const CLASSES = ["attended", "cancelled_late", "no_show"];

describe("drift of the class mix", () => {
  it("the same world, another seed: PSI by hand, ok", async () => {
    const plan = await makePlan([planFile], path.join(dir, "plan-a"), { target: "visit_outcome" });
    const later = visitOutcomes(2000, 99);
    const run = await cli(["drift", writeFile(dir, "later.csv", later.csv), "--plan", plan, "--format", "json", "--threads", "1"]);
    expect(run.code, run.err).toBe(0);
    const report = JSON.parse(run.out) as DriftReport;
    const psi = byHand([...CLASSES.map((c) => count(train.rows, c)), 0], [...CLASSES.map((c) => count(later.rows, c)), 0]);
    expect(report.classes?.psi).toBeCloseTo(psi, 12);
    expect(report.classes?.classes.map((c) => [c.value, c.rows])).toEqual(CLASSES.map((c) => [c, count(later.rows, c)]));
    expect(report.classes?.status).toBe(psi >= 0.1 ? "watch" : "ok");
    expect(report.classes?.unknown).toEqual([]);
  });

  it("a shifted mix with a class the plan does not know: PSI by hand, act, the class named", async () => {
    const plan = await makePlan([planFile], path.join(dir, "plan-b"), { target: "visit_outcome" });
    const shifted = visitOutcomes(2000, 98).rows.map((r, i) => {
      const out = [...r];
      if (out[5] === "attended" && i % 3 === 0) out[5] = "no_show";
      if (i % 50 === 1) out[5] = "rescheduled";
      return out;
    });
    const file = writeFile(dir, "shifted.csv", [train.header.join(","), ...shifted.map((r) => r.join(","))].join("\n") + "\n");
    const run = await cli(["drift", file, "--plan", plan, "--format", "json", "--threads", "1"]);
    const report = JSON.parse(run.out) as DriftReport;
    const psi = byHand([...CLASSES.map((c) => count(train.rows, c)), 0], [...CLASSES.map((c) => count(shifted, c)), count(shifted, "rescheduled")]);
    expect(psi).toBeGreaterThan(0.25);
    expect(report.classes?.psi).toBeCloseTo(psi, 12);
    expect(report.classes?.status).toBe("act");
    expect(report.status).toBe("act");
    expect(report.classes?.unknown).toEqual([{ value: "rescheduled", rows: count(shifted, "rescheduled") }]);
    expect(report.classes?.reasons.join(" ")).toMatch(/1 class the plan does not know \(2\.0 % of the rows\): 'rescheduled'/);
    const text = await cli(["drift", file, "--plan", plan, "--threads", "1"]);
    expect(text.out).toMatch(/^target \(act\): Class mix of 'visit_outcome': PSI \d\.\d{3} over 4 bins/m);
  });
});
