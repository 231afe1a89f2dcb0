/**
 * The three views of a multi-class profile (terminal table, Markdown record, HTML report) show
 * each class compactly: the classes and shares in the header, m per class and the multi-class log
 * loss in the table, per-class tables and the evidence in the record and the report — every number
 * read back from the profile, so a view that drops or mislabels a class fails.
 */
import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import type { Profile } from "../../src/profile/types.js";
import { renderHtmlReport } from "../../src/render/html.js";
import { renderDecisionRecord } from "../../src/render/markdown.js";
import { renderTable } from "../../src/render/table.js";
import { formatNumber, formatShare } from "../../src/render/format.js";
import { visitOutcomes } from "../fixtures/visitOutcomes.js";
import { tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("render-mc");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
let profile: Profile;
beforeAll(async () => {
  profile = await scan([writeFile(dir, "v.csv", visitOutcomes(6000, 15).csv)], { target: "visit_outcome" });
}, 120_000);

const escMd = (s: string) => s.replace(/_/g, "\\_");

describe("multi-class views", () => {
  it("terminal: classes with shares, m per class, log loss shares/encoded", () => {
    const text = renderTable(profile);
    if (profile.target?.kind !== "multiclass") throw new Error("not multiclass");
    expect(text).toContain(`(multiclass: ${profile.target.classes.map((k) => `${k.value} ${formatShare(k.share)}`).join(", ")}; 0 missing)`);
    const clinic = profile.columns.find((c) => c.name === "clinic")!;
    const line = text.split("\n").find((l) => l.includes("│ clinic "))!;
    expect(line).toContain(clinic.classes!.map((k) => formatNumber(k.target.prior.weight!, 1)).join("/"));
    expect(line).toContain(`${formatNumber(clinic.multiclassEvidence!.candidates[0]!.loss, 3)}/${formatNumber(clinic.multiclassEvidence!.candidates[1]!.loss, 3)}`);
    expect(line).toContain("3 classes, K=5");
  });

  it("Markdown: per-class table, class rates with Wilson intervals, the evidence; parameters in one line", () => {
    const md = renderDecisionRecord(profile);
    const clinic = profile.columns.find((c) => c.name === "clinic")!;
    const section = md.slice(md.indexOf("### 2. clinic"), md.indexOf("### 3."));
    for (const k of clinic.classes!) {
      expect(section).toContain(`| ${escMd(k.value)} | ${formatNumber(k.target.prior.weight!, 1)} | ${k.target.flaggedLevels} (`);
    }
    const first = clinic.classes![1]!.levels[0]!;
    expect(section).toContain(`${formatShare(first.targetMean)} \\[${formatShare(first.low)}–${formatShare(first.high)}\\]`);
    expect(section).toContain(`| target encoding, one class against the rest | ${formatNumber(clinic.multiclassEvidence!.candidates[1]!.loss, 5)} |`);
    expect(section).toContain("**Parameters:** one column per class: attended m=");
  });

  it("HTML: the same tables", async () => {
    const html = await renderHtmlReport(profile);
    expect(html).toContain("<caption>Per class, one against the rest</caption>");
    expect(html).toContain("<caption>Out-of-fold multi-class log loss (5 folds, 6,000 rows)</caption>");
    expect(html).toContain("cancelled_late");
  });
});
