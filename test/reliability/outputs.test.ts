/**
 * Nothing lost: inputs are only read (bytes and mtime unchanged by scan and encode); a failed run
 * leaves an existing report folder byte-identical; SIGTERM cancels the query, removes temp files
 * and exits 143 (128 + 15, the shell convention for a signal — common practice).
 */
import { createHash } from "node:crypto";
import { execFileSync, spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { encode } from "../../src/commands/encode.js";
import { expectCliError } from "../helpers/cliError.js";
import { collector, mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("outputs");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

function visitsCsv(rows: number, seed: number): string {
  const rand = mulberry32(seed);
  const lines = ["clinic,species,no_show"];
  for (let i = 0; i < rows; i++) {
    lines.push(`c${Math.floor(rand() * 6)},${["dog", "cat", "rabbit"][Math.floor(rand() * 3)]},${rand() < 0.3 ? 1 : 0}`);
  }
  return `${lines.join("\n")}\n`;
}

const digest = (file: string) => createHash("sha256").update(fs.readFileSync(file)).digest("hex");
const snapshot = (file: string) => ({ sha256: digest(file), mtimeMs: fs.statSync(file).mtimeMs, size: fs.statSync(file).size });

describe("inputs are never modified", () => {
  it("scan --out and encode leave the input's bytes and mtime unchanged", async () => {
    const input = writeFile(dir, "visits.csv", visitsCsv(500, 1));
    const past = new Date("2020-01-02T03:04:05Z");
    fs.utimesSync(input, past, past);
    const before = snapshot(input);
    const plan = path.join(dir, "plan");
    const c = collector();
    expect(await runCli(["scan", input, "--target", "no_show", "--out", plan, "--quiet", "--format", "json"], c.io), c.err).toBe(0);
    expect(snapshot(input)).toEqual(before);
    await encode([input], { plan, out: path.join(dir, "encoded.parquet"), mode: "training", threads: 1 });
    await encode([input], { plan, out: path.join(dir, "scored.csv"), mode: "scoring", threads: 1 });
    expect(snapshot(input)).toEqual(before);
    expect(fs.statSync(input).mtime.toISOString()).toBe(past.toISOString());
  });
});

describe("an existing output is replaced only by a complete one", () => {
  it("a scan --out that fails (single-valued target) leaves the old folder byte-identical", async () => {
    const input = writeFile(dir, "good.csv", visitsCsv(200, 2));
    const out = path.join(dir, "report");
    expect(await runCli(["scan", input, "--target", "no_show", "--out", out, "--quiet", "--format", "json"], collector().io)).toBe(0);
    const files = fs.readdirSync(out).sort();
    expect(files).toEqual(["decisions.md", "levels.parquet", "profile.json", "report.html"]);
    const before = Object.fromEntries(files.map((f) => [f, digest(path.join(out, f))]));

    const bad = writeFile(dir, "bad.csv", "clinic,species,no_show\nc1,dog,1\nc2,cat,1\n");
    await expectCliError(["scan", bad, "--target", "no_show", "--out", out], "target_single_value", /single value/);
    expect(fs.readdirSync(out).sort()).toEqual(files); // no temp files either
    for (const f of files) expect(digest(path.join(out, f)), f).toBe(before[f]);
  });
});

describe("signals", () => {
  it("SIGTERM during a scan exits 143 and leaves no output behind", async () => {
    const input = path.join(dir, "big.csv");
    execFileSync("node", ["sample-data/generate.mjs", "--rows", "1200000", "--seed", "4", "--out", input]);
    const out = path.join(dir, "term");
    // TAILSIFT_TRACE=1 prints a line after each engine step: the first one means the signal handlers
    // are installed and the engine is open, so SIGTERM arrives mid-scan however slow the machine is
    // (a fixed delay raced node's start-up under load)
    const child = spawn("node", ["dist/cli.js", "scan", input, "--target", "no_show", "--out", out, "--threads", "1"],
      { stdio: ["ignore", "pipe", "pipe"], env: { ...process.env, TAILSIFT_TRACE: "1" } });
    let stderr = "";
    const exited = new Promise<number | null>((resolve) => child.on("exit", (c) => resolve(c)));
    await Promise.race([exited, new Promise<void>((resolve) => {
      child.stderr.on("data", (d: Buffer) => { stderr += d.toString(); if (stderr.includes("[tailsift]")) resolve(); });
    })]);
    child.kill("SIGTERM");
    const code = await exited;
    expect(code, stderr).toBe(143);
    expect(stderr).not.toMatch(/\n\s+at /);
    const left = fs.existsSync(out) ? fs.readdirSync(out) : [];
    expect(left).toEqual([]);
  });
});
