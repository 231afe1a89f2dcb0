/**
 * encode/planColumns: decides, for every input column, what the output holds — the encoded
 * column(s), the column unchanged, or nothing — and checks that the plan fits the input.
 */
import { TailsiftError } from "../errors.js";
import type { ColumnProfile, Profile } from "../profile/types.js";
import { encoderFor } from "./encodings/registry.js";
import { checkUniqueNames, textName } from "./names.js";
import { encodingSpec } from "./params.js";
import type { EncodedColumn, EncodeMode, OutputItem, PassType } from "./types.js";

export interface ColumnPlanOptions {
  mode: EncodeMode;
  keep: readonly string[];
  keepOriginal: boolean;
  foldColumn: string;
  /** Training: the columns the plan's fold contract reads (engine/folds keyColumns); they must be in the input. */
  foldKeys: readonly string[];
  /** A multi-class target's encoding writes every class (--all-classes), not K − 1. */
  allClasses?: boolean;
}

export interface ColumnPlan {
  outputs: OutputItem[];
  encoded: EncodedColumn[];
  passedThrough: string[];
  dropped: string[];
  notInPlan: string[];
  /** Every output column name in order (the fold column last in training mode). */
  names: string[];
}

const list = (names: readonly string[]) => names.map((n) => `'${n}'`).join(", ");

/**
 * How a passed-through column is written: `--keep` columns untouched (text), the target as its y,
 * the plan's numeric columns as the type scan's sample recorded (double for older plans).
 * Everything else is text as read: a time column (role time) too — it may hold rows that do not
 * read as a time (scan counts them as unparsed), which a TIMESTAMP cast would refuse or null —
 * and a numeric identifier, which the plan drops and `--keep` passes as text (a key, never a number to sum).
 */
function passType(name: string, kept: boolean, target: string | undefined, column: ColumnProfile | undefined): PassType {
  if (kept) return "text";
  if (name === target) return "target";
  if (column?.role === "numeric") return column.numberType ?? "double";
  return "text";
}

/**
 * Plans the output columns. Input columns the plan does not know are left out (unless --keep
 * names them); `--keep` wins over the plan (and keeps the text); the target and numeric columns
 * pass through typed (encode/passThrough).
 * @throws TailsiftError (exit 2): `unknown_column` for a --keep column not in the input,
 *   `target_missing` for training input without the plan's target, `plan_mismatch` when plan
 *   columns the run needs are absent (a plan made from another file), `name_clash`, `bad_plan`.
 */
export function planColumns(profile: Profile, inputColumns: readonly string[], o: ColumnPlanOptions): ColumnPlan {
  const present = new Set(inputColumns);
  const absentKeep = o.keep.filter((k) => !present.has(k));
  if (absentKeep.length > 0) throw new TailsiftError("unknown_column", `--keep: column ${list(absentKeep)} not in the input; columns are: ${inputColumns.join(", ")}`);
  const target = profile.target?.column;
  if (o.mode === "training" && target !== undefined && !present.has(target)) {
    throw new TailsiftError("target_missing", `--for training needs the plan's target column '${target}' in the input (the out-of-fold encoding is computed from it); use --for scoring for data without the target`);
  }
  const multiclass = profile.target?.kind === "multiclass" ? profile.target : undefined;
  const specs = new Map(profile.columns.map((c) => [c.name, encodingSpec(c, profile.settings.maxHashBits, multiclass, o.allClasses ?? false)]));
  const needed = new Set(profile.columns.filter((c) => c.name !== target && specs.get(c.name) !== "drop").map((c) => c.name));
  if (o.mode === "training") for (const c of o.foldKeys) needed.add(c);
  const missing = [...needed].filter((c) => !present.has(c));
  if (missing.length > 0) {
    throw new TailsiftError("plan_mismatch", `the input lacks the plan's column${missing.length === 1 ? "" : "s"} ${list(missing.slice(0, 8))}${missing.length > 8 ? " …" : ""}; the plan was made from ${list(profile.input.paths.slice(0, 2))} — encode data with the same columns or rescan`);
  }
  const plan: ColumnPlan = { outputs: [], encoded: [], passedThrough: [], dropped: [], notInPlan: [], names: [] };
  const keep = new Set(o.keep);
  const profiled = new Map(profile.columns.map((c) => [c.name, c]));
  for (const name of inputColumns) {
    const spec = specs.get(name);
    if (keep.has(name) || (spec !== undefined && (name === target || spec === "keep"))) {
      plan.outputs.push({ kind: "pass", column: name, type: passType(name, keep.has(name), target, profiled.get(name)) });
      plan.passedThrough.push(name);
      plan.names.push(name);
    } else if (spec === undefined) {
      plan.notInPlan.push(name);
    } else if (spec === "drop") {
      plan.dropped.push(name);
    } else {
      const column: EncodedColumn = { name, index: plan.encoded.length, spec };
      plan.encoded.push(column);
      plan.outputs.push({ kind: "encoded", column });
      plan.names.push(...encoderFor(column).outputNames(column));
      if (o.keepOriginal) {
        plan.outputs.push({ kind: "text", column: name });
        plan.names.push(textName(name));
      }
    }
  }
  if (o.mode === "training") plan.names.push(o.foldColumn);
  checkUniqueNames(plan.names, o.mode === "training" ? o.foldColumn : undefined);
  return plan;
}
