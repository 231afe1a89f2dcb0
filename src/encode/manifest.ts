/**
 * encode/manifest: the entries of `mappings.json` — per encoded column, everything a serving
 * system needs besides the per-level table: the parameters, the prior(s) and the formula.
 */
import type { Engine } from "../engine/db.js";
import { HASH_NAME } from "../engine/hashing.js";
import { quoteLiteral } from "../engine/sql.js";
import { pooledLabel } from "./names.js";
import { codedGroupManifestParams, hashedGroupManifestParams, structureManifestParams } from "./structureManifest.js";
import { foldPriorVar, priorVar } from "./targetMaps.js";
import type { EncodedColumn, EncodeMode } from "./types.js";

async function variable<T>(engine: Engine, name: string): Promise<T | null> {
  const [row] = await engine.rows<{ v: T | null }>(`SELECT getvariable(${quoteLiteral(name)}) AS v`, "reading a mapping constant");
  return row?.v ?? null;
}

/** The encoding's parameters and formula, for the manifest. */
async function paramsOf(engine: Engine, column: EncodedColumn, mode: EncodeMode, leaveOneOut: boolean): Promise<Record<string, unknown>> {
  const spec = column.spec;
  switch (spec.encoding) {
    case "indicator": return { one: spec.one, zero: spec.zero, value: "1 when the level is `one`, else 0" };
    case "one-hot": return { levels: spec.levels, value: "column=level is 1 for that level, else 0" };
    case "pooled-one-hot": return { keep: spec.keep, otherColumn: `${column.name}=${pooledLabel(spec.keep, spec.other)}`, value: "kept levels one-hot; other = 1 for any other non-missing level" };
    case "hashing":
      if (spec.grouping) return hashedGroupManifestParams(spec.width, spec.salt, spec.grouping);
      return { width: spec.width, salt: spec.salt, hash: HASH_NAME, value: "little-endian uint64 of the first 8 bytes of MD5(salt ‖ UTF-8 level), mod width" };
    case "frequency": return { value: "training rows of the level / all training rows" };
    case "codes":
      if (spec.grouping) return codedGroupManifestParams(spec.tableSize, spec.grouping);
      return { tableSize: spec.tableSize, value: "rank by descending training rows, ties by level text in byte order; ranks past tableSize → 0" };
    case "target-kfold": {
      const p = await variable<number>(engine, priorVar(column.index));
      if (spec.structure) {
        const priors = mode === "training" ? await variable<number[]>(engine, foldPriorVar(column.index)) : null;
        return structureManifestParams(spec.structure, mode, p, priors);
      }
      const base = { weight: spec.weight, prior: p, value: "(sum_y + m·p)/(n_y + m); n_y + m = 0 → p" };
      if (mode === "scoring") return base;
      if (leaveOneOut) return { ...base, training: "leave-one-out: (sum_y − y + m·p)/(n_y − 1 + m); n_y − 1 + m ≤ 0 → p; no target value → the full-data value" };
      const priors = await variable<number[]>(engine, foldPriorVar(column.index));
      return { ...base, foldPriors: priors, training: "out-of-fold: the (level, fold) row of the .folds file; missing → foldPriors[fold]" };
    }
  }
}

/** One manifest entry. `files` are the file names in the mappings folder. */
export async function manifestEntry(
  engine: Engine, column: EncodedColumn, outputs: string[], files: Record<string, string>, fallback: string,
  mode: EncodeMode, leaveOneOut: boolean,
): Promise<Record<string, unknown>> {
  return {
    column: column.name, encoding: column.spec.encoding, outputs, ...files, fallback,
    params: await paramsOf(engine, column, mode, leaveOneOut),
  };
}
