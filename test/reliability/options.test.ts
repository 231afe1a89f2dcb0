/**
 * Issue 17, items 6–9: bad options and inputs that used to be accepted, refused at random or
 * answered with a message from inside (commander, DuckDB, a statistics module). Each case must
 * give exit 2 and ONE line starting "tailsift: ", no stack trace. Expected texts are ours.
 */
import fs from "node:fs";
import path from "node:path";
import zlib from "node:zlib";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { collector, mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("options");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const SAMPLE = "sample-data/appointments.csv.gz";

async function fails(args: string[], message: RegExp): Promise<string> {
  const c = collector();
  const code = await runCli(args, c.io);
  expect(code, c.err).toBe(2);
  const lines = c.err.trimEnd().split("\n");
  expect(lines, c.err).toHaveLength(1);
  expect(lines[0]).toMatch(/^tailsift: /);
  expect(c.err).not.toMatch(/\n\s+at /);
  expect(lines[0]).toMatch(message);
  return lines[0]!;
}

/** A small CSV of `rows` rows built by `row(i)`, with header `header`. */
function csv(name: string, header: string, rows: number, row: (i: number) => string): string {
  const lines = [header];
  for (let i = 0; i < rows; i++) lines.push(row(i));
  return writeFile(dir, name, `${lines.join("\n")}\n`);
}

describe("numeric and text options are validated (item 8, validation half)", () => {
  const small = csv("small.csv", "clinic,y", 200, (i) => `c${i % 4},${i % 2}`);
  it.each([
    [["--top", "0"], /--top must be an integer of at least 1/],
    [["--top", "-5"], /--top must be an integer of at least 1/],
    [["--delimiter", ""], /--delimiter must be one character/],
    [["--delimiter", ";;"], /--delimiter must be one character/],
    [["--delimiter", "\""], /--delimiter cannot be a quote/],
    [["--target", ""], /--target needs a value/],
    [["--out", " "], /--out needs a value/],
    [["--temp-dir", ""], /--temp-dir needs a value/],
    [["--folds", "2.5"], /--folds must be an integer/],
    [["--threads", "x"], /--threads must be an integer/],
  ])("scan %j is refused", async (args, message) => {
    await fails(["scan", small, ...args], message);
  });
  it("drift and encode options are checked the same way", async () => {
    await fails(["drift", small, "--plan", ""], /--plan needs a value/);
    await fails(["encode", small, "--plan", dir, "--out", "", "--for", "scoring"], /--out needs a value/);
    await fails(["sql", "--columns", "a", "--from", "t", "--folds", "1e3"], /--folds must be an integer/);
  });
  it("a tab delimiter can be written as \\t", async () => {
    const tsv = writeFile(dir, "tab.txt", "a\tb\nx\t1\ny\t2\n");
    const c = collector();
    expect(await runCli(["scan", tsv, "--delimiter", "\\t", "--format", "json"], c.io), c.err).toBe(0);
    expect((JSON.parse(c.out) as { columns: { name: string }[] }).columns.map((x) => x.name)).toEqual(["a", "b"]);
  });
});

describe("clear one-line errors (item 9)", () => {
  it("commander's own errors are one prefixed line, exit 2", async () => {
    await fails(["scan", "x.csv", "--bogus"], /^tailsift: unknown option '--bogus'/);
    await fails(["scan"], /^tailsift: missing required argument 'inputs'/);
    await fails(["scan", "x.csv", "--target"], /^tailsift: option '--target <column>' argument missing/);
    await fails(["frobnicate"], /^tailsift: unknown command 'frobnicate'/);
  });
  it("a 30-digit --seed is refused before any scan", async () => {
    await fails(["scan", SAMPLE, "--seed", "123456789012345678901234567890"], /--seed must be an integer from -9007199254740991 to 9007199254740991/);
  });
  it("an absurd --memory-limit is refused in our words", async () => {
    const line = await fails(["scan", SAMPLE, "--memory-limit", "99999999TB"], /--memory-limit '99999999TB' is larger than any machine/);
    expect(line).not.toMatch(/Parser Error/);
  });
  it("a continuous target value of 1e400 is named, not a statistics module", async () => {
    const f = csv("inf.csv", "g,y", 300, (i) => `${i % 2 ? "a" : "b"},${i % 5 === 0 ? "1e400" : String(i % 7)}`);
    const line = await fails(["scan", f, "--target", "y", "--target-kind", "continuous"], /target 'y' has values too large to add up/);
    expect(line).not.toMatch(/normalNormalPriorWeight/);
  });
  it("--positive yes when the values are Yes says that the case differs", async () => {
    const f = csv("yes.csv", "g,y", 300, (i) => `${i % 2 ? "a" : "b"},${i % 3 === 0 ? "Yes" : "No"}`);
    await fails(["scan", f, "--target", "y", "--positive", "yes"], /no row of target 'y' is 'yes'.*check the case/);
  });
  it("a one-hot level containing NUL is one clear line at encode", async () => {
    const levels = ["a", "b", "c\u0000d", "e", "f", "g", "h", "i", "j", "k"];
    const f = csv("nul.csv", "k,y", 3000, (i) => `${levels[i % 10]},${i % 2}`);
    const plan = path.join(dir, "nulplan");
    const c = collector();
    expect(await runCli(["scan", f, "--target", "y", "--out", plan, "--quiet"], c.io), c.err).toBe(0);
    const line = await fails(["encode", f, "--plan", plan, "--out", path.join(dir, "nul.out.csv"), "--for", "training"], /the value 'c\\0d' holds a NUL byte/);
    expect(line).not.toMatch(/unexpected error/);
  });
});

describe("compressed input that is not whole (item 7)", () => {
  const whole = fs.readFileSync(SAMPLE);
  const truncated = writeFile(dir, "cut.csv.gz", whole.subarray(0, Math.floor(whole.length / 2)));
  const corrupt = writeFile(dir, "bad.csv.gz", Buffer.concat([whole.subarray(0, 20000), Buffer.alloc(5000, 7), whole.subarray(25000)]));
  it.each([[[]], [["--skip-bad-rows"]]])("a truncated .csv.gz is an error naming the file (%j)", async (extra) => {
    await fails(["scan", truncated, ...extra], /cannot read '.*cut\.csv\.gz': it is truncated/);
  });
  it("a corrupt .csv.gz is an error naming the file with --skip-bad-rows", async () => {
    await fails(["scan", corrupt, "--skip-bad-rows"], /cannot read '.*bad\.csv\.gz': it is not a whole gzip stream/);
  });
  it("a whole .csv.gz still reads (Node's gunzip of the same bytes agrees on the rows)", async () => {
    const small = writeFile(dir, "ok.csv.gz", zlib.gzipSync("a,b\nx,1\ny,2\nz,3\n"));
    const c = collector();
    expect(await runCli(["scan", small, "--skip-bad-rows", "--format", "json"], c.io), c.err).toBe(0);
    expect((JSON.parse(c.out) as { input: { rows: number } }).input.rows).toBe(3);
  });
});

describe("raw header read deterministically at two threads (item 6)", () => {
  // Over 32 MiB (DuckDB's read buffer here) so several threads read the file in parallel; the
  // names end in _<digits>, which makes tailsift re-read the header as data.
  const random = mulberry32(6);
  const cols = Array.from({ length: 50 }, (_, i) => `c_${i}`);
  const words = ["a", "b", "cc", "d"];
  const file = path.join(dir, "wide.csv");
  const fd = fs.openSync(file, "w");
  fs.writeSync(fd, `${cols.join(",")}\n`);
  for (let chunk = 0; chunk < 40; chunk++) {
    const lines: string[] = [];
    for (let r = 0; r < 10000; r++) lines.push(cols.map(() => words[Math.floor(random() * 4)]).join(","));
    fs.writeSync(fd, `${lines.join("\n")}\n`);
  }
  fs.closeSync(fd);
  it.each([1, 2, 3, 4])("try %i: the header is the first line", async () => {
    const c = collector();
    const code = await runCli(["scan", file, "--threads", "2", "--columns", "c_1", "--format", "json"], c.io);
    expect(code, c.err).toBe(0);
    expect((JSON.parse(c.out) as { input: { rows: number } }).input.rows).toBe(400000);
  }, 120_000);
});
