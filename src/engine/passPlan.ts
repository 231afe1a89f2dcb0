/**
 * engine/passPlan: the level table's name, what the one pass needs (engine/aggregate,
 * engine/widePass), and the per-row fields both passes read: the fold (from the plan's fold
 * contract — the only place the pass turns the contract into SQL), the target and the content hash.
 */
import { contentHashSql } from "./contentFingerprint.js";
import { foldSql, type FoldContract } from "./folds.js";
import { targetSql, type TargetSpec } from "./target.js";

export const LEVEL_TABLE = "tailsift_levels";

/**
 * Rows of the level table with col ≤ this hold the exact distinct values of `distinctColumns`
 * (column j at DISTINCT_COL_BASE - j); they are read and deleted right after the pass.
 */
export const DISTINCT_COL_BASE = -1_000_000;

export interface PassPlan {
  view: string;
  /** Columns whose levels are counted. */
  levelColumns: readonly string[];
  /** Columns for which only the non-missing count is kept (numeric and time columns). */
  countColumns: readonly string[];
  /** Date/time columns: exact min, max and granularity aggregates (engine/timeColumns); not levels. */
  timeColumns?: readonly string[];
  /** Numeric columns whose exact distinct count is wanted (identifier screen, few values). */
  distinctColumns?: readonly string[];
  target?: TargetSpec;
  /** How each row gets its fold (engine/folds). */
  fold: FoldContract;
  /** All columns in file order: also compute the content fingerprint (engine/contentFingerprint). */
  contentColumns?: readonly string[];
  /**
   * Where the per-fold extras (numeric non-missing counts, time ranges, content hash) are summed:
   * "inline" in the GROUPING SETS pass (one read), or "apart" in a second statement grouped by fold
   * only (a second read). Default: apart for Parquet, inline otherwise (engine/passExtras).
   */
  extras?: "inline" | "apart";
  /**
   * Of timeColumns: those with few distinct values in the first rows, whose range the GROUPING SETS
   * pass reads from a grouping set of their text (engine/keyedExtras). The wide pass ignores it.
   */
  keyableTimeColumns?: readonly string[];
}

/**
 * The per-row SELECT items of the pass, shared by both pass shapes: `__fold` (the row's fold by the
 * plan's contract), `__y` / `__bad` (the target value, and whether it did not fit the target kind)
 * and, with contentColumns, `__h` (the row's content hash).
 */
export function rowFieldsSql(plan: PassPlan): string[] {
  const target = plan.target ? targetSql(plan.target) : { y: "NULL::DOUBLE", bad: "false" };
  return [
    `${foldSql(plan.fold)} AS __fold`,
    `${target.y} AS __y`,
    `${target.bad} AS __bad`,
    ...(plan.contentColumns ? [`${contentHashSql(plan.contentColumns)} AS __h`] : []),
  ];
}

/** The level table's column of class k's rows (multi-class targets only: y = k). */
export const classSumColumn = (k: number): string => `sum_c${k}`;

/** The classes of a multi-class target in the plan (none otherwise). */
export const planClasses = (plan: Pick<PassPlan, "target">): readonly string[] =>
  plan.target?.kind === "multiclass" ? plan.target.classes ?? [] : [];

/**
 * Multi-class targets: the per-class row counts added to the pass's aggregates (an empty string
 * for binary and continuous targets, whose SQL is unchanged). The same in both pass shapes: in the
 * wide pass every unnested entry is one row's, so the counts are per (col, level, fold) alike.
 */
export function classSumsSql(plan: PassPlan): string {
  return planClasses(plan).map((_, k) => `, count(*) FILTER (WHERE __y = ${k})::DOUBLE AS ${classSumColumn(k)}`).join("");
}
