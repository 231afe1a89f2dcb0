/**
 * engine/target: decides how a target column becomes a number y (binary 0/1 or continuous) and
 * builds the SQL that maps it. Missing targets (NULL or blank) give y = NULL and are counted;
 * values that do not fit the kind are counted as `bad` in the pass and rejected afterwards.
 */
import { TailsiftError } from "../errors.js";
import { quoteIdent, quoteLiteral } from "./sql.js";

/** How a target becomes y: 0/1 (binary) or a number (continuous). */
export type TargetKind = "binary" | "continuous";

/**
 * What scan may be asked for: a binary or continuous y, or a multi-class target (3 to
 * `maxClasses` text values), measured one class against the rest (pipeline/multiclass).
 */
export type ScanTargetKind = TargetKind | "multiclass";

/** The default cap on the classes of an automatic multi-class target (--max-classes). */
export const DEFAULT_MAX_CLASSES = 50;

export const POSITIVE_WORDS = ["1", "1.0", "true", "t", "yes", "y"];
export const NEGATIVE_WORDS = ["0", "0.0", "false", "f", "no", "n"];

export interface TargetSpec {
  column: string;
  kind: ScanTargetKind;
  /** For binary targets given with --positive: the exact text that counts as 1. */
  positive?: string;
  /** Multi-class targets: every class (trimmed text), sorted; y is the class's index. */
  classes?: string[];
}

export interface TargetRequest {
  column: string;
  kind?: ScanTargetKind;
  positive?: string;
  /** The most classes an automatic (or --target-kind multiclass) target may have. */
  maxClasses?: number;
}

const isNumber = (v: string) => /^-?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(v);

/** Decides the target kind from the user's options and a sample of its distinct values. */
export function resolveTarget(request: TargetRequest, sampled: readonly string[]): TargetSpec {
  const { column } = request;
  if (request.positive !== undefined) {
    if (request.kind === "continuous" || request.kind === "multiclass") {
      throw new TailsiftError("bad_option", "--positive applies to binary targets; drop it or use --target-kind binary");
    }
    return { column, kind: "binary", positive: request.positive };
  }
  if (sampled.length === 0) {
    throw new TailsiftError("target_empty", `target '${column}' has no values in the first rows; check the column name or give --target-kind`);
  }
  if (request.kind === "multiclass") {
    if (sampled.length < 2) throw singleValued(column, sampled);
    return { column, kind: "multiclass" };
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
  const cap = request.maxClasses ?? DEFAULT_MAX_CLASSES;
  if (sampled.length >= 3 && sampled.length <= cap) return { column, kind: "multiclass" };
  if (sampled.length > cap) throw tooManyClasses(column, cap);
  throw new TailsiftError("target_needs_positive",
    `target '${column}' has text values ${preview(sampled)}; name the positive class with --positive VALUE`);
}

/** The error for a multi-class target with more classes than the cap. */
export function tooManyClasses(column: string, cap: number): TailsiftError {
  return new TailsiftError("target_too_many_classes",
    `target '${column}' has more than ${cap} distinct values; name one class with --positive VALUE, or raise --max-classes`);
}

/**
 * The exact classes of a multi-class target, in one query over the target column alone (the
 * sample only saw the first rows): sorted by code unit, with their rows. Refuses more than `cap`
 * or fewer than two.
 */
export function classesSql(view: string, column: string, cap: number): string {
  const q = quoteIdent(column);
  return `SELECT trim(${q}) AS v, count(*)::DOUBLE AS n FROM ${view} WHERE ${q} IS NOT NULL AND trim(${q}) <> '' GROUP BY 1 LIMIT ${Math.floor(cap) + 1}`;
}

/** Sorts the rows of classesSql and checks their number. */
export function readClasses(column: string, rows: readonly { v: string; n: number }[], cap: number): { value: string; rows: number }[] {
  if (rows.length > cap) throw tooManyClasses(column, cap);
  if (rows.length < 2) throw singleValued(column, rows.map((r) => r.v));
  return [...rows].sort((a, b) => (a.v < b.v ? -1 : a.v > b.v ? 1 : 0)).map((r) => ({ value: r.v, rows: r.n }));
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
  if (spec.kind === "multiclass") {
    // y = the class's index in the sorted list (0-based); every class was found by classesSql
    const index = `(list_position([${(spec.classes ?? []).map(quoteLiteral).join(", ")}]::VARCHAR[], trim(${q})) - 1)`;
    return { y: `CASE WHEN ${present} THEN ${index}::DOUBLE END`, bad: `(${present} AND ${index} IS NULL)` };
  }
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
