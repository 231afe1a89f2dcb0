/**
 * Multi-class targets, one class against the rest (pipeline/multiclass): on a generated
 * three-class visit log (sample-data/visit-outcomes.mjs, invented), every class's figures must be
 * EXACTLY those of a binary scan of the same extract with --positive CLASS — the prior weight,
 * flags, leakage, the level rates with their Wilson intervals, the evidence and the advice —
 * through both pass shapes (GROUPING SETS and the wide unnest pass). The classes and their rows
 * are counted again in plain JS. "Exactly": the binary path is not bit-reproducible itself — two
 * identical binary scans differ in the last bits of some evidence figures (DuckDB adds floating
 * sums in parallel, in no fixed order) — so numbers are compared to 1e-12 relative, and every
 * other value (levels, flags, choices, reasons' words aside from those digits) exactly.
 */
import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { validateProfile } from "../../src/profile/schema.js";
import type { ColumnProfile, Profile } from "../../src/profile/types.js";
import { expectCliError } from "../helpers/cliError.js";
import { tempDir, writeFile } from "../helpers/tmp.js";
import { visitOutcomes } from "../fixtures/visitOutcomes.js";

const dir = tempDir("multiclass");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const data = visitOutcomes(3000, 15);
const file = writeFile(dir, "visits.csv", data.csv);
const CLASSES = ["attended", "cancelled_late", "no_show"];

function withPass<T>(mode: "wide" | "grouping", run: () => Promise<T>): Promise<T> {
  const before = process.env.TAILSIFT_PASS;
  process.env.TAILSIFT_PASS = mode;
  return run().finally(() => { if (before === undefined) delete process.env.TAILSIFT_PASS; else process.env.TAILSIFT_PASS = before; });
}

/** Deep equality; numbers to 1e-12 relative (see the header), text and structure exact. */
function same(a: unknown, b: unknown, at = "$"): void {
  if (typeof a === "number" && typeof b === "number") {
    expect(Math.abs(a - b) <= 1e-12 * Math.max(1, Math.abs(a), Math.abs(b)), `${at}: ${a} vs ${b}`).toBe(true);
  } else if (typeof a === "string" && typeof b === "string") {
    // reasons carry the numbers; compare them with the digits past the 10th significant one cut
    const cut = (t: string) => t.replace(/\d+\.\d{10,}/g, (n) => Number(n).toPrecision(10));
    expect(cut(a), at).toBe(cut(b));
  } else if (Array.isArray(a) && Array.isArray(b)) {
    expect(a.length, at).toBe(b.length);
    a.forEach((x, i) => same(x, b[i], `${at}[${i}]`));
  } else if (a && b && typeof a === "object" && typeof b === "object") {
    expect(Object.keys(a).sort(), at).toEqual(Object.keys(b).sort());
    for (const k of Object.keys(a)) same((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${at}.${k}`);
  } else {
    expect(a, at).toEqual(b);
  }
}

const levelTarget = (c: ColumnProfile) => c.topLevels.map(({ targetMean, low, high, smoothed, flag }) =>
  Object.fromEntries(Object.entries({ targetMean, low, high, smoothed, flag }).filter(([, v]) => v !== undefined)));

describe.each(["grouping", "wide"] as const)("one-vs-rest equals the binary path on each class (%s pass)", (mode) => {
  let multi: Profile;
  const binary = new Map<string, Profile>();
  beforeAll(async () => {
    multi = await withPass(mode, () => scan([file], { target: "visit_outcome" }));
    for (const cls of CLASSES) binary.set(cls, await withPass(mode, () => scan([file], { target: "visit_outcome", positive: cls })));
  }, 240_000);

  it("is detected as multiclass; the classes are sorted and counted exactly; the record passes the schema", () => {
    validateProfile(JSON.parse(JSON.stringify(multi)));
    const counts = new Map<string, number>();
    for (const r of data.rows) counts.set(r[5]!, (counts.get(r[5]!) ?? 0) + 1);
    expect(multi.target?.kind).toBe("multiclass");
    if (multi.target?.kind !== "multiclass") return;
    expect(multi.target.classes.map((c) => c.value)).toEqual(CLASSES);
    for (const c of multi.target.classes) {
      expect(c.rows).toBe(counts.get(c.value));
      expect(c.share).toBeCloseTo(counts.get(c.value)! / data.rows.length, 15);
    }
    expect(multi.target.mean).toBe(Math.max(...multi.target.classes.map((c) => c.share)));
  });

  it("every class's figures, level rates, evidence and advice are the binary scan's with --positive CLASS", () => {
    const measured = multi.columns.filter((c) => c.role === "categorical" || c.role === "identifier");
    expect(measured.map((c) => c.name)).toEqual(["visit_id", "clinic", "booking_channel", "referral", "species"]);
    for (const column of measured) {
      expect(column.target).toBeUndefined();
      expect(column.classes?.map((k) => k.value)).toEqual(CLASSES);
      for (const figures of column.classes ?? []) {
        const b = binary.get(figures.value)!.columns.find((c) => c.name === column.name)!;
        same(figures.target, b.target);
        same(figures.levels, levelTarget(b));
        same(figures.evidence, b.evidence);
        expect(figures.advised).toBe(b.recommendation.encoding);
        // the counts do not depend on the target
        expect(column.topLevels.map((l) => [l.value, l.rows])).toEqual(b.topLevels.map((l) => [l.value, l.rows]));
      }
    }
    // the figures differ between classes: a real per-class measurement, not one copied K times
    const channel = multi.columns.find((c) => c.name === "booking_channel")!;
    const weights = channel.classes!.map((k) => k.target.prior.weight);
    expect(new Set(weights).size).toBe(3);
  });
});

describe("choosing the kind", () => {
  it("a numeric target with three values stays continuous (unchanged)", async () => {
    const f = writeFile(dir, "numeric.csv", "clinic,y\nA,1\nB,2\nA,3\nB,1\nA,2\n");
    expect((await scan([f], { target: "y" })).target?.kind).toBe("continuous");
  });
  it("--target-kind multiclass makes a numeric target multi-class; classes sorted by code unit", async () => {
    const f = writeFile(dir, "numeric-mc.csv", "clinic,y\nA,1\nB,2\nA,3\nB,10\nA,2\n");
    const p = await scan([f], { target: "y", targetKind: "multiclass" });
    expect(p.target?.kind === "multiclass" && p.target.classes.map((c) => [c.value, c.rows])).toEqual([["1", 1], ["10", 1], ["2", 2], ["3", 1]]);
  });
  it("classes are trimmed; a missing target is left out", async () => {
    const f = writeFile(dir, "trim.csv", "clinic,y\nA, cat\nB,cat\nA,dog \nB,\nA,cow\n");
    const p = await scan([f], { target: "y" });
    expect(p.target).toMatchObject({ kind: "multiclass", rows: 4, missing: 1, classes: [{ value: "cat", rows: 2 }, { value: "cow", rows: 1 }, { value: "dog", rows: 1 }] });
  });
  it("more classes than the cap: one line, exit 2, saying what to do (also past the first rows' sample of 50 values)", async () => {
    const rows = Array.from({ length: 60 }, (_, i) => `A,class${i}`).join("\n");
    const f = writeFile(dir, "many.csv", `clinic,y\n${rows}\n`);
    await expectCliError(["scan", f, "--target", "y"], "target_too_many_classes", /^target 'y' has more than 50 distinct values; name one class with --positive VALUE, or raise --max-classes$/);
    const p = await scan([f], { target: "y", maxClasses: 60 });
    expect(p.target?.kind === "multiclass" && p.target.classes.length).toBe(60);
  });
  it("--positive with --target-kind multiclass is refused", async () => {
    await expectCliError(["scan", file, "--target", "visit_outcome", "--target-kind", "multiclass", "--positive", "attended"], "bad_option", /--positive applies to binary targets/);
  });
  it("--decide COL=target-kfold gives the per-class encoding with each class's weight; other overrides as on the binary path", async () => {
    const p = await scan([file], { target: "visit_outcome", decide: { species: "target-kfold", clinic: "one-hot" } });
    const species = p.columns.find((c) => c.name === "species")!;
    expect(species.recommendation.encoding).toBe("target-kfold");
    expect(species.recommendation.overridden).toEqual({ from: "one-hot", by: "--decide" });
    if (species.recommendation.encoding === "target-kfold") {
      expect(species.recommendation.params.classes?.map((c) => [c.value, c.weight])).toEqual(species.classes!.map((k) => [k.value, k.target.prior.weight]));
    }
    expect(p.columns.find((c) => c.name === "clinic")!.recommendation).toMatchObject({ encoding: "one-hot", overridden: { by: "--decide" } });
  });
});
