/**
 * encode/params: reads a plan column's `recommendation` into a checked EncodingSpec. The plan is
 * a file a user may have edited, so every parameter is checked and a bad one is a TailsiftError
 * (exit 2) naming the column and the parameter.
 */
import { TailsiftError } from "../errors.js";
import { HASH_NAME } from "../engine/hashing.js";
import type { ColumnProfile } from "../profile/types.js";
import { hashingGrouping, targetStructure } from "./hierarchyParams.js";
import type { EncodingSpec } from "./types.js";

function bad(column: string, what: string): TailsiftError {
  return new TailsiftError("bad_plan", `plan column '${column}': ${what}; rescan or fix the plan`);
}

function stringList(column: string, value: unknown, name: string): string[] {
  if (!Array.isArray(value) || !value.every((v) => typeof v === "string")) throw bad(column, `params.${name} must be a list of level texts`);
  return value as string[];
}

function textOrNull(column: string, value: unknown, name: string): string | null {
  if (value === null || typeof value === "string") return value;
  throw bad(column, `params.${name} must be a level text or null`);
}

function positiveInteger(column: string, value: unknown, name: string): number {
  if (typeof value !== "number" || !Number.isInteger(value) || value < 1 || value > 2 ** 53) {
    throw bad(column, `params.${name} must be a positive integer`);
  }
  return value;
}

/**
 * The encoding a plan column asks for: "drop", "keep" (pass through) or a checked spec.
 * Edge cases: indicator levels may be null (null = the missing level); one-hot with no levels
 * writes no column; codes without `tableSize` number every level; target-kfold needs a finite
 * weight m ≥ 0 (0 = raw means, with the prior used where a level has no rows) or null (m = ∞, no
 * detectable spread: every level takes the prior); target-kfold with
 * `grouping: "backoff"` or `prior: "hierarchical"`, and hashing with `grouping: "backoff"` (the
 * advice for identifier-like nesting codes without a target), are read by encode/hierarchyParams.
 * @throws TailsiftError `bad_plan` for a missing or malformed parameter, an unknown encoding or
 *   grouping; `unsupported_plan` for a grouping on encodings other than target-kfold and hashing,
 *   or a hierarchical prior on one other than target-kfold.
 */
export function encodingSpec(column: ColumnProfile): EncodingSpec | "drop" | "keep" {
  const { encoding } = column.recommendation;
  // the plan is a file a user may have edited: its parameters are read as unknown and checked
  const params: Record<string, unknown> = Object.fromEntries(Object.entries(column.recommendation.params));
  const name = column.name;
  const groupable = encoding === "target-kfold" || (encoding === "hashing" && params.prior === undefined);
  if (!groupable && (params.grouping !== undefined || params.prior !== undefined)) {
    throw new TailsiftError("unsupported_plan",
      `plan column '${name}': encode applies a grouping only with target-kfold or hashing and a hierarchical prior only with target-kfold, not with ${String(encoding)}; rescan with --decide ${name}=${String(encoding)} to use the plain encoding`);
  }
  switch (encoding) {
    case "drop": return "drop";
    case "keep": return "keep";
    case "indicator": return { encoding, one: textOrNull(name, params.one, "one"), zero: textOrNull(name, params.zero, "zero") };
    case "one-hot": return { encoding, levels: stringList(name, params.levels, "levels") };
    case "pooled-one-hot": {
      const other = params.other ?? "other";
      if (typeof other !== "string") throw bad(name, "params.other must be text");
      return { encoding, keep: stringList(name, params.keep, "keep"), other };
    }
    case "hashing": {
      if (params.hash !== undefined && params.hash !== HASH_NAME) throw bad(name, `params.hash '${String(params.hash)}' is not supported (only ${HASH_NAME})`);
      const salt = params.salt ?? "";
      if (typeof salt !== "string") throw bad(name, "params.salt must be text");
      const width = positiveInteger(name, params.width, "width"), grouping = hashingGrouping(name, params);
      return grouping ? { encoding, width, salt, grouping } : { encoding, width, salt };
    }
    case "frequency": return { encoding };
    case "codes": return { encoding, tableSize: params.tableSize === undefined ? 2 ** 53 : positiveInteger(name, params.tableSize, "tableSize") };
    case "target-kfold": {
      const structure = targetStructure(name, params);
      if (structure) return { encoding, structure };
      const m = params.weight;
      // null: no detectable spread, m = ∞ — every level takes the prior (never read as 0)
      if (m === null) return { encoding, weight: null };
      if (typeof m !== "number" || !Number.isFinite(m) || m < 0) throw bad(name, "params.weight (the prior weight m) must be a number ≥ 0, or null (no detectable spread: the prior)");
      return { encoding, weight: m };
    }
    default: throw bad(name, `unknown encoding '${String(encoding)}'`);
  }
}
