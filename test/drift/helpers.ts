/**
 * Helpers for the drift tests: an in-process CLI runner (runCli), plan making through the
 * library scan, the sample-data generator, and plain CSV reading for independent recomputations.
 */
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { runCli } from "../../src/cli.js";
import { scan, type ScanOptions } from "../../src/commands/scan.js";
import { LEVEL_FILE_NAME } from "../../src/engine/levelFile.js";
import { collector } from "../helpers/tmp.js";

export interface CliResult { code: number; out: string; err: string }

export async function cli(argv: string[]): Promise<CliResult> {
  const c = collector();
  const code = await runCli(argv, c.io);
  return { code, out: c.out, err: c.err };
}

/** A plan folder (profile.json + levels.parquet) from the library scan, without the HTML report. */
export async function makePlan(inputs: string[], dir: string, options: ScanOptions = {}): Promise<string> {
  fs.mkdirSync(dir, { recursive: true });
  const profile = await scan(inputs, { threads: 1, ...options, levelTableOut: path.join(dir, LEVEL_FILE_NAME) });
  const file = path.join(dir, "profile.json");
  fs.writeFileSync(file, JSON.stringify(profile));
  return file;
}

const GENERATOR = fileURLToPath(new URL("../../sample-data/generate.mjs", import.meta.url));

/** The invented appointment log: `node sample-data/generate.mjs --rows N --seed S [--shift]`. */
export function generate(out: string, rows: number, seed: number, shift = false): string {
  execFileSync(process.execPath, [GENERATOR, "--rows", String(rows), "--seed", String(seed), "--out", out, ...(shift ? ["--shift"] : [])]);
  return out;
}

/** A simple CSV (no quoting: the generator never quotes) as header + rows of fields. */
export function readCsv(file: string): { header: string[]; rows: string[][] } {
  const lines = fs.readFileSync(file, "latin1").split("\n").filter((l) => l !== "");
  const [head = "", ...rest] = lines;
  return { header: head.split(","), rows: rest.map((l) => l.split(",")) };
}

/** Level counts of one column, plain JavaScript (empty field = missing, keyed as null). */
export function levelCounts(file: string, column: string): Map<string | null, number> {
  const { header, rows } = readCsv(file);
  const i = header.indexOf(column);
  const counts = new Map<string | null, number>();
  for (const r of rows) {
    const v = r[i] === undefined || r[i] === "" ? null : r[i]!;
    counts.set(v, (counts.get(v) ?? 0) + 1);
  }
  return counts;
}

/** PSI = Σ (aᵢ − eᵢ)·ln(aᵢ/eᵢ) over shares, written out plainly (no bin may be empty). */
export function plainPsi(actual: number[], expected: number[]): number {
  const sa = actual.reduce((s, x) => s + x, 0);
  const se = expected.reduce((s, x) => s + x, 0);
  return actual.reduce((s, a, i) => s + (a / sa - expected[i]! / se) * Math.log((a / sa) / (expected[i]! / se)), 0);
}
