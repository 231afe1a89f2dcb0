/**
 * engine/missingLike: THE definition of "missing" in the SQL every command reads. A value is
 * missing when it is NULL (an empty CSV field, a JSON/Parquet null) or, with `--missing-like
 * VALUE,…`, when its trimmed, lower-cased text is one of the given values. `openSource` applies
 * it once, in the text view `tailsift_src` that scan, encode and drift read, and `tailsift sql`
 * writes the same expression into its query (portableSql/levelSql), so every command agrees on which rows are missing
 * (the fold hash reads the view too, so scan and encode assign the same folds when they use the
 * same list; the list is recorded in profile.json settings.missingLike).
 */
import { TailsiftError } from "../errors.js";
import { quoteLiteral } from "./sql.js";

/** The values as compared: trimmed, lower-cased, without duplicates, sorted (so the record is stable). */
export function normaliseMissingLike(values: readonly string[] | undefined): string[] {
  const out = new Set<string>();
  for (const v of values ?? []) {
    const t = v.trim().toLowerCase();
    if (t === "") throw new TailsiftError("bad_option", "--missing-like: an empty value is already missing (an empty field); give the spellings that stand for missing, e.g. --missing-like unknown,n/a");
    out.add(t);
  }
  return [...out].sort();
}

/** How a dialect spells the pieces of missingLikeSql (portableSql/dialects has one per engine). */
export interface MissingLikeSpelling {
  literal(s: string): string;
  trim(expr: string): string;
  lower(expr: string): string;
}

const DUCKDB: MissingLikeSpelling = { literal: quoteLiteral, trim: (e) => `TRIM(${e})`, lower: (e) => `LOWER(${e})` };

/**
 * `expr` with the missing-like values turned into NULL: CASE WHEN lower(trim(expr)) IN (…) THEN
 * NULL ELSE expr END, spelled for the engine by `d` (DuckDB's by default). No values: `expr` unchanged.
 */
export function missingLikeSql(expr: string, values: readonly string[], d: MissingLikeSpelling = DUCKDB): string {
  if (values.length === 0) return expr;
  return `CASE WHEN ${d.lower(d.trim(expr))} IN (${values.map(d.literal).join(", ")}) THEN NULL ELSE ${expr} END`;
}

/**
 * The list a command that reads a plan applies: the plan's own (settings.missingLike) unless the
 * user gives one. `mustMatch` (encode): a different list than the plan's is refused, because the
 * plan's levels and folds were counted with the plan's list.
 */
export function planMissingLike(planList: unknown, given: readonly string[] | undefined, mustMatch: boolean): string[] {
  const plan = Array.isArray(planList) ? normaliseMissingLike(planList.filter((v): v is string => typeof v === "string")) : [];
  if (given === undefined) return plan;
  const mine = normaliseMissingLike(given);
  if (mustMatch && mine.join("\u0000") !== plan.join("\u0000")) {
    throw new TailsiftError("bad_option", `--missing-like ${mine.join(",") || "(none)"} differs from the plan's (${plan.join(",") || "none"}); encode reads the input as the scan did — give the plan's list or leave the option out`);
  }
  return mine;
}
