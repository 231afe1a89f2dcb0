/**
 * Planned shifts of the sample-data generator (sample-data/generate.mjs --shift, documented in
 * its header): (a) 10 % of rows get postcodes the base never produces, (b) booking channel mix
 * phone .38 → .26 and web .30 → .42, (c) +1.2 no-show logit at clinic 'Marshcombe Vets 13'.
 * A plan from seed 1 without the shift is checked against seed 2 with it.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { DriftReport } from "../../src/commands/drift.js";
import { tempDir } from "../helpers/tmp.js";
import { cli, generate, levelCounts, makePlan, plainPsi, readCsv, type CliResult } from "./helpers.js";

const dir = tempDir("drift-shift");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

let base: string;
let shifted: string;
let plan: string;
let run: CliResult;
let report: DriftReport;
const col = (name: string) => report.columns.find((c) => c.name === name)!;

beforeAll(async () => {
  base = generate(path.join(dir, "base.csv"), 20_000, 1);
  shifted = generate(path.join(dir, "shifted.csv"), 20_000, 2, true);
  plan = await makePlan([base], path.join(dir, "plan"), { target: "no_show" });
  run = await cli(["drift", shifted, "--plan", plan, "--format", "json", "--threads", "1"]);
  report = JSON.parse(run.out) as DriftReport;
});

describe("drift on the generator's planned shifts", () => {
  it("new postcodes: owner_postcode's unseen share is well above the forecast (watch or act)", () => {
    const c = col("owner_postcode");
    // Plain recomputation: rows of the new file whose postcode never occurs in the base file.
    const seen = levelCounts(base, "owner_postcode");
    let unseen = 0; let nonMissing = 0;
    for (const [level, n] of levelCounts(shifted, "owner_postcode")) {
      if (level === null) continue;
      nonMissing += n;
      if (!seen.has(level)) unseen += n;
    }
    expect(c.unseenRows).toBe(unseen);
    expect(c.unseenShare).toBeCloseTo(unseen / nonMissing, 12);
    expect(c.unseenInterval!.low).toBeGreaterThan(c.unseenForecastInterval!.high);
    expect(["watch", "act"]).toContain(c.status);
    expect(c.reasons.join(" ")).toContain("well above the plan's Good-Turing forecast");
  });

  it("channel mix: booking_channel's PSI equals a plain recomputation and the designed shift", () => {
    const c = col("booking_channel");
    const before = levelCounts(base, "booking_channel");
    const after = levelCounts(shifted, "booking_channel");
    const levels = [...before.keys()];
    expect(c.psi).toBeCloseTo(plainPsi(levels.map((l) => after.get(l) ?? 0), levels.map((l) => before.get(l) ?? 0)), 10);
    // Designed mix (generator header): phone .38/.30/.12/.20 → .26/.42/.10/.22 over phone, web,
    // walk-in, app gives PSI 0.0915 (plain computation); 20,000 rows a side add little noise.
    const designed = plainPsi([0.26, 0.42, 0.1, 0.22], [0.38, 0.3, 0.12, 0.2]);
    expect(designed).toBeCloseTo(0.0915, 4);
    expect(Math.abs(c.psi! - designed)).toBeLessThan(0.02);
    // Under the 0.10 rule-of-thumb band: the mix change alone is not raised at the defaults.
    expect(c.psi).toBeLessThan(0.1);
    expect(c.reasons.join(" ")).not.toContain("level mix");
  });

  it("channel mix: a lower --psi-watch makes booking_channel watch", async () => {
    const lower = await cli(["drift", shifted, "--plan", plan, "--format", "json", "--threads", "1", "--psi-watch", "0.05"]);
    const c = (JSON.parse(lower.out) as DriftReport).columns.find((x) => x.name === "booking_channel")!;
    expect(c.status).toBe("watch");
    expect(c.reasons.join(" ")).toContain("the level mix moved");
  });

  it("target-rate change: clinic 'Marshcombe Vets 13' separates from the plan's rate", () => {
    const c = col("clinic");
    const level = c.targetShift!.levels.find((l) => l.value === "Marshcombe Vets 13")!;
    // Plain recomputation of the clinic's no-show rate in each file.
    const rate = (file: string) => {
      const { header, rows } = readCsv(file);
      const ci = header.indexOf("clinic"); const yi = header.indexOf("no_show");
      const mine = rows.filter((r) => r[ci] === "Marshcombe Vets 13");
      return mine.filter((r) => r[yi] === "1").length / mine.length;
    };
    expect(level.planRate).toBeCloseTo(rate(base), 12);
    expect(level.rate).toBeCloseTo(rate(shifted), 12);
    expect(level.rate!).toBeGreaterThan(level.planRate!);
    expect(level.separated).toBe(true);
    expect(["watch", "act"]).toContain(c.status);
    expect(c.reasons.join(" ")).toContain("'Marshcombe Vets 13'");
  });

  it("exits 1 exactly when a column is act", () => {
    const acting = report.columns.some((c) => c.status === "act");
    expect(run.code).toBe(acting ? 1 : 0);
  });

  it("exits 1 with one line on stderr when --unseen-act-ratio makes owner_postcode act", async () => {
    const strict = await cli(["drift", shifted, "--plan", plan, "--format", "json", "--threads", "1", "--unseen-act-ratio", "1.5"]);
    const r = JSON.parse(strict.out) as DriftReport;
    expect(r.columns.find((c) => c.name === "owner_postcode")!.status).toBe("act");
    expect(r.status).toBe("act");
    expect(strict.code).toBe(1);
    expect(strict.err.trim().split("\n")).toHaveLength(1);
    expect(strict.err).toMatch(/^tailsift: drift: .*owner_postcode/);
  });
});
