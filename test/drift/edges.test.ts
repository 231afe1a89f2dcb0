/**
 * Columns that went missing, a large target shift, an extract without the target, and bad input:
 * missing plan, plan without levels.parquet, missing or empty input (exit 2, one line).
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { DriftReport } from "../../src/commands/drift.js";
import { expectCliError } from "../helpers/cliError.js";
import { tempDir } from "../helpers/tmp.js";
import { cli, makePlan } from "./helpers.js";

const dir = tempDir("drift-edges");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** Rows of (channel, positives, rows): channel A/B/C with the given no-show counts. */
function write(name: string, header: string[], groups: [string, number, number][], extra?: (i: number) => string[]): string {
  const lines = [header.join(",")];
  let i = 0;
  for (const [channel, positives, rows] of groups) {
    for (let k = 0; k < rows; k++, i++) {
      const row: Record<string, string> = { id: `r${i}`, region: "north", channel, y: k < positives ? "1" : "0", extra: "x" };
      lines.push(header.map((h) => row[h] ?? "").concat(extra ? extra(i) : []).join(","));
    }
  }
  const file = path.join(dir, name);
  fs.writeFileSync(file, `${lines.join("\n")}\n`);
  return file;
}

const PLAN_GROUPS: [string, number, number][] = [["A", 10, 100], ["B", 12, 60], ["C", 20, 40]];
let plan: string;

beforeAll(async () => {
  const planFile = write("plan.csv", ["id", "region", "channel", "y"], PLAN_GROUPS);
  plan = await makePlan([planFile], path.join(dir, "plan"), { target: "y" });
});

const json = (out: string) => JSON.parse(out) as DriftReport;
const col = (r: DriftReport, name: string) => r.columns.find((c) => c.name === name)!;

describe("drift edge cases", () => {
  it("the plan classes the columns as expected (identifier, constant, categorical)", () => {
    const profile = JSON.parse(fs.readFileSync(plan, "utf8")) as { columns: { name: string; role: string }[] };
    expect(profile.columns.map((c) => [c.name, c.role])).toEqual([["id", "identifier"], ["region", "constant"], ["channel", "categorical"], ["y", "target"]]);
  });

  it("a plan column missing from the extract is act ('column missing'); a dropped one only watch; exit 1", async () => {
    const file = write("missing.csv", ["id", "y"], PLAN_GROUPS);
    const run = await cli(["drift", file, "--plan", plan, "--format", "json", "--threads", "1"]);
    const r = json(run.out);
    expect(col(r, "channel").status).toBe("act");
    expect(col(r, "channel").present).toBe(false);
    expect(col(r, "channel").reasons[0]).toContain("Column missing");
    expect(col(r, "channel").psi).toBeNull();
    expect(col(r, "region").status).toBe("watch"); // constant: the plan drops it
    expect(col(r, "region").reasons.join(" ")).toContain("capped at watch");
    expect(r.input.missingColumns).toEqual(["region", "channel"]);
    expect(run.code).toBe(1);
    expect(run.err).toBe("tailsift: drift: 1 column needs action (channel)\n");
  });

  it("a large shift of a level's target rate is act (Cohen's h ≥ 0.5)", async () => {
    // A: 10/100 → 60/100. Cohen's h = 2·asin(√.6) − 2·asin(√.1) = 1.128 (plain computation).
    const file = write("target.csv", ["id", "region", "channel", "y"], [["A", 60, 100], ["B", 12, 60], ["C", 20, 40]]);
    const run = await cli(["drift", file, "--plan", plan, "--format", "json", "--threads", "1"]);
    const r = json(run.out);
    const a = col(r, "channel").targetShift!.levels.find((l) => l.value === "A")!;
    expect(a.effect).toBeCloseTo(2 * Math.asin(Math.sqrt(0.6)) - 2 * Math.asin(Math.sqrt(0.1)), 12);
    expect(a.separated).toBe(true);
    expect(col(r, "channel").status).toBe("act");
    expect(col(r, "channel").psi).toBe(0); // same channel mix
    expect(r.target!.status).toBe("watch"); // 42/200 → 92/200 overall: intervals apart, at most watch
    expect(run.code).toBe(1);
  });

  it("an extract without the target: no target shift; unknown columns are listed; --plan takes the folder", async () => {
    const file = write("notarget.csv", ["id", "region", "channel", "extra"], PLAN_GROUPS);
    const run = await cli(["drift", file, "--plan", path.dirname(plan), "--format", "json", "--threads", "1"]);
    const r = json(run.out);
    expect(run.code).toBe(0);
    expect(r.target).toBeUndefined();
    expect(r.columns.every((c) => c.targetShift === undefined)).toBe(true);
    expect(r.input.newColumns).toEqual(["extra"]);
    expect(r.status).toBe("ok");
  });

  it("prints a table by default and Markdown on request", async () => {
    const file = write("table.csv", ["id", "y"], PLAN_GROUPS);
    const table = await cli(["drift", file, "--plan", plan, "--threads", "1"]);
    expect(table.out).toMatch(/│ channel\s+│ act\s+│ column missing/);
    expect(table.out).toContain("channel (act):");
    const md = await cli(["drift", file, "--plan", plan, "--format", "markdown", "--threads", "1"]);
    expect(md.out).toContain("# Drift check");
    expect(md.out).toContain("## channel: act");
    expect(md.code).toBe(1);
  });
});

describe("drift on bad input exits 2 with one line", () => {
  const data = () => path.join(dir, "plan.csv");

  it("missing plan", async () => {
    const run = await expectCliError(["drift", data(), "--plan", path.join(dir, "nope", "profile.json")], "plan_not_found", /not found/);
    expect(run.stdout).toBe("");
  });

  it("plan folder without levels.parquet", async () => {
    const bare = path.join(dir, "bare");
    fs.mkdirSync(bare, { recursive: true });
    fs.copyFileSync(plan, path.join(bare, "profile.json"));
    await expectCliError(["drift", data(), "--plan", path.join(bare, "profile.json")], "plan_without_levels", /no levels\.parquet/);
  });

  it("a levels.parquet that is not Parquet", async () => {
    const broken = path.join(dir, "broken");
    fs.mkdirSync(broken, { recursive: true });
    fs.copyFileSync(plan, path.join(broken, "profile.json"));
    fs.writeFileSync(path.join(broken, "levels.parquet"), "not parquet");
    await expectCliError(["drift", data(), "--plan", broken, "--threads", "1"], "engine", /level table/);
  });

  it("missing input", async () => {
    await expectCliError(["drift", path.join(dir, "absent.csv"), "--plan", plan, "--threads", "1"], "input_not_found", /absent\.csv/);
  });

  it("input with a header and no rows", async () => {
    const empty = path.join(dir, "empty.csv");
    fs.writeFileSync(empty, "id,region,channel,y\n");
    await expectCliError(["drift", empty, "--plan", plan, "--threads", "1"], "empty_input", /no rows/);
  });

  it("an act band below the watch band", async () => {
    await expectCliError(["drift", data(), "--plan", plan, "--psi-watch", "0.3", "--psi-act", "0.2"], "bad_option", /--psi-act/);
  });
});
