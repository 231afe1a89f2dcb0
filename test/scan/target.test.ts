/**
 * Target statistics through the whole scan path (SQL sums → stats formulas), checked against
 * published data sets and against brute-force row-by-row computations.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { rowHashFoldSql as foldSql } from "../../src/engine/folds.js";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import type { ColumnProfile, Profile } from "../../src/profile/types.js";
import { meanInterval } from "../../src/stats/meanInterval.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("target");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const col = (p: Profile, name: string): ColumnProfile => {
  const c = p.columns.find((x) => x.name === name);
  if (!c) throw new Error(`no column ${name}`);
  return c;
};

/** CSV with one row per trial: id, level, y — `groups` gives (level, successes, trials). */
function trialsCsv(name: string, groups: [string, number, number][]): string {
  const lines = ["id,grp,y"];
  let id = 0;
  for (const [level, successes, trials] of groups) {
    for (let i = 0; i < trials; i++) lines.push(`${id++},${level},${i < successes ? 1 : 0}`);
  }
  return writeFile(dir, name, `${lines.join("\n")}\n`);
}

describe("level rates and Wilson intervals", () => {
  it("reproduces Newcombe (1998) worked examples 81/263 and 15/148", async () => {
    const file = trialsCsv("newcombe.csv", [["A", 81, 263], ["B", 15, 148]]);
    const p = await scan([file], { target: "y", columns: ["grp"] });
    const [a, b] = col(p, "grp").topLevels;
    // Newcombe (1998), Statistics in Medicine 17:857–872, method 3 (Wilson): 0.2553–0.3662 and 0.0624–0.1605
    expect(a?.targetMean).toBeCloseTo(81 / 263, 12);
    expect(a?.low).toBeCloseTo(0.255289, 6); // recomputed to six places (docs/references.md "Wilson score interval")
    expect(a?.high).toBeCloseTo(0.36621, 5);
    expect(b?.low).toBeCloseTo(0.062386, 6);
    expect(b?.high).toBeCloseTo(0.160487, 6);
    // overall rate 96/411 = 0.2336: A's interval lies above it, B's below
    expect(a?.flag).toBe("above");
    expect(b?.flag).toBe("below");
    expect(col(p, "grp").target?.flaggedLevels).toBe(2);
  });
});

describe("prior weight m fitted from the level table", () => {
  it("Efron & Morris (1975) 18 × 45: the moment estimator gives m = 368.0", async () => {
    const hits = [18, 17, 16, 15, 14, 14, 13, 12, 11, 11, 10, 10, 10, 10, 10, 9, 8, 7]; // published data set
    const file = trialsCsv("efron-morris.csv", hits.map((h, i) => [`p${String(i).padStart(2, "0")}`, h, 45]));
    const p = await scan([file], { target: "y", columns: ["grp"] });
    const prior = col(p, "grp").target?.prior;
    expect(prior?.mean).toBeCloseTo(215 / 810, 12);
    // docs/references.md "Shrinkage of level means" (recomputed): S = 3.709877, rho = 0.0027101, m = 368.0 with the (k − 1) moment form
    expect(prior?.rho).toBeCloseTo(0.0027101, 6);
    expect(prior?.weight).toBeCloseTo(368.0, 0);
  });

  it("rat tumour data (Gelman et al., BDA3 ch. 5, from Tarone 1982): m = 21.64", async () => {
    // published data set, 70 historical experiments (docs/references.md "Shrinkage of level means")
    const y = [...Array(14).fill(0), ...Array(8).fill(1), ...Array(9).fill(2), 1, 5, 2, 5, 3, 2, 7, 7, 3, 3, 2, 9, 10,
      ...Array(7).fill(4), 10, 4, 4, 4, 5, 11, 12, 5, 5, 6, 5, 6, 6, 6, 6, 16, 15, 15, 9];
    const n = [...Array(7).fill(20), ...Array(4).fill(19), 18, 18, 17, 20, 20, 20, 20, 19, 19, 18, 18, 25, 24, 23,
      ...Array(6).fill(20), 10, 49, 19, 46, 27, 17, 49, 47, 20, 20, 13, 48, 50, ...Array(7).fill(20),
      48, 19, 19, 19, 22, 46, 49, 20, 20, 23, 19, 22, 20, 20, 20, 52, 46, 47, 24];
    expect(y.length).toBe(70);
    expect(n.length).toBe(70);
    expect(y.reduce((s, v) => s + v, 0)).toBe(263);
    expect(n.reduce((s, v) => s + v, 0)).toBe(1725);
    const file = trialsCsv("rats.csv", y.map((yi, i) => [`e${String(i).padStart(2, "0")}`, yi, n[i]!]));
    const p = await scan([file], { target: "y", columns: ["grp"] });
    const prior = col(p, "grp").target?.prior;
    // docs/references.md "Shrinkage of level means" (recomputed): p̂ = 0.152464, rho = 0.044166, m = 21.64
    expect(prior?.mean).toBeCloseTo(0.152464, 6);
    expect(prior?.rho).toBeCloseTo(0.044166, 6);
    expect(prior?.weight).toBeCloseTo(21.64, 2);
  });
});

/** Generated data: `noise` has ~N/3 levels unrelated to y; `signal` has 10 levels with rates 0.05…0.5. */
function leakageCsv(rows: number, seed: number): string {
  const rand = mulberry32(seed);
  const lines = ["id,noise,signal,y,amount"];
  for (let i = 0; i < rows; i++) {
    const s = Math.floor(rand() * 10);
    const noise = `n${Math.floor(rand() * (rows / 3))}`;
    const y = rand() < 0.05 + 0.05 * s ? 1 : 0;
    const amount = (10 * s + 20 * rand()).toFixed(3);
    lines.push(`${i},${noise},s${s},${y},${amount}`);
  }
  return lines.join("\n") + "\n";
}

describe("the leakage gap", () => {
  const file = writeFile(dir, "leak.csv", leakageCsv(6000, 11));
  it("scores a noise column at m = ∞ (no detectable spread: the prior, AUC 0.5 in-sample) and keeps the signal", async () => {
    const p = await scan([file], { target: "y", columns: ["noise", "signal"] });
    const noise = col(p, "noise").target!.leakage;
    const signal = col(p, "signal").target!.leakage;
    expect(noise.metric).toBe("auc");
    // no detectable spread is the limit m → ∞: every level is encoded as the overall mean, one
    // value for every row, so the in-sample AUC is exactly ½ (all pairs tied; Mann–Whitney ties ½).
    // Before, the leakage was scored at m = 0 (raw level means) and showed an in-sample AUC > 0.7.
    expect(col(p, "noise").target!.prior.weight).toBeNull();
    expect(noise.weightUsed).toBeNull();
    expect(noise.inSample!).toBe(0.5);
    expect(Math.abs(noise.outOfFold! - 0.5)).toBeLessThan(0.05);
    expect(signal.outOfFold!).toBeGreaterThan(0.65);
    expect(signal.inSample! - signal.outOfFold!).toBeLessThan(0.02);
    expect(col(p, "signal").recommendation.encoding).toBe("one-hot"); // 10 well-filled levels
  });

  it("equals a brute-force row-by-row out-of-fold AUC and R²", async () => {
    const small = writeFile(dir, "leak-small.csv", leakageCsv(400, 5));
    const p = await scan([small], { target: "y", columns: ["noise", "signal"] });
    const pc = await scan([small], { target: "amount", columns: ["noise", "signal"] });
    // folds exactly as scan assigns them, read back by id
    const rows = await withEngine({}, (e) => e.rows<{ id: string; noise: string; signal: string; y: string; amount: string; fold: number }>(
      `SELECT *, ${foldSql(["id", "noise", "signal", "y", "amount"], 42, 5)} AS fold FROM read_csv(${quoteLiteral(small)}, all_varchar = true)`, "test"));
    for (const name of ["noise", "signal"] as const) {
      const m = col(p, name).target!.leakage.weightUsed ?? Infinity; // null = no detectable spread, m = ∞
      const oof = rows.map((r) => {
        const others = rows.filter((o) => o.fold !== r.fold);
        const prior = others.reduce((s, o) => s + Number(o.y), 0) / others.length;
        const same = others.filter((o) => o[name] === r[name]);
        // a level unseen in the other folds (with m = 0) falls back to the other folds' mean
        // m = ∞ is the limit where every level takes the prior
        return m === Infinity || same.length + m === 0 ? prior : (same.reduce((s, o) => s + Number(o.y), 0) + m * prior) / (same.length + m);
      });
      let wins = 0;
      let pairs = 0;
      rows.forEach((a, i) => rows.forEach((b, j) => {
        if (a.y === "1" && b.y === "0") { pairs++; wins += oof[i]! > oof[j]! ? 1 : oof[i] === oof[j] ? 0.5 : 0; }
      }));
      expect(col(p, name).target!.leakage.outOfFold).toBeCloseTo(wins / pairs, 9);

      const mc = col(pc, name).target!.leakage.weightUsed ?? Infinity;
      const pred = rows.map((r) => {
        const others = rows.filter((o) => o.fold !== r.fold);
        const prior = others.reduce((s, o) => s + Number(o.amount), 0) / others.length;
        const same = others.filter((o) => o[name] === r[name]);
        return mc === Infinity || same.length + mc === 0 ? prior : (same.reduce((s, o) => s + Number(o.amount), 0) + mc * prior) / (same.length + mc);
      });
      const mean = rows.reduce((s, r) => s + Number(r.amount), 0) / rows.length;
      const sse = rows.reduce((s, r, i) => s + (Number(r.amount) - pred[i]!) ** 2, 0);
      const sst = rows.reduce((s, r) => s + (Number(r.amount) - mean) ** 2, 0);
      expect(col(pc, name).target!.leakage.metric).toBe("r2");
      expect(col(pc, name).target!.leakage.outOfFold).toBeCloseTo(1 - sse / sst, 8);
    }
  });
});

describe("target problems are exit-2 errors with one line", () => {
  const base = "id,grp,y\n1,a,1\n2,b,0\n3,a,1\n";
  it.each([
    ["missing target column", base, { target: "nope" }, /column 'nope' not found/],
    ["single-valued target", "id,grp,y\n1,a,1\n2,b,1\n", { target: "y" }, /single value/],
    ["two-valued text target without --positive", "id,grp,y\n1,a,cat\n2,b,dog\n3,c,cat\n", { target: "y" }, /--positive/],
    ["three text values over --max-classes (else multi-class: test/scan/multiclass.test.ts)", "id,grp,y\n1,a,cat\n2,b,dog\n3,c,cow\n", { target: "y", maxClasses: 2 }, /more than 2 distinct values; name one class with --positive VALUE, or raise --max-classes/],
    ["non-numeric continuous target", "id,grp,y\n1,a,1.5\n2,b,x\n3,c,2\n", { target: "y", targetKind: "continuous" as const }, /not numeric/],
  ])("%s", async (_name, csv, options, message) => {
    const file = writeFile(dir, `bad-${Math.random().toString(36).slice(2)}.csv`, csv);
    await expect(scan([file], options)).rejects.toMatchObject({ name: "TailsiftError", exitCode: 2, message });
  });

  it("counts rows with a missing target and leaves them out of target figures", async () => {
    const file = writeFile(dir, "missing-y.csv", "id,grp,y\n1,a,1\n2,a,0\n3,b,\n4,b,1\n5,a,\n");
    const p = await scan([file], { target: "y", columns: ["grp"] });
    expect(p.target).toMatchObject({ rows: 3, missing: 2, mean: 2 / 3 });
    expect(col(p, "grp").topLevels[0]).toMatchObject({ value: "a", rows: 3, targetMean: 0.5 });
  });
});

describe("flagged levels for a continuous target", () => {
  it("equal a count of levels whose stats/meanInterval excludes the overall mean", async () => {
    const rand = mulberry32(21);
    const lines = ["id,grp,amount"];
    // 60 levels of 1–40 rows; level means spread so that some intervals exclude the overall mean
    for (let i = 0; i < 1500; i++) {
      const g = Math.floor(rand() ** 2 * 60);
      lines.push(`${i},g${g},${(g * 0.8 + 10 * rand()).toFixed(3)}`);
    }
    const file = writeFile(dir, "flags-continuous.csv", `${lines.join("\n")}\n`);
    const p = await scan([file], { target: "amount", columns: ["grp"] });
    const byLevel = new Map<string, number[]>();
    for (const line of lines.slice(1)) {
      const [, g, y] = line.split(",");
      byLevel.set(g!, [...(byLevel.get(g!) ?? []), Number(y)]);
    }
    const all = [...byLevel.values()].flat();
    const mean = all.reduce((s, v) => s + v, 0) / all.length;
    let flagged = 0;
    let tested = 0;
    for (const ys of byLevel.values()) {
      const interval = meanInterval(ys.length, ys.reduce((s, v) => s + v, 0), ys.reduce((s, v) => s + v * v, 0));
      if (!interval) continue;
      tested++;
      if (interval.low > mean || interval.high < mean) flagged++;
    }
    expect(tested).toBeGreaterThan(40);
    expect(flagged).toBeGreaterThan(5);
    expect(col(p, "grp").target?.testedLevels).toBe(tested);
    expect(col(p, "grp").target?.flaggedLevels).toBe(flagged);
  });
});
