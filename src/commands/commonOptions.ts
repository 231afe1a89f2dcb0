/** Option parsers and option groups shared by the commands (commander). */
import { type Command, InvalidArgumentError } from "commander";
import { parseDecision } from "../advice/overrides.js";
import type { Encoding } from "../profile/types.js";

export const integer = (name: string, min?: number) => (value: string) => {
  if (!/^\s*-?\d+\s*$/.test(value)) throw new InvalidArgumentError(`${name} must be an integer`);
  const n = Number(value);
  // beyond 2^53 a JavaScript number is not that integer any more (a 30-digit --seed)
  if (!Number.isSafeInteger(n)) throw new InvalidArgumentError(`${name} must be an integer from ${-Number.MAX_SAFE_INTEGER} to ${Number.MAX_SAFE_INTEGER} (got ${value})`);
  if (min !== undefined && n < min) throw new InvalidArgumentError(`${name} must be an integer of at least ${min} (got ${value})`);
  return n;
};
/** A CSV delimiter: exactly one character, not a quote, newline or NUL; "\\t" means tab. */
export const delimiter = (value: string) => {
  const d = value === "\\t" ? "\t" : value;
  if ([...d].length !== 1) throw new InvalidArgumentError(`--delimiter must be one character (got '${value}'); use \\t for tab`);
  if (d === "\"" || d === "\n" || d === "\r" || d === "\u0000") throw new InvalidArgumentError("--delimiter cannot be a quote, a newline or NUL");
  return d;
};
export const fraction = (name: string) => (value: string) => {
  const x = Number(value);
  if (!Number.isFinite(x)) throw new InvalidArgumentError(`${name} must be a number`);
  return x;
};
export const list = (value: string, previous: string[] = []) => [...previous, ...value.split(",").map((s) => s.trim()).filter((s) => s !== "")];
export const decisions = (value: string, previous: Record<string, Encoding> = {}) => {
  const [column, encoding] = parseDecision(value);
  return { ...previous, [column]: encoding };
};

export function engineOptions(cmd: Command): Command {
  return cmd
    .option("--memory-limit <size>", "DuckDB memory limit, e.g. 8GB or 50%; beyond it DuckDB spills to --temp-dir (default: 1/4 of RAM, 2GiB to 16GiB)")
    .option("--threads <n>", "DuckDB threads (default: all cores)", integer("--threads"))
    .option("--temp-dir <dir>", "folder DuckDB spills to when memory runs short (default: the OS temp folder)")
    .option("--quiet", "print nothing but results and errors")
    .option("--no-progress", "no progress bar (it only shows when stderr is a terminal)")
    .option("--debug", "print the stack trace of an error");
}

export function sourceOptions(cmd: Command): Command {
  return cmd
    .option("--skip-bad-rows", "skip rows that do not parse (ragged rows) instead of stopping")
    .option("--encoding <name>", "text encoding of CSV input: utf-8, latin-1 or utf-16")
    .option("--delimiter <char>", "CSV delimiter (default: detected; tab for .tsv)", delimiter)
    .option("--missing-like <values>", "read these values as missing in every column, trimmed and case-insensitive, e.g. unknown,n/a (comma-separated, repeatable; encode and drift default to the plan's)", list);
}

