/**
 * The after-pass shortcuts against a row-by-row computation (plain loops over the raw rows, folds
 * read back through foldSql): engine/leakage scores the in-sample values from the level totals and
 * sums the levels whose target rows sit in one fold (LEVEL_TOTALS.single_fold: out-of-fold value =
 * the fold's prior, in closed form) by fold instead of row by row; the flat target-encoding
 * candidate of the evidence is taken from that same statement (evidence/candidates
 * sharedFlatScore) and the overall mean of every column is scored in one statement. Small
 * generated data: a tail of codes seen once or twice, a few large codes, missing codes and
 * missing targets, two columns.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { LEVEL_TOTALS } from "../../src/engine/levels.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";
import { csv, rowsWithFolds, withLevelTable } from "./helpers.js";
import { groupedOof, scoreRows, type Row } from "./plainOof.js";

const dir = tempDir("evidence-shared");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const rand = mulberry32(29);
const data = Array.from({ length: 360 }, (_, i) => {
  const big = rand() < 0.35;
  const code = i < 12 ? "" : big ? `B${Math.floor(rand() * 4)}` : `T${Math.floor(rand() * 160)}`;
  const shop = i % 9 === 0 ? "" : `S${Math.floor(rand() * 25)}`;
  const rate = big ? 0.2 + 0.15 * Number(code.slice(1)) : 0.3;
  const y = i % 31 === 5 ? "" : rand() < rate ? 1 : 0;
  const amount = i % 31 === 5 ? "" : (10 + (big ? 8 * Number(code.slice(1)) : 0) + 12 * rand()).toFixed(2);
  return [i, code, shop, y, amount];
});
const file = writeFile(dir, "shared.csv", csv(["id", "code", "shop", "y", "amount"], data));

const close = (a: number | null | undefined, b: number | undefined, what: string) =>
  expect(Math.abs((a ?? Number.NaN) - (b ?? Number.NaN)) <= 1e-9 * Math.max(1, Math.abs(b ?? 0)), `${what}: ${a} vs ${b}`).toBe(true);

const sum = (xs: readonly number[]) => xs.reduce((a, b) => a + b, 0);

describe.each([["y", true], ["amount", false]] as const)("target %s", (targetName, binary) => {
  it("leakage, flat candidate and overall mean equal the row-by-row computation", async () => {
    const profile = await scan([file], { target: targetName, columns: ["code", "shop"], ...(binary ? {} : { targetKind: "continuous" as const }) });
    const { raw, singleFold, multiFold } = await withLevelTable(file, ["code", "shop"], { column: targetName, kind: binary ? "binary" : "continuous" }, async ({ engine, columns }) => {
      const [t] = await engine.rows<{ single: number; multi: number }>(
        `SELECT count(*) FILTER (WHERE single_fold IS NOT NULL)::DOUBLE AS single, count(*) FILTER (WHERE single_fold IS NULL AND n_y > 0)::DOUBLE AS multi
         FROM ${LEVEL_TOTALS} WHERE col = 0 AND level IS NOT NULL`, "test");
      return { raw: await rowsWithFolds(engine, file, columns), singleFold: t!.single, multiFold: t!.multi };
    });
    // the data exercise both paths of the out-of-fold scoring
    expect(singleFold).toBeGreaterThan(50);
    expect(multiFold).toBeGreaterThan(3);
    for (const name of ["code", "shop"]) {
      const column = profile.columns.find((c) => c.name === name)!;
      const rows: Row[] = raw.filter((r) => r[targetName] !== null).map((r) => ({ level: r[name] ?? null, y: Number(r[targetName]), fold: r.fold }));
      const m = column.target!.prior.weight;
      // in-sample: each level's own mean shrunk toward the overall mean; missing → the overall mean
      const mean = sum(rows.map((r) => r.y)) / rows.length;
      const inPred = rows.map((r) => {
        if (r.level === null) return mean;
        const same = rows.filter((o) => o.level === r.level);
        return m === null ? mean : (sum(same.map((o) => o.y)) + m * mean) / (same.length + m);
      });
      const oofPred = groupedOof(rows, (l) => l, m);
      const inScore = scoreRows(rows, inPred, binary);
      const oofScore = scoreRows(rows, oofPred, binary);
      close(column.target!.leakage.inSample, binary ? inScore.auc : inScore.r2, `${name} leakage in-sample`);
      close(column.target!.leakage.outOfFold, binary ? oofScore.auc : oofScore.r2, `${name} leakage out-of-fold`);
      const ev = column.evidence;
      expect(ev, `${name} has evidence`).toBeDefined();
      const flat = ev!.candidates.find((c) => c.candidate === "target-kfold")!;
      close(flat.loss, oofScore.loss, `${name} flat loss`);
      close(flat.se, oofScore.se, `${name} flat se`);
      flat.foldLosses.forEach((l, i) => close(l, oofScore.foldLosses[i], `${name} flat fold ${i}`));
      if (binary) close(flat.auc, oofScore.auc, `${name} flat AUC`);
      else close(flat.r2, oofScore.r2, `${name} flat R²`);
      const overall = ev!.candidates.find((c) => c.candidate === "overall-mean")!;
      const want = scoreRows(rows, groupedOof(rows, () => null, 0), binary);
      close(overall.loss, want.loss, `${name} overall-mean loss`);
      overall.foldLosses.forEach((l, i) => close(l, want.foldLosses[i], `${name} overall-mean fold ${i}`));
      if (binary) close(overall.auc, want.auc, `${name} overall-mean AUC`);
      else close(overall.r2, want.r2, `${name} overall-mean R²`);
    }
  }, 120_000);
});
