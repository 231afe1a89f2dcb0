import fs from "node:fs";
import os from "node:os";
import path from "node:path";

/** A fresh temporary folder for one test file; removed by the caller's afterAll. */
export function tempDir(prefix: string): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), `tailsift-${prefix}-`));
}

export function writeFile(dir: string, name: string, content: string | Buffer): string {
  const file = path.join(dir, name);
  fs.writeFileSync(file, content);
  return file;
}

/** Collects what a CLI run prints. */
export function collector() {
  let out = "";
  let err = "";
  return {
    io: { stdout: (t: string) => { out += t; }, stderr: (t: string) => { err += t; } },
    get out() { return out; },
    get err() { return err; },
  };
}

/** A small seeded PRNG (mulberry32, common practice for reproducible test data), shared with the generators. */
export { mulberry32 } from "../../sample-data/random.mjs";
