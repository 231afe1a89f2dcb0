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
  createdDirs.push(dir);
}

/** Folders this run created (deepest last), removed again when the run writes nothing. */
const createdDirs: string[] = [];

/** Removes the folders this run created, if still empty (an interrupted or failed run leaves no empty --out). */
export function removeCreatedEmptyDirs(): void {
  for (const dir of createdDirs.splice(0).reverse()) {
    try { fs.rmdirSync(dir); } catch { /* not empty, or gone: leave it */ }
  }
}

/** Forgets the created folders once outputs are in them (they stay). */
export function keepCreatedDirs(): void { createdDirs.length = 0; }

const TEMP_NAME = /^\..+\.(\d+)(\.pending)?\.tmp$/;

/**
 * Removes temporary files of dead runs from `dir` (a run killed by SIGKILL cannot clean up):
 * names of our pattern `.<file>.<pid>[.pending].tmp` whose pid is no live process. `only`, when
 * given, limits it to temp files of that destination name (a folder that is not ours).
 */
export function removeStaleTemps(dir: string, only?: string): void {
  let names: string[];
  try { names = fs.readdirSync(dir); } catch { return; }
  for (const name of names) {
    const m = TEMP_NAME.exec(name);
    if (!m || (only !== undefined && !name.startsWith(`.${only}.`))) continue;
    const pid = Number(m[1]);
    if (pid === process.pid || processAlive(pid)) continue;
    fs.rmSync(path.join(dir, name), { force: true, recursive: true });
  }
}

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === "EPERM";
  }
}

/**
 * Writes a set of files into `dir` as one unit: each goes to a pending temp file first, then
 * `commit` runs the synchronous renames — `first` (the manifest) before the others, then the
 * removals (files of the old set that the new one lacks).
 * @param files final name → content (string) or path of a finished temp file to move in.
 */
export function writeFileSet(dir: string, files: Array<{ name: string; content?: string; from?: string }>,
  manifest: (staged: Record<string, string>) => { name: string; content: string }, remove: readonly string[],
  commit: (renames: () => void) => void): void {
  const staged: Record<string, string> = {};
  const temps: string[] = [];
  try {
    for (const f of files) {
      const destination = path.join(dir, f.name);
      if (f.from !== undefined) { staged[f.name] = f.from; continue; }
      const tmp = pendingPathFor(destination);
      pendingTemps.add(tmp);
      temps.push(tmp);
      fs.writeFileSync(tmp, f.content ?? "");
      staged[f.name] = tmp;
    }
    const m = manifest(staged);
    const manifestTmp = pendingPathFor(path.join(dir, m.name));
    pendingTemps.add(manifestTmp);
    temps.push(manifestTmp);
    fs.writeFileSync(manifestTmp, m.content);
    commit(() => {
      fs.renameSync(manifestTmp, path.join(dir, m.name));
      for (const [name, from] of Object.entries(staged)) {
        fs.renameSync(from, path.join(dir, name));
        // test hook (DEVELOPERS.md): a write that dies after the manifest and the first file
        if (process.env.TAILSIFT_TEST_FAIL_AT === "mid-commit") throw new Error("EIO (injected by TAILSIFT_TEST_FAIL_AT)");
      }
      for (const name of remove) fs.rmSync(path.join(dir, name), { force: true });
    });
  } catch (err) {
    if (err instanceof TailsiftError) throw err;
    throw new TailsiftError("output_unwritable", `cannot write the plan folder '${dir}': ${(err as NodeJS.ErrnoException).code ?? String(err)}; check the folder is writable and has room`);
  } finally {
    for (const tmp of temps) { fs.rmSync(tmp, { force: true }); pendingTemps.delete(tmp); }
  }
}

/** The pending temp name of a destination: `.<name>.<pid>.pending.tmp` beside it. */
export function pendingPathFor(destination: string): string {
  return tempPathFor(destination).replace(/\.tmp$/, ".pending.tmp");
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
