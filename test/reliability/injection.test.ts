/**
 * No injection: column names, level values, option values and file paths that look like SQL,
 * markup or spreadsheet formulas are data. A scan of such a file reports exactly the figures an
 * independent parser (d3-dsv, RFC 4180) gives for the same text.
 */
import fs from "node:fs";
import path from "node:path";
import { csvParse } from "d3-dsv";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { withEngine } from "../../src/engine/db.js";
import type { Profile } from "../../src/profile/types.js";
import { collector, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("injection");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const NAMES = ['a"b', "my col", "select", '"; DROP TABLE x; --', "café ☕", "Robert'); --", "y"];
const LEVELS = ["it's", 'say "hi"', "line\nbreak", "<script>alert(1)</script>", "=cmd|' /C calc'!A0", "+1", "-2", "@SUM(1)", "from", "'; DELETE FROM t; --", "tab\there"];

/** RFC 4180 quoting: every field quoted, inner quotes doubled. */
const field = (v: string) => `"${v.replaceAll('"', '""')}"`;

function hostileCsv(): string {
  const rows: string[][] = [];
  for (let i = 0; i < 44; i++) {
    rows.push(NAMES.map((_, j) => (j === NAMES.length - 1 ? String(i % 3 === 0 ? 1 : 0) : LEVELS[(i * (j + 1) + j) % LEVELS.length]!)));
  }
  return `${NAMES.map(field).join(",")}\n${rows.map((r) => r.map(field).join(",")).join("\n")}\n`;
}

const tally = (values: string[]) => values.reduce<Record<string, number>>((acc, v) => ({ ...acc, [v]: (acc[v] ?? 0) + 1 }), {});

async function scanJson(args: string[]): Promise<Profile> {
  const c = collector();
  expect(await runCli([...args, "--format", "json"], c.io), c.err).toBe(0);
  return JSON.parse(c.out) as Profile;
}

describe("hostile column names and level values", () => {
  const text = hostileCsv();
  const file = writeFile(dir, "hostile.csv", text);
  const parsed = csvParse(text);

  it("scan names every column as written and counts every level exactly", async () => {
    expect(parsed.columns).toEqual(NAMES);
    const p = await scanJson(["scan", file, "--target", "y", "--as-categorical", NAMES.slice(0, -1).join(",")]);
    expect(p.columns.map((c) => c.name)).toEqual(NAMES);
    expect(p.input.rows).toBe(parsed.length);
    expect(p.target).toMatchObject({ column: "y", rows: parsed.length, mean: parsed.filter((r) => r.y === "1").length / parsed.length });
    for (const name of NAMES.slice(0, -1)) {
      const column = p.columns.find((c) => c.name === name)!;
      expect(Object.fromEntries(column.topLevels.map((l) => [l.value, l.rows])), name).toEqual(tally(parsed.map((r) => r[name]!)));
    }
  });

  it("the names work in --columns, --target and --out; levels.parquet holds them verbatim", async () => {
    const out = path.join(dir, "out");
    const target = "y'); DROP TABLE t; --";
    const withTarget = text.replace(/^.*\n/, `${NAMES.slice(0, -1).map(field).join(",")},${field(target)}\n`);
    const tFile = writeFile(dir, "hostile-target.csv", withTarget);
    const c = collector();
    expect(await runCli(["scan", tFile, "--target", target, "--columns", 'a"b,select', "--out", out, "--quiet"], c.io), c.err).toBe(0);
    const rows = await withEngine({}, (e) => e.rows<{ column: string; level: string; n: number }>(
      "SELECT \"column\", level, sum(rows)::INTEGER AS n FROM read_parquet($p) GROUP BY ALL ORDER BY ALL", "reading back", { p: path.join(out, "levels.parquet") }));
    for (const name of ['a"b', "select"]) {
      const got = Object.fromEntries(rows.filter((r) => r.column === name).map((r) => [r.level, r.n]));
      expect(got, name).toEqual(tally(parsed.map((r) => r[name]!)));
    }
    const html = fs.readFileSync(path.join(out, "report.html"), "utf8");
    expect(html).not.toContain("<script>alert(1)</script>");
  });

  it("a --positive value with quotes is a value", async () => {
    const f = writeFile(dir, "positive.csv", "clinic,outcome\nNorth,it's\nSouth,no\nNorth,it's\nSouth,it's\n");
    const p = await scanJson(["scan", f, "--target", "outcome", "--positive", "it's"]);
    expect(p.target).toMatchObject({ kind: "binary", positive: "it's", rows: 4, mean: 3 / 4 });
  });

  it("a NUL byte inside a level value is kept as part of the value", async () => {
    const f = writeFile(dir, "nul-level.csv", Buffer.from("clinic,species\nx\u0000z,dog\nq,cat\nx\u0000z,cat\n", "utf8"));
    const p = await scanJson(["scan", f]);
    expect(Object.fromEntries(p.columns[0]!.topLevels.map((l) => [l.value, l.rows]))).toEqual({ "x\u0000z": 2, q: 1 });
  });
});

describe("file paths", () => {
  it("a file name with a single quote, spaces and unicode", async () => {
    const f = writeFile(dir, "clinic's visits ☕.csv", "clinic\nNorth\nSouth\nNorth\n");
    const p = await scanJson(["scan", f]);
    expect(p.input.paths).toEqual([f]);
    expect(p.columns[0]!.topLevels.map((l) => [l.value, l.rows])).toEqual([["North", 2], ["South", 1]]);
  });

  it("a glob inside a folder whose name has a quote", async () => {
    const folder = path.join(dir, "o'brien's data");
    fs.mkdirSync(folder);
    writeFile(folder, "a.csv", "clinic\nNorth\n");
    writeFile(folder, "b.csv", "clinic\nSouth\nSouth\n");
    const p = await scanJson(["scan", path.join(folder, "*.csv")]);
    expect(p.input.rows).toBe(3);
    expect(p.input.paths.map((x) => path.basename(x))).toEqual(["a.csv", "b.csv"]);
  });

  it("a file whose name has glob characters is read as that file", async () => {
    const f = writeFile(dir, "visits[1].csv", "clinic\nNorth\n");
    expect((await scanJson(["scan", f])).input.rows).toBe(1);
  });
});
