/**
 * Helpers of the encode tests: a plain CSV reader, the CLI in-process (with the encode command
 * registered even before src/cli.ts wires it), a scan that writes a plan folder, and the seeded
 * small data set the brute-force checks use.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { CommanderError } from "commander";
import { buildProgram } from "../../src/cli.js";
import { addEncodeCommand } from "../../src/commands/encodeCli.js";
import type { CliIO } from "../../src/commands/io.js";
import { isTailsiftError } from "../../src/errors.js";
import type { Profile } from "../../src/profile/types.js";
import { collector, mulberry32 } from "../helpers/tmp.js";

export type Cell = string | null;
export interface Csv { header: string[]; rows: Cell[][] }

/** Reads CSV without quoting (the test data never needs it); an empty field is missing (null). */
export function parseCsv(text: string): Csv {
  const lines = text.split("\n").filter((l) => l !== "");
  const [head = "", ...body] = lines;
  return { header: head.split(","), rows: body.map((l) => l.split(",").map((v) => (v === "" ? null : v))) };
}

/** A column of a parsed CSV by name. */
export function column(csv: Csv, name: string): Cell[] {
  const k = csv.header.indexOf(name);
  if (k < 0) throw new Error(`no column ${name} in ${csv.header.join(",")}`);
  return csv.rows.map((r) => r[k] ?? null);
}

/** Runs the CLI in-process; mirrors runCli's error handling so exit codes and messages match. */
export async function runEncodeCli(argv: string[], io: CliIO): Promise<number> {
  const program = buildProgram(io);
  if (!program.commands.some((c) => c.name() === "encode")) addEncodeCommand(program, io);
  try {
    await program.parseAsync(argv, { from: "user" });
    return 0;
  } catch (err) {
    // issue 17: commander no longer prints its own errors; runCli prints them as one prefixed line
    if (err instanceof CommanderError) { if (err.exitCode !== 0) io.stderr(`tailsift: ${err.message.replace(/^error: /, "")}\n`); return err.exitCode === 0 ? 0 : 2; }
    if (isTailsiftError(err)) { io.stderr(`tailsift: ${err.message}\n`); return err.exitCode; }
    io.stderr(`tailsift: unexpected error: ${String(err)}\n`);
    return 2;
  }
}

/** Runs the CLI and fails the test with its stderr when the exit code is not 0. */
export async function ok(argv: string[]): Promise<{ out: string; err: string }> {
  const c = collector();
  const code = await runEncodeCli(argv, c.io);
  if (code !== 0) throw new Error(`exit ${code}: ${c.err}`);
  return { out: c.out, err: c.err };
}

/** `scan FILE --out DIR` with extra arguments; returns the profile. */
export async function scanPlan(file: string, dir: string, extra: string[]): Promise<Profile> {
  await ok(["scan", file, "--out", dir, "--quiet", ...extra]);
  return JSON.parse(fs.readFileSync(path.join(dir, "profile.json"), "utf8")) as Profile;
}

/** Rewrites one column's recommendation params in a saved profile (a user editing the plan). */
export function editParams(dir: string, name: string, params: Record<string, unknown>): Profile {
  const file = path.join(dir, "profile.json");
  const profile = JSON.parse(fs.readFileSync(file, "utf8")) as Profile;
  const col = profile.columns.find((c) => c.name === name);
  if (!col) throw new Error(`no column ${name}`);
  col.recommendation.params = { ...col.recommendation.params, ...params };
  fs.writeFileSync(file, JSON.stringify(profile));
  return profile;
}

/** The hashing trick's bucket in Node: little-endian uint64 of MD5's first 8 bytes, mod width. */
export function md5Bucket(level: string, width: number, salt = ""): number {
  return Number(createHash("md5").update(salt + level).digest().readBigUInt64LE(0) % BigInt(width));
}

function pick<T>(r: () => number, items: readonly T[], weights: readonly number[]): T {
  const total = weights.reduce((a, b) => a + b, 0);
  let u = r() * total;
  for (let i = 0; i < items.length; i++) {
    u -= weights[i] ?? 0;
    if (u <= 0) return items[i] as T;
  }
  return items[items.length - 1] as T;
}
const names = (prefix: string, n: number) => Array.from({ length: n }, (_, i) => `${prefix}${String(i + 1).padStart(2, "0")}`);
const zipf = (n: number) => Array.from({ length: n }, (_, i) => 1 / (i + 1));
const flat = (n: number) => Array.from({ length: n }, () => 1);

/**
 * A seeded small extract: id (unique), shop (drives y; rare levels), colour, size, member,
 * street, brand, grade, amount (numeric), y (binary, ~3 % missing). Training row 5 is the only
 * row of shop 's77' (a level with no rows in the other folds). `later` draws the same
 * world plus one unseen level in each categorical column, and more missing shops.
 */
export function smallData(rows: number, seed: number, later: boolean): string {
  const r = mulberry32(seed);
  const plus = (base: string[], unseen: string) => (later ? [...base, unseen] : base);
  const w = (base: number[], unseen: number) => (later ? [...base, unseen] : base);
  const shops = plus(names("s", 15), "s90");
  const rate = (s: string | null) => (s === null ? 0.3 : 0.1 + (0.6 * ((Number(s.slice(1)) * 7) % 15)) / 15);
  const out = ["id,shop,colour,size,member,street,brand,grade,amount,y"];
  for (let i = 0; i < rows; i++) {
    const drawn = r() < (later ? 0.1 : 0.05) ? null : pick(r, shops, w(zipf(15), 0.3));
    const single = !later && i === 5; // one training row of level s77: no other-fold rows
    const shop = single ? "s77" : drawn;
    const colour = r() < 0.05 ? null : pick(r, plus(["red", "green", "blue", "white"], "teal"), w([4, 3, 2, 1], 1));
    const size = r() < 0.03 ? null : pick(r, plus(names("z", 8), "z99"), w(zipf(8), 0.2));
    const member = r() < 0.08 ? null : pick(r, plus(["yes", "no"], "maybe"), w([1, 2], 0.2));
    const street = pick(r, plus(names("st", 40), "st99"), w(flat(40), 1));
    const brand = pick(r, plus(names("b", 20), "b99"), w(zipf(20), 0.1));
    const grade = pick(r, plus(names("g", 10), "g99"), w([3, 3, 2, 2, 2, 1, 1, 1, 1, 1], 1));
    const amount = (r() * 1000).toFixed(2);
    const y = r() < 0.03 && !single ? null : r() < rate(shop) ? "1" : "0";
    out.push([`r${String(i).padStart(5, "0")}`, shop, colour, size, member, street, brand, grade, amount, y].map((v) => v ?? "").join(","));
  }
  return `${out.join("\n")}\n`;
}
