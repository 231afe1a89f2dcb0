/**
 * profile/checkTarget: the target's record (ProfileTarget) from the pass totals, after checking
 * that the target is usable — no values that do not fit its kind, some rows with a value, and at
 * least two distinct values. scan calls it after its pass, scan --levels after adding the tables.
 */
import type { TargetKind } from "../engine/target.js";
import { TailsiftError } from "../errors.js";
import type { ProfileTarget } from "./types.js";

export interface TargetTotals { rows: number; targetRows: number; sumY: number; sumY2: number; badTargets: number }

export interface TargetRequest { column: string; kind: TargetKind; positive?: string }

/**
 * Edge cases: bad values → `target_not_numeric` / `target_needs_positive`; no row with a target →
 * `target_empty`; one value (binary all 0 or all 1, continuous variance ≤ 1e-12·mean²) →
 * `target_single_value`. All exit 2.
 */
export function checkTarget(spec: TargetRequest, totals: TargetTotals): ProfileTarget {
  if (totals.badTargets > 0) {
    const what = spec.kind === "continuous" ? "are not numbers" : "are not one of 0/1, true/false, yes/no, y/n";
    throw new TailsiftError(spec.kind === "continuous" ? "target_not_numeric" : "target_needs_positive",
      `target '${spec.column}': ${totals.badTargets} values ${what}; ${spec.kind === "continuous" ? "clean them or give --target-kind binary with --positive" : "name the positive class with --positive VALUE"}`);
  }
  if (totals.targetRows === 0) throw new TailsiftError("target_empty", `target '${spec.column}' is missing on every row`);
  const mean = totals.sumY / totals.targetRows;
  const variance = Math.max(0, totals.sumY2 / totals.targetRows - mean * mean);
  if (spec.kind === "binary" ? totals.sumY === 0 || totals.sumY === totals.targetRows : variance <= 1e-12 * Math.max(1, mean * mean)) {
    throw new TailsiftError("target_single_value", `target '${spec.column}' has a single value on every row with a target; a target needs at least two`);
  }
  return {
    column: spec.column, kind: spec.kind, ...(spec.positive !== undefined ? { positive: spec.positive } : {}),
    rows: totals.targetRows, missing: totals.rows - totals.targetRows, mean,
    ...(spec.kind === "continuous" ? { sd: Math.sqrt(variance) } : {}),
  };
}
