/**
 * encode never overwrites its own input (issue 17, item 1): the output is compared with every
 * file read — after globs and Parquet folders are expanded — by real path and by device/inode,
 * so a glob, a Parquet folder, a symlink or a hard link cannot sneak the input in as --out. On
 * the code before this check (argument strings compared), each of these runs exited 0 and
 * replaced the input. What makes two paths one file (POSIX stat, realpath): docs/references.md
 * "Encode output".
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { encode } from "../../src/commands/encode.js";
import { withEngine } from "../../src/engine/db.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";
import { runEncodeCli, scanPlan, smallData } from "./helpers.js";

const dir = tempDir("encode-safety");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const text = smallData(120, 31, false);
const planDir = path.join(dir, "plan");
const globDir = path.join(dir, "d");
const pqDir = path.join(dir, "folder");

beforeAll(async () => {
  const train = writeFile(dir, "train.csv", text);
  await scanPlan(train, planDir, ["--target", "y"]);
  fs.mkdirSync(globDir);
  writeFile(globDir, "a.csv", text);
  writeFile(globDir, "b.csv", text);
  fs.mkdirSync(pqDir);
  await withEngine({ threads: 1 }, (e) => e.run(
    `COPY (SELECT * FROM read_csv('${train}', all_varchar = true)) TO '${path.join(pqDir, "part-1.parquet")}' (FORMAT parquet)`, "parquet input"));
  writeFile(dir, "target.csv", text);
  fs.symlinkSync(path.join(dir, "target.csv"), path.join(dir, "link.csv"));
  writeFile(dir, "hard.csv", text);
  fs.linkSync(path.join(dir, "hard.csv"), path.join(dir, "hard-twin.csv"));
  fs.mkdirSync(path.join(dir, "out.csv.mappings"));
  writeFile(path.join(dir, "out.csv.mappings"), "inside.csv", text);
});

const snapshot = (files: string[]) => files.map((f) => fs.readFileSync(f));

describe("encode refuses an output that is one of its inputs, however it is named", () => {
  it.each([
    ["a glob that matches the output", [path.join(globDir, "*.csv")], path.join(globDir, "b.csv"), [path.join(globDir, "a.csv"), path.join(globDir, "b.csv")]],
    ["a Parquet folder holding the output", [pqDir], path.join(pqDir, "part-1.parquet"), [path.join(pqDir, "part-1.parquet")]],
    ["a symlink input whose target is the output", [path.join(dir, "link.csv")], path.join(dir, "target.csv"), [path.join(dir, "target.csv")]],
    ["an output that is a symlink to the input", [path.join(dir, "target.csv")], path.join(dir, "link.csv"), [path.join(dir, "target.csv")]],
    ["a hard link of the input", [path.join(dir, "hard.csv")], path.join(dir, "hard-twin.csv"), [path.join(dir, "hard.csv")]],
    ["an input inside the mappings folder the run replaces", [path.join(dir, "out.csv.mappings", "inside.csv")], path.join(dir, "out.csv"), [path.join(dir, "out.csv.mappings", "inside.csv")]],
  ])("%s: exit 2, code output_is_input, the input unchanged", async (_name, inputs, out, watched) => {
    const before = snapshot(watched);
    const c = collector();
    const code = await runEncodeCli(["encode", ...inputs, "--plan", planDir, "--out", out, "--for", "scoring", "--quiet"], c.io);
    expect(code).toBe(2);
    expect(c.err).toMatch(/^tailsift: .*(is also an input|which this run replaces).*inputs are never modified/);
    expect(c.err.trim().split("\n")).toHaveLength(1);
    await expect(encode(inputs, { plan: planDir, out, mode: "scoring", threads: 1 })).rejects.toMatchObject({ code: "output_is_input", exitCode: 2 });
    expect(snapshot(watched)).toEqual(before);
  });
});
