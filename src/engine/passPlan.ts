/** engine/passPlan: the level table's name and what the one pass needs (engine/aggregate, engine/widePass). */
import type { FoldContract } from "./folds.js";
import type { TargetSpec } from "./target.js";

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
}
