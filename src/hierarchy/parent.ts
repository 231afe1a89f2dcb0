/**
 * hierarchy/parent: the parent of a level under a ParentSpec, as SQL (for DuckDB, over every
 * level) and as plain TypeScript (for the detection sample and for tests). Both follow one
 * definition: prefix L = the first L characters; tokens k = the text before the k-th delimiter.
 * A level with too few characters or tokens is its own parent.
 */
import { count, pct } from "../advice/words.js";
import { TailsiftError } from "../errors.js";
import { quoteLiteral, sqlNumber } from "../engine/sql.js";
import { DELIMITERS, type ParentFigures, type ParentSpec } from "./types.js";

function checkDelimiters(delimiters: string): void {
  if (delimiters === "" || [...delimiters].some((ch) => !DELIMITERS.includes(ch))) {
    throw new TailsiftError("bad_parent", `parent delimiters must be some of '${DELIMITERS}', got '${delimiters}'`);
  }
}

/** A regular-expression character class for the delimiters ('-' first, so it is literal). */
function delimiterClass(delimiters: string): string {
  const chars = [...new Set(delimiters)];
  return `${chars.includes("-") ? "-" : ""}${chars.filter((c) => c !== "-").join("")}`;
}

/** SQL for the parent of `levelExpr` (a VARCHAR expression). */
export function parentSql(spec: ParentSpec, levelExpr: string): string {
  if (spec.kind === "prefix") return `left(${levelExpr}, ${sqlNumber(Math.trunc(spec.length))})`;
  checkDelimiters(spec.delimiters);
  const inner = delimiterClass(spec.delimiters);
  const head = `^[^${inner}]*${`[${inner}][^${inner}]*`.repeat(Math.max(0, Math.trunc(spec.count) - 1))}`;
  return `(CASE WHEN regexp_matches(${levelExpr}, ${quoteLiteral(`${head}[${inner}]`)}) THEN regexp_extract(${levelExpr}, ${quoteLiteral(head)}) ELSE ${levelExpr} END)`;
}

/** The parent of one level, in TypeScript (same definition as parentSql). */
export function parentOf(spec: ParentSpec, level: string): string {
  if (spec.kind === "prefix") return [...level].slice(0, spec.length).join("");
  checkDelimiters(spec.delimiters);
  let seen = 0;
  for (let i = 0; i < level.length; i++) {
    if (spec.delimiters.includes(level.charAt(i)) && ++seen === spec.count) return level.slice(0, i);
  }
  return level;
}

/** Words for a parent spec: "the first 3 characters", "the first 2 tokens (split on '-@')". */
export function describeParent(spec: ParentSpec): string {
  return spec.kind === "prefix"
    ? `the first ${spec.length} character${spec.length === 1 ? "" : "s"}`
    : `the first ${spec.count} token${spec.count === 1 ? "" : "s"} (split on '${spec.delimiters}')`;
}

/** "the first 3 characters: 412 groups, 97.0 % of rows in groups of at least 30 rows, median group 233 rows". */
export function describeParentFigures(f: ParentFigures, minRows: number): string {
  return `${describeParent(f.parent)}: ${count(f.groups)} groups, ${pct(f.wellFilledRowShare)} of rows in groups of at least ${count(minRows)} rows, median group ${count(f.medianGroupRows)} rows`;
}
