/**
 * Fuzz (seeded, mulberry32): random bytes and random CSV-shaped text — ragged rows, unbalanced
 * quotes, empty and repeated names, BOMs, NUL and invalid UTF-8 bytes, CR/LF mixes — through the
 * CLI in-process. Every run ends with exit 0, or exit 2 and one line naming a known problem;
 * never an exception that escapes runCli or an "unexpected error".
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli.js";
import { collector, mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("fuzz");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const rand = mulberry32(20261201);
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)]!;
const int = (lo: number, hi: number) => lo + Math.floor(rand() * (hi - lo + 1));

const PIECES = ["North", "South", "Café", "a", "b", "1", "0", "", " ", '"', '""', ",", ";", "\t", "\r", "\n", "\u0000", "é", "☕", "=1+1", "<b>", "select"];
const NAMES = ["clinic", "species", "y", "", "clinic", "a b", '"q"', "column1", "x_1", "é"];

function randomBytes(): Buffer {
  return Buffer.from(Array.from({ length: int(1, 3000) }, () => int(0, 255)));
}

const SAFE = ["North", "South", "Café", "1", "0", "", "é", "☕", "=1+1", "<b>", "select", "a b", 'say "hi"', "x,y", "two\nlines"];
const quoted = (v: string) => (/[",\n]/.test(v) ? `"${v.replaceAll('"', '""')}"` : v);

/** Well-formed CSV (RFC 4180 quoting, unique names) with random values: should scan. */
function cleanCsv(): Buffer {
  const width = int(1, 5);
  const names = Array.from({ length: width }, (_, j) => `${pick(["clinic", "species", "é", "a b", "select"])}${j}`);
  const lines = [names.map(quoted).join(",")];
  for (let i = int(1, 30); i > 0; i--) lines.push(Array.from({ length: width }, () => quoted(pick(SAFE))).join(","));
  const eol = pick(["\n", "\r\n"]);
  return Buffer.from(`${lines.join(eol)}${eol}`, "utf8");
}

/** CSV-shaped text with damage: ragged rows, stray quotes, control bytes, BOMs, invalid UTF-8. */
function messyCsv(): Buffer {
  const width = int(1, 5);
  const names = Array.from({ length: width }, () => pick(NAMES));
  const lines = [names.join(",")];
  for (let i = int(0, 30); i > 0; i--) {
    const fields = rand() < 0.85 ? width : int(1, width + 2);
    lines.push(Array.from({ length: fields }, () => Array.from({ length: int(0, 3) }, () => pick(PIECES)).join("")).join(","));
  }
  const eol = pick(["\n", "\r\n", "\r"]);
  let bytes = Buffer.from(lines.join(eol) + (rand() < 0.5 ? eol : ""), "utf8");
  if (rand() < 0.15) bytes = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), bytes]);
  if (rand() < 0.15) bytes = Buffer.concat([bytes, Buffer.from([0xe9, 0xff, 0xc3])]);
  return bytes;
}

const cases = Array.from({ length: 40 }, (_, i) => {
  const binary = i % 4 === 0;
  const name = `f${i}${binary ? pick([".csv", ".parquet", ".jsonl", ".tsv"]) : i % 2 === 0 ? ".csv" : pick([".csv", ".csv", ".tsv"])}`;
  const options = [
    ...(rand() < 0.3 ? ["--skip-bad-rows"] : []),
    ...(rand() < 0.3 ? ["--target", pick(NAMES) || "y"] : []),
    ...(rand() < 0.15 ? ["--encoding", "latin-1"] : []),
  ];
  return { name, content: binary ? randomBytes() : i % 2 === 0 ? cleanCsv() : messyCsv(), options };
});

describe("fuzz: 40 seeded inputs", () => {
  it("exit 0, or exit 2 with one line; never an unhandled or unexpected error", async () => {
    const codes: Record<string, number> = {};
    for (const { name, content, options } of cases) {
      const file = writeFile(dir, name, content);
      const c = collector();
      const args = ["scan", file, ...options, "--threads", "1", "--format", "json"];
      let code: number;
      try {
        code = await runCli(args, c.io);
      } catch (err) {
        throw new Error(`runCli threw for ${JSON.stringify(args)}: ${String(err)}`);
      }
      expect([0, 2], `${JSON.stringify(args)}\n${c.err}`).toContain(code);
      if (code === 2) {
        expect(c.err.trimEnd().split("\n"), c.err).toHaveLength(1);
        expect(c.err, `${JSON.stringify(args)} ${JSON.stringify(content.toString("latin1").slice(0, 200))}`).not.toMatch(/unexpected error|failed: /);
      } else {
        expect(() => JSON.parse(c.out)).not.toThrow();
      }
      codes[code] = (codes[code] ?? 0) + 1;
    }
    // both outcomes occur, so the generator reaches good and bad input alike
    expect(codes[0]).toBeGreaterThan(0);
    expect(codes[2]).toBeGreaterThan(0);
  });
});
