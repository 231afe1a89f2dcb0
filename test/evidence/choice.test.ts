/**
 * The choice on generated hierarchical data (5-digit codes = 3-digit parent + 2-digit leaf):
 * - only the parent carries signal, leaves have few rows → backoff or the hierarchical prior wins;
 * - every leaf has its own strong rate and plenty of rows → flat target encoding wins or ties;
 * - nothing carries signal → the simplest candidate (the overall mean) is chosen.
 */
import { recommend } from "../../src/advice/recommend.js";
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { DEFAULT_POLICY } from "../../src/advice/policy.js";
import { scan } from "../../src/commands/scan.js";
import { applyEvidence } from "../../src/evidence/applyEvidence.js";
import { evidenceFor } from "../../src/evidence/evidenceFor.js";
import type { Evidence } from "../../src/evidence/types.js";
import { hierarchyFor } from "../../src/hierarchy/hierarchyFor.js";
import type { ColumnProfile } from "../../src/profile/types.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";
import { csv, withLevelTable } from "./helpers.js";

const dir = tempDir("evidence-choice");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** parents × leaves codes; rows per leaf from `rowsPerLeaf`; P(y = 1) from `rate(parentRate, leafRate)`. */
function generate(name: string, seed: number, parents: number, leaves: number, rowsPerLeaf: () => number, rate: (p: number, l: number) => number): string {
  const rand = mulberry32(seed);
  const used = new Set<string>();
  while (used.size < parents) used.add(String(Math.floor(rand() * 1000)).padStart(3, "0"));
  const rows: (string | number)[][] = [];
  for (const parent of used) {
    const parentRate = 0.05 + 0.6 * rand();
    for (let leaf = 0; leaf < leaves; leaf++) {
      const leafRate = 0.05 + 0.6 * rand();
      const code = `${parent}${String(leaf).padStart(2, "0")}`;
      for (let i = rowsPerLeaf(); i > 0; i--) rows.push([rows.length, code, rand() < rate(parentRate, leafRate) ? 1 : 0]);
    }
  }
  return writeFile(dir, name, csv(["id", "code", "y"], rows));
}

async function evidenceOf(file: string): Promise<{ column: ColumnProfile; evidence: Evidence }> {
  const profile = await scan([file], { target: "y", columns: ["code"], asCategorical: ["code"] });
  const scanned = profile.columns.find((c) => c.name === "code")!;
  // scan already applies the evidence; start again from the rules' own advice
  const { evidence: _applied, ...rest } = scanned;
  const column: ColumnProfile = { ...rest, recommendation: recommend(rest as ColumnProfile, DEFAULT_POLICY, profile.target) };
  const evidence = await withLevelTable(file, ["code"], { column: "y", kind: "binary" }, async ({ engine }) => {
    const h = await hierarchyFor(engine, [column], DEFAULT_POLICY);
    return (await evidenceFor(engine, [column], profile.target!, DEFAULT_POLICY, h)).get(0);
  });
  expect(evidence).toBeDefined();
  return { column, evidence: evidence! };
}

const get = (e: Evidence, name: string) => e.candidates.find((c) => c.candidate === name)!;

describe("one-standard-error choice on hierarchical codes", () => {
  it("parent signal only (40 parents × 50 leaves, 1–5 rows per leaf): backoff or hierarchical prior wins", async () => {
    const rand = mulberry32(1);
    const { column, evidence } = await evidenceOf(generate("parent.csv", 5, 40, 50, () => 1 + Math.floor(rand() * 5), (p) => p));
    expect(["backoff-target-kfold", "hierarchical-target-kfold"]).toContain(evidence.chosen);
    const flat = get(evidence, "target-kfold");
    const chosen = get(evidence, evidence.chosen);
    expect(flat.loss).toBeGreaterThan(chosen.loss + (chosen.se ?? 0)); // flat is outside the one-SE band
    const rec = applyEvidence(column, evidence, DEFAULT_POLICY);
    expect(rec.encoding).toBe("target-kfold");
    expect(rec.params.grouping === "backoff" || rec.params.prior === "hierarchical").toBe(true);
    expect(rec.reasons.join(" ")).toContain(chosen.loss.toPrecision(5)); // reasons quote the numbers
  });

  it("leaf signal with plenty of rows (200 leaves × 100 rows): flat target encoding wins or ties", async () => {
    const { evidence } = await evidenceOf(generate("leaf.csv", 6, 20, 10, () => 100, (_p, l) => l));
    const flat = get(evidence, "target-kfold");
    const best = get(evidence, evidence.best);
    expect(flat.loss).toBeLessThanOrEqual(best.loss + (best.se ?? 0));
    expect(evidence.chosen).toBe("target-kfold");
  });

  it("an identifier-like code (every leaf seen once) whose parent carries the signal: drop gives way to the hierarchy", async () => {
    const { column, evidence } = await evidenceOf(generate("ident.csv", 8, 40, 100, () => 1, (p) => p));
    expect(column.role).toBe("identifier");
    expect(column.recommendation.encoding).toBe("drop");
    expect(["backoff-target-kfold", "hierarchical-target-kfold"]).toContain(evidence.chosen);
    const rec = applyEvidence(column, evidence, DEFAULT_POLICY);
    expect(rec.encoding).toBe("target-kfold");
    expect(rec.reasons.at(-1)).toMatch(/^The rules alone advised drop/);
  });

  it("no signal (constant rate 0.3): the simplest candidate, the overall mean, is chosen and the rules' choice stands", async () => {
    const rand = mulberry32(2);
    const { column, evidence } = await evidenceOf(generate("none.csv", 7, 40, 50, () => 1 + Math.floor(rand() * 5), () => 0.3));
    expect(evidence.chosen).toBe("overall-mean");
    expect(evidence.candidates[0]?.candidate).toBe("overall-mean");
    const rec = applyEvidence(column, evidence, DEFAULT_POLICY);
    expect(rec.encoding).toBe(column.recommendation.encoding);
    expect(rec.reasons.at(-1)).toMatch(/no candidate beats the overall mean by more than one standard error.*frequency stands|stands\.$/);
    expect(rec.reasons.join(" ")).not.toMatch(/prefers it/); // never the reason of the choice that was not made
  });
});
