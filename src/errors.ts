/**
 * The one error type tailsift raises for problems a user can fix: bad options, unreadable or
 * unusable input, a plan that does not match the data. `code` is stable (tests and scripts may
 * match on it); `exitCode` is what the CLI exits with (2 for bad usage or input).
 * Only src/cli.ts prints these and exits.
 */
export class TailsiftError extends Error {
  readonly code: string;
  readonly exitCode: number;

  constructor(code: string, message: string, exitCode = 2, options?: { cause?: unknown }) {
    super(message, options);
    this.name = "TailsiftError";
    this.code = code;
    this.exitCode = exitCode;
  }
}

/** True when `err` is a TailsiftError (also across module copies). */
export function isTailsiftError(err: unknown): err is TailsiftError {
  return err instanceof TailsiftError || (err instanceof Error && err.name === "TailsiftError" && "code" in err);
}

/** The first line of an engine error, without DuckDB's multi-line context. */
export function firstLine(err: unknown): string {
  const text = err instanceof Error ? err.message : String(err);
  return (text.split("\n").find((l) => l.trim() !== "") ?? text).trim();
}

/**
 * Wraps an engine (DuckDB) error with what we were doing, keeping the original as `cause`.
 * Interrupts pass through as `interrupted` so the CLI can exit 130/143.
 */
export function wrapEngineError(err: unknown, doing: string): TailsiftError {
  if (isTailsiftError(err)) return err;
  const line = firstLine(err);
  if (/INTERRUPT/i.test(line)) {
    return new TailsiftError("interrupted", `interrupted while ${doing}`, 130, { cause: err });
  }
  return new TailsiftError("engine", `${doing} failed: ${line}`, 2, { cause: err });
}
