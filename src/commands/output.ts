/**
 * commands/output: every file we write goes to a temporary file beside its destination and is
 * renamed into place, so an interrupted run leaves the old file or none — never half a file.
 */
import fs from "node:fs";
import path from "node:path";
import { TailsiftError } from "../errors.js";

import { pendingTemps, tempPathFor } from "../files/temp.js";

export { pendingTemps, tempPathFor };

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

/** Where a path leads: its real path and, when it exists, its device and inode. */
interface FileIdentity { real: string; dev?: number; ino?: number }

function identify(p: string): FileIdentity {
  const abs = path.resolve(p);
  try {
    const st = fs.statSync(abs);
    return { real: fs.realpathSync(abs), dev: st.dev, ino: st.ino };
  } catch {
    // not there (yet): the real path of the folder it would be written to, and its name
    try {
      return { real: path.join(fs.realpathSync(path.dirname(abs)), path.basename(abs)) };
    } catch {
      return { real: abs };
    }
  }
}

const sameFile = (a: FileIdentity, b: FileIdentity): boolean =>
  a.real === b.real || (a.dev !== undefined && a.ino !== undefined && a.dev === b.dev && a.ino === b.ino);

const inside = (folder: FileIdentity, file: FileIdentity): boolean => file.real.startsWith(`${folder.real}${path.sep}`);

/**
 * Refuses an output path that is one of the inputs (inputs are never modified). Inputs and the
 * output are compared by resolved real path and by device and inode, so a symlink, a hard link or
 * a relative spelling of an input is caught; give the expanded input files (globs and Parquet
 * folders resolved) to catch those too. `folders` are output folders replaced as a whole (encode's
 * mappings folder): an input inside one of them is refused as well.
 * @throws TailsiftError `output_is_input`.
 */
export function refuseInputAsOutput(output: string, inputs: readonly string[], folders: readonly string[] = []): void {
  const out = identify(output);
  const dirs = folders.map(identify);
  for (const input of inputs) {
    const id = identify(input);
    if (sameFile(out, id)) {
      const how = path.resolve(input) === path.resolve(output) ? "" : ` (through a link, a glob or a folder: '${input}')`;
      throw new TailsiftError("output_is_input", `output '${output}' is also an input${how}; inputs are never modified — choose another path`);
    }
    const folder = folders.find((_, k) => sameFile(dirs[k]!, id) || inside(dirs[k]!, id));
    if (folder !== undefined) {
      throw new TailsiftError("output_is_input", `input '${input}' is inside '${folder}', which this run replaces; inputs are never modified — move it or choose another --out`);
    }
  }
}

/** Removes temp files left by an interrupted run. */
export function removePendingTemps(): void {
  for (const tmp of pendingTemps) fs.rmSync(tmp, { force: true });
  pendingTemps.clear();
}
