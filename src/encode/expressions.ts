/**
 * encode/expressions: the SQL of each output column over the source row `s`. Fallbacks:
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
import { bucketSql } from "../engine/hashing.js";
import { mEstimateSql } from "../engine/formulaSql.js";
import { quoteIdent, quoteLiteral } from "../engine/sql.js";
import type { LookupRef } from "./lookup.js";
import { foldPriorVar, priorVar, sqlDouble } from "./targetMaps.js";
import type { EncodedColumn } from "./types.js";

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
const is = (c: string, v: string | null) => `(${c} IS NOT DISTINCT FROM ${literal(v)})::INTEGER`;
const variable = (name: string) => `getvariable(${quoteLiteral(name)})`;

function lookupOf(column: EncodedColumn, ctx: ExprContext): LookupRef {
  if (!ctx.lookup) throw new Error(`column '${column.name}' has no prepared mapping`);
  return ctx.lookup;
}

/**
 * Target encoding; `m` is the flat weight (null: m = ∞, the prior; undefined: backoff or
 * hierarchical, no leave-one-out form).
 */
function targetSql(column: EncodedColumn, m: number | null | undefined, ctx: ExprContext): string {
  const look = lookupOf(column, ctx);
  const p = variable(priorVar(column.index));
  if (ctx.mode === "scoring") return `coalesce(${look.value("value")}, ${p})`;
  if (!ctx.leaveOneOut) return `coalesce(${look.value("value")}, ${variable(foldPriorVar(column.index))}[${ref(FOLD_FIELD)} + 1])`;
  if (m === undefined) throw new Error(`column '${column.name}' has no leave-one-out form`);
  if (m === null) return p;
  const n = `${look.value("n_y")}::DOUBLE`;
  const s = look.value("sum_y");
  const y = ref(Y_FIELD);
  const mm = sqlDouble(m);
  return `(CASE WHEN ${n} IS NULL THEN ${p}
    WHEN ${y} IS NULL THEN ${mEstimateSql(s, n, mm, p)}
    WHEN ${n} - 1 + ${mm} <= 0 THEN ${p}
    ELSE (${s} - ${y} + ${mm} * ${p}) / (${n} - 1 + ${mm}) END)`;
}

/** The SQL expressions of one encoded column, aligned with names.outputNames(column). */
export function columnSql(column: EncodedColumn, ctx: ExprContext): string[] {
  const c = ref(column.name);
  const spec = column.spec;
  switch (spec.encoding) {
    case "indicator": return [is(c, spec.one)];
    case "one-hot": return spec.levels.map((l) => is(c, l));
    case "pooled-one-hot": {
      const notKept = spec.keep.length === 0 ? "" : ` AND ${c} NOT IN (${spec.keep.map(quoteLiteral).join(", ")})`;
      return [...spec.keep.map((l) => is(c, l)), `(${c} IS NOT NULL${notKept})::INTEGER`];
    }
    case "hashing": return [spec.grouping ? `${lookupOf(column, ctx).value("bucket")}::BIGINT` : bucketSql(c, spec.width, spec.salt)];
    case "frequency": return [`coalesce(${lookupOf(column, ctx).value("value")}, 0::DOUBLE)`];
    case "codes": return [`coalesce(${lookupOf(column, ctx).value("value")}, 0)::BIGINT`];
    case "target-kfold": return [targetSql(column, spec.structure ? undefined : spec.weight, ctx)];
  }
}
