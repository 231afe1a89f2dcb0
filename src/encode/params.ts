/**
 * encode/params: reads a plan column's `recommendation` into a checked EncodingSpec. The plan is
 * a file a user may have edited, so every parameter is checked and a bad one is a TailsiftError
 * (exit 2) naming the column and the parameter.
 */
import { TailsiftError } from "../errors.js";
import { HASH_NAME } from "../engine/hashing.js";
import type { ColumnProfile, MulticlassTarget } from "../profile/types.js";
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
 * `grouping: "backoff"` or `prior: "hierarchical"`, and hashing or codes with `grouping:
 * "backoff"` (the advice for identifier-like nesting codes without a target: codes when the groups
 * fit the width cap, hashing past it), are read by encode/hierarchyParams.
 * `maxHashBits` is the plan's recorded cap (settings.maxHashBits, --max-hash-bits): a hashing
 * width above 2^maxHashBits is refused; undefined (a profile written before the cap) = no check.
 * @throws TailsiftError `bad_plan` for a missing or malformed parameter, a hash width past the
 *   plan's cap, an unknown encoding or grouping; `unsupported_plan` for a grouping on encodings other than target-kfold, hashing and codes,
 *   or a hierarchical prior on one other than target-kfold.
 */
export function encodingSpec(column: ColumnProfile, maxHashBits?: number, target?: MulticlassTarget, allClasses = false): EncodingSpec | "drop" | "keep" {
  const { encoding } = column.recommendation;
  // the plan is a file a user may have edited: its parameters are read as unknown and checked
  const params: Record<string, unknown> = Object.fromEntries(Object.entries(column.recommendation.params));
  const name = column.name;
  const groupable = encoding === "target-kfold" || ((encoding === "hashing" || encoding === "codes") && params.prior === undefined);
  if (!groupable && (params.grouping !== undefined || params.prior !== undefined)) {
    throw new TailsiftError("unsupported_plan",
      `plan column '${name}': encode applies a grouping only with target-kfold, hashing or codes and a hierarchical prior only with target-kfold, not with ${String(encoding)}; rescan with --decide ${name}=${String(encoding)} to use the plain encoding`);
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
      if (maxHashBits !== undefined && width > 2 ** maxHashBits) throw bad(name, `params.width ${width} is above the plan's hash width cap 2^${maxHashBits} (settings.maxHashBits, --max-hash-bits)`);
      return grouping ? { encoding, width, salt, grouping } : { encoding, width, salt };
    }
    case "frequency": return { encoding };
    case "codes": {
      const tableSize = params.tableSize === undefined ? 2 ** 53 : positiveInteger(name, params.tableSize, "tableSize"), grouping = hashingGrouping(name, params);
      return grouping ? { encoding, tableSize, grouping } : { encoding, tableSize };
    }
    case "target-kfold": {
      if (params.classes !== undefined) return classesSpec(name, params.classes, target, allClasses);
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

/**
 * A multi-class target's target encoding (params.classes, pipeline/multiclassAdvice): each class
 * of the plan's target with its m (null = ∞) and its share; `dropped` = the largest class (first
 * in order on a tie) unless --all-classes.
 */
function classesSpec(name: string, value: unknown, target: MulticlassTarget | undefined, allClasses: boolean): EncodingSpec {
  if (!target) throw bad(name, "params.classes needs the plan's multi-class target (target.classes)");
  if (!Array.isArray(value) || value.length !== target.classes.length) throw bad(name, `params.classes must list the target's ${target.classes.length} classes`);
  const classes = value.map((entry: unknown, k) => {
    const e = (entry ?? {}) as Record<string, unknown>;
    const cls = target.classes[k]!;
    if (e.value !== cls.value) throw bad(name, `params.classes[${k}].value must be '${cls.value}' (the target's classes, in order)`);
    const m = e.weight;
    if (m !== null && (typeof m !== "number" || !Number.isFinite(m) || m < 0)) throw bad(name, `params.classes[${k}].weight must be a number ≥ 0, or null (no detectable spread: the prior)`);
    return { value: cls.value, weight: m as number | null, share: cls.share };
  });
  let largest = 0;
  classes.forEach((c, k) => { if (c.share > classes[largest]!.share) largest = k; });
  return { encoding: "target-kfold", classes, dropped: allClasses ? null : largest };
}
