/**
 * Forward evidence of the hierarchy candidates (--time): the same small hierarchical-code data as
 * test/evidence/bruteForce.test.ts, with a time column, scored forward by evidenceFor and checked
 * against the plain row-by-row loops of test/evidence/plainOof.ts run on each step's rows. A step b
 * keeps the rows of blocks ≤ b; there "every block but b" is exactly blocks < b, so plainOof's
 * other-fold predictions of block b's rows are the forward predictions, and the backoff weight m is
 * fitted (fitGroups) on blocks < b only. Blocks are read back through foldSql of the scan's contract.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { DEFAULT_POLICY } from "../../src/advice/policy.js";
import { scan } from "../../src/commands/scan.js";
import { buildLevelTable } from "../../src/engine/aggregate.js";
import { withEngine } from "../../src/engine/db.js";
import { foldSql } from "../../src/engine/folds.js";
import { buildLevelTotals } from "../../src/engine/levels.js";
import { openSource } from "../../src/engine/source.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { resolveTarget } from "../../src/engine/target.js";
import { evidenceFor } from "../../src/evidence/evidenceFor.js";
import type { Evidence } from "../../src/evidence/types.js";
import { hierarchyFor } from "../../src/hierarchy/hierarchyFor.js";
import type { ParentSpec } from "../../src/hierarchy/types.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";
import { backoffGroups, counts } from "../hierarchy/plain.js";
import { codedRow, csv } from "./helpers.js";
import { fitGroups, groupedOof, hierarchicalOof, scoreRows, sums, type Row } from "./plainOof.js";

const dir = tempDir("fwd-hier");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const K = 4;

// the coded rows of bruteForce.test.ts (helpers codedRow, seed 17), plus a visit time: row i at hour i of 2025
const rand = mulberry32(17);
const data = Array.from({ length: 420 }, (_, i) => {
  const { code, y } = codedRow(rand, i);
  const time = new Date(Date.UTC(2025, 0, 1) + i * 3_600_000).toISOString().slice(0, 16).replace("T", " ");
  return [i, time, code, y];
});
const file = writeFile(dir, "fwd.csv", csv(["id", "t", "code", "y"], data));
const close = (a: number | null | undefined, b: number | undefined, what: string) =>
  expect(Math.abs((a ?? Number.NaN) - (b ?? Number.NaN)) <= 1e-9 * Math.max(1, Math.abs(b ?? 0)), `${what}: ${a} vs ${b}`).toBe(true);

describe("forward evidence with a hierarchy", () => {
  it("backoff and the hierarchical prior scored forward equal the plain loops on each step's rows", async () => {
    const profile = await scan([file], { target: "y", columns: ["code"], asCategorical: ["code"], time: "t", folds: K });
    const fold = profile.settings.fold!;
    const column = profile.columns.find((c) => c.name === "code")!;
    const { evidence, raw } = await withEngine({ threads: 1 }, async (engine) => {
      const source = await openSource(engine, [file]);
      await buildLevelTable(engine, { view: source.view, levelColumns: ["code"], countColumns: [], fold, target: resolveTarget({ column: "y", kind: "binary" }, ["0", "1"]) });
      await buildLevelTotals(engine);
      const hierarchy = await hierarchyFor(engine, [column], DEFAULT_POLICY);
      const ev = await evidenceFor(engine, [column], profile.target!, { ...DEFAULT_POLICY, folds: K, forward: true }, hierarchy);
      const rows = await engine.rows<Record<string, string | null> & { fold: number }>(
        `SELECT *, ${foldSql(fold)} AS fold FROM read_csv(${quoteLiteral(file)}, all_varchar = true, header = true)`, "rows back");
      return { evidence: ev.get(0) as Evidence, raw: rows };
    });
    expect(evidence.validation).toBe("forward");
    expect(evidence.candidates.map((c) => c.candidate)).toEqual(["overall-mean", "pooled-one-hot", "target-kfold", "backoff-target-kfold", "hierarchical-target-kfold"]);
    const rows: Row[] = raw.filter((r) => r.y !== null).map((r) => ({ level: r.code ?? null, y: Number(r.y), fold: r.fold }));
    const allCounts = counts(raw.filter((r) => r.code !== null).map((r) => r.code!)); // backoff groups: row counts of all blocks
    for (const c of evidence.candidates) {
      const p = c.params;
      const steps: number[] = [];
      for (let b = 1; b < K; b += 1) {
        const upTo = rows.filter((r) => r.fold <= b);
        let pred: number[];
        if (c.candidate === "overall-mean") pred = groupedOof(upTo, () => null, 0);
        else if (c.candidate === "pooled-one-hot") pred = groupedOof(upTo, (l) => ((p.keep as string[]).includes(l) ? l : "other"), 0);
        else if (c.candidate === "target-kfold") pred = groupedOof(upTo, (l) => l, p.weight as number | null);
        else if (c.candidate === "backoff-target-kfold") {
          const { of } = backoffGroups(allCounts, [...(p.parents as ParentSpec[])].reverse(), 30);
          const group = (l: string) => of.get(l) ?? "other";
          const m = fitGroups(sums(upTo.filter((r) => r.level !== null && r.fold < b), (r) => group(r.level!)), true);
          pred = groupedOof(upTo, group, m);
        } else pred = hierarchicalOof(upTo, p.parent as ParentSpec, true);
        const scored = upTo.map((r, i) => ({ r, p: pred[i]! })).filter((x) => x.r.fold === b);
        steps.push(scoreRows(scored.map((x) => x.r), scored.map((x) => x.p), true).loss);
      }
      c.foldLosses.forEach((l, i) => close(l, steps[i], `${c.candidate} step ${i + 1}`));
      const mean = steps.reduce((s, x) => s + x, 0) / steps.length;
      close(c.loss, mean, `${c.candidate} forward loss`);
      close(c.se, Math.sqrt(steps.reduce((s, x) => s + (x - mean) ** 2, 0) / (steps.length - 1) / steps.length), `${c.candidate} se`);
    }
  });
});
