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

/** A small seeded PRNG (mulberry32 — common practice for reproducible test data). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
