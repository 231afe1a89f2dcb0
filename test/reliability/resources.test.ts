/**
 * Bounded resources: option validation (--memory-limit, --threads, --temp-dir), memory errors as
 * one line, large fields and wide files. Wide-file figures are checked against an independent
 * count of the generated values.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { defaultMemoryLimit, MIN_MEMORY_BYTES, parseMemoryLimit, withEngine } from "../../src/engine/db.js";
import { PASS_BATCH } from "../../src/engine/aggregate.js";
import { checkMeasuredWidth, MAX_MEASURED_COLUMNS, type Source } from "../../src/engine/source.js";
import type { Profile } from "../../src/profile/types.js";
import { expectCliError } from "../helpers/cliError.js";
import { collector, mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("resources");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const small = writeFile(dir, "small.csv", "clinic,species\nNorth,dog\nSouth,cat\nNorth,cat\n");

/** The error contract (test/helpers/cliError.ts): exit 2, error code, one line matching `message`. */
async function oneLineError(args: string[], code: string, message: RegExp): Promise<string> {
  const f = await expectCliError(args, code, message);
  return f.stderr.trimEnd();
}

async function profile(args: string[]): Promise<Profile> {
  const c = collector();
  expect(await runCli([...args, "--format", "json"], c.io), c.err).toBe(0);
  return JSON.parse(c.out) as Profile;
}

describe("the default memory limit: a quarter of RAM, 2 to 16 GiB, never above 60 % of it", () => {
  it.each([
    [24, "6144MiB"], // this bench machine
    [4, "2048MiB"], // the 2 GiB floor
    [64, "16384MiB"],
    [1024, "16384MiB"], // capped at 16 GiB
    [2, "1228MiB"], // a small machine: 60 % of it
    [0.25, "256MiB"], // never below 256 MiB
  ])("%s GiB of RAM → %s", (gib, expected) => {
    expect(defaultMemoryLimit(gib * 2 ** 30)).toBe(expected);
  });
});

describe("--memory-limit, --threads and --temp-dir are checked before DuckDB starts", () => {
  it.each([
    ["lots", /--memory-limit 'lots' is not a size; give a size such as 2GB/],
    ["2", /--memory-limit '2' has no unit/],
    ["2 parsecs", /--memory-limit '2 parsecs' has an unknown unit 'parsecs'/],
    ["0GB", /--memory-limit '0GB' is too small/],
    ["-1GB", /--memory-limit '-1GB' is not a size/], // DuckDB reads -1GB as "no limit" (measured)
    ["150%", /--memory-limit '150%' is not a share from 1% to 100%/],
  ])("--memory-limit %s → exit 2 naming the option", async (value, message) => {
    await oneLineError(["scan", small, "--memory-limit", value], "bad_option", message);
  });

  it("accepts DuckDB's units and a share of RAM", () => {
    // 1 GB = 10^9 bytes, 1 GiB = 2^30 bytes (IEC 80000-13); results in MiB, rounded down
    expect(parseMemoryLimit("2GB")).toBe(`${Math.floor(2e9 / 2 ** 20)}MiB`);
    expect(parseMemoryLimit("1.5 GiB")).toBe("1536MiB");
    expect(parseMemoryLimit("512mb")).toBe(`${Math.floor(512e6 / 2 ** 20)}MiB`);
    expect(parseMemoryLimit("50%")).toBe(`${Math.floor(Math.floor(os.totalmem() / 2) / 2 ** 20)}MiB`);
    expect(MIN_MEMORY_BYTES).toBe(64e6);
  });

  it("a good limit runs", async () => {
    expect((await profile(["scan", small, "--memory-limit", "256MB", "--threads", "1"])).input.rows).toBe(3);
  });

  it("--threads 0 and an unwritable --temp-dir", async () => {
    await oneLineError(["scan", small, "--threads", "0"], "bad_option", /--threads must be a whole number from 1 to 1024 \(got 0\)/);
    await oneLineError(["scan", small, "--temp-dir", "/sys/tailsift-spill"], "bad_option", /--temp-dir '\/sys\/tailsift-spill' is not a writable folder/);
    await oneLineError(["scan", small, "--temp-dir", path.join(small, "x")], "bad_option", /--temp-dir .* is not a writable folder/);
  });

  it("a --temp-dir that does not exist yet is accepted and not left behind", async () => {
    const spill = path.join(dir, "spill", "deeper");
    expect((await profile(["scan", small, "--temp-dir", spill])).input.rows).toBe(3);
    expect(fs.existsSync(path.join(dir, "spill"))).toBe(false);
  });

  it("running out of memory is one line naming the limit and what to do", async () => {
    await withEngine({ memoryLimit: "64MB", threads: 1 }, async (engine) => {
      // a list aggregate cannot spill to disk, so 20M strings exceed 64 MB
      await expect(engine.rows("SELECT length(list(i::VARCHAR)) AS n FROM range(20000000) t(i)", "building a list"))
        .rejects.toMatchObject({ code: "out_of_memory", message: expect.stringMatching(/^building a list: ran out of memory \(limit [\d.]+ MiB\); raise --memory-limit/) });
    });
  });
});

/** A CSV of `cols` columns × `rows` rows; column j holds one of 5 values chosen by a seeded draw. */
function wideCsv(name: string, cols: number, rows: number, seed: number): { file: string; values: string[][] } {
  const rand = mulberry32(seed);
  const values = Array.from({ length: rows }, () => Array.from({ length: cols }, () => "abcde"[Math.floor(rand() * 5)]!));
  const header = Array.from({ length: cols }, (_, j) => `c${j}`).join(",");
  const file = writeFile(dir, name, `${header}\n${values.map((r) => r.join(",")).join("\n")}\n`);
  return { file, values };
}

describe("wide files", () => {
  it("10,000 columns: --columns of two of them works and counts exactly", async () => {
    const { file, values } = wideCsv("w10k.csv", 10_000, 5, 3);
    const p = await profile(["scan", file, "--columns", "c5,c9000", "--threads", "1"]);
    expect(p.columns).toHaveLength(10_000);
    for (const j of [5, 9000]) {
      const expected: Record<string, number> = {};
      for (const r of values) expected[r[j]!] = (expected[r[j]!] ?? 0) + 1;
      const c = p.columns[j]!;
      expect(c.name).toBe(`c${j}`);
      expect(Object.fromEntries(c.topLevels.map((l) => [l.value, l.rows]))).toEqual(expected);
    }
    expect(p.columns[6]!.role).toBe("excluded");
  });

  it("200 columns × 50 rows: a plain scan counts every column exactly", async () => {
    const { file, values } = wideCsv("w200.csv", 200, 50, 4);
    const p = await profile(["scan", file, "--threads", "1"]);
    expect(p.columns).toHaveLength(200);
    p.columns.forEach((c, j) => expect(c.distinct, c.name).toBe(new Set(values.map((r) => r[j])).size));
  });

  it(`refuses to measure more than ${MAX_MEASURED_COLUMNS} columns at once, naming --columns`, () => {
    const source = { files: ["w.csv"], columns: Array.from({ length: MAX_MEASURED_COLUMNS + 1 }, (_, j) => `c${j}`) } as Source;
    expect(() => checkMeasuredWidth(MAX_MEASURED_COLUMNS, source)).not.toThrow();
    expect(() => checkMeasuredWidth(MAX_MEASURED_COLUMNS + 1, source)).toThrow(new RegExp(`'w\\.csv' has ${MAX_MEASURED_COLUMNS + 1} columns; tailsift measures at most ${MAX_MEASURED_COLUMNS} at once .*--columns`));
  });

  // Wider than one pass batch (PASS_BATCH columns): counted batch by batch, each exact. A plain
  // scan of 10,000 columns × 50 rows completes the same way (measured: 4 min 26 s, 1.7 GB peak).
  it(`${PASS_BATCH * 2 + 50} columns × 30 rows: counted in batches, every column exact`, async () => {
    const cols = PASS_BATCH * 2 + 50;
    const { file, values } = wideCsv("w-batches.csv", cols, 30, 6);
    const p = await profile(["scan", file, "--threads", "1"]);
    expect(p.columns).toHaveLength(cols);
    p.columns.forEach((c, j) => {
      expect(c.name).toBe(`c${j}`);
      expect(c.distinct, c.name).toBe(new Set(values.map((r) => r[j])).size);
      const top = c.topLevels[0]!;
      expect(top.rows, c.name).toBe(values.filter((r) => r[j] === top.value).length);
    });
  });
});
