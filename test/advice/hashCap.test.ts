/**
 * Issue 14, point 9: the hash width cap --max-hash-bits is checked once, before anything is read
 * (scan and scan --levels: one line on stderr, exit 2, no output folder), recorded in the
 * profile's settings (settings.maxHashBits), and followed downstream: encode and tailsift sql
 * refuse a plan whose hashing width is past the recorded cap; a profile written before the cap
 * (no settings.maxHashBits) is not checked. The cap 2^20 is common practice (docs/references.md
 * "Hierarchy parents and hash widths"). Data: the invented small extract of test/encode/helpers.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { validateProfile } from "../../src/profile/schema.js";
import type { Profile } from "../../src/profile/types.js";
import { smallData } from "../encode/helpers.js";
import { cli } from "../levels/helpers.js";
import { tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("hash-cap");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const at = (n: string) => path.join(dir, n);
const readProfile = (d: string) => JSON.parse(fs.readFileSync(path.join(d, "profile.json"), "utf8")) as Profile;

let train: string;
beforeAll(async () => {
  train = writeFile(dir, "train.csv", smallData(600, 7, false));
  const r = await cli(["scan", train, "--out", at("plan"), "--quiet", "--no-progress"]);
  expect(r.code, r.err).toBe(0);
  const c = await cli(["scan", train, "--out", at("plan12"), "--max-hash-bits", "12", "--quiet", "--no-progress"]);
  expect(c.code, c.err).toBe(0);
}, 60_000);

describe("--max-hash-bits is validated once", () => {
  for (const value of ["31", "3", "0"]) {
    it(`scan --max-hash-bits ${value}: one line, exit 2, no output folder`, async () => {
      const out = at(`bad-${value}`);
      const r = await cli(["scan", train, "--out", out, "--max-hash-bits", value, "--no-progress"]);
      expect(r.code).toBe(2);
      expect(r.err.trim().split("\n")).toHaveLength(1);
      expect(r.err).toMatch(new RegExp(`--max-hash-bits must be an integer from 4 to 30 \\(got ${value}\\)`));
      expect(fs.existsSync(out)).toBe(false);
    });
  }
  // not a whole number: refused while the command line is parsed (commander adds its usage hint line)
  for (const value of ["2.5", "wide"]) {
    it(`scan --max-hash-bits ${value}: exit 2, the error names the option, no output folder`, async () => {
      const out = at(`bad-${value}`);
      const r = await cli(["scan", train, "--out", out, "--max-hash-bits", value, "--no-progress"]);
      expect(r.code).toBe(2);
      expect(r.err.trim().split("\n")[0]).toMatch(/--max-hash-bits must be an integer/);
      expect(r.err).not.toMatch(/\bat .*\.(js|ts):\d+/);
      expect(fs.existsSync(out)).toBe(false);
    });
  }

  it("scan --levels checks it the same way, before reading the level table", async () => {
    const r = await cli(["scan", "--levels", path.join(at("plan"), "levels.parquet"), "--max-hash-bits", "31", "--no-progress"]);
    expect(r.code).toBe(2);
    expect(r.err.trim().split("\n")).toHaveLength(1);
    expect(r.err).toMatch(/--max-hash-bits must be an integer from 4 to 30 \(got 31\)/);
  });
});

describe("settings.maxHashBits records the cap", () => {
  it("default 20, or the value given; the profile passes the schema", () => {
    expect(readProfile(at("plan")).settings.maxHashBits).toBe(20);
    const p = readProfile(at("plan12"));
    expect(p.settings.maxHashBits).toBe(12);
    expect(() => validateProfile(p)).not.toThrow();
  });

  it("scan --levels records it too", async () => {
    const out = at("levels-plan");
    const r = await cli(["scan", "--levels", path.join(at("plan"), "levels.parquet"), "--max-hash-bits", "9", "--out", out, "--quiet", "--no-progress"]);
    expect(r.code, r.err).toBe(0);
    expect(readProfile(out).settings.maxHashBits).toBe(9);
  });

  it("the schema refuses a cap outside 1..30", () => {
    const p = readProfile(at("plan12"));
    expect(() => validateProfile({ ...p, settings: { ...p.settings, maxHashBits: 31 } })).toThrow(/maxHashBits/);
  });
});

/** Copies a plan folder and makes `street` hashed at `width` (a user editing the plan). */
function planWithWidth(from: string, to: string, width: number, maxHashBits: number | undefined): string {
  fs.cpSync(from, to, { recursive: true });
  const file = path.join(to, "profile.json");
  const p = JSON.parse(fs.readFileSync(file, "utf8")) as Profile;
  if (maxHashBits === undefined) delete p.settings.maxHashBits;
  else p.settings.maxHashBits = maxHashBits;
  const c = p.columns.find((x) => x.name === "street")!;
  c.recommendation = { encoding: "hashing", params: { width, collisionRowShare: null, hash: "md5-first8-le", salt: "" }, reasons: ["edited"] };
  fs.writeFileSync(file, JSON.stringify(p));
  return to;
}

describe("encode and tailsift sql follow the recorded cap", () => {
  it("encode refuses a hashing width past 2^maxHashBits: one line, exit 2, no output", async () => {
    const plan = planWithWidth(at("plan12"), at("plan-wide"), 2 ** 13, 12);
    const out = at("wide.csv");
    const r = await cli(["encode", train, "--plan", plan, "--out", out, "--for", "scoring", "--no-progress"]);
    expect(r.code).toBe(2);
    expect(r.err.trim().split("\n")).toHaveLength(1);
    expect(r.err).toMatch(/plan column 'street': params\.width 8192 is above the plan's hash width cap 2\^12/);
    expect(fs.existsSync(out)).toBe(false);
  });

  it("tailsift sql --plan refuses it the same way", async () => {
    const r = await cli(["sql", "--plan", at("plan-wide"), "--from", "visits"]);
    expect(r.code).toBe(2);
    expect(r.err.trim().split("\n")).toHaveLength(1);
    expect(r.err).toMatch(/params\.width 8192 is above the plan's hash width cap 2\^12/);
  });

  it("a width at the cap is encoded; a profile without settings.maxHashBits is not checked", async () => {
    const atCap = planWithWidth(at("plan12"), at("plan-at-cap"), 2 ** 12, 12);
    const a = await cli(["encode", train, "--plan", atCap, "--out", at("at-cap.csv"), "--for", "scoring", "--no-progress"]);
    expect(a.code, a.err).toBe(0);
    const old = planWithWidth(at("plan12"), at("plan-old"), 2 ** 13, undefined);
    const b = await cli(["encode", train, "--plan", old, "--out", at("old.csv"), "--for", "scoring", "--no-progress"]);
    expect(b.code, b.err).toBe(0);
  });
});
