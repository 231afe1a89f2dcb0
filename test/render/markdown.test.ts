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
    // the number of values of a numeric column is stated (issue 14, point 10): sampled here
    expect(md).toContain("| weight\\_kg | numeric | ≥ 3,412 (first 50,000 rows) | keep | — |");
    const section = md.slice(md.indexOf("### 11. weight"), md.indexOf("### 12."));
    expect(section).toContain("| missing | 0 (0.0 %) |");
    expect(section).not.toContain("distinct levels");
    expect(section).toContain("| distinct values | ≥ 3,412 (first 50,000 rows) |");
  });

  it("renders a profile without columns", () => {
    const md = renderDecisionRecord({ ...loadFixture("no-target"), columns: [] });
    expect(md).toContain("No columns were profiled.");
    expect(md).toContain("## Cautions");
  });
});

describe("renderDecisionRecord: evidence and structure", () => {
  const section = (md: string, n: number) => md.slice(md.indexOf(`### ${n}. `), md.indexOf(`### ${n + 1}. `));
  /** Mean and SE (sample sd / √K) of a candidate's fold losses: plain computation, independent of the renderer. */
  const foldStats = (losses: number[]) => {
    const mean = losses.reduce((a, b) => a + b, 0) / losses.length;
    const sd = Math.sqrt(losses.reduce((a, b) => a + (b - mean) ** 2, 0) / (losses.length - 1));
    return { mean, se: sd / Math.sqrt(losses.length) };
  };

  it("tables every candidate with its loss, SE and AUC, marks best and chosen, and states the rule", () => {
    const profile = loadFixture("binary");
    const md = section(renderDecisionRecord(profile), 6);
    const e = profile.columns[5]!.evidence!;
    expect(md).toContain("**Evidence (out-of-fold)**");
    expect(md).toContain("| candidate | key parameters | out-of-fold log loss | ± SE | AUC | one-SE rule |");
    const marks: Record<string, string> = { "backoff-target-kfold": "chosen", "hierarchical-target-kfold": "best" };
    for (const c of e.candidates) {
      const { mean, se } = foldStats(c.foldLosses);
      expect(md).toContain(` | ${mean.toFixed(5)} | ${se.toFixed(5)} | ${c.auc!.toFixed(3)} | ${marks[c.candidate] ?? ""} |`);
    }
    expect(md).toContain("| **backoff grouping then target encoding** | parents first 1 token (split on ' '); ≥ 30 rows; 958 groups; m = 36.9 |");
    expect(md).toContain("| target encoding with a hierarchical prior | parent first 1 token (split on ' '), 460 groups; m = 52.7, parent m = 41.3 |");
    expect(md).toContain("Backoff grouping then target encoding (out-of-fold log loss 0.35760) is within one standard error of the best");
    // one-SE rule (Breiman et al. 1984 §3.4.3): threshold = best loss + its SE, best = hierarchical prior here
    const best = foldStats(e.candidates[4]!.foldLosses);
    expect(md).toContain(`One-standard-error threshold: ${(best.mean + best.se).toFixed(5)} (the best loss plus its standard error); 5 folds, 119,640 rows scored.`);
    expect(section(renderDecisionRecord(profile), 7)).not.toContain("Evidence (out-of-fold)");
  });

  it("lists the structure: pattern, candidate parents and the backoff grouping", () => {
    const md = section(renderDecisionRecord(loadFixture("binary")), 6);
    expect(md).toContain("**Structure**");
    expect(md).toContain("- Delimited codes of two tokens split by \" \"; 99.9 % of 2,000 sampled levels follow it.");
    expect(md).toContain("| parent | groups | rows in groups of ≥ 30 rows | median group rows |");
    expect(md).toContain("| first 1 token (split on ' ') — prior parent | 460 | 98.1 % | 176 |");
    expect(md).toContain("| coverage (rows not in \"other\") | 99.7 % |"); // 0.997175
    expect(md).toContain("| rows backed off to a parent | 20.1 % |"); // 0.2012
    expect(md).toContain("| rows in \"other\" | 0.3 % |"); // 0.002825
  });

  it("says when the user's choice differs from the evidence's, and only then", () => {
    const profile = loadFixture("binary");
    expect(section(renderDecisionRecord(profile), 8)).toContain("The user chose hashing; the evidence favoured pooled one-hot.");
    const agrees = loadFixture("binary");
    agrees.columns[7]!.recommendation = { ...agrees.columns[7]!.recommendation, encoding: "pooled-one-hot" };
    expect(section(renderDecisionRecord(agrees), 8)).not.toContain("The user chose");
    const flat = loadFixture("binary");
    flat.columns[5]!.recommendation = { encoding: "target-kfold", params: { weight: 38.4 }, reasons: [], overridden: { from: "target-kfold", by: "user" } };
    expect(section(renderDecisionRecord(flat), 6)).toContain("The user chose target encoding; the evidence favoured backoff grouping then target encoding.");
    expect(section(renderDecisionRecord(loadFixture("binary")), 6)).not.toContain("The user chose"); // not overridden
  });

  it("escapes level values kept by the pooled candidate", () => {
    const profile = loadFixture("binary");
    const pooled = profile.columns[9]!.evidence!.candidates[1]!;
    pooled.params = { ...pooled.params, keep: ["line1\nline2", "=cmd|' /C calc'!A0", "`rm -rf`", "plain"] };
    const md = section(renderDecisionRecord(profile), 10);
    expect(md).toContain("| pooled one-hot | keep 4 (\"line1\\nline2\", \"=cmd\\|' /C calc'!A0\", \"\\`rm -rf\\`\", …) + other; 7.4 % of rows pooled |");
    expect(section(renderDecisionRecord(loadFixture("binary")), 10))
      .toContain("keep 15 (\"\\<script\\>alert(1)\\</scrip…\", \"Tom \\& \"Jerry\"\", \"a\\|b\", …)");
  });
});
