/**
 * Pure parts of the evidence: the nested prior weight, the per-fold loss and its standard error,
 * and the one-standard-error choice.
 */
import { describe, expect, it } from "vitest";
import { foldLoss } from "../../src/evidence/foldLoss.js";
import { nestedPriorWeight, type NestedSums } from "../../src/stats/nestedPriorWeight.js";
import { chooseByOneSeRule } from "../../src/evidence/oneSe.js";
import type { CandidateName, EvidenceCandidate } from "../../src/evidence/types.js";
import { normalNormalPriorWeight } from "../../src/stats/normalNormalPriorWeight.js";
import { mulberry32 } from "../helpers/tmp.js";

/** The sums nestedPriorWeight takes, from raw values: parents → levels → values. */
function nestedSums(parents: number[][][]): NestedSums {
  const s: NestedSums = { rows: 0, levels: 0, parents: 0, sumY2: 0, levelSumSqOverRows: 0, parentSumSqOverRows: 0, nestedRowsSq: 0 };
  for (const levels of parents) {
    let n = 0; let sum = 0; let sq = 0;
    for (const values of levels) {
      const t = values.reduce((a, b) => a + b, 0);
      s.levels++; s.rows += values.length; s.sumY2 += values.reduce((a, y) => a + y * y, 0);
      s.levelSumSqOverRows += (t * t) / values.length;
      n += values.length; sum += t; sq += values.length ** 2;
    }
    s.parents++; s.parentSumSqOverRows += (sum * sum) / n; s.nestedRowsSq += sq / n;
  }
  return s;
}

describe("nestedPriorWeight", () => {
  it("matches the definitional ANOVA computation on a hand-worked two-parent example", () => {
    // P1: a = 1,2,3 (mean 2), b = 4,6 (mean 5); P2: c = 10,11, d = 7, e = 9,9,12.
    // Worked by hand (definitional form): SSW = 2 + 2 + 0.5 + 0 + 6 = 10.5, σ² = 10.5/(11 − 5) = 1.75;
    // SSB = Σnᵢ(ȳᵢ − ȳₚ)² = 10.8 + 8.8333 = 19.6333; N − ΣΣnᵢ²/Nₚ = 11 − 13/5 − 14/6 = 6.0667;
    // τ² = (19.6333 − 3 × 1.75)/6.0667 = 2.370879; m = σ²/τ² = 0.738123.
    const fit = nestedPriorWeight(nestedSums([[[1, 2, 3], [4, 6]], [[10, 11], [7], [9, 9, 12]]]));
    expect(fit.sigma2).toBeCloseTo(1.75, 12);
    expect(fit.tau2).toBeCloseTo(2.370879, 6);
    expect(fit.weight).toBeCloseTo(0.738123, 6);
  });

  it("with one parent it is normalNormalPriorWeight (DerSimonian & Laird on level means)", () => {
    const rand = mulberry32(9);
    const levels = Array.from({ length: 12 }, (_, i) => Array.from({ length: 2 + (i % 5) }, () => 3 * (i % 4) + 4 * rand()));
    const s = nestedSums([levels]);
    const flat = normalNormalPriorWeight({ levels: s.levels, rows: s.rows, sumY: levels.flat().reduce((a, b) => a + b, 0), sumY2: s.sumY2, sumSumSqOverRows: s.levelSumSqOverRows, sumRowsSq: levels.reduce((a, l) => a + l.length ** 2, 0) });
    const nested = nestedPriorWeight(s);
    expect(flat.weight).not.toBeNull();
    expect(nested.weight).toBeCloseTo(flat.weight!, 10);
    expect(nested.tau2).toBeCloseTo(flat.tau2, 10);
  });

  it("edge cases: one row per level, one level per parent, no spread within parents → null", () => {
    expect(nestedPriorWeight(nestedSums([[[1], [2]], [[5], [6]]])).weight).toBeNull(); // N − k = 0
    expect(nestedPriorWeight(nestedSums([[[1, 2]], [[5, 6]]])).weight).toBeNull(); // each parent one level
    expect(nestedPriorWeight(nestedSums([[[1, 3], [1, 3]], [[5, 7], [5, 7]]])).weight).toBeNull(); // levels = parent means
    expect(() => nestedPriorWeight({ ...nestedSums([[[1, 2], [3, 4]]]), rows: Number.NaN })).toThrow(RangeError);
  });
});

describe("foldLoss", () => {
  it("per-fold losses 1…5 on equal folds: mean 3, se = sd/√5 = √2.5/√5 = 0.707107 (hand-worked)", () => {
    const r = foldLoss([1, 2, 3, 4, 5].map((l, fold) => ({ fold, rows: 10, loss: 10 * l })));
    expect(r?.loss).toBe(3);
    expect(r?.foldLosses).toEqual([1, 2, 3, 4, 5]);
    expect(r?.se).toBeCloseTo(Math.sqrt(0.5), 12);
  });
  it("pools by rows; empty folds are skipped; one fold → se null; none → null", () => {
    expect(foldLoss([{ fold: 0, rows: 1, loss: 1 }, { fold: 1, rows: 3, loss: 9 }, { fold: 2, rows: 0, loss: 0 }])?.loss).toBe(2.5);
    expect(foldLoss([{ fold: 0, rows: 4, loss: 2 }])?.se).toBeNull();
    expect(foldLoss([])).toBeNull();
    expect(() => foldLoss([{ fold: 0, rows: 4, loss: Number.NaN }])).toThrow(RangeError);
  });
});

describe("chooseByOneSeRule (Breiman et al. 1984, §3.4.3)", () => {
  const c = (candidate: CandidateName, loss: number, se: number | null): EvidenceCandidate => ({ candidate, params: {}, loss, se, foldLosses: [] });
  it("prefers the simplest candidate within one standard error of the best", () => {
    const r = chooseByOneSeRule({ metric: "log-loss", candidates: [c("overall-mean", 0.65, 0.002), c("target-kfold", 0.6, 0.01), c("hierarchical-target-kfold", 0.595, 0.01)] });
    expect(r?.best.candidate).toBe("hierarchical-target-kfold");
    expect(r?.threshold).toBeCloseTo(0.605, 12);
    expect(r?.candidate.candidate).toBe("target-kfold");
    expect(r?.reason).toMatch(/within one standard error/);
  });
  it("keeps the best when nothing simpler is within one standard error", () => {
    const r = chooseByOneSeRule({ metric: "log-loss", candidates: [c("overall-mean", 0.65, 0.002), c("target-kfold", 0.61, 0.004), c("backoff-target-kfold", 0.56, 0.009)] });
    expect(r?.candidate.candidate).toBe("backoff-target-kfold");
    expect(r?.reason).toMatch(/more than one standard error worse/);
  });
  it("a tie goes to the simpler candidate, in any input order; no candidates → null", () => {
    const r = chooseByOneSeRule({ metric: "squared-error", candidates: [c("target-kfold", 2, null), c("pooled-one-hot", 2, null)] });
    expect(r?.candidate.candidate).toBe("pooled-one-hot");
    expect(r?.best.candidate).toBe("pooled-one-hot");
    expect(chooseByOneSeRule({ metric: "log-loss", candidates: [] })).toBeNull();
  });
});
