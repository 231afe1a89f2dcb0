/**
 * Forward evidence (--time; evidence/forward), recomputed row by row in plain JavaScript on a
 * small generated visit log whose referral codes grow over time (test/fixtures/growingVisits.ts).
 * For each step b = 1..K−1 every row of block b is predicted from the rows of blocks < b only:
 *  - the overall mean: the mean of y over blocks < b;
 *  - target encoding with weight m: (Σy_level + m·prior)/(n_level + m) over blocks < b, the prior
 *    for a level no earlier block has (m = ∞: the prior);
 *  - pooled one-hot: the kept levels (most rows, at least minLevelRows, ties by value) and
 *    "other", each predicting its raw rate over blocks < b (the prior when absent);
 * the step loss is the mean log loss of block b's rows (p clipped to [1e-15, 1 − 1e-15]); the
 * forward loss is the mean over the steps, its SE the sample sd / √(K − 1). The k-fold scores
 * kept beside are recomputed the same way with "every block but f" as the fitting rows, and the
 * flat candidate's weight is the tried weight with the lowest recomputed forward loss.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import type { EvidenceCandidate } from "../../src/evidence/types.js";
import { tempDir, writeFile } from "../helpers/tmp.js";
import { growingVisits } from "../fixtures/growingVisits.js";

const dir = tempDir("fwdevidence");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const data = growingVisits(2500, 31);
const file = writeFile(dir, "visits.csv", data.csv);
const K = 4;
const EPS = 1e-15;

const times = data.rows.map((r) => r[1]!);
const sorted = [...times].sort();
const cuts = Array.from({ length: K - 1 }, (_, j) => sorted[Math.ceil(sorted.length * ((j + 1) / K)) - 1]!);
const block = times.map((t) => cuts.filter((c) => t > c).length);
const y = data.rows.map((r) => Number(r[5]));

const rowLoss = (yi: number, p: number) => { const q = Math.min(1 - EPS, Math.max(EPS, p)); return -(yi * Math.log(q) + (1 - yi) * Math.log(1 - q)); };

/** Per scored block: mean log loss of its rows predicted from `fit(block)` rows by `group` (null = missing/none). */
function stepLosses(scored: number[], fitRows: (b: number) => number[], group: (i: number) => string | null, m: number | null): number[] {
  return scored.map((b) => {
    const fit = fitRows(b);
    const prior = fit.reduce((s, i) => s + y[i]!, 0) / fit.length;
    const sums = new Map<string, { n: number; s: number }>();
    for (const i of fit) {
      const g = group(i);
      if (g === null) continue;
      const e = sums.get(g) ?? { n: 0, s: 0 };
      e.n += 1; e.s += y[i]!;
      sums.set(g, e);
    }
    const rows = data.rows.map((_, i) => i).filter((i) => block[i] === b);
    const total = rows.reduce((s, i) => {
      const g = group(i);
      const e = g === null ? undefined : sums.get(g);
      const p = g === null || m === null || !e ? prior : (e.s + m * prior) / (e.n + m);
      return s + rowLoss(y[i]!, p);
    }, 0);
    return total / rows.length;
  });
}
const meanSe = (xs: number[]) => {
  const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
  const sd = Math.sqrt(xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (xs.length - 1));
  return { mean, se: sd / Math.sqrt(xs.length) };
};
const forwardSteps = Array.from({ length: K - 1 }, (_, j) => j + 1);
const before = (b: number) => data.rows.map((_, i) => i).filter((i) => block[i]! < b);
const allBlocks = Array.from({ length: K }, (_, j) => j);
const others = (b: number) => data.rows.map((_, i) => i).filter((i) => block[i] !== b);

describe("forward evidence", () => {
  it("scores every candidate forward as a row-by-row recount, keeps the k-fold scores beside, picks the weight by forward loss", async () => {
    const p = await scan([file], { target: "no_show", time: "visit_time", folds: K });
    for (const name of ["clinic", "referral"]) {
      const c = data.header.indexOf(name);
      const column = p.columns.find((x) => x.name === name)!;
      const e = column.evidence!;
      expect(e.validation).toBe("forward");
      const find = (list: EvidenceCandidate[], n: string) => list.find((x) => x.candidate === n)!;
      const check = (cand: EvidenceCandidate, steps: number[]) => {
        const ms = meanSe(steps);
        expect(cand.foldLosses.length).toBe(steps.length);
        cand.foldLosses.forEach((l, i) => expect(l).toBeCloseTo(steps[i]!, 10));
        expect(cand.loss).toBeCloseTo(ms.mean, 10);
        expect(cand.se!).toBeCloseTo(ms.se, 10);
      };
      // overall mean
      check(find(e.candidates, "overall-mean"), stepLosses(forwardSteps, before, () => null, null));
      // flat target encoding at every weight tried; the chosen one is the lowest
      const w = e.forwardWeight!;
      expect(w.fitted).toBe(column.target!.prior.weight);
      for (const t of w.tried) {
        const steps = stepLosses(forwardSteps, before, (i) => data.rows[i]![c]!, t.weight);
        expect(t.loss).toBeCloseTo(meanSe(steps).mean, 10);
      }
      const lowest = Math.min(...w.tried.map((t) => t.loss));
      expect(w.chosenLoss).toBeCloseTo(lowest, 12);
      const flat = find(e.candidates, "target-kfold");
      expect(flat.params).toMatchObject({ weight: w.chosen });
      check(flat, stepLosses(forwardSteps, before, (i) => data.rows[i]![c]!, w.chosen));
      // pooled one-hot: the kept levels as scan keeps them, then raw rates forward
      const pooled = find(e.candidates, "pooled-one-hot");
      if (pooled.candidate !== "pooled-one-hot") throw new Error("unreachable");
      const keep = new Set(pooled.params.keep);
      const counts = new Map<string, number>();
      for (const r of data.rows) counts.set(r[c]!, (counts.get(r[c]!) ?? 0) + 1);
      const expectedKeep = [...counts].filter(([, n]) => n >= 30).sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1)).slice(0, 15).map(([l]) => l);
      expect([...keep].sort()).toEqual(expectedKeep.sort());
      check(pooled, stepLosses(forwardSteps, before, (i) => (keep.has(data.rows[i]![c]!) ? data.rows[i]![c]! : "\u0000other"), 0));
      // k-fold beside: the same candidates fitted on every other block
      expect(e.kfold!.map((x) => x.candidate)).toEqual(e.candidates.map((x) => x.candidate));
      const kfoldFlat = find(e.kfold!, "target-kfold");
      expect(kfoldFlat.params).toMatchObject({ weight: w.fitted });
      const kSteps = stepLosses(allBlocks, others, (i) => data.rows[i]![c]!, w.fitted);
      kfoldFlat.foldLosses.forEach((l, i) => expect(l).toBeCloseTo(kSteps[i]!, 10));
      // the recommendation (target encoding here, whatever the one-SE rule chose) uses the forward weight
      expect(column.recommendation.encoding).toBe("target-kfold");
      expect(column.recommendation.params).toMatchObject({ weight: w.chosen });
      expect(column.recommendation.reasons.join(" ")).toMatch(/Prior weight( chosen for forward loss: m = |: the fitted m = )/);
      // the reasons say how it was scored, and name both figures
      const reasons = column.recommendation.reasons.join(" ");
      expect(reasons).toContain(`Forward log loss (nats per row) over ${K - 1} steps`);
      expect(reasons).toContain(`scored ${K}-fold over the same blocks`);
    }
    // referral codes keep appearing: forward, target encoding of referral gains less than k-fold says
    const ref = p.columns.find((x) => x.name === "referral")!.evidence!;
    const gain = (list: EvidenceCandidate[]) => list.find((x) => x.candidate === "overall-mean")!.loss - list.find((x) => x.candidate === "target-kfold")!.loss;
    expect(gain(ref.candidates)).toBeLessThan(gain(ref.kfold!));
  });

  it("scores the leakage forward: the AUC of each row of blocks ≥ 1 encoded from earlier blocks, recounted pair by pair", async () => {
    const p = await scan([file], { target: "no_show", time: "visit_time", folds: K });
    for (const name of ["clinic", "referral", "species"]) {
      const c = data.header.indexOf(name);
      const leakage = p.columns.find((x) => x.name === name)!.target!.leakage;
      const m = leakage.weightUsed!;
      const scored: { s: number; y: number }[] = [];
      for (const b of forwardSteps) {
        const fit = before(b);
        const prior = fit.reduce((s, i) => s + y[i]!, 0) / fit.length;
        const sums = new Map<string, { n: number; s: number }>();
        for (const i of fit) { const e = sums.get(data.rows[i]![c]!) ?? { n: 0, s: 0 }; e.n += 1; e.s += y[i]!; sums.set(data.rows[i]![c]!, e); }
        data.rows.forEach((r, i) => {
          if (block[i] !== b) return;
          const e = sums.get(r[c]!);
          scored.push({ s: m === null || !e ? prior : (e.s + m * prior) / (e.n + m), y: y[i]! });
        });
      }
      // AUC by brute force over every (positive, negative) pair, ties one half
      const pos = scored.filter((x) => x.y === 1), neg = scored.filter((x) => x.y === 0);
      let u = 0;
      for (const a of pos) for (const b of neg) u += a.s > b.s ? 1 : a.s === b.s ? 0.5 : 0;
      expect(leakage.forward!).toBeCloseTo(u / (pos.length * neg.length), 9);
    }
    const plain = await scan([file], { target: "no_show" });
    expect(plain.columns.every((x) => x.target?.leakage.forward === undefined)).toBe(true);
  });

  it("a continuous target: forward squared error and forward R², recounted row by row", async () => {
    const p = await scan([file], { target: "no_show", targetKind: "continuous", time: "visit_time", folds: K });
    const c = data.header.indexOf("referral");
    const column = p.columns.find((x) => x.name === "referral")!;
    const e = column.evidence!;
    expect(e.metric).toBe("squared-error");
    /** Per step: the scored rows' predictions from blocks < b with weight m (group null = prior only). */
    const predictions = (m: number | null, useLevel: boolean) => forwardSteps.map((b) => {
      const fit = before(b);
      const prior = fit.reduce((s, i) => s + y[i]!, 0) / fit.length;
      const sums = new Map<string, { n: number; s: number }>();
      for (const i of fit) { const k = data.rows[i]![c]!; const v = sums.get(k) ?? { n: 0, s: 0 }; v.n += 1; v.s += y[i]!; sums.set(k, v); }
      return data.rows.map((_, i) => i).filter((i) => block[i] === b).map((i) => {
        const v = sums.get(data.rows[i]![c]!);
        return { y: y[i]!, pred: !useLevel || m === null || !v ? prior : (v.s + m * prior) / (v.n + m) };
      });
    });
    const stepSe = (steps: { y: number; pred: number }[][]) => steps.map((rows) => rows.reduce((s, r) => s + (r.y - r.pred) ** 2, 0) / rows.length);
    const overall = e.candidates.find((x) => x.candidate === "overall-mean")!;
    stepSe(predictions(null, false)).forEach((l, i) => expect(overall.foldLosses[i]).toBeCloseTo(l, 10));
    const flat = e.candidates.find((x) => x.candidate === "target-kfold")!;
    const w = e.forwardWeight!;
    stepSe(predictions(w.chosen, true)).forEach((l, i) => expect(flat.foldLosses[i]).toBeCloseTo(l, 10));
    // forward R² of the leakage line: 1 − SSE/SST over every scored row, at the fitted weight
    const rows = predictions(column.target!.leakage.weightUsed!, true).flat();
    const mean = rows.reduce((s, r) => s + r.y, 0) / rows.length;
    const sse = rows.reduce((s, r) => s + (r.y - r.pred) ** 2, 0);
    const sst = rows.reduce((s, r) => s + (r.y - mean) ** 2, 0);
    expect(column.target!.leakage.forward!).toBeCloseTo(1 - sse / sst, 10);
  });

  it("without --time the evidence is k-fold only", async () => {
    const p = await scan([file], { target: "no_show", folds: K });
    const e = p.columns.find((x) => x.name === "clinic")!.evidence!;
    expect(e.validation).toBeUndefined();
    expect(e.kfold).toBeUndefined();
    expect(e.forwardWeight).toBeUndefined();
  });
});
