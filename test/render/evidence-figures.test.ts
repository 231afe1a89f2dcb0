import { describe, it, expect } from "vitest";
import type { Evidence } from "../../src/evidence/types.js";
import type { HierarchyFigures } from "../../src/hierarchy/types.js";
import {
  backoffFigures, candidateParamsText, evidenceHeader, evidenceNotes, evidenceRows, hierarchyNotes, parentChainText,
} from "../../src/render/evidence-figures.js";
import { loadFixture } from "./load-fixture.js";

const prefix = (length: number) => ({ kind: "prefix" as const, length });
const tokens = (count: number, delimiters = "-") => ({ kind: "tokens" as const, count, delimiters });

describe("parentChainText", () => {
  it("writes a chain of prefixes or of tokens compactly, deepest first, and mixed chains in full", () => {
    expect(parentChainText([prefix(4), prefix(3), prefix(2), prefix(1)])).toBe("first 4 → 3 → 2 → 1 characters");
    expect(parentChainText([tokens(2), tokens(1)])).toBe("first 2 → 1 tokens (split on '-')");
    expect(parentChainText([tokens(2, "-"), tokens(1, "/")])).toBe("first 2 tokens (split on '-') → first 1 token (split on '/')");
    expect(parentChainText([prefix(1)])).toBe("first 1 character");
    expect(parentChainText([])).toBe("—");
  });
});

describe("candidateParamsText", () => {
  it("shows an infinite weight as ∞ and missing figures as n/a, never NaN or undefined", () => {
    expect(candidateParamsText({ candidate: "hierarchical-target-kfold", params: { weight: null, parentWeight: 45.546, parent: prefix(4), parentGroups: 1785 },
      loss: 0.36, se: 0.002, foldLosses: [] })).toBe("parent first 4 characters, 1,785 groups; m = ∞, parent m = 45.55");
    expect(candidateParamsText({ candidate: "backoff-target-kfold", params: {}, loss: 0.36, se: 0.002, foldLosses: [] }))
      .toBe("parents —; ≥ n/a rows; n/a groups; m = ∞");
    expect(candidateParamsText({ candidate: "pooled-one-hot", params: { keep: [null, "", "a"] }, loss: 0.36, se: 0.002, foldLosses: [] }))
      .toBe("keep 3 ((missing), (empty), \"a\") + other; n/a of rows pooled");
  });
  it("shortens long kept levels to 24 characters without splitting a character", () => {
    const text = candidateParamsText({ candidate: "pooled-one-hot", params: { keep: ["🐕".repeat(30)], pooledRowShare: 0.5 }, loss: 0.36, se: 0.002, foldLosses: [] });
    expect(text).toBe(`keep 1 ("${"🐕".repeat(23)}…") + other; 50.0 % of rows pooled`);
  });
});

describe("evidence rows and notes", () => {
  const continuous: Evidence = {
    metric: "squared-error", folds: 5, rows: 1000, rule: "one-standard-error", best: "target-kfold", chosen: "target-kfold",
    threshold: 1300.25, reason: "target encoding has the lowest out-of-fold squared error.",
    candidates: [
      { candidate: "overall-mean", params: {}, loss: 1520.5, se: 40.125, foldLosses: [], r2: 0 },
      { candidate: "target-kfold", params: { weight: 12 }, loss: 1260.125, se: 40.125, foldLosses: [], r2: null },
    ],
  };
  it("uses R² and five significant digits at the scale of the largest loss for a continuous target", () => {
    expect(evidenceHeader(continuous)).toEqual(["candidate", "key parameters", "out-of-fold squared error", "± SE", "R²", "one-SE rule"]);
    // 1520.5 has 4 integer digits → 1 decimal for every loss and SE (plain computation)
    expect(evidenceRows(continuous).map((r) => [r.loss, r.se, r.score, r.mark])).toEqual([
      ["1,520.5", "40.1", "0.000", ""], ["1,260.1", "40.1", "n/a", "best and chosen"],
    ]);
  });
  it("marks candidates at or below the threshold that are neither best nor chosen as within 1 SE", () => {
    const e = loadFixture("binary").columns[5]!.evidence!;
    const raised = { ...e, threshold: 0.3588 }; // above target encoding's 0.35871
    expect(evidenceRows(raised).map((r) => r.mark)).toEqual(["", "", "within 1 SE", "chosen", "best"]);
  });
  it("counts drop as the column unused (the overall mean) when comparing an override with the evidence", () => {
    const column = loadFixture("binary").columns[5]!;
    const evidence = { ...column.evidence!, chosen: "overall-mean" as const };
    const dropped = { ...column, evidence, recommendation: { encoding: "drop" as const, params: {}, reasons: [], overridden: { from: "target-kfold" as const, by: "user" } } };
    expect(evidenceNotes(dropped)?.override).toBeNull();
    expect(evidenceNotes({ ...dropped, evidence: column.evidence! })?.override)
      .toBe("The user chose drop; the evidence favoured backoff grouping then target encoding.");
    expect(evidenceNotes({ ...column, evidence: undefined })).toBeNull();
  });
});

describe("structure figures", () => {
  const counter: HierarchyFigures = {
    pattern: "fixed-length", shape: "LLDDDDDD", sampledLevels: 4000, matchingShare: 0.97, parents: [], priorParent: null,
    backoff: { minRows: 30, groups: 1, coverage: 0.2, levelRowShare: 0.1, parentRowShare: 0.1, otherRowShare: 0.8,
      hashing: { width: 1024, collisionRowShare: 0.0042, hash: "md5-first8-le" } },
    counterLike: true, useful: false,
  };
  it("says when codes look like a counter and when no parent suits a prior", () => {
    expect(hierarchyNotes(counter)).toEqual([
      "Fixed-length codes of shape LLDDDDDD (D digit, L letter); 97.0 % of 4,000 sampled levels follow it.",
      "No parent is well filled enough for a hierarchical prior.",
      "The trailing digits run almost without gaps, as a counter's would: not treated as a hierarchy.",
    ]);
    expect(hierarchyNotes({ ...counter, pattern: "delimited", shape: "-@", counterLike: false })[0])
      .toBe("Delimited codes of 3 tokens, delimiters \"-@\" in order; 97.0 % of 4,000 sampled levels follow it.");
  });
  it("adds the hashing of the group keys when the backoff has one", () => {
    expect(backoffFigures(counter).at(-1)).toEqual({ label: "hashing of the group keys", value: "1,024 buckets, 0.42 % of rows colliding" });
    expect(backoffFigures({ ...counter, backoff: { ...counter.backoff, hashing: undefined } }).length).toBe(6);
  });
});
