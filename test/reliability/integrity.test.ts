/**
 * Issue 17, items 2, 3 and 10: a plan folder is one set (plan-manifest.json ties profile.json and
 * levels.parquet together), the scan's content fingerprint catches a file changed in the middle,
 * and long level values are shortened in human-facing outputs but kept whole where encode maps.
 */
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { csvParse } from "d3-dsv";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("integrity");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
afterEach(() => { delete process.env.TAILSIFT_TEST_FAIL_AT; });
const input = path.join(dir, "visits.csv");
beforeAll(() => {
  execFileSync("node", ["sample-data/generate.mjs", "--rows", "4000", "--seed", "17", "--out", input]);
});

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  const c = collector();
  const code = await runCli(args, c.io);
  return { code, out: c.out, err: c.err };
}
async function ok(args: string[]): Promise<string> {
  const r = await run(args);
  expect(r.code, r.err).toBe(0);
  return r.out;
}
/** Exit 2 and one line with the reason. */
async function refused(args: string[], reason: RegExp): Promise<void> {
  const r = await run(args);
  expect(r.code, r.err).toBe(2);
  const lines = r.err.trimEnd().split("\n");
  expect(lines, r.err).toHaveLength(1);
  expect(lines[0]).toMatch(/^tailsift: /);
  expect(lines[0]).toMatch(reason);
}
const scanArgs = (out: string, ...extra: string[]) => ["scan", input, "--target", "no_show", "--out", out, "--quiet", ...extra];
const encodeTraining = (plan: string, name: string) => ["encode", input, "--plan", plan, "--out", path.join(dir, name), "--for", "training", "--quiet"];

/** The plan readers: encode, drift and report all refuse a mixed set. */
async function everyReaderRefuses(plan: string, reason: RegExp): Promise<void> {
  await refused(encodeTraining(plan, `${path.basename(plan)}.enc.parquet`), reason);
  await refused(["drift", input, "--plan", plan], reason);
  await refused(["report", path.join(plan, "profile.json"), "--out", path.join(dir, `${path.basename(plan)}.html`)], reason);
}

describe("a plan folder is written and read as one set (item 2)", () => {
  it("a scan writes a manifest with the SHA-256 of each file, and encode reads the set", async () => {
    const plan = path.join(dir, "whole");
    await ok(scanArgs(plan));
    const manifest = JSON.parse(fs.readFileSync(path.join(plan, "plan-manifest.json"), "utf8")) as { files: Record<string, string> };
    expect(Object.keys(manifest.files).sort()).toEqual(["decisions.md", "levels.parquet", "profile.json", "report.html"]);
    // brute-force check of the recorded hash with sha256sum (coreutils), not our own code
    const outside = execFileSync("sha256sum", [path.join(plan, "levels.parquet")]).toString().split(" ")[0];
    expect(manifest.files["levels.parquet"]).toBe(`sha256:${outside}`);
    await ok(encodeTraining(plan, "whole.parquet"));
  });

  it("a re-scan that fails half-way (new profile.json, old levels.parquet) is refused by every reader", async () => {
    const plan = path.join(dir, "halfway");
    await ok(scanArgs(plan, "--seed", "1"));
    const oldLevels = fs.readFileSync(path.join(plan, "levels.parquet"));
    process.env.TAILSIFT_TEST_FAIL_AT = "mid-commit";
    const r = await run(scanArgs(plan, "--seed", "2"));
    delete process.env.TAILSIFT_TEST_FAIL_AT;
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^tailsift: cannot write the plan folder/);
    expect(fs.readFileSync(path.join(plan, "levels.parquet")).equals(oldLevels)).toBe(true); // the old table stayed
    expect((JSON.parse(fs.readFileSync(path.join(plan, "profile.json"), "utf8")) as { settings: { seed: number } }).settings.seed).toBe(2);
    await everyReaderRefuses(plan, /levels\.parquet' does not belong to the plan/);
  });

  it("a levels.parquet copied from a scan with another seed is refused", async () => {
    const a = path.join(dir, "seedA");
    const b = path.join(dir, "seedB");
    await ok(scanArgs(a, "--seed", "3"));
    await ok(scanArgs(b, "--seed", "4"));
    fs.copyFileSync(path.join(b, "levels.parquet"), path.join(a, "levels.parquet"));
    await everyReaderRefuses(a, /levels\.parquet' does not belong to the plan.*content differs/);
  });

  it("a redacted re-scan into the same folder does not keep the old levels.parquet", async () => {
    const plan = path.join(dir, "redacted");
    await ok(scanArgs(plan));
    const saved = path.join(dir, "saved-levels.parquet");
    fs.copyFileSync(path.join(plan, "levels.parquet"), saved);
    await ok(scanArgs(plan, "--redact"));
    expect(fs.existsSync(path.join(plan, "levels.parquet"))).toBe(false);
    await refused(encodeTraining(plan, "red.parquet"), /no levels\.parquet/);
    // and one copied back in does not belong to the redacted set
    fs.copyFileSync(saved, path.join(plan, "levels.parquet"));
    await refused(encodeTraining(plan, "red2.parquet"), /does not belong to the plan.*lists no levels\.parquet/);
  });

  it("a profile.json from another scan is refused; one whose parameters a user edited is read", async () => {
    const plan = path.join(dir, "edited");
    const other = path.join(dir, "other");
    await ok(scanArgs(plan));
    await ok(scanArgs(other, "--seed", "5"));
    const file = path.join(plan, "profile.json");
    const profile = JSON.parse(fs.readFileSync(file, "utf8")) as { planId: string; columns: { name: string; recommendation: { encoding: string; params: Record<string, unknown> } }[] };
    const manifest = JSON.parse(fs.readFileSync(path.join(plan, "plan-manifest.json"), "utf8")) as { planId: string };
    expect(profile.planId).toBe(manifest.planId);
    const clinic = profile.columns.find((c) => c.name === "species")!;
    clinic.recommendation = { ...clinic.recommendation, encoding: "frequency", params: {} };
    fs.writeFileSync(file, JSON.stringify(profile));
    await ok(encodeTraining(plan, "edited.parquet"));
    fs.copyFileSync(path.join(other, "profile.json"), file);
    await refused(encodeTraining(plan, "edited2.parquet"), /profile\.json' does not belong to the plan.*planId/);
  });
});

describe("the content fingerprint (item 3)", () => {
  const text = () => fs.readFileSync(input, "utf8");
  const lines = () => text().trimEnd().split("\n");
  const targetIndex = () => lines()[0]!.split(",").indexOf("no_show");

  it("is recorded by the scan and does not depend on row order", async () => {
    const all = lines();
    const shuffled = [all[0]!, ...all.slice(1).reverse()];
    const other = writeFile(dir, "reversed.csv", `${shuffled.join("\n")}\n`);
    const fp = async (f: string) => (JSON.parse(await ok(["scan", f, "--format", "json", "--quiet"])) as { input: { contentFingerprint: string } }).input.contentFingerprint;
    const a = await fp(input);
    expect(a).toMatch(/^rows:4000;sum64:[0-9a-f]{16}$/);
    expect(await fp(other)).toBe(a);
  });

  it("200 targets flipped in the middle (same size, head and tail) make encode recount, not reuse the stale table", async () => {
    const plan = path.join(dir, "fp-plan");
    const copy = path.join(dir, "fp", "visits.csv");
    fs.mkdirSync(path.dirname(copy), { recursive: true });
    fs.copyFileSync(input, copy);
    await ok(["scan", copy, "--target", "no_show", "--out", plan, "--quiet"]);
    const all = lines();
    const t = targetIndex();
    const mid = Math.floor(all.length / 2);
    for (let i = mid; i < mid + 200; i++) {
      const f = all[i]!.split(",");
      f[t] = f[t] === "1" ? "0" : "1";
      all[i] = f.join(",");
    }
    const flipped = `${all.join("\n")}\n`;
    expect(Buffer.byteLength(flipped)).toBe(fs.statSync(copy).size);
    fs.writeFileSync(copy, flipped);
    const enc = (name: string, ...extra: string[]) => ok(["encode", copy, "--plan", plan, "--out", path.join(dir, name), "--for", "training", "--format", "json", ...extra]);
    const summary = JSON.parse(await enc("fp.csv")) as { levelSource: string };
    expect(summary.levelSource).toBe("input pass (content differs from the plan's scan)");
    // the result is the one of a forced recount (the reference: counting the changed file itself)
    await enc("fp-recount.csv", "--recount");
    expect(fs.readFileSync(path.join(dir, "fp.csv"), "utf8")).toBe(fs.readFileSync(path.join(dir, "fp-recount.csv"), "utf8"));
    // unchanged content still reuses the plan's table
    const back = path.join(dir, "fp-back");
    await ok(["scan", copy, "--target", "no_show", "--out", back, "--quiet"]);
    const again = JSON.parse(await ok(["encode", copy, "--plan", back, "--out", path.join(dir, "fp2.csv"), "--for", "training", "--format", "json"])) as { levelSource: string };
    expect(again.levelSource).toBe("plan level table");
  });
});

describe("long level values (item 10)", () => {
  const long = `${"L".repeat(300_000)}end`;
  const file = path.join(dir, "long.csv");
  beforeAll(() => {
    const rows = ["k,y"];
    for (let i = 0; i < 400; i++) rows.push(`${i % 4 === 0 ? long : ["a", "b", "c"][i % 3]},${i % 2}`);
    fs.writeFileSync(file, `${rows.join("\n")}\n`);
  });
  it("are shortened with a marker in profile.json's lists, decisions.md, report.html and the terminal; levels.parquet and encode keep them whole", async () => {
    const plan = path.join(dir, "long-plan");
    const table = await ok(["scan", file, "--target", "y", "--out", plan, "--quiet", "--min-level-rows", "5"]);
    expect(table.length).toBeLessThan(20_000);
    const marker = /L{10}…\\?\[shortened: 300,003 characters\\?\]/;
    for (const name of ["decisions.md", "report.html"]) {
      const content = fs.readFileSync(path.join(plan, name), "utf8");
      expect(content, name).toMatch(marker);
      expect(content.length, name).toBeLessThan(200_000);
    }
    const profile = JSON.parse(fs.readFileSync(path.join(plan, "profile.json"), "utf8")) as { columns: { topLevels: { value: string }[]; recommendation: { encoding: string; params: { levels?: string[] } } }[] };
    const k = profile.columns[0]!;
    expect(k.topLevels[0]!.value).toMatch(marker);
    // the encoding parameters encode maps by stay whole
    expect(k.recommendation.encoding).toBe("one-hot");
    expect(k.recommendation.params.levels).toContain(long);
    // encode maps the full value: its one-hot column is 1 on exactly the 100 rows that hold it
    await ok(["encode", file, "--plan", plan, "--out", path.join(dir, "long.enc.csv"), "--for", "scoring", "--quiet"]);
    const rows = csvParse(fs.readFileSync(path.join(dir, "long.enc.csv"), "utf8"));
    const col = rows.columns.find((c) => c.endsWith("end"));
    expect(col).toBeDefined();
    expect(rows.filter((r) => r[col!] === "1")).toHaveLength(100);
  }, 60_000);
});
