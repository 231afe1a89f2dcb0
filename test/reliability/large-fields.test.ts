/**
 * Large fields: DuckDB's default max_line_size (2 MB) would refuse a 10 MB field; tailsift reads
 * lines up to 16 MiB (MAX_LINE_BYTES) with a 32 MiB buffer, which keeps read memory at DuckDB's
 * default, and names the file when a line is longer.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { MAX_LINE_BYTES } from "../../src/engine/source.js";
import type { Profile } from "../../src/profile/types.js";
import { expectCliError } from "../helpers/cliError.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("large-fields");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

async function profile(args: string[]): Promise<Profile> {
  const c = collector();
  expect(await runCli([...args, "--format", "json"], c.io), c.err).toBe(0);
  return JSON.parse(c.out) as Profile;
}

/** The error contract (test/helpers/cliError.ts): exit 2, error code, one line matching `message`. */
async function oneLineError(args: string[], code: string, message: RegExp): Promise<string> {
  const f = await expectCliError(args, code, message);
  expect(f.stderr.length).toBeLessThan(400); // DuckDB's "Original Line" (megabytes here) is never copied
  return f.stderr.trimEnd();
}

describe("large fields", () => {
  it("reads lines up to 16 MiB", () => expect(MAX_LINE_BYTES).toBe(16 * 2 ** 20));

  it("a single 10 MB field is read", async () => {
    const big = "x".repeat(10 * 2 ** 20);
    const file = writeFile(dir, "big-field.csv", `clinic,note\nNorth,${big}\nSouth,short\nNorth,short\n`);
    const p = await profile(["scan", file, "--threads", "1"]);
    expect(p.input.rows).toBe(3);
    const note = p.columns.find((c) => c.name === "note")!;
    expect(note.distinct).toBe(2);
    expect(note.topLevels.find((l) => l.value === "short")?.rows).toBe(2);
    expect(note.topLevels.find((l) => l.value === big)?.rows).toBe(1);
  });

  it("a line longer than 16 MiB is an error naming the file", async () => {
    const file = writeFile(dir, "huge-line.csv", `clinic,note\nNorth,${"y".repeat(17 * 2 ** 20)}\n`);
    await oneLineError(["scan", file, "--threads", "1"], "line_too_long", /cannot read '.*huge-line\.csv' near line \d+: a line of 17\.0 MiB is longer than the 16\.0 MiB tailsift reads/);
  });
});

