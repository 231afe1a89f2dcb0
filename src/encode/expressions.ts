/**
 * encode/expressions: what the SQL of every output column shares — the source row `s`, the
 * helper fields of the output query, and the lookup of a mapping. Each encoding's own column
 * SQL lives in its module (encode/encodings/*); their fallbacks, in brief:
 *  - indicator: 1 for the level `one`, else 0 (missing and unseen → 0);
 *  - one-hot: `column=level` is 1 for that level; missing and unseen rows are all 0;
 *  - pooled one-hot: kept levels as one-hot, `column=other` is 1 for any other non-missing
 *    level (pooled or unseen); missing rows are all 0;
 *  - hashing: md5_number_upper(salt ‖ level) mod width (engine/hashing); of backoff groups, the
 *    looked-up bucket of the group key, `width` for "other" (encode/hashedGroupMap); missing → NULL;
 *  - frequency, codes: the mapped value; missing and unseen → 0;
 *  - target (scoring): the full-data m-estimate; missing and unseen → p (the plan's target mean);
 *  - target (training, k-fold): the row's (level, fold) out-of-fold value; missing → the
 *    other folds' prior of the row's fold;
 *  - target (training, leave-one-out): (sum − y + m·p)/(n − 1 + m) from the level's full sums,
 *    n − 1 + m ≤ 0 → p; a row without a target value gets (sum + m·p)/(n + m); missing → p;
 *  - target over a hierarchy (backoff, hierarchical prior): as target k-fold and scoring — the
 *    mapping covers every plan and input level, so only missing rows take the fallback.
 */
import { quoteIdent, quoteLiteral } from "../engine/sql.js";
import type { LookupRef } from "./lookup.js";

export const SOURCE_ALIAS = "s";
export const FOLD_FIELD = "__tailsift_fold";
export const Y_FIELD = "__tailsift_y";
export const ROW_FIELD = "__tailsift_row";

/** A column of the source row. */
export const ref = (column: string): string => `${SOURCE_ALIAS}.${quoteIdent(column)}`;

export interface ExprContext {
  mode: "training" | "scoring";
  leaveOneOut: boolean;
  lookup: LookupRef | null;
}

const literal = (v: string | null) => (v === null ? "NULL" : quoteLiteral(v));
/** 1 when the level expression `c` is `v` (null = missing), else 0, as INTEGER. */
export const isLevelSql = (c: string, v: string | null): string => `(${c} IS NOT DISTINCT FROM ${literal(v)})::INTEGER`;
/** A DuckDB variable as SQL. */
export const variableSql = (name: string): string => `getvariable(${quoteLiteral(name)})`;

/** The prepared lookup of a column's mapping (an Error when the caller did not prepare one). */
export function lookupOf(column: { name: string }, ctx: ExprContext): LookupRef {
  if (!ctx.lookup) throw new Error(`column '${column.name}' has no prepared mapping`);
  return ctx.lookup;
}

