/**
 * The decision pipeline (pipeline/advise) on the shipped sample extract and on small invented
 * data: "no detectable spread" (prior weight null) is the limit m → ∞ — the prior — wherever a
 * weight is used, the reasons follow the final decision, and --top shapes the display only.
 * Each expectation below failed on the code before the pipeline (noted per test).
 */
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { encode } from "../../src/commands/encode.js";
import { writeReportFolder } from "../../src/commands/scanCli.js";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import type { ColumnProfile, Profile } from "../../src/profile/types.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const SAMPLE = fileURLToPath(new URL("../../sample-data/appointments.csv.gz", import.meta.url));
const dir = tempDir("pipeline-advise");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const col = (p: Profile, name: string): ColumnProfile => p.columns.find((c) => c.name === name)!;

describe("no detectable spread is m = ∞ (the prior), never 0", () => {
  it("--decide insurance_plan=target-kfold records weight null, and encode gives every row the other folds' mean", async () => {
    const out = path.join(dir, "plan");
    fs.mkdirSync(out, { recursive: true });
    const p = await scan([SAMPLE], { target: "no_show", columns: ["insurance_plan"], decide: { "insurance_plan": "target-kfold" }, levelTableOut: path.join(out, "levels.parquet") });
    const c = col(p, "insurance_plan");
    expect(c.target!.prior.weight).toBeNull(); // the fit: no detectable spread between the 5 plans
    const rec = c.recommendation;
    expect(rec.encoding).toBe("target-kfold");
    // before: weight 0 (raw level means, no smoothing) — the opposite limit
    expect(rec.encoding === "target-kfold" && rec.params.weight).toBeNull();

    // end to end: with m = ∞ every row of fold f is encoded as the mean of y over the other folds
    // (brute-force recomputation from the encoded file's own fold and target columns)
    await writeReportFolder(p, out);
    const train = path.join(dir, "train.csv");
    await encode([SAMPLE], { plan: out, out: train, mode: "training", keep: ["no_show"] });
    const rows = await withEngine({ threads: 1 }, (e) => e.rows<{ fold: number; y: number | null; te: number }>(
      `SELECT fold::INTEGER AS fold, CASE WHEN no_show IS NULL OR trim(no_show) = '' THEN NULL WHEN lower(trim(no_show)) IN ('1','true','yes','y','t') THEN 1 ELSE 0 END::DOUBLE AS y,
              insurance_plan::DOUBLE AS te FROM read_csv(${quoteLiteral(train)}, header = true, all_varchar = true)`, "reading the encoded file"));
    const folds = [...new Set(rows.map((r) => r.fold))];
    for (const f of folds) {
      const others = rows.filter((r) => r.fold !== f && r.y !== null);
      const prior = others.reduce((s, r) => s + r.y!, 0) / others.length;
      const values = [...new Set(rows.filter((r) => r.fold === f).map((r) => r.te))];
      expect(values).toHaveLength(1);
      expect(values[0]).toBeCloseTo(prior, 12);
    }
  });

  it("a one-row identifier level's smoothed value is the prior (0.119), not its raw mean (0 or 1)", async () => {
    const p = await scan([SAMPLE], { target: "no_show", columns: ["appointment_id"] });
    const c = col(p, "appointment_id");
    expect(c.target!.prior.weight).toBeNull();
    const prior = p.target!.mean;
    expect(prior).toBeCloseTo(0.1195, 3); // the no-show rate of the sample: 11.95 % (sample-data/README.md)
    expect(c.topLevels.length).toBeGreaterThan(0);
    for (const level of c.topLevels) {
      expect(level.rows).toBe(1);
      expect(level.smoothed).toBe(prior); // before: smoothed 0 (or 1) — m read as 0
    }
    // the leakage is scored at the same limit: one value for every row, so AUC ½ in-sample (ties ½)
    expect(c.target!.leakage.weightUsed).toBeNull();
    expect(c.target!.leakage.inSample).toBe(0.5);
  });
});

/** 40 levels × 50 rows, each level with exactly 10 positives: zero spread by construction. */
function flatCsv(): string {
  const rand = mulberry32(3);
  const lines = ["id,code,y"];
  let id = 0;
  for (let level = 0; level < 40; level++) {
    const ys = Array.from({ length: 50 }, (_, i) => (i < 10 ? 1 : 0)).sort(() => rand() - 0.5);
    for (const y of ys) lines.push(`${id++},c${String(level).padStart(2, "0")},${y}`);
  }
  return lines.join("\n") + "\n";
}

describe("zero spread in the evidence and in the reasons", () => {
  const file = writeFile(dir, "flat.csv", flatCsv());

  it("the plain target-encoding candidate is scored at m = ∞: exactly the overall mean's predictions", async () => {
    const p = await scan([file], { target: "y", columns: ["code"] });
    const c = col(p, "code");
    expect(c.target!.prior.weight).toBeNull();
    const e = c.evidence!;
    const flat = e.candidates.find((x) => x.candidate === "target-kfold")!;
    const mean = e.candidates.find((x) => x.candidate === "overall-mean")!;
    expect(flat.candidate === "target-kfold" && flat.params.weight).toBeNull(); // before: 0
    // both predict the other folds' mean for every row, so their per-fold losses agree (before:
    // the raw level means, a worse loss)
    flat.foldLosses.forEach((l, i) => expect(l).toBeCloseTo(mean.foldLosses[i]!, 12));
    expect(e.chosen).toBe("overall-mean");
  });

  it("reasons describe the final decision, never the one-SE rule's preference for a choice not made", async () => {
    const p = await scan([file], { target: "y", columns: ["code"] });
    const rec = col(p, "code").recommendation;
    expect(rec.encoding).toBe("frequency");
    const text = rec.reasons.join(" ");
    // before: "… so the one-standard-error rule (Breiman et al. 1984) prefers it." followed by
    // "the rules' choice (frequency) stands"
    expect(text).not.toMatch(/prefers it/);
    expect(rec.reasons.at(-1)).toMatch(/^Evidence: no candidate beats the overall mean by more than one standard error.*frequency stands\.$/);
  });
});

describe("--top shapes the display only", () => {
  it("--top 3 keeps the advice of the full data (one-hot for 6 species and 4 channels) and lists 3 levels", async () => {
    const full = await scan([SAMPLE], { target: "no_show", columns: ["species", "booking_channel"] });
    const top3 = await scan([SAMPLE], { target: "no_show", columns: ["species", "booking_channel"], top: 3 });
    for (const name of ["species", "booking_channel"]) {
      expect(col(full, name).recommendation.encoding).toBe("one-hot");
      // before: frequency (species) and pooled one-hot (booking_channel) — the top list was cut first
      expect(col(top3, name).recommendation.encoding).toBe("one-hot");
      expect(col(top3, name).recommendation.params).toEqual(col(full, name).recommendation.params);
      const shown = (c: ColumnProfile) => c.topLevels.map((l) => [l.value, l.rows]);
      expect(shown(col(top3, name))).toEqual(shown(col(full, name)).slice(0, 3));
    }
  });
});
