/** An extract checked against its own plan: nothing moved, so every figure says so. */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { drift, type DriftReport } from "../../src/commands/drift.js";
import { tempDir } from "../helpers/tmp.js";
import { cli, generate, makePlan, type CliResult } from "./helpers.js";

const dir = tempDir("drift-self");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

let run: CliResult;
let report: DriftReport;
let continuous: DriftReport;

beforeAll(async () => {
  const data = generate(path.join(dir, "appointments.csv"), 5000, 1);
  const plan = await makePlan([data], path.join(dir, "plan"), { target: "no_show" });
  run = await cli(["drift", data, "--plan", plan, "--format", "json", "--threads", "1"]);
  report = JSON.parse(run.out) as DriftReport;
  const planContinuous = await makePlan([data], path.join(dir, "plan-invoice"), { target: "invoice_amount" });
  continuous = await drift([data], planContinuous, { threads: 1 });
});

describe("drift of an extract against its own plan", () => {
  it("exits 0 with status ok and prints nothing on stderr", () => {
    expect(run.code).toBe(0);
    expect(run.err).toBe("");
    expect(report.status).toBe("ok");
  });

  it("compares every column with levels, and every one is ok with PSI 0 and no unseen rows", () => {
    // Independent fact about the generator: 14 columns, of which lead_time_days and
    // invoice_amount are numeric, appointment_date holds dates (the time role: not levels, so
    // not compared) and no_show is the target, leaving 10 with levels.
    expect(report.columns.map((c) => c.name)).toEqual([
      "appointment_id", "clinic", "vet", "species", "breed", "owner_postcode",
      "booking_channel", "visit_reason", "referral_code", "insurance_plan",
    ]);
    for (const c of report.columns) {
      expect(c.status, c.name).toBe("ok");
      expect(c.psi, c.name).toBeCloseTo(0, 10);
      expect(c.unseenShare, c.name).toBe(0);
      expect(c.distinctGrowth, c.name).toBe(1);
      expect(c.targetShift!.separated, c.name).toBe(0);
      expect(c.targetShift!.flagged, c.name).toBe(0);
    }
  });

  it("finds the same overall target rate", () => {
    expect(report.target!.rate).toBe(report.target!.planRate);
    expect(report.target!.effect).toBe(0);
    expect(report.target!.status).toBe("ok");
    expect(report.input.rows).toBe(5000);
    expect(report.input.missingColumns).toEqual([]);
    expect(report.input.newColumns).toEqual([]);
  });
});

describe("drift of an extract against its own plan, continuous target", () => {
  it("every column is ok with PSI 0, and the target mean agrees (sums in another order: to 9 places)", () => {
    expect(continuous.status).toBe("ok");
    for (const c of continuous.columns) {
      expect(c.status, c.name).toBe("ok");
      expect(c.psi, c.name).toBeCloseTo(0, 10);
      expect(c.targetShift!.separated, c.name).toBe(0);
    }
    expect(continuous.target!.kind).toBe("continuous");
    expect(continuous.target!.rate!).toBeCloseTo(continuous.target!.planRate!, 9);
    expect(continuous.target!.effect!).toBeCloseTo(0, 9);
  });
});
