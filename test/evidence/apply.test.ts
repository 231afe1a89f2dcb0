/**
 * applyEvidence (pure): which rule outcomes the evidence may revise, the params it carries over
 * and the reasons quoting the numbers. Hand-made evidence; the numbers are arbitrary inputs.
 */
import { describe, expect, it } from "vitest";
import { DEFAULT_POLICY } from "../../src/advice/policy.js";
import { applyEvidence, comparisonText } from "../../src/evidence/applyEvidence.js";
import type { CandidateName, Evidence, EvidenceCandidate } from "../../src/evidence/types.js";
import { unmeasuredColumn } from "../../src/profile/columnFigures.js";
import type { ColumnProfile, Recommendation } from "../../src/profile/types.js";

const cand = (candidate: CandidateName, loss: number, params: Record<string, unknown> = {}): EvidenceCandidate =>
  ({ candidate, params, loss, se: 0.004, foldLosses: [loss, loss], auc: 0.6 });
const evidence = (chosen: CandidateName, candidates: EvidenceCandidate[]): Evidence =>
  ({ metric: "log-loss", folds: 5, rows: 1000, candidates, best: chosen, chosen, rule: "one-standard-error", threshold: 0.5, reason: `${chosen} chosen.` });
function column(role: ColumnProfile["role"], recommendation: Recommendation): ColumnProfile {
  return { ...unmeasuredColumn("clinic_code", role, 1000, 0, ""), distinct: 400, recommendation };
}
const frequency: Recommendation = { encoding: "frequency", params: { tableSize: 400, unseen: 0 }, reasons: ["Frequency: rules."] };
const pooledParams = { keep: ["A1", "B2"], other: "other", pooledRowShare: 0.25, minRows: 30 };

describe("applyEvidence", () => {
  it("frequency → pooled one-hot when pooled one-hot is chosen, with its kept levels and the numbers", () => {
    const e = evidence("pooled-one-hot", [cand("overall-mean", 0.65), cand("pooled-one-hot", 0.61234, pooledParams), cand("target-kfold", 0.6123)]);
    const rec = applyEvidence(column("categorical", frequency), e, DEFAULT_POLICY);
    expect(rec.encoding).toBe("pooled-one-hot");
    expect(rec.params).toEqual(pooledParams);
    expect(rec.reasons[0]).toMatch(/the 2 levels with at least 30 rows keep their own column; the other 25\.0 % of non-missing rows share "other"/);
    expect(rec.reasons.join(" ")).toContain("0.61234");
    expect(rec.reasons.at(-1)).toBe("The rules alone advised frequency: Frequency: rules.");
  });

  it("the rules' choice stands for overrides, for the overall mean, and for identifiers unless a hierarchy wins", () => {
    const overridden: Recommendation = { ...frequency, overridden: { from: "target-kfold", by: "--decide" } };
    const e = evidence("target-kfold", [cand("overall-mean", 0.65), cand("target-kfold", 0.6)]);
    expect(applyEvidence(column("categorical", overridden), e, DEFAULT_POLICY)).toBe(overridden);
    const drop: Recommendation = { encoding: "drop", params: { role: "identifier" }, reasons: ["Drop: identifier."] };
    const kept = applyEvidence(column("identifier", drop), e, DEFAULT_POLICY);
    expect(kept.encoding).toBe("drop");
    expect(kept.reasons.at(-1)).toMatch(/stands/);
    const none = applyEvidence(column("categorical", frequency), evidence("overall-mean", [cand("overall-mean", 0.65)]), DEFAULT_POLICY);
    expect(none.encoding).toBe("frequency");
    // the rules' reason, the comparison and why the rules' choice stands — not the one-SE rule's
    // preference for the overall mean, which is not the decision (issue 14, point 8)
    expect(none.reasons).toHaveLength(3);
    expect(none.reasons.join(" ")).not.toMatch(/prefers/);
  });

  it("a hierarchy candidate turns an identifier's drop into target-kfold with its params", () => {
    const params = { weight: 12.5, parentWeight: 40, prior: "hierarchical", parent: { kind: "prefix", length: 3 }, parentGroups: 412, folds: 5, seed: 42, priorMean: 0.3, fallback: "prior mean" };
    const drop: Recommendation = { encoding: "drop", params: { role: "identifier" }, reasons: ["Drop: identifier."] };
    const rec = applyEvidence(column("identifier", drop), evidence("hierarchical-target-kfold", [cand("overall-mean", 0.65), cand("hierarchical-target-kfold", 0.58, params)]), DEFAULT_POLICY);
    expect(rec.encoding).toBe("target-kfold");
    expect(rec.params).toEqual(params);
    expect(rec.reasons[0]).toMatch(/the first 3 characters, 412 groups\) with weight m = 12\.5, and each parent's toward the overall mean with weight 40\.0/);
  });

  it("comparisonText lists every candidate with loss ± se and AUC", () => {
    const text = comparisonText(evidence("target-kfold", [cand("overall-mean", 0.65), cand("target-kfold", 0.6)]));
    expect(text).toBe("Out-of-fold log loss (nats per row) over 5 folds, ± one standard error across folds: the overall mean (column unused) 0.65000 ± 0.0040 (AUC 0.600); target encoding 0.60000 ± 0.0040 (AUC 0.600).");
  });
});
