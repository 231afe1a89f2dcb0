/**
 * The CLI error contract, checked together: the exit code, the stable error code and the one-line
 * message. The error code is not printed on stderr, so it is read in-process: the commander
 * program (buildProgram, exitOverride) is run directly and the error it throws is caught — a
 * TailsiftError(code, message, exitCode), or commander's own CommanderError for option misuse.
 * Then runCli runs the same argv the way the binary does, for the exit code and the stderr line.
 */
import { CommanderError } from "commander";
import { expect } from "vitest";
import { buildProgram, runCli } from "../../src/cli.js";
import { isTailsiftError } from "../../src/errors.js";
import { collector } from "./tmp.js";

export interface CliFailure {
  /** What runCli returned (the process exit code). */
  exit: number;
  /** Everything printed on stderr and stdout by runCli. */
  stderr: string;
  stdout: string;
  /** The thrown error's stable code ("commander.unknownOption" etc. for commander's errors). */
  code: string;
  /** The thrown error's exit code. */
  exitCode: number;
  message: string;
}

/** Runs `argv` in-process twice: once to catch the thrown error, once through runCli. */
export async function cliFailure(argv: readonly string[]): Promise<CliFailure> {
  const quiet = collector();
  let thrown: unknown = null;
  try {
    await buildProgram(quiet.io).parseAsync([...argv], { from: "user" });
  } catch (err) {
    thrown = err;
  }
  const c = collector();
  const exit = await runCli(argv, c.io);
  const printed = { exit, stderr: c.err, stdout: c.out };
  if (isTailsiftError(thrown)) return { ...printed, code: thrown.code, exitCode: thrown.exitCode, message: thrown.message };
  if (thrown instanceof CommanderError) return { ...printed, code: thrown.code, exitCode: thrown.exitCode, message: thrown.message };
  throw new Error(`expected ${argv.join(" ")} to fail with a TailsiftError, got ${thrown === null ? "success" : String(thrown)}`);
}

/**
 * Asserts the contract for bad input: exit 2, the error code `code`, a message matching
 * `message`, and — for tailsift's own errors — exactly one stderr line "tailsift: <message>"
 * with no stack trace. Returns the failure for further checks.
 */
export async function expectCliError(argv: readonly string[], code: string, message: RegExp): Promise<CliFailure> {
  const f = await cliFailure(argv);
  expect(f.exit, f.stderr).toBe(2);
  expect(f.code, f.stderr).toBe(code);
  expect(f.message).toMatch(message);
  expect(f.stderr).not.toMatch(/\n\s+at /);
  if (!code.startsWith("commander.")) {
    expect(f.exitCode).toBe(2);
    expect(f.stderr.trimEnd().split("\n"), f.stderr).toEqual([`tailsift: ${f.message}`]);
  } else {
    expect(f.stderr).toContain(f.message);
  }
  return f;
}
