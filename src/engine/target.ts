/**
 * engine/target: decides how a target column becomes a number y (binary 0/1 or continuous) and
 * builds the SQL that maps it. Missing targets (NULL or blank) give y = NULL and are counted;
 * values that do not fit the kind are counted as `bad` in the pass and rejected afterwards.
 */
import { TailsiftError } from "../errors.js";
import { quoteIdent, quoteLiteral } from "./sql.js";

/** How a target becomes y: 0/1 (binary) or a number (continuous). */
export type TargetKind = "binary" | "continuous";

export const POSITIVE_WORDS = ["1", "1.0", "true", "t", "yes", "y"];
export const NEGATIVE_WORDS = ["0", "0.0", "false", "f", "no", "n"];

export interface TargetSpec {
  column: string;
  kind: TargetKind;
  /** For binary targets given with --positive: the exact text that counts as 1. */
  positive?: string;
}

export interface TargetRequest {
  column: string;
  kind?: TargetKind;
  positive?: string;
}

const isNumber = (v: string) => /^-?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(v);

/** Decides the target kind from the user's options and a sample of its distinct values. */
export function resolveTarget(request: TargetRequest, sampled: readonly string[]): TargetSpec {
  const { column } = request;
  if (request.positive !== undefined) {
    if (request.kind === "continuous") {
      throw new TailsiftError("bad_option", "--positive applies to binary targets; drop it or use --target-kind binary");
    }
    return { column, kind: "binary", positive: request.positive };
  }
  if (sampled.length === 0) {
    throw new TailsiftError("target_empty", `target '${column}' has no values in the first rows; check the column name or give --target-kind`);
  }
  const lower = sampled.map((v) => v.toLowerCase());
  const binaryWords = lower.every((v) => POSITIVE_WORDS.includes(v) || NEGATIVE_WORDS.includes(v));
  if (request.kind === "binary" || (request.kind === undefined && binaryWords && sampled.length <= 2)) {
    if (!binaryWords) {
      throw new TailsiftError("target_needs_positive",
        `target '${column}' has values ${preview(sampled)}; name the positive class with --positive VALUE`);
    }
    if (sampled.length < 2) throw singleValued(column, sampled);
    return { column, kind: "binary" };
  }
  if (lower.every(isNumber)) {
    if (sampled.length < 2) throw singleValued(column, sampled);
    if (request.kind === undefined && sampled.length === 2) {
      throw new TailsiftError("target_needs_positive",
        `target '${column}' has two numeric values ${preview(sampled)}; give --positive VALUE for a binary target or --target-kind continuous`);
    }
    return { column, kind: "continuous" };
  }
  if (request.kind === "continuous") {
    throw new TailsiftError("target_not_numeric", `target '${column}' is not numeric (values such as ${preview(sampled)}); a continuous target needs numbers`);
  }
  if (sampled.length < 2) throw singleValued(column, sampled);
  throw new TailsiftError("target_needs_positive",
    `target '${column}' has text values ${preview(sampled)}; name the positive class with --positive VALUE`);
}

function singleValued(column: string, sampled: readonly string[]): TailsiftError {
  return new TailsiftError("target_single_value", `target '${column}' has a single value (${preview(sampled)}); a target needs at least two`);
}

function preview(values: readonly string[]): string {
  const shown = values.slice(0, 4).map((v) => `'${v}'`).join(", ");
  return values.length > 4 ? `${shown}, …` : shown;
}

/** SQL for y (DOUBLE or NULL) and for "bad" (true when a non-empty value does not fit the kind). */
export function targetSql(spec: TargetSpec): { y: string; bad: string } {
  const q = quoteIdent(spec.column);
  const present = `(${q} IS NOT NULL AND trim(${q}) <> '')`;
  if (spec.kind === "continuous") {
    const cast = `TRY_CAST(trim(${q}) AS DOUBLE)`;
    return { y: `CASE WHEN ${present} THEN ${cast} END`, bad: `(${present} AND ${cast} IS NULL)` };
  }
  if (spec.positive !== undefined) {
    return { y: `CASE WHEN ${present} THEN (trim(${q}) = ${quoteLiteral(spec.positive.trim())})::DOUBLE END`, bad: "false" };
  }
  const pos = POSITIVE_WORDS.map(quoteLiteral).join(", ");
  const neg = NEGATIVE_WORDS.map(quoteLiteral).join(", ");
  const low = `lower(trim(${q}))`;
  return {
    y: `CASE WHEN ${low} IN (${pos}) THEN 1.0 WHEN ${low} IN (${neg}) THEN 0.0 END`,
    bad: `(${present} AND ${low} NOT IN (${pos}, ${neg}))`,
  };
}
