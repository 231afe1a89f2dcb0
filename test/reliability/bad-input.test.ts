/**
 * Bad input through the CLI in-process (runCli): each case has a defined behaviour — exit 0 with
 * exact figures, or exit 2 with ONE line on stderr naming the file (and line) and what to do,
 * and no stack trace. Expected figures come from an independent reading of the fixture text
 * (d3-dsv's RFC 4180 parser, or plain string counting), not from tailsift.
 */
import fs from "node:fs";
import path from "node:path";
import { csvParse } from "d3-dsv";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { buildLevelTable } from "../../src/engine/aggregate.js";
import { rowHashFolds } from "../../src/engine/folds.js";
import { withEngine } from "../../src/engine/db.js";
import { countSkippedRows, openSource } from "../../src/engine/source.js";
import type { Profile } from "../../src/profile/types.js";
import { cliFailure, expectCliError } from "../helpers/cliError.js";
import { collector, mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("bad-input");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const fixture = (name: string) => path.join("test", "fixtures", "bad", name);

/**
 * Runs the CLI and checks the error contract (test/helpers/cliError.ts): exit 2, the error code
 * `code`, ONE line "tailsift: <message>" matching `message`, no stack trace.
 */
async function fails(args: string[], code: string, message: RegExp): Promise<string> {
  const f = await expectCliError(args, code, message);
  return f.stderr.trimEnd();
}

async function profiles(args: string[]): Promise<Profile> {
  const c = collector();
  const code = await runCli([...args, "--format", "json"], c.io);
  expect(code, c.err).toBe(0);
  return JSON.parse(c.out) as Profile;
}

const column = (p: Profile, name: string) => {
  const found = p.columns.find((c) => c.name === name);
  if (!found) throw new Error(`no column ${name} in ${p.columns.map((c) => c.name).join(", ")}`);
  return found;
};
const levels = (p: Profile, name: string) => Object.fromEntries(column(p, name).topLevels.map((l) => [l.value, l.rows]));
/** Independent count of values in a parsed CSV column. */
const tally = (values: string[]) => values.reduce<Record<string, number>>((acc, v) => ({ ...acc, [v]: (acc[v] ?? 0) + 1 }), {});

describe("inputs that are not there", () => {
  it("a missing file", async () => {
    await fails(["scan", path.join(dir, "nope.csv")], "input_not_found", /input '.*nope\.csv' not found; give a file, a glob or a folder/);
  });
  it("a glob with no match", async () => {
    await fails(["scan", path.join(dir, "none-*.csv")], "input_not_found", /no file matches '.*none-\*\.csv'; check the pattern/);
  });
  it("a folder without Parquet files", async () => {
    const folder = path.join(dir, "folder");
    fs.mkdirSync(folder);
    writeFile(folder, "a.csv", "clinic\nNorth\n");
    await fails(["scan", folder], "input_is_directory", /'.*folder' is a folder with no \.parquet files; give files or a glob such as '.*folder\/\*\.csv'/);
  });
  it("an empty file", async () => {
    await fails(["scan", writeFile(dir, "empty.csv", "")], "empty_input", /input '.*empty\.csv' is empty/);
  });
  it("a header without rows", async () => {
    await fails(["scan", fixture("header-only.csv")], "empty_input", /header but no rows/);
  });
});

describe("files that are not CSV text", () => {
  it("random bytes named .csv: binary data, exit 2", async () => {
    const rand = mulberry32(8);
    const bytes = Buffer.from(Array.from({ length: 4000 }, () => Math.floor(rand() * 256)));
    await fails(["scan", writeFile(dir, "garbage.csv", bytes)], "binary_input", /cannot read '.*garbage\.csv': it holds binary data, not CSV text/);
  });
  it("random bytes named .parquet", async () => {
    const rand = mulberry32(9);
    const bytes = Buffer.from(Array.from({ length: 4000 }, () => Math.floor(rand() * 256)));
    await fails(["scan", writeFile(dir, "garbage.parquet", bytes)], "unreadable_parquet", /cannot read '.*garbage\.parquet': not a Parquet file/);
  });
  it("malformed JSON lines name the line; --skip-bad-rows is refused for JSON", async () => {
    await fails(["scan", fixture("malformed.jsonl")], "bad_row", /cannot read '.*malformed\.jsonl' line 3: malformed JSON/);
    await fails(["scan", fixture("malformed.jsonl"), "--skip-bad-rows"], "bad_option", /--skip-bad-rows applies to CSV and TSV input/);
  });
});

describe("ragged rows", () => {
  const text = fs.readFileSync(fixture("ragged.csv"), "utf8");
  const lines = text.trimEnd().split("\n");
  const badLine = lines.findIndex((l) => l.split(",").length !== 4) + 1; // 1-based, header = line 1
  const good = lines.slice(1).filter((l) => l.split(",").length === 4);

  it("stop with the line number by default", async () => {
    expect(badLine).toBe(13);
    await fails(["scan", fixture("ragged.csv")], "bad_row", /cannot read '.*ragged\.csv' line 13: expected 4 fields, found 5; fix the row or pass --skip-bad-rows/);
  });
  it("stop with the line number far past the layout sample too", async () => {
    const rows = ["clinic,species", ...Array.from({ length: 30000 }, (_, i) => `c${i % 7},s${i % 3}`)];
    rows.splice(25000, 0, "c1,s1,extra"); // line 25001
    await fails(["scan", writeFile(dir, "ragged-far.csv", `${rows.join("\n")}\n`)], "bad_row", /line 25001: expected 2 fields, found 3/);
  });
  it("--skip-bad-rows skips them and the figures are those of the good rows", async () => {
    const p = await profiles(["scan", fixture("ragged.csv"), "--skip-bad-rows"]);
    expect(p.input.rows).toBe(good.length);
    expect(levels(p, "clinic")).toEqual(tally(good.map((l) => l.split(",")[1]!)));
  });
  it("countSkippedRows counts the skipped rows after the pass (undefined when not skipping)", async () => {
    const skipped = async (file: string, skipBadRows: boolean) => withEngine({ threads: 1 }, async (engine) => {
      const source = await openSource(engine, [file], { skipBadRows });
      await buildLevelTable(engine, { view: source.view, levelColumns: source.columns, countColumns: [], fold: rowHashFolds(source.columns, 5, 1) });
      return countSkippedRows(engine, source);
    });
    expect(await skipped(fixture("ragged.csv"), true)).toBe(lines.length - 1 - good.length);
    expect(await skipped(fixture("bom.csv"), true)).toBe(0);
    expect(await skipped(fixture("bom.csv"), false)).toBeUndefined();
    const many = ["a,b", ...Array.from({ length: 5000 }, (_, i) => (i % 7 === 0 ? `${i},${i},9` : `${i},${i}`))];
    expect(await skipped(writeFile(dir, "many-bad.csv", `${many.join("\n")}\n`), true)).toBe(many.filter((l) => l.split(",").length !== 2).length);
  });

  it("--skip-bad-rows reports the count in profile.json as input.skippedRows", async () => {
    const out = path.join(dir, "skipped");
    expect(await runCli(["scan", fixture("ragged.csv"), "--skip-bad-rows", "--out", out, "--quiet", "--format", "json"], collector().io)).toBe(0);
    const saved = JSON.parse(fs.readFileSync(path.join(out, "profile.json"), "utf8")) as Profile;
    expect(saved.input.skippedRows).toBe(lines.length - 1 - good.length);
  });

  it("a delimiter given with --delimiter still names the line", async () => {
    await fails(["scan", fixture("ragged.csv"), "--delimiter", ","], "bad_row", /line 13: expected 4 fields, found 5/);
  });
});

describe("text that DuckDB must read exactly", () => {
  it("quoted fields with embedded newlines, delimiters and quotes", async () => {
    const expected = csvParse(fs.readFileSync(fixture("quoted.csv"), "utf8"));
    const p = await profiles(["scan", fixture("quoted.csv"), "--columns", "note,clinic"]);
    expect(p.input.rows).toBe(expected.length);
    expect(levels(p, "note")).toEqual(tally(expected.map((r) => r.note!)));
    expect(levels(p, "clinic")).toEqual(tally(expected.map((r) => r.clinic!)));
    expect(Object.keys(levels(p, "note"))).toContain("line one\nline two, with comma");
  });
  it("a UTF-8 byte-order mark is not part of the first column's name", async () => {
    const p = await profiles(["scan", fixture("bom.csv")]);
    expect(p.columns.map((c) => c.name)).toEqual(["clinic", "no_show"]);
    expect(levels(p, "clinic")).toEqual({ North: 2, South: 1 });
  });
  it("non-UTF-8 bytes: an error naming the file and --encoding latin-1, which then reads 'Café'", async () => {
    await fails(["scan", fixture("latin1.csv")], "bad_encoding", /cannot read '.*latin1\.csv': it is not UTF-8 text .*pass --encoding latin-1/);
    const p = await profiles(["scan", fixture("latin1.csv"), "--encoding", "latin-1"]);
    expect(levels(p, "clinic")).toEqual({ "Café Vets": 2, North: 1 });
  });
  it("UTF-16 without --encoding is refused with a hint; with it, read exactly", async () => {
    await fails(["scan", fixture("utf16.csv")], "binary_input", /binary data.*--encoding utf-16/);
    const p = await profiles(["scan", fixture("utf16.csv"), "--encoding", "utf-16"]);
    expect(levels(p, "clinic")).toEqual({ "Café Vets": 2, North: 1 });
  });
});

describe("headers", () => {
  it("a repeated column name is an error naming it (DuckDB would rename it clinic_1)", async () => {
    await fails(["scan", fixture("duplicate-names.csv")], "duplicate_column", /names column 'clinic' twice \(columns 1 and 3\); rename one/);
  });
  it("an empty column name is an error naming its position", async () => {
    await fails(["scan", fixture("empty-name.csv")], "empty_column_name", /column 2 of '.*empty-name\.csv' has no name/);
  });
  it("a NUL byte in a column name is an error", async () => {
    await fails(["scan", fixture("nul-in-header.csv")], "bad_column_name", /column name with a NUL byte/);
  });
  it("a real column named like a DuckDB rename (clinic_1) is kept", async () => {
    const file = writeFile(dir, "suffix.csv", "clinic,clinic_1\nNorth,a\nSouth,b\n");
    const p = await profiles(["scan", file]);
    expect(p.columns.map((c) => c.name)).toEqual(["clinic", "clinic_1"]);
  });
});

describe("targets (see test/scan/target.test.ts for the figures)", () => {
  it("missing target values: exit 0, counted as missing", async () => {
    const file = writeFile(dir, "y-missing.csv", "clinic,y\nNorth,1\nSouth,\nNorth,0\nSouth,1\n");
    const p = await profiles(["scan", file, "--target", "y"]);
    expect(p.target).toMatchObject({ rows: 3, missing: 1 });
  });
  it("a single target value: exit 2", async () => {
    await fails(["scan", writeFile(dir, "y-single.csv", "clinic,y\nNorth,1\nSouth,1\n"), "--target", "y"], "target_single_value", /single value/);
  });
  it("two text target values: exit 2 asking for --positive", async () => {
    await fails(["scan", writeFile(dir, "y-text2.csv", "clinic,y\nNorth,cat\nSouth,dog\nNorth,cat\n"), "--target", "y"], "target_needs_positive", /--positive/);
  });
  it("three text target values over --max-classes: exit 2 saying what to do (three or more are multi-class, test/scan/multiclass.test.ts)", async () => {
    await fails(["scan", writeFile(dir, "y-text.csv", "clinic,y\nNorth,cat\nSouth,dog\nNorth,cow\n"), "--target", "y", "--max-classes", "2"], "target_too_many_classes", /more than 2 distinct values; name one class with --positive VALUE, or raise --max-classes/);
  });
});

describe("outputs", () => {
  const small = writeFile(dir, "small.csv", "clinic,y\nNorth,1\nSouth,0\nNorth,0\n");
  it("an output folder that cannot be made: exit 2, one line", async () => {
    // /proc and /sys refuse mkdir even for root (tests may run as root, so a read-only folder would not do)
    await fails(["scan", small, "--out", "/proc/tailsift-x"], "output_unwritable", /cannot write to folder '\/proc\/tailsift-x'/);
    await fails(["scan", small, "--out", "/sys/tailsift-x"], "output_unwritable", /cannot write to folder '\/sys\/tailsift-x'/);
    await fails(["scan", small, "--out", path.join(small, "sub")], "output_unwritable", /cannot write to folder/);
  });
  it("an output path that is an input", async () => {
    const out = path.join(dir, "plan");
    expect(await runCli(["scan", small, "--out", out, "--quiet", "--format", "json"], collector().io)).toBe(0);
    const profile = path.join(out, "profile.json");
    await fails(["report", profile, "--out", profile], "output_is_input", /is also an input; inputs are never modified/);
  });
});

describe("--debug", () => {
  it("adds the stack trace to the one line", async () => {
    const c = collector();
    expect(await runCli(["scan", fixture("duplicate-names.csv"), "--debug"], c.io)).toBe(2);
    expect(c.err.split("\n")[0]).toMatch(/^tailsift: .*names column 'clinic' twice/);
    expect((await cliFailure(["scan", fixture("duplicate-names.csv"), "--debug"])).code).toBe("duplicate_column");
    expect(c.err).toMatch(/\n\s+at /);
  });
});
