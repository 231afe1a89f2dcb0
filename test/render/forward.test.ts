/**
 * The record of a --time scan shows the forward and the k-fold figures side by side: the
 * evidence table's forward and k-fold columns carry the numbers of profile.evidence (candidates
 * and kfold), the unseen-level share forward sits beside the Good–Turing rate, the leakage line
 * and the terminal table carry the forward score. Without --time the record is as before.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { renderHtmlReport } from "../../src/render/html.js";
import { renderDecisionRecord } from "../../src/render/markdown.js";
import { renderTable } from "../../src/render/table.js";
import { formatNumber, formatShare } from "../../src/render/format.js";
import { tempDir, writeFile } from "../helpers/tmp.js";
import { growingVisits } from "../fixtures/growingVisits.js";

const dir = tempDir("fwdrender");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const file = writeFile(dir, "visits.csv", growingVisits(2500, 51).csv);

describe("forward figures in the record", () => {
  it("markdown, HTML and the table show forward and k-fold side by side", async () => {
    const p = await scan([file], { target: "no_show", time: "visit_time", folds: 4 });
    const md = renderDecisionRecord(p);
    const html = await renderHtmlReport(p);
    const ref = p.columns.find((c) => c.name === "referral")!;
    const e = ref.evidence!;
    expect(md).toContain("**Evidence (forward in time, with k-fold beside)**");
    expect(md).toContain("| candidate | key parameters | forward log loss | ± SE | 4-fold log loss | ± SE | 4-fold AUC | one-SE rule (forward) |");
    expect(html).toContain("<h3>Evidence (forward in time, with k-fold beside)</h3>");
    // the overall mean's row carries its forward and its k-fold loss
    const fwd = e.candidates.find((c) => c.candidate === "overall-mean")!;
    const kf = e.kfold!.find((c) => c.candidate === "overall-mean")!;
    const row = md.split("\n").find((l) => l.startsWith("| the overall mean") || l.startsWith("| **the overall mean"))!;
    const cells = row.split("|").map((x) => x.trim());
    expect(Number(cells[3])).toBeCloseTo(fwd.loss, 3);
    expect(Number(cells[5])).toBeCloseTo(kf.loss, 3);
    expect(md).toContain(`unseen-level share forward in time | ${formatShare(ref.forwardUnseen!.mean, 2)}`);
    expect(md).toContain(`forward ${formatNumber(ref.target!.leakage.forward!, 3)}`);
    expect(md).toContain("3 forward steps over 4 time blocks (block 0 is fit-only).");
    const table = renderTable(p);
    expect(table).toContain("unseen GT/fwd");
    expect(table).toContain("AUC in/oof/fwd");
    expect(table).toContain(`${formatShare(ref.unseenRate, 2)}/${formatShare(ref.forwardUnseen!.mean, 2)}`);
    // the reasons name what encode --for training writes for a --time plan: past-only encodings
    const targetReasons = p.columns.filter((c) => c.recommendation.encoding === "target-kfold").map((c) => c.recommendation.reasons[0] ?? "");
    expect(targetReasons.length).toBeGreaterThan(0);
    for (const r of targetReasons) {
      expect(r).toMatch(/past-only over 4 time blocks/);
      expect(r).not.toMatch(/-fold out-of-fold/);
    }
    const plain = await scan([file], { target: "no_show", folds: 4 });
    expect(plain.columns.filter((c) => c.recommendation.encoding === "target-kfold").every((c) => /4-fold out-of-fold/.test(c.recommendation.reasons[0] ?? ""))).toBe(true);
    const plainMd = renderDecisionRecord(plain);
    expect(plainMd).toContain("**Evidence (out-of-fold)**");
    expect(plainMd).not.toContain("forward");
    expect(renderTable(plain)).not.toContain("fwd");
  });
});
