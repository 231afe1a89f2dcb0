/**
 * The forward unseen-level share (--time; engine/forwardUnseen, stats/stepMean), recomputed by
 * brute force in plain JavaScript from the raw rows of a generated visit log whose referral codes
 * keep appearing over the year (test/fixtures/growingVisits.ts): blocks from the exact quantile
 * cut points, then for each block b ≥ 1 the rows whose level no earlier block has; mean over the
 * K − 1 steps and its standard error s/√(K − 1).
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { tempDir, writeFile } from "../helpers/tmp.js";
import { growingVisits } from "../fixtures/growingVisits.js";

const dir = tempDir("fwdunseen");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const data = growingVisits(4000, 12);
const file = writeFile(dir, "visits.csv", data.csv);
const K = 5;

function blocksByBruteForce(): number[] {
  const times = data.rows.map((r) => r[1]!);
  const sorted = [...times].sort();
  const cuts = Array.from({ length: K - 1 }, (_, j) => sorted[Math.ceil(sorted.length * ((j + 1) / K)) - 1]!);
  return times.map((t) => cuts.filter((c) => t > c).length);
}

describe("forward unseen-level share", () => {
  it("equals a row-by-row recount for every level column, with the step mean and its SE", async () => {
    const p = await scan([file], { target: "no_show", time: "visit_time", folds: K });
    const block = blocksByBruteForce();
    for (const name of ["clinic", "referral", "species", "visit_id"]) {
      const c = data.header.indexOf(name);
      const steps: { block: number; rows: number; unseen: number }[] = [];
      for (let b = 1; b < K; b += 1) {
        const before = new Set(data.rows.filter((_, i) => block[i]! < b).map((r) => r[c]!));
        const here = data.rows.filter((_, i) => block[i] === b);
        steps.push({ block: b, rows: here.length, unseen: here.filter((r) => !before.has(r[c]!)).length });
      }
      const shares = steps.map((s) => s.unseen / s.rows);
      const mean = shares.reduce((s, x) => s + x, 0) / shares.length;
      const sd = Math.sqrt(shares.reduce((s, x) => s + (x - mean) ** 2, 0) / (shares.length - 1));
      const f = p.columns.find((x) => x.name === name)!.forwardUnseen!;
      expect(f.steps).toEqual(steps);
      expect(f.mean).toBeCloseTo(mean, 12);
      expect(f.se!).toBeCloseTo(sd / Math.sqrt(shares.length), 12);
      expect(f.last).toBeCloseTo(shares.at(-1)!, 12);
    }
    // the figures of the scenario: every visit id is new; the clinic set is stable; referral
    // codes keep coming, so the forward share is far above the Good–Turing forecast from the
    // whole (exchangeable) extract, and the last block's share lies within mean ± 2 SE
    const ref = p.columns.find((x) => x.name === "referral")!;
    expect(p.columns.find((x) => x.name === "visit_id")!.forwardUnseen!.mean).toBe(1);
    expect(p.columns.find((x) => x.name === "clinic")!.forwardUnseen!.mean).toBeLessThan(0.01);
    expect(ref.forwardUnseen!.mean).toBeGreaterThan(ref.unseenInterval!.high);
    expect(Math.abs(ref.forwardUnseen!.last - ref.forwardUnseen!.mean)).toBeLessThan(2 * ref.forwardUnseen!.se!);
    // without --time there is no forward figure
    const plain = await scan([file], { target: "no_show" });
    expect(plain.columns.every((x) => x.forwardUnseen === undefined)).toBe(true);
  });
});
