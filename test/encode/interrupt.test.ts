/**
 * Ctrl-C during a long encode: the running DuckDB query is interrupted, the process exits 130,
 * and neither the output, its mappings folder nor any temporary file is left behind. The signal
 * is sent while the output's temporary file is being written (the worst moment).
 * Runs the BUILT code (npm test builds first): `node dist/cli.js encode`.
 */
import { execFileSync, spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { tempDir } from "../helpers/tmp.js";
import { scanPlan } from "./helpers.js";

const dir = tempDir("encode-int");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** The command line of the built CLI's encode command. */
function encodeCommand(): string[] {
  if (!fs.existsSync("dist/commands/encodeCli.js")) throw new Error("build first: npx tsc -p tsconfig.json");
  return ["dist/cli.js", "encode"];
}

describe("interrupting an encode", () => {
  it("exits 130 after SIGINT and leaves no output and no temporary file", async () => {
    const big = path.join(dir, "big.csv");
    execFileSync("node", ["sample-data/generate.mjs", "--rows", "2000000", "--seed", "9", "--out", big]);
    const buf = Buffer.alloc(3_000_000);
    const fd = fs.openSync(big, "r");
    fs.readSync(fd, buf, 0, buf.length, 0);
    fs.closeSync(fd);
    const head = buf.toString("utf8");
    const sample = path.join(dir, "sample.csv");
    fs.writeFileSync(sample, head.slice(0, head.lastIndexOf("\n") + 1));
    const planDir = path.join(dir, "plan");
    await scanPlan(sample, planDir, ["--target", "no_show"]);

    const outDir = path.join(dir, "out");
    fs.mkdirSync(outDir);
    const out = path.join(outDir, "encoded.parquet");
    const child = spawn("node", [...encodeCommand(), big, "--plan", planDir, "--out", out, "--for", "training", "--threads", "1"], { stdio: ["ignore", "pipe", "pipe"] });
    let stderr = "";
    child.stderr.on("data", (d: Buffer) => { stderr += d.toString(); });
    const exited = new Promise<number | null>((resolve) => child.on("exit", (c) => resolve(c)));
    // Interrupt while the output is being written: wait until its temporary file exists (the
    // input pass comes first), then send SIGINT.
    let running = true;
    void exited.then(() => { running = false; });
    while (running && !fs.readdirSync(outDir).some((f) => f.endsWith(".tmp"))) await new Promise((r) => setTimeout(r, 50));
    expect(running, `encode ended before writing: ${stderr}`).toBe(true);
    child.kill("SIGINT");
    const code = await exited;
    expect(code, stderr).toBe(130);
    expect(stderr).toMatch(/interrupted/);
    // no timing assertion: the machine may be slow
    expect(fs.readdirSync(outDir)).toEqual([]);
  });
});
