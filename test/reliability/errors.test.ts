/**
 * The one error path: engine errors become a TailsiftError with a stable code, one line naming
 * what, where and what to do, the DuckDB error kept as `cause`. The DuckDB messages used here are
 * produced by DuckDB itself in the test (not copied), so a change in its wording shows up here.
 */
import fs from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { withEngine } from "../../src/engine/db.js";
import { quoteLiteral } from "../../src/engine/sql.js";
import { diagnoseEngineMessage, firstLine, TailsiftError, wrapEngineError } from "../../src/errors.js";
import { tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("errors");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** The raw DuckDB error of a statement, bypassing our wrapping. */
async function duckdbMessage(sql: string): Promise<string> {
  return withEngine({ threads: 1 }, async (e) => {
    try {
      await e.connection.run(sql);
    } catch (err) {
      return (err as Error).message;
    }
    throw new Error(`no error from: ${sql}`);
  });
}

describe("diagnoseEngineMessage on DuckDB's own messages", () => {
  it("a ragged row past the layout sample: file and line", async () => {
    const rows = ["clinic,species", ...Array.from({ length: 30000 }, (_, i) => `c${i % 5},s${i % 3}`)];
    rows.splice(25000, 0, "c1,s1,extra");
    const file = writeFile(dir, "ragged.csv", `${rows.join("\n")}\n`);
    const text = await duckdbMessage(`SELECT count(*) FROM read_csv(${quoteLiteral(file)}, all_varchar = true)`);
    expect(text).toMatch(/CSV Error on Line: 25001/);
    expect(diagnoseEngineMessage(text)).toEqual({
      code: "bad_row",
      message: `cannot read '${file}' line 25001: expected 2 fields, found 3; fix the row or pass --skip-bad-rows`,
    });
  });

  it("invalid UTF-8: names the file and --encoding latin-1", async () => {
    const file = writeFile(dir, "latin.csv", Buffer.from("clinic\nCaf\xe9\nNorth\n", "latin1"));
    const text = await duckdbMessage(`SELECT count(*) FROM read_csv(${quoteLiteral(file)}, all_varchar = true)`);
    expect(diagnoseEngineMessage(text)).toMatchObject({ code: "bad_encoding", message: expect.stringMatching(new RegExp(`^cannot read '${file}': it is not UTF-8 text .*--encoding latin-1`)) });
  });

  it("a file that is not Parquet", async () => {
    const file = writeFile(dir, "fake.parquet", "clinic\nNorth\n");
    const text = await duckdbMessage(`SELECT * FROM read_parquet(${quoteLiteral(file)})`);
    expect(diagnoseEngineMessage(text)?.code).toBe("unreadable_parquet");
  });

  it("unknown messages are left to the generic wrapper", () => {
    expect(diagnoseEngineMessage("Binder Error: something new")).toBeNull();
  });
});

describe("wrapEngineError", () => {
  it("keeps the DuckDB error as cause and says what we were doing", () => {
    const cause = new Error("Binder Error: Referenced column \"x\" not found\n\nLINE 1: SELECT x");
    const wrapped = wrapEngineError(cause, "reading the plan");
    expect(wrapped).toBeInstanceOf(TailsiftError);
    expect(wrapped).toMatchObject({ code: "engine", exitCode: 2, message: "reading the plan failed: Binder Error: Referenced column \"x\" not found" });
    expect(wrapped.cause).toBe(cause);
  });

  it("an interrupt becomes `interrupted` with exit 130 (the CLI turns SIGTERM into 143)", () => {
    expect(wrapEngineError(new Error("INTERRUPT Error: Interrupted!"), "scanning 'x.csv'"))
      .toMatchObject({ code: "interrupted", exitCode: 130, message: "interrupted while scanning 'x.csv'" });
  });

  it("passes a TailsiftError through unchanged", () => {
    const err = new TailsiftError("bad_option", "--folds must be an integer");
    expect(wrapEngineError(err, "anything")).toBe(err);
  });

  it("never copies more than one line or 300 characters of an engine message", () => {
    const long = `Invalid Input Error: ${"x".repeat(5000)}\nOriginal Line: ${"y".repeat(5000)}`;
    expect(firstLine(new Error(long)).length).toBeLessThanOrEqual(300);
    expect(wrapEngineError(new Error(long), "reading").message).not.toContain("\n");
  });
});
