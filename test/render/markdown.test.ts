import { describe, it, expect } from "vitest";
import { renderDecisionRecord } from "../../src/render/markdown.js";
import { loadFixture } from "./load-fixture.js";

/** Cells of a GFM table row: pipes preceded by an odd number of backslashes are escaped. */
function cellCount(line: string): number {
  let pipes = 0;
  let backslashes = 0;
  for (const ch of line) {
    if (ch === "|" && backslashes % 2 === 0) pipes += 1;
    backslashes = ch === "\\" ? backslashes + 1 : 0;
  }
  return pipes - 1;
}

/** Groups consecutive table lines into tables. */
function tables(markdown: string): string[][] {
  const out: string[][] = [];
  let current: string[] = [];
  for (const line of markdown.split("\n")) {
    if (line.startsWith("|")) current.push(line);
    else if (current.length > 0) { out.push(current); current = []; }
  }
  if (current.length > 0) out.push(current);
  return out;
}

describe("renderDecisionRecord", () => {
  it("matches the snapshot (binary target, every encoding kind, nasty values)", async () => {
    await expect(renderDecisionRecord(loadFixture("binary"))).toMatchFileSnapshot("__snapshots__/decisions-binary.md");
  });
  it("matches the snapshot (no target, redacted, from a level table)", async () => {
    await expect(renderDecisionRecord(loadFixture("no-target"))).toMatchFileSnapshot("__snapshots__/decisions-no-target.md");
  });

  it("is deterministic and leaves the profile unchanged", () => {
    const profile = loadFixture("binary");
    const before = JSON.stringify(profile);
    const first = renderDecisionRecord(profile);
    expect(renderDecisionRecord(loadFixture("binary"))).toBe(first);
    expect(JSON.stringify(profile)).toBe(before);
  });

  it("keeps every table rectangular despite pipes, newlines and backticks in names and values", () => {
    const md = renderDecisionRecord(loadFixture("binary"));
    const found = tables(md);
    expect(found.length).toBeGreaterThan(10);
    for (const table of found) {
      const width = cellCount(table[0]!);
      for (const line of table) expect({ line, cells: cellCount(line) }).toEqual({ line, cells: width });
    }
  });

  it("escapes level values and neutralises formulas in table cells (OWASP CSV Injection)", () => {
    const md = renderDecisionRecord(loadFixture("binary"));
    expect(md).toContain("| \\<script\\>alert(1)\\</script\\> | 20,235 |");
    expect(md).toContain("| '=cmd\\|' /C calc'!A0 |");
    expect(md).toContain("| '@SUM(A1) |");
    expect(md).toContain("| '+44 20 |");
    expect(md).toContain("| '-5 |");
    expect(md).toContain("| line1\\nline2 |"); // the newline shown as \n
    expect(md).toContain("| \\`rm -rf\\` |");
    expect(md).toContain("| *(empty)* |");
    expect(md).toContain("### 10. owner notes \\<b\\>\\&\\</b\\> \"quoted\" \\| \\`tick\\`");
    expect(md).not.toMatch(/(^|[^\\])<script/);
  });

  it("writes the header, settings, override, target figures and the standing cautions", () => {
    const md = renderDecisionRecord(loadFixture("binary"));
    expect(md).toContain("| created | 2025-03-14T09:26:53.000Z |");
    expect(md).toContain("| target | no\\_show (binary, positive = \"yes\"); mean 0.118; 119,640 rows, 360 missing |");
    expect(md).toContain("| folds | 5 |");
    expect(md).toContain("| seed | 42 |");
    expect(md).toContain("**Decision:** hashing (overridden by the user, was target-kfold)");
    expect(md).toContain("| prior weight m | 38.4 (beta-binomial moments; prior mean 0.118) |");
    expect(md).toContain("| flagged levels | 212 flagged vs 114.6 expected false flags (2,292 levels tested) |");
    expect(md).toContain("| leakage (AUC) | in-sample 0.681, out-of-fold 0.583 |");
    expect(md).toContain("## Cautions");
    expect(md).toMatch(/proxies for protected characteristics/);
    expect(md).toMatch(/credit, insurance, employment, housing, health/);
    expect(md).toContain("--redact");
    expect(md).not.toMatch(/NaN|undefined/);
  });

  it("notes redaction and level-table input, and prints n/a for missing figures", () => {
    const md = renderDecisionRecord(loadFixture("no-target"));
    expect(md).toContain("> **Note:** Level values are redacted");
    expect(md).toContain("| target | none |");
    expect(md).not.toContain("prior weight m");
    const noMissing = loadFixture("binary");
    const vet = noMissing.columns.find((c) => c.name === "vet_code")!;
    expect(vet.target?.prior.weight).toBeNull();
    expect(renderDecisionRecord(noMissing)).toContain("| prior weight m | n/a (beta-binomial moments; prior mean 0.118) |");
    expect(md).not.toMatch(/NaN|undefined/);
  });

  it("shows only rows and missing for columns not profiled as levels", () => {
    const md = renderDecisionRecord(loadFixture("binary"));
    expect(md).toContain("| weight\\_kg | numeric | — | keep | — |");
    const section = md.slice(md.indexOf("### 11. weight"), md.indexOf("### 12."));
    expect(section).toContain("| missing | 0 (0.0 %) |");
    expect(section).not.toContain("distinct levels");
  });

  it("renders a profile without columns", () => {
    const md = renderDecisionRecord({ ...loadFixture("no-target"), columns: [] });
    expect(md).toContain("No columns were profiled.");
    expect(md).toContain("## Cautions");
  });
});
