/**
 * The CLI, in-process (commander program with exitOverride) and end to end on the built binary.
 * Exit code, message and output are asserted together.
 */
import { execFile } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildProgram, runCli } from "../../src/cli.js";
import { validateProfile } from "../../src/profile/schema.js";
import { expectCliError } from "../helpers/cliError.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";

const run = promisify(execFile);
const dir = tempDir("cli");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const CSV = "id,colour,size,y\n1,red,S,1\n2,red,M,0\n3,blue,S,0\n4,blue,L,1\n5,green,S,0\n6,red,M,0\n";
const small = writeFile(dir, "small.csv", CSV);

describe("tailsift in-process", () => {
  it("prints help with every command and exits 0", async () => {
    const c = collector();
    expect(await runCli(["--help"], c.io)).toBe(0);
    // every command the program registers is listed on its own line with the start of its description
    const commands = buildProgram(collector().io).commands;
    expect(commands.map((cmd) => cmd.name()).sort()).toEqual(["drift", "encode", "report", "scan", "sql"]);
    const lines = c.out.split("\n");
    for (const cmd of commands) {
      const line = lines.find((l) => l.startsWith(`  ${cmd.name()} `));
      expect(line, cmd.name()).toBeDefined();
      expect(line).toContain(cmd.description().split(" ").slice(0, 3).join(" "));
    }
  });

  it("scan --format json prints a profile that validates against the published schema", async () => {
    const c = collector();
    expect(await runCli(["scan", small, "--target", "y", "--format", "json"], c.io)).toBe(0);
    const profile = validateProfile(JSON.parse(c.out));
    expect(profile.input.rows).toBe(6);
    expect(profile.target).toMatchObject({ column: "y", kind: "binary", rows: 6, mean: 2 / 6 });
    expect(profile.columns.map((x) => x.name)).toEqual(["id", "colour", "size", "y"]);
  });

  it("scan prints a table with one row per column", async () => {
    const c = collector();
    expect(await runCli(["scan", small], c.io)).toBe(0);
    expect(c.out).toMatch(/6 rows, 4 columns/);
    for (const name of ["id", "colour", "size", "y"]) expect(c.out).toContain(name);
  });

  it("scan --out writes profile.json, decisions.md, report.html and levels.parquet, and report re-renders", async () => {
    const out = path.join(dir, "out");
    const c = collector();
    expect(await runCli(["scan", small, "--target", "y", "--out", out, "--quiet"], c.io)).toBe(0);
    for (const f of ["profile.json", "decisions.md", "report.html", "levels.parquet"]) expect(fs.existsSync(path.join(out, f)), f).toBe(true);
    expect(fs.readdirSync(out).filter((f) => f.endsWith(".tmp"))).toEqual([]);
    const again = path.join(dir, "again.html");
    const r = collector();
    expect(await runCli(["report", path.join(out, "profile.json"), "--out", again], r.io)).toBe(0);
    expect(fs.readFileSync(again, "utf8")).toContain("<svg");
  });

  it("--decide overrides the advice and the record says so", async () => {
    const c = collector();
    expect(await runCli(["scan", small, "--decide", "colour=hashing", "--format", "json"], c.io)).toBe(0);
    const rec = JSON.parse(c.out).columns.find((x: { name: string }) => x.name === "colour").recommendation;
    expect(rec.encoding).toBe("hashing");
    expect(rec.overridden.by).toBe("--decide");
  });

  it.each([
    ["file not found", ["scan", path.join(dir, "nope.csv")], "input_not_found", /input '.*nope\.csv' not found/],
    ["unsupported format", ["scan", writeFile(dir, "x.xlsx", "abc")], "unsupported_format", /cannot read '.*x\.xlsx': use \.csv/],
    ["empty file", ["scan", writeFile(dir, "empty.csv", "")], "empty_input", /is empty/],
    ["header only", ["scan", writeFile(dir, "header.csv", "a,b,c\n")], "empty_input", /header but no rows/],
    ["unknown column in --columns", ["scan", small, "--columns", "colour,nope"], "unknown_column", /--columns: column 'nope' not found; columns are: id, colour, size, y/],
    ["bad --folds", ["scan", small, "--folds", "1"], "bad_option", /--folds must be an integer from 2 to 100/],
    ["bad --decide", ["scan", small, "--decide", "colour=magic"], "bad_option", /--decide 'colour=magic'/],
    ["unknown option", ["scan", small, "--frobnicate"], "commander.unknownOption", /unknown option/],
    ["glob with no match", ["scan", path.join(dir, "none-*.csv")], "input_not_found", /no file matches/],
  ])("%s: exit 2, error code and one line, no stack trace", async (_name, argv, code, message) => {
    await expectCliError(argv, code, message);
  });

  it("output equal to an input: refused before the input is read, and the input is unchanged", async () => {
    // A valid profile as the input, so the refusal cannot come from "not JSON" (or any other
    // problem with the input): report must refuse --out naming its own input.
    const out = path.join(dir, "plan");
    expect(await runCli(["scan", small, "--target", "y", "--out", out, "--quiet"], collector().io)).toBe(0);
    const profile = path.join(out, "profile.json");
    const before = fs.readFileSync(profile);
    await expectCliError(["report", profile, "--out", profile], "output_is_input", /'.*profile\.json' is also an input; inputs are never modified/);
    expect(fs.readFileSync(profile).equals(before)).toBe(true);
    expect(fs.readdirSync(out).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });
});

describe("tailsift binary end to end", () => {
  const bin = path.join(process.cwd(), "dist", "cli.js");
  beforeAll(() => {
    if (!fs.existsSync(bin)) throw new Error("dist/cli.js missing: run `npm run build` (npm test does it)");
  });

  it("scans and exits 0; a bad input exits 2 with one line on stderr", async () => {
    const ok = await run("node", [bin, "scan", small, "--target", "y", "--format", "json"]);
    expect(JSON.parse(ok.stdout).input.rows).toBe(6);
    const bad = await run("node", [bin, "scan", path.join(dir, "missing.csv")]).catch((e: { code: number; stderr: string }) => e);
    expect((bad as { code: number }).code).toBe(2);
    expect((bad as { stderr: string }).stderr.trim().split("\n")).toEqual([expect.stringMatching(/^tailsift: input '.*missing\.csv' not found/)]);
  });

  it("prints its version", async () => {
    const { stdout } = await run("node", [bin, "--version"]);
    expect(stdout.trim()).toBe(JSON.parse(fs.readFileSync("package.json", "utf8")).version);
  });
});
