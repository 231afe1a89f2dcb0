/**
 * The multi-class evidence (engine/multiclassLoss, pipeline/multiclassAdvice) recomputed row by
 * row in plain JS: for every row, from the rows of the OTHER folds only (folds read back through
 * foldSql), the class shares π_k and each class's m-estimate (s_k + m_k·π_k)/(n + m_k) at the
 * weight of that class's binary run, renormalised to sum 1 (Zadrozny & Elkan 2002); the row's
 * loss is −ln q(its class), clipped at 1e-15 as the binary log loss. The multi-class log loss
 * −(1/N) Σ ln p(y_i) is the usual cross-entropy (Bishop 2006, eq. 4.108). Pooled loss, per-fold
 * losses and their SE (sd/√K) must agree; the data have missing levels and missing targets.
 */
import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { withEngine } from "../../src/engine/db.js";
import type { Profile } from "../../src/profile/types.js";
import { visitOutcomes } from "../fixtures/visitOutcomes.js";
import { tempDir, writeFile } from "../helpers/tmp.js";
import { rowsWithFolds } from "./helpers.js";

const dir = tempDir("mc-evidence");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const data = visitOutcomes(1500, 7);
// missing clinics every 37th row, missing outcomes every 53rd
const rows = data.rows.map((r, i) => r.map((v, j) => (j === 1 && i % 37 === 5) || (j === 5 && i % 53 === 7) ? "" : v));
const file = writeFile(dir, "visits.csv", [data.header.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n");
const EPS = 1e-15;
const clip = (q: number) => Math.max(EPS, Math.min(1 - EPS, q));

interface Row { level: string | null; cls: number; fold: number }

/** Row-by-row out-of-fold multi-class log loss: per fold the summed loss of each prediction. */
function bruteForce(all: readonly Row[], weights: readonly (number | null)[], k: number) {
  const folds = [...new Set(all.map((r) => r.fold))].sort();
  return folds.map((fold) => {
    let shares = 0, encoded = 0, n = 0;
    const train = all.filter((r) => r.fold !== fold);
    const pi = Array.from({ length: k }, (_, c) => train.filter((r) => r.cls === c).length / train.length);
    for (const r of all.filter((x) => x.fold === fold)) {
      n++;
      shares -= Math.log(clip(pi[r.cls]! / pi.reduce((a, b) => a + b, 0)));
      const same = r.level === null ? [] : train.filter((o) => o.level === r.level);
      const p = pi.map((prior, c) => {
        const m = weights[c];
        if (r.level === null || m === null || m === undefined || same.length === 0) return prior;
        return (same.filter((o) => o.cls === c).length + m * prior) / (same.length + m);
      });
      encoded -= Math.log(clip(p[r.cls]! / p.reduce((a, b) => a + b, 0)));
    }
    return { fold, n, shares, encoded };
  });
}

function summary(folds: { n: number; loss: number }[]) {
  const losses = folds.map((f) => f.loss / f.n);
  const mean = losses.reduce((a, b) => a + b, 0) / losses.length;
  const sd = Math.sqrt(losses.reduce((a, b) => a + (b - mean) ** 2, 0) / (losses.length - 1));
  return { loss: folds.reduce((a, f) => a + f.loss, 0) / folds.reduce((a, f) => a + f.n, 0), se: sd / Math.sqrt(losses.length), foldLosses: losses };
}

describe("multi-class log loss out-of-fold, row by row", () => {
  let profile: Profile;
  let raw: (Record<string, string | null> & { fold: number })[];
  beforeAll(async () => {
    profile = await scan([file], { target: "visit_outcome" });
    raw = await withEngine({}, (engine) => rowsWithFolds(engine, file, data.header));
  }, 120_000);

  it.each(["clinic", "booking_channel", "referral", "species"])("%s: both candidates' pooled loss, per-fold losses and SE", (name) => {
    if (profile.target?.kind !== "multiclass") throw new Error("not multiclass");
    const classes = profile.target.classes.map((c) => c.value);
    const column = profile.columns.find((c) => c.name === name)!;
    const evidence = column.multiclassEvidence!;
    const weights = column.classes!.map((k) => k.target.prior.weight);
    const trimmed = (v: string | null) => (v === null || v.trim() === "" ? null : v);
    const all: Row[] = raw.filter((r) => trimmed(r.visit_outcome ?? null) !== null)
      .map((r) => ({ level: trimmed(r[name] ?? null), cls: classes.indexOf(r.visit_outcome!.trim()), fold: r.fold }));
    expect(all.every((r) => r.cls >= 0)).toBe(true);
    const brute = bruteForce(all, weights, classes.length);
    expect(evidence.rows).toBe(all.length);
    const [shares, encoded] = evidence.candidates;
    for (const [got, want] of [[shares!, summary(brute.map((f) => ({ n: f.n, loss: f.shares })))], [encoded!, summary(brute.map((f) => ({ n: f.n, loss: f.encoded })))]] as const) {
      expect(got.loss).toBeCloseTo(want.loss, 10);
      expect(got.se).toBeCloseTo(want.se, 10);
      got.foldLosses.forEach((l, i) => expect(l).toBeCloseTo(want.foldLosses[i]!, 10));
    }
  });

});

describe("the decision on 6,000 rows", () => {
  let profile: Profile;
  beforeAll(async () => {
    profile = await scan([writeFile(dir, "visits-6000.csv", visitOutcomes(6000, 15).csv)], { target: "visit_outcome" });
  }, 120_000);
  it("follows the evidence: clinic is target-encoded per class with each class's weight; species and referral are not", () => {
    const clinic = profile.columns.find((c) => c.name === "clinic")!;
    expect(clinic.multiclassEvidence?.chosen).toBe("target-kfold");
    const e = clinic.multiclassEvidence!;
    expect(e.candidates[1]!.loss + e.candidates[1]!.se! < e.candidates[0]!.loss).toBe(true);
    expect(clinic.recommendation.encoding).toBe("target-kfold");
    if (clinic.recommendation.encoding !== "target-kfold") return;
    expect(clinic.recommendation.params.classes).toEqual(clinic.classes!.map((k) => ({ value: k.value, weight: k.target.prior.weight, priorMean: k.target.prior.mean })));
    expect(clinic.recommendation.reasons[0]).toMatch(/one-vs-rest target encoding: out-of-fold multi-class log loss 0\.\d{5}/);
    for (const name of ["species", "referral"]) {
      const c = profile.columns.find((x) => x.name === name)!;
      expect(c.multiclassEvidence?.chosen).toBe("class-shares");
      expect(c.recommendation.encoding).not.toBe("target-kfold");
    }
  });
});
