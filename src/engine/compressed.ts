/**
 * engine/compressed: a gzip input is decompressed once in full (in Node's thread pool, beside
 * DuckDB's own reading) to prove it is whole. DuckDB reads a truncated .csv.gz up to the cut and
 * reports the cut as a ragged row — which --skip-bad-rows would then skip, profiling half a file.
 * A truncated or corrupt stream is an error naming the file, whatever --skip-bad-rows.
 * .zst is not checked here (Node 20's zlib has no zstd).
 */
import fs from "node:fs";
import { pipeline } from "node:stream/promises";
import { Writable } from "node:stream";
import zlib from "node:zlib";
import { TailsiftError } from "../errors.js";

const GZIP = /\.(gz|gzip)$/i;

/** Resolves when every gzip file among `files` decompresses to its end; rejects with `corrupt_compressed` otherwise. */
export async function checkCompressedWhole(files: readonly string[]): Promise<void> {
  for (const file of files.filter((f) => GZIP.test(f))) {
    try {
      await pipeline(fs.createReadStream(file), zlib.createGunzip(), new Writable({ write(_chunk, _enc, done) { done(); } }));
    } catch (err) {
      const why = (err as NodeJS.ErrnoException).code === "Z_BUF_ERROR" ? "it is truncated (the compressed stream ends early)" : `it is not a whole gzip stream (${(err as Error).message})`;
      throw new TailsiftError("corrupt_compressed", `cannot read '${file}': ${why}; copy or download the file again`);
    }
  }
}
