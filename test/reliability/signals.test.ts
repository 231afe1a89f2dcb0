/**
 * Issue 17, item 4: signals at several moments of `scan --out`, with real child processes. The
 * test hook TAILSIFT_TEST_PAUSE_AT (src/runState.ts) makes the child wait at a named point, so
 * each signal lands at a known moment. Either nothing new is written and the exit is 130 / 143,
 * or the run completed, says so and exits 0 — never both. Uses dist/ (run `npm run build`).
 */
import { type ChildProcess, execFileSync, spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { tempDir } from "../helpers/tmp.js";

const dir = tempDir("signals");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const input = path.join(dir, "visits.csv");
beforeAll(() => {
  execFileSync("node", ["sample-data/generate.mjs", "--rows", "3000", "--seed", "4", "--out", input]);
});

interface Run { child: ChildProcess; paused: Promise<void>; exit: Promise<number | null>; stderr: () => string }

function start(out: string, pauseAt?: string, extra: string[] = []): Run {
  const env = { ...process.env, ...(pauseAt ? { TAILSIFT_TEST_PAUSE_AT: pauseAt } : {}) };
  const child = spawn("node", ["dist/cli.js", "scan", input, "--target", "no_show", "--out", out, "--threads", "1", ...extra], { env, stdio: ["ignore", "ignore", "pipe"] });
  let err = "";
  let onPause: () => void = () => {};
  const paused = new Promise<void>((resolve) => { onPause = resolve; });
  child.stderr!.on("data", (d: Buffer) => { err += d.toString(); if (pauseAt && err.includes(`paused at ${pauseAt}`)) onPause(); });
  const exit = new Promise<number | null>((resolve) => child.on("exit", (code, signal) => resolve(code ?? (signal ? -1 : null))));
  return { child, paused, exit, stderr: () => err };
}

const snapshot = (folder: string) => Object.fromEntries(fs.readdirSync(folder).sort().map((f) => [f, fs.readFileSync(path.join(folder, f)).toString("base64")]));

async function completeScan(out: string, extra: string[] = []): Promise<void> {
  const r = start(out, undefined, extra);
  expect(await r.exit, r.stderr()).toBe(0);
}

describe("signals during scan --out", () => {
  it("SIGTERM after the pass, into a new folder: exit 143 and no folder left", async () => {
    const out = path.join(dir, "fresh", "plan");
    const r = start(out, "after-pass");
    await r.paused;
    r.child.kill("SIGTERM");
    expect(await r.exit, r.stderr()).toBe(143);
    expect(r.stderr()).toMatch(/interrupted by SIGTERM; nothing was written/);
    expect(fs.existsSync(out)).toBe(false);
  }, 120_000);

  it("SIGINT just before the commit: exit 130 and the old set untouched, no temp file", async () => {
    const out = path.join(dir, "old");
    await completeScan(out, ["--seed", "1"]);
    const before = snapshot(out);
    const r = start(out, "before-commit", ["--seed", "2"]);
    await r.paused;
    r.child.kill("SIGINT");
    expect(await r.exit, r.stderr()).toBe(130);
    expect(snapshot(out)).toEqual(before);
  }, 120_000);

  it("SIGTERM after the commit: the run completed, says so and exits 0 with the new set", async () => {
    const out = path.join(dir, "late");
    await completeScan(out, ["--seed", "1"]);
    const r = start(out, "after-commit", ["--seed", "2"]);
    await r.paused;
    r.child.kill("SIGTERM");
    expect(await r.exit, r.stderr()).toBe(0);
    expect(r.stderr()).toMatch(/SIGTERM came after the run had finished; its outputs are complete/);
    const profile = JSON.parse(fs.readFileSync(path.join(out, "profile.json"), "utf8")) as { settings: { seed: number } };
    expect(profile.settings.seed).toBe(2);
    expect(fs.readdirSync(out).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  }, 120_000);

  it("SIGKILL leaves pending temp files; the next run on the same folder removes them", async () => {
    const out = path.join(dir, "killed");
    const r = start(out, "before-commit");
    await r.paused;
    r.child.kill("SIGKILL");
    await r.exit;
    const stale = fs.readdirSync(out).filter((f) => f.endsWith(".pending.tmp"));
    expect(stale.length).toBeGreaterThan(0);
    await completeScan(out);
    expect(fs.readdirSync(out).filter((f) => f.endsWith(".tmp"))).toEqual([]);
    expect(fs.readdirSync(out).sort()).toEqual(["decisions.md", "levels.parquet", "plan-manifest.json", "profile.json", "report.html"]);
  }, 120_000);
});
