/**
 * The walk of scan's `--folds` from the command line to the SQL of the pass and into encode
 * (DEVELOPERS.md "The fold contract"): every file where the fold request or the fold contract is
 * parsed, made, turned into SQL, or read back from a plan. The request is made into a contract in
 * one place (engine/folds foldContractFor), the contract becomes SQL in one place
 * (engine/folds foldSql, called once for the pass by engine/passPlan rowFieldsSql) and encode reads
 * it back through one function (readFoldContract). The goal of the code's layout is at most six
 * files, each with one step; this test fails when a seventh file starts handling folds on that walk.
 * Not on the walk: K also reaches encode's out-of-fold map builders (encode/targetMaps and the
 * target-kfold and hierarchy encodings) as a number, because a map has one row per fold 0..K−1
 * even for a fold with no rows of a level; they never see the contract or its SQL.
 */
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";

const SRC = fileURLToPath(new URL("../../src/", import.meta.url));

function sourceFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const full = path.join(dir, e.name);
    return e.isDirectory() ? sourceFiles(full) : e.name.endsWith(".ts") ? [full] : [];
  });
}

/** Source without comments, so a mention in a doc comment is not a step of the walk. */
const code = (text: string) => text.replace(/\/\*[\s\S]*?\*\//g, "").replace(/(^|[^:"'`])\/\/.*$/gm, "$1");

/** The steps of the walk, each a pattern of code that performs it. */
const STEPS: Record<string, RegExp> = {
  "declares scan's --folds": /option\(\s*"--folds <k>",\s*"folds for out-of-fold figures"/,
  "makes the contract from the request": /\bfoldContractFor\(/,
  "turns a contract into SQL": /\bfoldSql\(/,
  "reads the contract back from a plan": /\breadFoldContract\(/,
  "writes the fold column of encode's output": /\bctx\.folds\.(?:expr|contract)\b/,
};

function walk(): Map<string, string[]> {
  const files = new Map<string, string[]>();
  for (const full of sourceFiles(SRC)) {
    const text = code(fs.readFileSync(full, "utf8"));
    const steps = Object.entries(STEPS).filter(([, re]) => re.test(text)).map(([name]) => name);
    if (steps.length > 0) files.set(path.relative(SRC, full).split(path.sep).join("/"), steps);
  }
  return files;
}

describe("the walk of --folds", () => {
  it("touches at most six files, each of them named here", () => {
    const files = walk();
    expect([...files.keys()].sort()).toEqual([
      "cli.ts", // the option and its default
      "commands/encode.ts", // readFoldContract + foldSql over encode's input view
      "commands/scan.ts", // foldContractFor, once, after the input's columns are known
      "encode/writeOutput.ts", // the fold column and the manifest's fold entry
      "engine/folds.ts", // the contract: made, validated, turned into SQL, read back
      "engine/passPlan.ts", // the pass's per-row fields: the one foldSql of the scan
    ]);
  });

  it("finds a step in a file that has one (the patterns are not dead)", () => {
    const files = walk();
    expect(files.get("cli.ts")).toEqual(["declares scan's --folds"]);
    expect(files.get("engine/folds.ts")).toEqual(expect.arrayContaining(["makes the contract from the request", "turns a contract into SQL", "reads the contract back from a plan"]));
    expect(files.get("engine/passPlan.ts")).toEqual(["turns a contract into SQL"]);
    expect(files.get("commands/scan.ts")).toEqual(["makes the contract from the request"]);
  });

  it("the pass's SQL takes the fold from the plan's contract, in both pass shapes", async () => {
    const { levelPassSql } = await import("../../src/engine/aggregate.js");
    const { widePassSql } = await import("../../src/engine/widePass.js");
    const { foldSql, rowHashFolds, groupedFolds } = await import("../../src/engine/folds.js");
    for (const fold of [rowHashFolds(["a", "b"], 7, 3), groupedFolds(["a"], 4, 11)]) {
      const plan = { view: "v", levelColumns: ["a"], countColumns: [], fold };
      expect(levelPassSql(plan)).toContain(`${foldSql(fold)} AS __fold`);
      expect(widePassSql(plan)).toContain(`${foldSql(fold)} AS __fold`);
    }
  });
});
