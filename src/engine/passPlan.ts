/** engine/passPlan: the level table's name and what the one pass needs (engine/aggregate, engine/widePass). */
import type { FoldContract } from "./folds.js";
import type { TargetSpec } from "./target.js";

export const LEVEL_TABLE = "tailsift_levels";

export interface PassPlan {
  view: string;
  /** Columns whose levels are counted. */
  levelColumns: readonly string[];
  /** Columns for which only the non-missing count is kept (numeric columns). */
  countColumns: readonly string[];
  target?: TargetSpec;
  /** How each row gets its fold (engine/folds). */
  fold: FoldContract;
}

