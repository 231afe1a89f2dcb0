/**
 * Ctrl-C during a long scan: the running DuckDB query is interrupted, the process exits 130, and
 * the report folder holds no partial or temporary file.
 */
import { execFileSync, spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { tempDir } from "../helpers/tmp.js";

const dir = tempDir("interrupt");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe("interrupting a scan", () => {
  it("exits 130 soon after SIGINT and leaves no output behind", async () => {
    const input = path.join(dir, "big.csv");
    execFileSync("node", ["sample-data/generate.mjs", "--rows", "1500000", "--seed", "9", "--out", input]);
    const out = path.join(dir, "report");
    const child = spawn("node", ["dist/cli.js", "scan", input, "--target", "no_show", "--out", out, "--threads", "1"], { stdio: ["ignore", "pipe", "pipe"] });
    let stderr = "";
    child.stderr.on("data", (d: Buffer) => { stderr += d.toString(); });
    await new Promise((r) => setTimeout(r, 1500));
    child.kill("SIGINT");
    const code = await new Promise<number | null>((resolve) => child.on("exit", (c) => resolve(c)));
    expect(code, stderr).toBe(130);
    expect(stderr).toMatch(/interrupted/);
    // no timing assertion (tests run on slow machines); the promptness is measured in bench/
    const left = fs.existsSync(out) ? fs.readdirSync(out) : [];
    expect(left).toEqual([]);
  });
});
