/**
 * encode/manifest: the entries of `mappings.json` — per encoded column, everything a serving
 * system needs besides the per-level table: the parameters, the prior(s) and the formula, as the
 * column's encoding module states them (encode/encodings/*).
 */
import type { Engine } from "../engine/db.js";
import { encoderFor } from "./encodings/registry.js";
import type { EncodedColumn, EncodeMode } from "./types.js";

/** One manifest entry. `outputs` are the written names, `files` the file names in the mappings folder. */
export async function manifestEntry(
  engine: Engine, column: EncodedColumn, outputs: string[], files: Record<string, string>, fallback: string,
  mode: EncodeMode, leaveOneOut: boolean,
): Promise<Record<string, unknown>> {
  return {
    column: column.name, encoding: column.spec.encoding, outputs, ...files, fallback,
    params: await encoderFor(column).manifestParams(engine, column, outputs, mode, leaveOneOut),
  };
}
