/**
 * commands/output: every file we write goes to a temporary file beside its destination and is
 * renamed into place, so an interrupted run leaves the old file or none — never half a file.
 */
import fs from "node:fs";
import path from "node:path";
import { TailsiftError } from "../errors.js";

/** Temporary files in flight, removed on interrupt. */
export const pendingTemps = new Set<string>();

export function tempPathFor(destination: string): string {
  return path.join(path.dirname(destination), `.${path.basename(destination)}.${process.pid}.tmp`);
}

export function writeFileAtomic(destination: string, content: string): void {
  const tmp = tempPathFor(destination);
  pendingTemps.add(tmp);
  try {
    fs.writeFileSync(tmp, content);
    fs.renameSync(tmp, destination);
  } catch (err) {
    throw new TailsiftError("output_unwritable", `cannot write '${destination}': ${(err as NodeJS.ErrnoException).code ?? String(err)}; check the folder exists and is writable`);
  } finally {
    fs.rmSync(tmp, { force: true });
    pendingTemps.delete(tmp);
  }
}

/** Creates the output folder (and parents); a clear error when it cannot. */
export function ensureOutputDir(dir: string): void {
  try {
    makeDirs(path.resolve(dir));
    fs.accessSync(dir, fs.constants.W_OK);
  } catch (err) {
    throw new TailsiftError("output_unwritable", `cannot write to folder '${dir}': ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
  }
}

/**
 * mkdir -p, one level at a time. Node 20's `mkdirSync(p, { recursive: true })` never returns for
 * a path under /proc (seen here), so the recursion is ours.
 */
function makeDirs(dir: string): void {
  if (fs.existsSync(dir)) {
    if (!fs.statSync(dir).isDirectory()) throw Object.assign(new Error("not a folder"), { code: "ENOTDIR" });
    return;
  }
  const parent = path.dirname(dir);
  if (parent !== dir) makeDirs(parent);
  fs.mkdirSync(dir);
}

/** Refuses an output path that is one of the inputs (inputs are never modified). */
export function refuseInputAsOutput(output: string, inputs: readonly string[]): void {
  const out = path.resolve(output);
  for (const input of inputs) {
    if (path.resolve(input) === out) {
      throw new TailsiftError("output_is_input", `output '${output}' is also an input; inputs are never modified — choose another path`);
    }
  }
}

/** Removes temp files left by an interrupted run. */
export function removePendingTemps(): void {
  for (const tmp of pendingTemps) fs.rmSync(tmp, { force: true });
  pendingTemps.clear();
}
