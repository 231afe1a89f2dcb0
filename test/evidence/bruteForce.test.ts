/**
 * Every candidate's out-of-fold loss, per-fold losses, standard error and AUC/R², computed from the
 * level table in SQL, equal a row-by-row computation over the raw rows (plain loops; folds read
 * back through foldSql). Small generated data with missing levels and missing targets.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { DEFAULT_POLICY } from "../../src/advice/policy.js";
import { scan } from "../../src/commands/scan.js";
import { evidenceFor } from "../../src/evidence/evidenceFor.js";
import type { Evidence } from "../../src/evidence/types.js";
import { hierarchyFor } from "../../src/hierarchy/hierarchyFor.js";
import type { ParentSpec } from "../../src/hierarchy/types.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";
import { backoffGroups, counts } from "../hierarchy/plain.js";
import { codedRow, csv, rowsWithFolds, withLevelTable } from "./helpers.js";
import { fitGroups, groupedOof, hierarchicalOof, scoreRows, sums, type Row } from "./plainOof.js";

const dir = tempDir("evidence-bf");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// 420 rows: three big codes (~40 rows each), ~130 small 4-digit codes under 8 two-digit parents,
// 15 rows with the code missing, 12 rows with the target missing.
const rand = mulberry32(17);
const data = Array.from({ length: 420 }, (_, i) => {
  const { code, y, parent, leaf } = codedRow(rand, i);
  const amount = i % 35 === 7 ? "" : (20 * (parent - 10) + (leaf % 4 === 0 ? 60 : 0) + 30 * rand()).toFixed(2);
  return [i, code, y, amount];
});
const file = writeFile(dir, "bf.csv", csv(["id", "code", "y", "amount"], data));

const close = (a: number | null | undefined, b: number | undefined, what: string) =>
  expect(Math.abs((a ?? Number.NaN) - (b ?? Number.NaN)) <= 1e-9 * Math.max(1, Math.abs(b ?? 0)), `${what}: ${a} vs ${b}`).toBe(true);

describe.each([["y", true], ["amount", false]] as const)("target %s", (targetName, binary) => {
  it("each candidate equals the row-by-row computation", async () => {
    const profile = await scan([file], { target: targetName, columns: ["code"], asCategorical: ["code"], ...(binary ? {} : { targetKind: "continuous" as const }) });
    const column = profile.columns.find((c) => c.name === "code")!;
    const { evidence, raw } = await withLevelTable(file, ["code"], { column: targetName, kind: binary ? "binary" : "continuous" }, async ({ engine, columns }) => {
      const hierarchy = await hierarchyFor(engine, [column], DEFAULT_POLICY);
      const ev = await evidenceFor(engine, [column], profile.target!, DEFAULT_POLICY, hierarchy);
      return { evidence: ev.get(0) as Evidence, raw: await rowsWithFolds(engine, file, columns) };
    });
    expect(evidence.candidates.map((c) => c.candidate)).toEqual(["overall-mean", "pooled-one-hot", "target-kfold", "backoff-target-kfold", "hierarchical-target-kfold"]);
    const rows: Row[] = raw.filter((r) => r[targetName] !== null).map((r) => ({ level: r.code ?? null, y: Number(r[targetName]), fold: r.fold }));
    const allCounts = counts(raw.filter((r) => r.code !== null).map((r) => r.code!)); // backoff counts all rows
    for (const c of evidence.candidates) {
      const p = c.params;
      let pred: number[];
      if (c.candidate === "overall-mean") pred = groupedOof(rows, () => null, 0);
      else if (c.candidate === "pooled-one-hot") pred = groupedOof(rows, (l) => ((p.keep as string[]).includes(l) ? l : "other"), 0);
      else if (c.candidate === "target-kfold") pred = groupedOof(rows, (l) => l, (column.target!.prior.weight ?? 0));
      else if (c.candidate === "backoff-target-kfold") {
        const { of } = backoffGroups(allCounts, [...(p.parents as ParentSpec[])].reverse(), 30);
        const group = (l: string) => of.get(l) ?? "other";
        const m = fitGroups(sums(rows.filter((r) => r.level !== null), (r) => group(r.level!)), binary);
        if (m === null) expect(p.weight).toBeNull();
        else close(p.weight as number, m, "backoff m");
        pred = groupedOof(rows, group, m);
      } else pred = hierarchicalOof(rows, p.parent as ParentSpec, binary);
      const want = scoreRows(rows, pred, binary);
      close(c.loss, want.loss, `${c.candidate} loss`);
      close(c.se, want.se, `${c.candidate} se`);
      c.foldLosses.forEach((l, i) => close(l, want.foldLosses[i], `${c.candidate} fold ${i}`));
      if (binary) close(c.auc, want.auc, `${c.candidate} AUC`);
      else close(c.r2, want.r2, `${c.candidate} R²`);
    }
    // the flat candidate is the encoding scan scores as its out-of-fold leakage figure: both are built
    // from engine/formulaSql (one m-estimate, unseen levels take the prior exactly) and agree to round-off
    const flat = evidence.candidates.find((c) => c.candidate === "target-kfold")!;
    if (binary) expect(flat.auc).toBeCloseTo(column.target!.leakage.outOfFold!, 9);
    else close(flat.r2, column.target!.leakage.outOfFold!, "flat R² vs leakage");
  });
});
