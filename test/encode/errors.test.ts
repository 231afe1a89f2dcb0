/**
 * Bad input to `tailsift encode`: exit 2 with one line naming the problem, no stack trace, and
 * no output file left behind.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { expectCliError } from "../helpers/cliError.js";
import { tempDir, writeFile } from "../helpers/tmp.js";
import { ok, scanPlan, smallData } from "./helpers.js";

const dir = tempDir("encode-err");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const trainFile = writeFile(dir, "train.csv", smallData(200, 21, false));
const noTarget = writeFile(dir, "no-y.csv", fs.readFileSync(trainFile, "utf8").replace(/,[^,\n]*\n/g, "\n"));
const other = writeFile(dir, "other.csv", "city,temp,y\nOslo,3,1\nRome,18,0\nOslo,4,0\n");
const withFold = writeFile(dir, "with-fold.csv", fs.readFileSync(trainFile, "utf8").replace(/\n/g, ",1\n").replace(/^([^\n]*),1\n/, "$1,fold\n"));
const planDir = path.join(dir, "plan");
const bareDir = path.join(dir, "bare");
const out = path.join(dir, "out.parquet");

beforeAll(async () => {
  await scanPlan(trainFile, planDir, ["--target", "y", "--decide", "shop=target-kfold"]);
  fs.mkdirSync(bareDir);
  fs.copyFileSync(path.join(planDir, "profile.json"), path.join(bareDir, "profile.json"));
});

describe("encode: bad input exits 2 with one line", () => {
  it.each([
    ["plan not found", [trainFile, "--plan", path.join(dir, "nope", "profile.json"), "--for", "training"], "plan_not_found", /plan '.*nope.*' not found/],
    ["plan is not a profile", [trainFile, "--plan", writeFile(dir, "x.json", '{"a":1}'), "--for", "training"], "bad_profile", /is not a tailsift profile/],
    ["plan without levels.parquet", [trainFile, "--plan", bareDir, "--for", "scoring"], "plan_without_levels", /no levels\.parquet beside profile\.json/],
    ["plan from another file", [other, "--plan", planDir, "--for", "scoring"], "plan_mismatch", /the input lacks the plan's columns 'shop', 'colour'.*rescan/],
    ["training without the target column", [noTarget, "--plan", planDir, "--for", "training"], "target_missing", /--for training needs the plan's target column 'y'/],
    ["leave-one-out when scoring", [trainFile, "--plan", planDir, "--for", "scoring", "--leave-one-out"], "bad_option", /--leave-one-out applies to --for training only/],
    ["unknown --keep column", [trainFile, "--plan", planDir, "--for", "scoring", "--keep", "nope"], "unknown_column", /--keep: column 'nope' not in the input/],
    ["fold column clash", [withFold, "--plan", planDir, "--for", "training", "--keep", "fold"], "name_clash", /two columns named 'fold'; choose another name with --fold-column/],
    ["no --for", [trainFile, "--plan", planDir], "commander.missingMandatoryOptionValue", /required option '--for <use>'/],
    ["bad --for", [trainFile, "--plan", planDir, "--for", "testing"], "commander.invalidArgument", /--for.*training, scoring/],
  ])("%s", async (_name, args, code, message) => {
    // exit 2, the error code and one line (commander's own errors for option misuse; see test/helpers/cliError.ts)
    await expectCliError(["encode", ...args, "--out", out], code, message);
    expect(fs.existsSync(out)).toBe(false);
    expect(fs.readdirSync(dir).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });

  it("an unsupported output extension is refused before any work", async () => {
    await expectCliError(["encode", trainFile, "--plan", planDir, "--for", "scoring", "--out", path.join(dir, "out.xlsx")], "bad_output", /--out '.*out\.xlsx': the extension decides the format/);
    expect(fs.existsSync(path.join(dir, "out.xlsx"))).toBe(false);
  });

  it("--fold-column resolves the clash", async () => {
    await ok(["encode", withFold, "--plan", planDir, "--for", "training", "--keep", "fold", "--fold-column", "cv_fold", "--out", path.join(dir, "ok.csv"), "--quiet"]);
    expect(fs.readFileSync(path.join(dir, "ok.csv"), "utf8").split("\n")[0]).toMatch(/,fold,cv_fold$/);
  });
});
